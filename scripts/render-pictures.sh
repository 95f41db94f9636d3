#!/usr/bin/env bash
# Draw the README's pictures anew: each as the SVG gearsieve writes, and a PNG of it for the
# page (rendered with rsvg-convert, Debian package librsvg2-bin, installed when missing).
set -euo pipefail
cd "$(dirname "$0")/.."
command -v rsvg-convert >/dev/null || apt-get install -y -qq librsvg2-bin
cargo build --release --locked --quiet
g=target/release/gearsieve
out=docs/pictures

picture() {
    # $1: name; the rest: the gearsieve command (its SVG on stdout)
    local name=$1
    shift
    "$g" "$@" >"$out/$name.svg"
    rsvg-convert -w 1200 -b white "$out/$name.svg" -o "$out/$name.png"
    echo "$out/$name.png"
}

picture reducer-75mm search --ratio 12 --tol 1% --teeth 14..90 --module 1.5 --stages 2 --centre-distance 75 --limit 1 --format svg
picture motion-work clock motion --limit 1 --format svg
picture planetary-5 planetary --ratio 5 --limit 1 --format svg
picture pair-17-53 mesh --teeth 17,53 --module 2 --centre-distance 71 --format svg
"$g" draw --gear 12 --module 2 --profile "$out/gear-12-undercut.svg" >/dev/null
rsvg-convert -w 800 -b white "$out/gear-12-undercut.svg" -o "$out/gear-12-undercut.png"
echo "$out/gear-12-undercut.png"
