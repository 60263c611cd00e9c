#!/usr/bin/env bash
# The desk's page in a real browser: `trivet desk BEAM --port 0` serves it,
# headless Chromium loads it, lets its script ask the server for the check,
# and dumps the rendered DOM.
#  1. The page as it opens: the verdict, an <svg> plot, the caution, and the
#     node table's values equal to those of `trivet check --json` on the same
#     file (the reaction at the first node, the moments at the first two).
#  2. The page's test hook (#test-edit) changes span 1's length through the
#     same path as a person's edit (its input and an `input` event), waits for
#     the new result and writes both results into #test-log: the first must
#     equal `trivet check --json` of the file, the second that of the file
#     edited the same way (written here with python3), and they must differ.
#
# usage: desk_browser_test.sh TRIVET BEAM_FILE
# Exits 77 (skipped) only when chromium is not installed.
set -u

trivet=${1:?usage: desk_browser_test.sh TRIVET BEAM_FILE}
beam=${2:?usage: desk_browser_test.sh TRIVET BEAM_FILE}

what="the desk page"
. "$(dirname "$0")/find_chromium.sh"
command -v python3 >/dev/null 2>&1 || { echo "FAIL: python3 is needed to read the DOM and the JSON report"; exit 1; }

work=$(mktemp -d)
server=""
cleanup() {
  if [ -n "$server" ] && kill -0 "$server" 2>/dev/null; then
    kill "$server" 2>/dev/null
    for _ in $(seq 1 50); do kill -0 "$server" 2>/dev/null || break; sleep 0.1; done
    kill -9 "$server" 2>/dev/null
  fi
  rm -rf "$work"
}
trap cleanup EXIT
trap 'exit 1' INT TERM

cp "$beam" "$work/beam.json" || { echo "FAIL: cannot copy $beam"; exit 1; }
"$trivet" desk "$work/beam.json" --port 0 >"$work/desk.out" 2>"$work/desk.err" &
server=$!

# The first line of standard output: "trivet desk: http://127.0.0.1:PORT/".
url=""
for _ in $(seq 1 200); do
  line=$(head -n 1 "$work/desk.out" 2>/dev/null)
  url=$(printf '%s\n' "$line" | grep -o 'http://127\.0\.0\.1:[0-9][0-9]*/' | head -n 1)
  [ -n "$url" ] && break
  kill -0 "$server" 2>/dev/null || break
  sleep 0.1
done
if [ -z "$url" ]; then
  echo "FAIL: trivet desk printed no address on its first line"
  echo "stdout:"; cat "$work/desk.out"; echo "stderr:"; tail -20 "$work/desk.err"
  exit 1
fi
echo "desk: $url"

dump() {  # dump URL OUT: the DOM after the page's script has run
  timeout 120 "$browser" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
    --disable-background-networking --disable-component-update --disable-sync \
    --user-data-dir="$work/profile-$(basename "$2")" --virtual-time-budget=30000 \
    --dump-dom "$1" >"$2" 2>"$work/browser.err"
  local brc=$?
  if [ "$brc" -ne 0 ] || [ ! -s "$2" ]; then
    echo "FAIL: chromium exited $brc with no DOM for $1"; tail -20 "$work/browser.err"; exit 1
  fi
}
dump "$url" "$work/dom.html"
dump "${url}#test-edit" "$work/dom-edit.html"

"$trivet" check "$work/beam.json" --json "$work/check.json" >/dev/null 2>"$work/check.err"
rc=$?
if [ "$rc" -gt 1 ]; then echo "FAIL: trivet check exited $rc"; cat "$work/check.err"; exit 1; fi

python3 - "$trivet" "$work" <<'PY'
import html.parser, json, subprocess, sys

trivet, work = sys.argv[1], sys.argv[2]
failures = []
def fail(msg):
    failures.append(msg)
    print("FAIL: " + msg)

class Dom(html.parser.HTMLParser):
    """Collects what the test reads: elements by id (their text), node table cells, svgs."""
    def __init__(self):
        super().__init__()
        self.stack = []          # open elements: (tag, id)
        self.text = {}           # id -> text inside it
        self.cells = {}          # (row id, field) -> data-value
        self.row = None
        self.svg_in_plot = 0
        self.verdict_class = ""
    def handle_starttag(self, tag, attrs):
        a = dict(attrs)
        if tag in ("br", "input", "img", "meta", "link", "hr"):
            return
        self.stack.append((tag, a.get("id")))
        if a.get("id"):
            self.text.setdefault(a["id"], "")
        if a.get("id") == "verdict":
            self.verdict_class = a.get("class", "")
        if tag == "tr" and (a.get("id") or "").startswith("node-"):
            self.row = a["id"]
        if tag == "td" and self.row and a.get("data-field") and "data-value" in a:
            self.cells[(self.row, a["data-field"])] = a["data-value"]
        if tag == "svg" and any(i == "plot" for _, i in self.stack[:-1]):
            self.svg_in_plot += 1
    def handle_endtag(self, tag):
        while self.stack:
            t, _ = self.stack.pop()
            if t == "tr":
                self.row = None
            if t == tag:
                break
    def handle_data(self, data):
        for _, i in self.stack:
            if i:
                self.text[i] += data

def read_dom(path):
    d = Dom()
    with open(path, encoding="utf-8") as f:
        d.feed(f.read())
    return d

def consensus(report, node, field):
    """The median of the ok methods' values at a node, in the first load set (as the page and the console show)."""
    beam = report["beams"][0]
    results = beam["results"]
    first = results[next(iter(results))]
    vals = sorted(m["nodes"][node][field] for m in first["methods"].values() if m["status"] == "ok")
    if not vals:
        return None
    h = len(vals) // 2
    return vals[h] if len(vals) % 2 else (vals[h - 1] + vals[h]) / 2

def close(a, b):
    return abs(a - b) <= 1e-9 * max(1.0, abs(a), abs(b))

with open(f"{work}/check.json", encoding="utf-8") as f:
    report = json.load(f)
status = report["beams"][0]["status"]
checked = [(0, "reaction_force"), (0, "moment_right"), (1, "moment_left"), (1, "reaction_force")]

# 1. the page as it opens
dom = read_dom(f"{work}/dom.html")
verdict = dom.text.get("verdict", "").strip()
if verdict != status:
    fail(f"the page's verdict is {verdict!r}, trivet check says {status!r}")
if f"v-{status}" not in dom.verdict_class:
    fail(f"the verdict's class {dom.verdict_class!r} does not name {status!r}")
if dom.svg_in_plot < 1:
    fail("no <svg> plot in #plot")
# The results in the units a person reads: the example's file is in kN and m,
# its deflections are shown in mm.
if "mm" not in dom.text.get("t-nodes", "") or "mm" not in dom.text.get("t-span-results", ""):
    fail("the node and span tables do not show deflections in mm: " + dom.text.get("t-nodes", "")[:200])
caution = dom.text.get("caution", "")
if "qualified engineer" not in caution or "local codes" not in caution:
    fail("the caution is not on the page")
compared = 0
for node, field in checked:
    want = consensus(report, node, field)
    got = dom.cells.get((f"node-{node}", field))
    if want is None:
        fail(f"trivet check has no {field} at node {node + 1}")
    elif got is None:
        fail(f"the node table has no {field} for node {node + 1}")
    elif not close(float(got), want):
        fail(f"node {node + 1} {field}: page {got}, trivet check {want!r}")
    else:
        compared += 1
        print(f"node {node + 1} {field}: page {float(got)!r} = trivet check {want!r}")
if compared < 2:
    fail(f"only {compared} values of the node table compared (at least 2 needed)")

# 2. the edit through the page's test hook
dom2 = read_dom(f"{work}/dom-edit.html")
log = {}
for line in dom2.text.get("test-log", "").splitlines():
    if ": " in line:
        k, v = line.split(": ", 1)
        log[k.strip()] = v.strip()
if "done" not in dom2.text.get("test-log", ""):
    fail("the #test-edit run wrote no finished log: " + repr(dom2.text.get("test-log", "")[:300]))
else:
    ptr, _, value = log.get("edit", "").partition(" ")
    if ptr != "/spans/0/length":
        fail(f"the test hook edited {ptr!r}, not /spans/0/length")
    else:
        with open(f"{work}/beam.json", encoding="utf-8") as f:
            beam = json.load(f)
        beam["spans"][0]["length"] = float(value)
        with open(f"{work}/edited.json", "w", encoding="utf-8") as f:
            json.dump(beam, f)
        r = subprocess.run([trivet, "check", f"{work}/edited.json", "--json", f"{work}/edited-check.json"],
                           capture_output=True, text=True)
        if r.returncode > 1:
            fail(f"trivet check of the edited file exited {r.returncode}: {r.stderr[:500]}")
        else:
            with open(f"{work}/edited-check.json", encoding="utf-8") as f:
                edited = json.load(f)
            for tag, rep in (("first", report), ("second", edited)):
                if log.get(f"{tag}-verdict") != rep["beams"][0]["status"]:
                    fail(f"{tag} verdict on the page {log.get(tag + '-verdict')!r}, trivet check {rep['beams'][0]['status']!r}")
                for key, node, field in ((f"{tag}-reaction-node1", 0, "reaction_force"),
                                         (f"{tag}-moment-node2-left", 1, "moment_left")):
                    want = consensus(rep, node, field)
                    try:
                        got = float(log.get(key, "nan"))
                    except ValueError:
                        got = float("nan")
                    if want is None or not close(got, want):
                        fail(f"{key}: page {log.get(key)!r}, trivet check {want!r}")
                    else:
                        print(f"{key}: page {got!r} = trivet check {want!r}")
            a, b = float(log.get("first-reaction-node1", "nan")), float(log.get("second-reaction-node1", "nan"))
            if close(a, b):
                fail(f"the edit did not change the reaction at node 1 ({a!r} before and after)")

sys.exit(1 if failures else 0)
PY
prc=$?

if ! kill -0 "$server" 2>/dev/null; then
  echo "FAIL: trivet desk is no longer running after the browser runs"; tail -20 "$work/desk.err"; exit 1
fi
echo "browser: $browser"
if [ "$prc" -ne 0 ]; then exit 1; fi
echo "desk browser test: 2 passed, 0 failed"
