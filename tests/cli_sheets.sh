#!/usr/bin/env bash
# Spreadsheets and tables of claims from the command line, on the fixtures
# of tests/data/sheets (made by make_sheets.py; closed form there): a
# correct .xlsx and .ods export passes, moments times 1000 fail (exit 1)
# with the units finding, a sheet by name, a missing sheet lists the sheets
# (exit 2), --their-sheet and --claims-sheet are refused without their
# file; --claims from CSV and .xlsx holds, a moment typed in N*m fails with
# its finding, bad rows make the beam invalid (exit 2), and --claims takes
# one beam file.
set -u
trivet="$1"; data="$2"
beam="$data/two-span.json"
out=$(mktemp); json=$(mktemp); bad=$(mktemp --suffix=.csv)
trap 'rm -f "$out" "$json" "$bad"' EXIT
fail=0
expect() {  # expect CODE TEXT-TO-FIND DESCRIPTION -- ARGS...
  local code="$1" text="$2" what="$3"; shift 4
  "$trivet" "$@" >"$out" 2>&1
  local rc=$?
  [ "$rc" = "$code" ] || { echo "FAIL: $what: exit $rc, expected $code"; cat "$out"; fail=1; return; }
  [ -z "$text" ] || grep -qF -- "$text" "$out" || { echo "FAIL: $what: no \"$text\""; cat "$out"; fail=1; }
}
expect 0 "every value holds" "a correct .xlsx export" -- check "$beam" --against "$data/two-span-stations.xlsx"
expect 1 "divided by 1000" "moments times 1000 in an .xlsx" -- check "$beam" --against "$data/two-span-stations-moments-x1000.xlsx"
expect 0 "every value holds" "an .ods export on its second sheet" -- check "$beam" --against "$data/two-span-stations.ods" --their-sheet Stations
expect 0 "every value holds" "--their-sheet before the beam file takes one value" -- check --their-sheet Stations --against "$data/two-span-stations.ods" "$beam"
expect 2 "no row of sheet \"Notes\" looks like the table's header" "one --their-sheet for each --against, in order" -- check "$beam" --against "$data/two-span-stations.ods" --their-sheet Notes --against "$data/two-span-stations.xlsx" --their-sheet Stations
expect 2 "no row of sheet \"Notes\" looks like the table's header" "an .ods whose first sheet has no table" -- check "$beam" --against "$data/two-span-stations.ods"
expect 2 "its sheets: \"Notes\", \"Stations\"" "a sheet that is not there" -- check "$beam" --against "$data/two-span-stations.ods" --their-sheet Results
expect 2 "--their-sheet: applies to the file given with --against" "--their-sheet without --against" -- check "$beam" --their-sheet Stations
expect 2 "--claims-sheet: applies to the file given with --claims" "--claims-sheet without --claims" -- check "$beam" --claims-sheet Claims
expect 2 "give one for every --against file, or one for each" "three --their-sheet for one file" -- check "$beam" --against "$data/two-span-stations.ods" --their-sheet A --their-sheet B --their-sheet C
expect 0 "claims-ok.csv, line 7" "claims from a CSV table" -- check "$beam" --claims "$data/claims-ok.csv"
expect 0 "sheet Claims, row 7" "claims from an .xlsx table below a title" -- check "$beam" --claims "$data/two-span-claims.xlsx"
expect 1 "divided by 1000" "a moment typed in N*m" -- check "$beam" --claims "$data/claims-moment-in-Nm.csv"
printf 'quantity,where,value\nmoment,Q,1\n' > "$bad"
expect 2 "line 2, column 2 (where): \"Q\" is not a node" "a bad row of claims" -- check "$beam" --claims "$bad"
expect 2 "--claims adds a table of claims to one beam file" "--claims with two beam files" -- check "$beam" "$beam" --claims "$data/claims-ok.csv"
# The JSON report: a claim from a table says where it was read; a bad table is the beam's error, with its id.
"$trivet" check "$beam" --claims "$data/claims-ok.csv" --json "$json" >/dev/null 2>&1
grep -q '"source": *"[^"]*claims-ok.csv, line 3"' "$json" || { echo "FAIL: no source in the JSON claims"; fail=1; }
"$trivet" check "$beam" --claims "$bad" --json "$json" >/dev/null 2>&1
grep -q '"id": *"claims.bad_row"' "$json" && grep -q '"status": "invalid"' "$json" || { echo "FAIL: a bad table of claims is not the beam's error in the JSON"; fail=1; }
# A table of claims may name a moving load's own load set: a single 10 kN
# load crossing a simple 6 m span gives at most PL/4 = 15 kN*m at midspan
# (closed form: the moment under the load is P a (L - a) / L, largest at
# a = L/2), claimed at the point (moment_max) and over the span (max_moment,
# also written moment_max with a span).
tmpd=$(mktemp -d)
cat > "$tmpd/crossing.json" <<'JSON'
{"title": "a load crossing a simple span", "units": {"force": "kN", "length": "m"},
 "spans": [{"length": 6, "EI": 20000}], "supports": ["pinned", "roller"],
 "moving_loads": [{"name": "cart", "points": [{"P": 10, "offset": 0}]}]}
JSON
printf 'quantity,where,value,case\nmoment_max,x = 3,15,cart\nmax_moment,span 1,15,cart\nmoment_max,span 1,15,cart\n' > "$tmpd/cart.csv"
"$trivet" check "$tmpd/crossing.json" --claims "$tmpd/cart.csv" >"$tmpd/out" 2>&1
rc=$?; [ $rc = 0 ] || { echo "FAIL: claims on a moving load from a table: exit $rc"; cat "$tmpd/out"; fail=1; }
[ "$(grep -c 'cart .* yes' "$tmpd/out")" = 3 ] || { echo "FAIL: the three moving-load claims do not all hold"; cat "$tmpd/out"; fail=1; }
printf 'quantity,where,value,case\nmoment_max,x = 3,16,cart\n' > "$tmpd/cart-wrong.csv"
"$trivet" check "$tmpd/crossing.json" --claims "$tmpd/cart-wrong.csv" >"$tmpd/out" 2>&1
rc=$?; [ $rc = 1 ] || { echo "FAIL: a wrong moving-load claim from a table: exit $rc, expected 1"; cat "$tmpd/out"; fail=1; }
rm -rf "$tmpd"
[ $fail = 0 ] && echo "sheets: all checks passed"
exit $fail
