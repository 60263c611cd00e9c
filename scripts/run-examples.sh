#!/usr/bin/env bash
# Sets up, builds, and checks the bundled examples/ library (prints the tables).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/build.sh
build/trivet check examples/
