# Sourced by the browser tests: sets $browser to the system's Chromium, or
# exits 77 (ctest: skipped) with a line saying what was not checked ($what).
browser=""
for b in chromium chromium-browser; do
  if command -v "$b" >/dev/null 2>&1; then browser=$(command -v "$b"); break; fi
done
if [ -z "$browser" ]; then
  echo "SKIPPED: chromium is not installed (apt-get install chromium); $what was not checked in a browser"
  exit 77
fi
