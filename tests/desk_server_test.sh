#!/usr/bin/env bash
# trivet desk's server end to end: runs desk_server_test.py (python3, the
# standard library only) on TRIVET and a copy of an example beam file.
# usage: desk_server_test.sh TRIVET EXAMPLE_BEAM_FILE
# Exits 77 (skipped, never passed) when python3 is not installed.
set -u
if ! command -v python3 >/dev/null 2>&1; then
  echo "SKIPPED: python3 is not installed; the desk's server was not tested"
  exit 77
fi
exec python3 "$(dirname "$0")/desk_server_test.py" "$@"
