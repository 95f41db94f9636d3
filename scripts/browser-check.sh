#!/usr/bin/env bash
# Open gearsieve's pictures in a real browser: headless Chromium (Debian package `chromium`,
# installed when missing) takes a screenshot of each SVG, and examples/picture_check compares
# it with resvg's render of the same file (size, not blank, the same drawing); the HTML chart
# page (a thread chart with each setup drawn on the banjo) is checked for size and ink. Run by
# .ci/run.
set -euo pipefail
cd "$(dirname "$0")/.."

if ! command -v chromium >/dev/null; then
    echo "== installing chromium"
    apt-get update -qq
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq chromium >/dev/null
fi
cargo build --release --locked --quiet
cargo build --release --locked --quiet --example picture_check
g=target/release/gearsieve
check=target/release/examples/picture_check
dir=$(mktemp -d)
trap 'rm -rf "$dir"' EXIT

"$g" search --ratio 12 --tol 1% --teeth 14..90 --module 1.5 --stages 2 --centre-distance 75 --limit 1 --format svg >"$dir/train.svg"
"$g" mesh --teeth 17,53 --module 2 --centre-distance 71 --format svg >"$dir/pair.svg"
"$g" clock motion --limit 1 --format svg >"$dir/motion.svg"
"$g" planetary --ratio 5 --planets 4 --limit 1 --format svg >"$dir/planetary.svg"
"$g" draw --gear 23 --module 2 --shift 0.3 --profile "$dir/gear.svg" >/dev/null

for svg in "$dir"/*.svg; do
    read -r w h < <("$check" --size "$svg")
    shot="${svg%.svg}.png"
    chromium --headless --no-sandbox --disable-gpu --hide-scrollbars --force-device-scale-factor=4 \
        --window-size="$w,$h" --screenshot="$shot" "file://$svg" >/dev/null 2>&1
    "$check" "$svg" "$shot"
done
"$g" chart --series iso-coarse --leadscrew 8tpi --stock catalogs/lathe-change-gears.csv \
    --banjo catalogs/lathe/brackenfold.banjo --format html >"$dir/chart.html"
chromium --headless --no-sandbox --disable-gpu --hide-scrollbars \
    --window-size=900,1300 --screenshot="$dir/chart.png" "file://$dir/chart.html" >/dev/null 2>&1
"$check" --not-blank "$dir/chart.png" 900 1300
echo "browser check passed"
