#!/usr/bin/env bash
# Chart check in headless Chromium (Debian's `chromium`): writes the demo
# report, a what-if report (the demo night through the demo rig and through
# the same rig with its cover never fitted) and an assess page, takes a full-page screenshot of each, and fails
# when two text labels of any chart overlap, a label is struck through by a
# threshold or event line, or an event mark has no label (overlap.js says
# how).
#
#   host-sim/tests/browser/check.sh [OUT_DIR]
#
# OUT_DIR (default: <cargo target dir>/browser-check) receives the pages,
# the screenshots (*.png) and each page's overlap list (*.overlaps.txt);
# nothing is written elsewhere. Without chromium the check is skipped with a
# message, except under CI (CI set), where a missing chromium is a failure.
# Exit status: 0 pass or skipped, 1 overlapping labels, 2 setup failure.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(cd "$here/../../.." && pwd)"
cd "$root"

chromium_bin="${CHROMIUM:-$(command -v chromium || true)}"
if [ -z "$chromium_bin" ]; then
  if [ -n "${CI:-}" ]; then
    echo "chart check: chromium not found, and CI is set: failing (install Debian's chromium)" >&2
    exit 2
  fi
  echo "chart check SKIPPED: chromium not found (apt-get install -y chromium); CI runs it"
  exit 0
fi

target="${CARGO_TARGET_DIR:-$root/target}"
out="${1:-$target/browser-check}"
mkdir -p "$out"
out="$(cd "$out" && pwd)"

cargo build -q -p standfast-sim --bin standfast
bin="$target/debug/standfast"

# The pages: the demo night's report (the whole invented night), the same
# night as a what-if (the rig as it is, and without its cover), and the
# assessment of the demo rig.
"$bin" demo --out "$out/demo" --replace >"$out/demo-summary.txt"
"$bin" replay --rig "$out/demo/rig.toml" --profile "$out/demo/night-log-profile.toml" \
  --what-if cover=off --html "$out/whatif.html" >"$out/whatif-summary.txt"
"$bin" assess host-sim/demo/rig.toml --html "$out/assess.html" >"$out/assess.txt"

profile="$(mktemp -d)"
trap 'rm -rf "$profile"' EXIT
chrome() {
  "$chromium_bin" --headless --no-sandbox --disable-gpu --disable-quic \
    --no-first-run --disable-background-networking --disable-component-update \
    --disable-sync --user-data-dir="$profile" --hide-scrollbars \
    --virtual-time-budget=10000 "$@" 2>/dev/null
}

status=0
for page in "$out/demo/report.html" "$out/whatif.html" "$out/assess.html"; do
  name="$(basename "$(dirname "$page")")-$(basename "$page" .html)"
  [ "$(dirname "$page")" = "$out" ] && name="$(basename "$page" .html)"
  # A copy with the check appended as an inline script.
  probe="$out/$name.probe.html"
  {
    sed 's#</body></html>##' "$page"
    printf '<script>\n'
    cat "$here/overlap.js"
    printf '</script></body></html>\n'
  } >"$probe"
  chrome --window-size=1280,1000 --dump-dom "file://$probe" >"$out/$name.dom.html"
  sed -n '/<pre id="standfast-overlap-check">/,/<\/pre>/p' "$out/$name.dom.html" |
    sed -e 's#.*<pre id="standfast-overlap-check">##' -e 's#</pre>.*##' \
      -e 's/&amp;/\&/g' -e 's/&lt;/</g' -e 's/&gt;/>/g' -e 's/&quot;/"/g' >"$out/$name.overlaps.txt"
  if ! grep -q '^CHECKED ' "$out/$name.overlaps.txt"; then
    echo "chart check: the check script did not run on $page" >&2
    exit 2
  fi
  # A full-page screenshot: the window as tall as the page.
  height="$(grep -o 'PAGEHEIGHT [0-9]*' "$out/$name.overlaps.txt" | awk '{print $2}' || true)"
  chrome --window-size="1280,${height:-6000}" --screenshot="$out/$name.png" "file://$page" >/dev/null
  read -r _ charts labels < <(grep '^CHECKED ' "$out/$name.overlaps.txt")
  n="$(grep -cE '^(OVERLAP|STRUCK|UNLABELLED) ' "$out/$name.overlaps.txt" || true)"
  if [ "$n" -gt 0 ]; then
    echo "FAIL $name: $n problems in $charts charts ($labels labels):"
    grep -E '^(OVERLAP|STRUCK|UNLABELLED) ' "$out/$name.overlaps.txt" | sed 's/^/  /'
    status=1
  else
    echo "ok   $name: no overlapping, struck or missing labels in $charts charts ($labels labels)"
  fi
  echo "     screenshot $out/$name.png"
done
exit "$status"
