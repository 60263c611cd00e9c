#!/usr/bin/env bash
# --show-units on check and plot: the defaults (a N, mm file shows kN*m and
# mm; an imperial file kip*ft and in), `file` for the file's own units, the
# JSON report unchanged by it, the plot's axis titles, bad texts exit 2
# naming the option and what it accepts.
set -u
trivet="$1"; examples="$2"
out=$(mktemp -d); fail=0
nmm="$examples/balcony-cantilever.json"   # units N, mm
imp="$examples/steel-purlin-run.json"     # units kip, ft
grep -q '"force": "N", "length": "mm"' "$nmm" || { echo "FAIL: $nmm is no longer in N, mm"; fail=1; }
grep -q '"force": "kip", "length": "ft"' "$imp" || { echo "FAIL: $imp is no longer in kip, ft"; fail=1; }

"$trivet" check "$nmm" > "$out/default.txt" || { echo "FAIL: check exit $?"; fail=1; }
for want in "max sagging [kN*m]" "deflection [mm]" "reaction [kN]" "x [m]" "(file: N, mm)"; do
  grep -qF "$want" "$out/default.txt" || { echo "FAIL: default: no '$want'"; fail=1; }
done
grep -qF "[N*mm]" "$out/default.txt" && { echo "FAIL: default shows N*mm"; fail=1; }
"$trivet" check "$nmm" --show-units file > "$out/file.txt" || { echo "FAIL: --show-units file exit $?"; fail=1; }
for want in "max sagging [N*mm]" "deflection [mm]" "reaction [N]" "x [mm]"; do
  grep -qF "$want" "$out/file.txt" || { echo "FAIL: file: no '$want'"; fail=1; }
done
"$trivet" check "$nmm" --show-units moment=N*m,length=mm > "$out/some.txt" || { echo "FAIL: a subset exit $?"; fail=1; }
for want in "max sagging [N*m]" "x [mm]" "reaction [kN]" "deflection [mm]"; do
  grep -qF "$want" "$out/some.txt" || { echo "FAIL: subset: no '$want'"; fail=1; }
done
"$trivet" check "$imp" > "$out/imp.txt" || { echo "FAIL: imperial exit $?"; fail=1; }
for want in "max sagging [kip*ft]" "max deflection [in]" "x [ft]" "reaction [kip]"; do
  grep -qF "$want" "$out/imp.txt" || { echo "FAIL: imperial: no '$want'"; fail=1; }
done

# The JSON report stays in the file's units whatever is shown.
"$trivet" check "$nmm" --json "$out/a.json" > /dev/null
"$trivet" check "$nmm" --json "$out/b.json" --show-units force=MN,moment=N*m,length=cm,deflection=in > /dev/null
cmp -s "$out/a.json" "$out/b.json" || { echo "FAIL: --show-units changed the JSON report"; fail=1; }
grep -q '"units": {"force":"N","length":"mm"}' "$out/a.json" || { echo "FAIL: JSON units"; fail=1; }

# HTML and the checking record.
"$trivet" check "$nmm" --html "$out/r.html" --record "$out/rec" > /dev/null 2>&1 || { echo "FAIL: html exit $?"; fail=1; }
grep -qF "max sagging [kN*m]" "$out/r.html" || { echo "FAIL: html: no kN*m"; fail=1; }
grep -qF "largest deflection [mm]" "$out/rec/"*.html || { echo "FAIL: record: no mm"; fail=1; }

# Bad texts: exit 2, the option named, the reason and what is accepted.
for bad in "torque=kN*m:unknown kind 'torque'" "moment=kN:kN is force, but moment is force*length" \
           "deflection=furlong:deflection=furlong" "force=kN,force=N:force is given twice" "metric:'metric' is not KIND=UNIT"; do
  text="${bad%%:*}"; why="${bad#*:}"
  msg=$("$trivet" check "$nmm" --show-units "$text" 2>&1); rc=$?
  { [ $rc = 2 ] && echo "$msg" | grep -qF -- "--show-units" && echo "$msg" | grep -qF -- "$why" &&
    echo "$msg" | grep -qF "force=kN,moment=kN*m,length=m,deflection=mm"; } ||
    { echo "FAIL: check --show-units '$text': exit $rc: $msg"; fail=1; }
done
msg=$("$trivet" plot "$nmm" -o "$out/bad.svg" --show-units moment=mm 2>&1); rc=$?
{ [ $rc = 2 ] && echo "$msg" | grep -qF -- "--show-units" && [ ! -e "$out/bad.svg" ]; } ||
  { echo "FAIL: plot --show-units moment=mm: exit $rc: $msg"; fail=1; }

# The plot's axis titles carry the display units.
if command -v gnuplot >/dev/null; then
  "$trivet" plot "$nmm" -o "$out/p.svg" 2>/dev/null || { echo "FAIL: plot exit $?"; fail=1; }
  for want in "moment [kN*m]" "deflection [mm]" "shear [kN]" "x [m]"; do
    grep -qF "$want" "$out/p.svg" || { echo "FAIL: plot: no axis title '$want'"; fail=1; }
  done
  "$trivet" plot "$nmm" -o "$out/f.svg" --show-units file 2>/dev/null || { echo "FAIL: plot file exit $?"; fail=1; }
  for want in "moment [N*mm]" "x [mm]"; do
    grep -qF "$want" "$out/f.svg" || { echo "FAIL: plot --show-units file: no axis title '$want'"; fail=1; }
  done
else
  echo "gnuplot is not installed: the plot's axis titles not checked"
fi
rm -rf "$out"
[ $fail = 0 ] && echo "show-units: all checks passed"
exit $fail
