#!/usr/bin/env bash
# The HTML report as a browser reads it: headless Chromium loads the file
# (no network) and dumps its DOM; the summary, every beam's section and, for
# every beam that is not invalid, its plot must be there.
#
# usage: html_browser_test.sh TRIVET BEAM_FILE_OR_DIR...
#   runs `TRIVET check BEAM... --html REPORT` (exit 0 or 1 both give a report)
# Exits 77 (skipped) when chromium is not installed.
set -u

trivet=${1:?usage: html_browser_test.sh TRIVET BEAM_FILE_OR_DIR...}
shift
[ $# -gt 0 ] || { echo "usage: html_browser_test.sh TRIVET BEAM_FILE_OR_DIR..." >&2; exit 2; }

what="the HTML report"
. "$(dirname "$0")/find_chromium.sh"

work=$(mktemp -d)
trap 'rm -rf "$work"' EXIT
report="$work/report.html"

"$trivet" check "$@" --html "$report" >"$work/check.out" 2>"$work/check.err"
rc=$?
# Invalid files among the inputs make the run exit 2; the report is still written.
if [ "$rc" -gt 2 ] || [ ! -s "$report" ]; then
  echo "FAIL: $trivet check exited $rc"; cat "$work/check.err"; exit 1
fi
[ -s "$report" ] || { echo "FAIL: no report written at $report"; cat "$work/check.err"; exit 1; }

timeout 120 "$browser" --headless --no-sandbox --disable-gpu --disable-quic --no-first-run \
  --disable-background-networking --disable-component-update --disable-sync \
  --user-data-dir="$work/profile" --dump-dom "file://$report" >"$work/dom.html" 2>"$work/browser.err"
brc=$?
if [ "$brc" -ne 0 ] || [ ! -s "$work/dom.html" ]; then
  echo "FAIL: chromium exited $brc with no DOM"; tail -20 "$work/browser.err"; exit 1
fi

failed=0
fail() { echo "FAIL: $*"; failed=1; }

dom="$work/dom.html"
grep -q 'id="summary"' "$dom" || fail "no summary section in the DOM"
grep -q 'class="counts"' "$dom" || fail "no counts in the summary"
grep -q 'id="caution"' "$dom" || fail "no caution"
grep -q 'id="provenance"' "$dom" || fail "no provenance section"
grep -qi '<script' "$dom" && fail "the report has a script"

# One section per beam, numbered 1..N; each valid beam's section has a plot.
sections=$(grep -o '<section class="beam" id="beam-[0-9]*"' "$dom" | wc -l)
[ "$sections" -gt 0 ] || fail "no beam sections"
# Split the DOM at each beam section and look inside each piece.
awk -v dir="$work" '
  /<section class="beam" id="beam-[0-9]+"/ { n++ }
  { if (n) print > (dir "/section-" n ".html") }
' "$dom"
plots=0
for i in $(seq 1 "$sections"); do
  f="$work/section-$i.html"
  [ -f "$f" ] || { fail "section $i not found"; continue; }
  grep -q "id=\"beam-$i\"" "$f" || fail "beam $i: section id beam-$i missing or out of order"
  grep -q "href=\"#beam-$i\"" "$dom" || fail "beam $i: no link from the summary"
  if grep -q 'class="st invalid"' <(head -c 2000 "$f"); then
    continue  # an invalid file has nothing to plot
  fi
  if grep -q '<svg' "$f"; then
    plots=$((plots + 1))
  else
    fail "beam $i: no plot (<svg>) in its section"
  fi
done

echo "browser: $browser"
echo "beam sections: $sections, plotted: $plots"
if [ "$failed" -ne 0 ]; then exit 1; fi
echo "html browser test: 1 passed, 0 failed"
