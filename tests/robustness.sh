#!/usr/bin/env bash
# trivet under faults: a reader of standard output that goes away, a report
# path that names an input, a kill in the middle of writing a report, odd
# directory entries (dangling links, link loops, a named pipe, an unreadable
# file), a library in which one beam fails, and --jobs 1 against --jobs 2.
# Usage: robustness.sh TRIVET REPO_ROOT
set -u
trivet="$(cd "$(dirname "$1")" && pwd)/$(basename "$1")"; root="$(cd "$2" && pwd)"
work="$(mktemp -d "${TMPDIR:-/tmp}/trivet-robust.XXXXXX")"
trap 'rm -rf "$work"' EXIT
fail=0
no() { echo "FAIL: $*"; fail=1; }
ok() { echo "ok: $*"; }

# --- a report target that exists must be a regular file --------------------
beam="$root/examples/core-wall-beam.json"
mkfifo "$work/fifo"
touch "$work/real.json"; ln -s "$work/real.json" "$work/link.json"
touch "$work/ro.json"; chmod 444 "$work/ro.json"
for target in /dev/null /dev/full "$work/fifo" "$work/link.json" "$work/ro.json" "$work"; do
  timeout 20 "$trivet" check "$beam" --json "$target" >/dev/null 2>"$work/err"
  rc=$?
  [ "$rc" = 2 ] && grep -q "$target" "$work/err" && ok "--json $target refused: exit 2" || no "--json $target: exit $rc: $(cat "$work/err")"
done
[ -c /dev/null ] && [ -c /dev/full ] && ok "/dev/null and /dev/full are still devices" || no "a device was replaced"
[ -p "$work/fifo" ] && [ -L "$work/link.json" ] && ok "the named pipe and the link are untouched" || no "a pipe or a link was replaced"
"$trivet" check "$beam" --json "$work/twice.json" --junit "$work/twice.json" >/dev/null 2>"$work/err"
rc=$?
[ "$rc" = 2 ] && ok "one path for two reports refused" || no "one path for two reports: exit $rc"
"$trivet" selfcheck --json /dev/null >/dev/null 2>&1
rc=$?
[ "$rc" = 2 ] && ok "selfcheck --json /dev/null refused" || no "selfcheck --json /dev/null: exit $rc"

# --- out of memory on one beam: exit 3, named, the other beams kept --------
# (not under AddressSanitizer, which reserves more address space than the
# limit allows)
if [ -z "${ASAN_OPTIONS:-}" ]; then
  mkdir -p "$work/oom"
  cp "$root/examples/core-wall-beam.json" "$work/oom/small.json"
  python3 - "$work/oom/big.json" <<'PY'
import json, sys
n = 1000
b = {"units": {"force": "kN", "length": "m"}, "stations_per_span": 4,
     "spans": [{"length": 5, "EI": 50000} for _ in range(n)], "supports": ["pinned"] + ["roller"] * n,
     "loads": [{"type": "udl", "span": i + 1, "w": 6.0, "case": "live"} for i in range(n)],
     "combinations": [{"name": "strength", "factors": {"live": 1.6}, "pattern": ["live"]}]}
json.dump(b, open(sys.argv[1], "w"))
PY
  (ulimit -v 400000; "$trivet" check "$work/oom" --jobs 1 --json "$work/oom.json" >"$work/oom.out" 2>&1)
  rc=$?
  # (Where memory runs out depends on the threads' timing: while checking
  # the beam or while writing its report; either way the beam is named as
  # an internal failure in the JSON report too, and the other beam kept.)
  if [ "$rc" = 3 ] && grep -q "out of memory while \(checking\|writing the report of\) this beam" "$work/oom.out" \
     && grep -q "small.json.*\[agree\]" "$work/oom.out" && grep -q '"internal.out_of_memory"' "$work/oom.json" \
     && grep -q '"file": *"[^"]*small.json"' "$work/oom.json"; then
    ok "out of memory on one beam: exit 3, named, the other kept"
  else
    no "out of memory on one beam: exit $rc: $(head -c 600 "$work/oom.out")"
  fi
fi

# --- a broken pipe ends quietly, with the verdict's exit code ---------------
# (more than a pipe's 64 KiB, so that trivet is still writing when head leaves)
"$trivet" check "$root/examples" "$root/examples" "$root/examples" "$root/examples" --jobs 2 2>"$work/err" | head -1 >/dev/null
rc=${PIPESTATUS[0]}
[ "$rc" = 0 ] && ok "tables into a closed pipe: exit 0" || no "tables into a closed pipe: exit $rc (141 would be death by SIGPIPE)"
grep -qi "error\|cannot write" "$work/err" && no "tables into a closed pipe: complaint on stderr: $(cat "$work/err")"
"$trivet" check "$root/examples" --json - --jobs 2 2>"$work/err" | head -c 10 >/dev/null
rc=${PIPESTATUS[0]}
[ "$rc" = 0 ] && ok "--json - into a closed pipe: exit 0" || no "--json - into a closed pipe: exit $rc"
grep -qi "cannot write\|internal" "$work/err" && no "--json - into a closed pipe: complaint: $(cat "$work/err")"
"$trivet" check "$root/tests/corpus/bad" --jobs 2 2>/dev/null | head -1 >/dev/null
rc=${PIPESTATUS[0]}
[ "$rc" = 2 ] && ok "invalid library into a closed pipe: exit 2" || no "invalid library into a closed pipe: exit $rc, expected 2"

# --- a report path that names an input is refused ---------------------------
mkdir -p "$work/lib"
cp "$root/examples/core-wall-beam.json" "$root/examples/balcony-cantilever.json" "$work/lib/"
cp "$work/lib/core-wall-beam.json" "$work/core.orig"
"$trivet" check "$work/lib" --json "$work/lib/core-wall-beam.json" >/dev/null 2>"$work/err"
rc=$?
[ "$rc" = 2 ] && ok "--json naming an input: exit 2" || no "--json naming an input: exit $rc"
grep -q "trivet: --json: .*core-wall-beam.json.* the report would overwrite it" "$work/err" \
  && ok "--json naming an input: message" || no "--json naming an input: message: $(cat "$work/err")"
cmp -s "$work/core.orig" "$work/lib/core-wall-beam.json" && ok "the input is untouched" || no "the input was changed"
(cd "$work/lib" && "$trivet" check core-wall-beam.json --junit ./core-wall-beam.json >/dev/null 2>"$work/err"); rc=$?
[ "$rc" = 2 ] && grep -q "trivet: --junit: " "$work/err" && ok "--junit naming an input by another spelling: exit 2" \
  || no "--junit naming an input: exit $rc: $(cat "$work/err")"
ln -s "$work/lib/balcony-cantilever.json" "$work/alias.json"
"$trivet" check "$work/lib" --json "$work/alias.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && ok "--json through a link to an input: exit 2" || no "--json through a link to an input: exit $rc"
ln "$work/lib/core-wall-beam.json" "$work/hard.json"
"$trivet" check "$work/lib" --json "$work/hard.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && cmp -s "$work/core.orig" "$work/lib/core-wall-beam.json" && ok "--json naming a hard link of an input: exit 2" \
  || no "--json naming a hard link of an input: exit $rc"
mkdir -p "$work/lib2"; cp "$root/examples/core-wall-beam.json" "$work/lib2/"
echo "an earlier report" > "$work/earlier.json"
ln -s "$work/earlier.json" "$work/lib2/linked.json"     # an input that is a link to the report
"$trivet" check "$work/lib2" --json "$work/earlier.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && grep -q "linked.json" "$work/err" && [ "$(cat "$work/earlier.json")" = "an earlier report" ] \
  && ok "--json naming the target of a link in the library: exit 2" || no "--json naming the target of a link in the library: exit $rc: $(cat "$work/err")"
"$trivet" check "$work/lib2/../lib/core-wall-beam.json" --json "$work/lib/core-wall-beam.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && ok "--json naming an input spelt through ..: exit 2" || no "--json naming an input spelt through ..: exit $rc"
ln -s "$work/lib" "$work/lib-alias"                     # the library's directory under another name
"$trivet" check "$work/lib" --json "$work/lib-alias/core-wall-beam.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && ok "--json naming an input through a linked directory: exit 2" || no "--json naming an input through a linked directory: exit $rc"
cmp -s "$work/core.orig" "$work/lib/core-wall-beam.json" && ok "the input is still untouched" || no "the input was changed"
# A report replaces an old one whole, and leaves no temporary file; a
# report path that is a directory is refused and the directory stays.
mkdir -p "$work/rep"; echo "the report of an earlier run" > "$work/rep/r.json"
"$trivet" check "$work/lib" --json "$work/rep/r.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 0 ] && python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$work/rep/r.json" \
  && ok "a report replaces an old one" || no "a report over an old one: exit $rc, $(head -c 80 "$work/rep/r.json")"
[ "$(ls -A "$work/rep")" = "r.json" ] && ok "no temporary file is left beside the report" || no "left in the report's directory: $(ls -A "$work/rep")"
mkdir -p "$work/rep/d.json"; touch "$work/rep/d.json/keep"
"$trivet" check "$work/lib" --json "$work/rep/d.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && [ -f "$work/rep/d.json/keep" ] && grep -q "trivet: --json: " "$work/err" \
  && ok "--json naming a directory: exit 2, the directory stays" || no "--json naming a directory: exit $rc: $(cat "$work/err")"
[ "$(ls -A "$work/rep" | sort | tr '\n' ' ')" = "d.json r.json " ] && ok "no temporary file is left after the refusal" || no "left: $(ls -A "$work/rep")"
"$trivet" merge "$work/lib/core-wall-beam.json" --json "$work/lib/core-wall-beam.json" >/dev/null 2>"$work/err"; rc=$?
[ "$rc" = 2 ] && cmp -s "$work/core.orig" "$work/lib/core-wall-beam.json" && ok "merge --json naming an input: exit 2" \
  || no "merge --json naming an input: exit $rc"

# --- a kill in the middle of writing leaves the old report ------------------
big="$work/big"; mkdir -p "$big"
python3 - "$big" <<'PY'
import json, os, sys
for n in range(24):
    beam = {"title": "big %d" % n, "units": {"force": "kN", "length": "m"}, "stations_per_span": 1000,
            "spans": [{"length": 5.0 + 0.1 * k, "EI": 50000} for k in range(12)],
            "supports": ["pinned"] + ["roller"] * 12,
            "loads": [{"type": "udl", "span": k + 1, "w": 10.0} for k in range(12)]}
    with open(os.path.join(sys.argv[1], "beam-%02d.json" % n), "w") as f:
        json.dump(beam, f)
PY
out="$work/out"; mkdir -p "$out"
echo "the report of an earlier run" > "$out/report.json"
"$trivet" check "$big" --jobs 2 --json "$out/report.json" >/dev/null 2>&1 &
pid=$!
seen=""
for _ in $(seq 1 6000); do   # until the temporary file appears (bounded: 10 minutes)
  if ls -A "$out" | grep -q '^\.report\.json\.trivet-tmp\.'; then seen=yes; break; fi
  kill -0 "$pid" 2>/dev/null || break
  sleep 0.1
done
kill -9 "$pid" 2>/dev/null; wait "$pid" 2>/dev/null
if [ -z "$seen" ]; then
  no "kill mid-write: the run ended before its temporary report file appeared"
else
  [ "$(cat "$out/report.json")" = "the report of an earlier run" ] && ok "kill mid-write: the old report is intact" \
    || no "kill mid-write: the report path holds something else ($(head -c 80 "$out/report.json"))"
  left=$(ls -A "$out" | grep -c '^\.report\.json\.trivet-tmp\.')
  [ "$left" = 1 ] && ok "kill mid-write: one hidden temporary file left" || no "kill mid-write: $left temporary files"
  # The next write of the same report removes it (its process is gone).
  "$trivet" check "$work/lib" --json "$out/report.json" >/dev/null 2>&1
  left=$(ls -A "$out" | grep -c '^\.report\.json\.trivet-tmp\.')
  [ "$left" = 0 ] && ok "the next run removed the leftover temporary file" || no "the next run left $left temporary files"
  python3 -c "import json,sys; json.load(open(sys.argv[1]))" "$out/report.json" && ok "the next report is whole JSON" || no "the next report is not JSON"
fi

# --- odd directory entries; one failing beam does not lose the others -------
odd="$work/odd"; mkdir -p "$odd/sub"
cp "$root/examples/core-wall-beam.json" "$odd/good.json"
cp "$root/examples/balcony-cantilever.json" "$odd/sub/good-too.json"
cp "$root/tests/corpus/bad/length-negative.json" "$odd/bad.json"
ln -s "$odd/nowhere.json" "$odd/dangling.json"          # listed, but nothing to read (as a file removed after listing)
ln -s "$odd/self.json" "$odd/self.json"                  # a loop of one link
ln -s "$odd" "$odd/sub/loop"                             # a directory loop
mkfifo "$odd/pipe.json"                                  # would block a reader forever
cp "$root/examples/core-wall-beam.json" "$odd/locked.json"; chmod 000 "$odd/locked.json"
timeout 120 "$trivet" check "$odd" --jobs 2 --json "$work/odd.json" >"$work/odd.txt" 2>&1; rc=$?
[ "$rc" = 2 ] && ok "odd library: exit 2" || no "odd library: exit $rc (124: it hung)"
python3 - "$work/odd.json" "$odd" "$(id -u)" <<'PY' || fail=1
import json, sys
report, odd, uid = json.load(open(sys.argv[1])), sys.argv[2], sys.argv[3]
beams = {b["file"]: b for b in report["beams"]}
def expect(name, status, reason=None):
    b = beams.get(odd + "/" + name)
    if b is None:
        print("FAIL: %s is missing from the report" % name); return False
    if b["status"] != status:
        print("FAIL: %s is %s, expected %s" % (name, b["status"], status)); return False
    if reason and not any(reason in e["message"] for e in b["errors"]):
        print("FAIL: %s: no error saying '%s': %s" % (name, reason, b["errors"])); return False
    print("ok: %s: %s%s" % (name, status, " (" + reason + ")" if reason else "")); return True
good = all([
  expect("good.json", "agree"), expect("sub/good-too.json", "agree"),
  expect("bad.json", "invalid", "/spans/1/length (span 2): must be greater than 0 (got -6.5)"),
  expect("dangling.json", "invalid", "a symbolic link to nothing"),
  expect("self.json", "invalid", "a symbolic link to nothing (or a loop of links)"),
  expect("pipe.json", "invalid", "not a regular file (a named pipe)"),
  expect("locked.json", "agree" if uid == "0" else "invalid", None if uid == "0" else "cannot open the file for reading"),
])
if any("/loop/" in f for f in beams):
    print("FAIL: the walk followed the directory loop"); good = False
sys.exit(0 if good else 1)
PY
# A named pipe named on the command line is refused, not read forever.
timeout 60 "$trivet" check "$odd/pipe.json" >"$work/err" 2>&1; rc=$?
[ "$rc" = 2 ] && grep -q "pipe.json: /: is not a regular file (a named pipe)" "$work/err" && ok "a named pipe on the command line: exit 2" \
  || no "a named pipe on the command line: exit $rc: $(cat "$work/err")"
chmod 600 "$odd/locked.json"

# --- --jobs 1 and --jobs 2 give the same reports, byte for byte -------------
lib=("$root/examples" "$root/tests/corpus/bad" "$root/tests/corpus/good" "$root/tests/data/good" "$root/tests/data/claim-fails")
"$trivet" check "${lib[@]}" --jobs 1 --json "$work/j1.json" --junit "$work/j1.xml" >"$work/j1.txt" 2>/dev/null; r1=$?
"$trivet" check "${lib[@]}" --jobs 2 --json "$work/j2.json" --junit "$work/j2.xml" >"$work/j2.txt" 2>/dev/null; r2=$?
[ "$r1" = 2 ] && [ "$r2" = 2 ] && ok "--jobs 1 and 2: exit 2 both" || no "--jobs 1 exit $r1, --jobs 2 exit $r2"
cmp -s "$work/j1.json" "$work/j2.json" && ok "--jobs 1 and 2: JSON reports identical" || no "--jobs 1 and 2: JSON reports differ"
# The same but for the measured times (time="..."), which differ from run to run.
untimed() { sed -E 's/ time="[0-9.]+" */ /' "$1"; }
cmp -s <(untimed "$work/j1.xml") <(untimed "$work/j2.xml") && ok "--jobs 1 and 2: JUnit reports identical but for times" ||
  no "--jobs 1 and 2: JUnit reports differ"
grep -q '<testsuite [^>]* time="[0-9]*\.[0-9]*"' "$work/j1.xml" && ok "JUnit: every suite has its time" || no "JUnit: a suite without time"
grep -q 'classname="[^"]*\.json"' "$work/j1.xml" && no "JUnit: a classname ends in .json" || ok "JUnit: classnames without .json"
cmp -s "$work/j1.txt" "$work/j2.txt" && ok "--jobs 1 and 2: tables identical" || no "--jobs 1 and 2: tables differ"
[ -s "$work/j1.json" ] || no "--jobs 1: no JSON report"

# --- limits through the program: refused with a message, in bounded memory --
python3 - "$work" <<'PY'
import os, sys
w = sys.argv[1]
with open(os.path.join(w, "spans.json"), "w") as f:
    f.write('{"units": {"force": "kN", "length": "m"}, "spans": [' + ",".join(["0"] * 1000001) + '], "supports": []}')
with open(os.path.join(w, "deep.json"), "w") as f:
    f.write('{"title": ' + "[" * 5000000 + "]" * 5000000 + "}")
PY
(
  # Without AddressSanitizer (which reserves a vast address space), at most 1 GiB.
  if [ -z "${ASAN_OPTIONS:-}" ]; then ulimit -v 1048576; fi
  "$trivet" check "$work/spans.json" "$work/deep.json" >"$work/lim.txt" 2>&1
  echo $? >"$work/lim.rc"
)
[ "$(cat "$work/lim.rc")" = 2 ] && ok "limits: exit 2" || no "limits: exit $(cat "$work/lim.rc")"
grep -q "spans.json: /spans: has 1000001 spans, more than the limit of 1000000" "$work/lim.txt" && ok "limits: spans" || no "limits: spans: $(head -c 300 "$work/lim.txt")"
grep -q "deep.json: /title/0/0.*: nested more than 64 levels deep" "$work/lim.txt" && ok "limits: nesting" || no "limits: nesting: $(grep deep "$work/lim.txt" | head -c 300)"

exit $fail
