#!/usr/bin/env bash
# Sets up (scripts/setup.sh) and builds trivet into build/ (Release).
set -euo pipefail
cd "$(dirname "$0")/.."
bash scripts/setup.sh
cmake -S . -B build -DCMAKE_BUILD_TYPE=Release -DTRIVET_WERROR=ON "$@"
cmake --build build -j"$(nproc)"
