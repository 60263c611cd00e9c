#!/usr/bin/env bash
# The exit codes of the contract and their precedence: 2 (invalid) over 1
# (disagreement or failed claim) over 0; the other files are still checked.
set -u
trivet="$1"; data="$2"
fail=0
expect() {
  local want="$1"; shift
  "$trivet" "$@" >/tmp/trivet-cli-test.out 2>&1
  local got=$?
  if [ "$got" != "$want" ]; then
    echo "FAIL: trivet $* exited $got, expected $want"; cat /tmp/trivet-cli-test.out; fail=1
  else
    echo "ok: trivet $* -> $got"
  fi
}
expect 0 check "$data/good"
expect 1 check "$data/claim-fails"
expect 2 check "$data/invalid"
expect 2 check "$data/good" "$data/claim-fails" "$data/invalid"
expect 1 check "$data/good" "$data/claim-fails"
expect 2 check "$data/no-such-file.json"
expect 2 check --methods nonsense "$data/good"
expect 0 check --methods stiffness "$data/good"
expect 0 --version
# A standard output that cannot be written (a full device) is a failure of
# the run: exit 3 and a message, never 0. A pipe whose reader has gone is not.
if [ -w /dev/full ]; then
  "$trivet" check "$data/good" >/dev/full 2>/tmp/trivet-cli-full.err
  got=$?
  if [ "$got" != 3 ] || ! grep -q "could not write to standard output" /tmp/trivet-cli-full.err; then
    echo "FAIL: check > /dev/full exited $got"; cat /tmp/trivet-cli-full.err; fail=1
  else
    echo "ok: check > /dev/full -> 3"
  fi
fi
"$trivet" check "$data/good" | head -c 1 >/dev/null
got=${PIPESTATUS[0]}
[ "$got" = 0 ] || { echo "FAIL: check | head exited $got"; fail=1; }
# The invalid file's message names the file, the JSON location and the reason.
"$trivet" check "$data/invalid/negative-span.json" | grep -q "negative-span.json: /spans/1/length (span 2): must be greater than 0 (got -6.5)" \
  || { echo "FAIL: message for a negative span"; fail=1; }
# The good files' results are still reported beside an invalid one.
"$trivet" check "$data/good" "$data/invalid" --json /tmp/trivet-cli-test.json >/dev/null 2>&1
grep -q '"status": "agree"' /tmp/trivet-cli-test.json || { echo "FAIL: good beam missing from the JSON report"; fail=1; }
grep -q '"status": "invalid"' /tmp/trivet-cli-test.json || { echo "FAIL: invalid beam missing from the JSON report"; fail=1; }
# JSON to standard output is the report alone.
"$trivet" check "$data/good" --json - 2>/dev/null | head -c 1 | grep -q '{' || { echo "FAIL: --json - is not JSON"; fail=1; }
exit $fail
