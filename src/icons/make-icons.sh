#!/usr/bin/env bash
# Draws Fluxwalk's app icons (a collar in soil with CO2 rising from it) and renders them to PNG
# with headless Chromium. Run by hand after changing the drawing; the PNGs are committed.
# icon(kind, size): kind=any → rounded tile on transparent; maskable → full bleed, art in the safe zone.
set -e
cd "$(dirname "$0")"; out=../../public/icons; tmp=$(mktemp -d)
svg() {
  local kind=$1 scale bg
  if [ "$kind" = maskable ]; then scale=0.72; bg='<rect width="512" height="512" fill="#1d5c46"/>'; else scale=0.9; bg='<rect x="16" y="16" width="480" height="480" rx="96" fill="#1d5c46"/>'; fi
  cat <<SVG
<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 512 512" width="512" height="512">
$bg
<g transform="translate(256 256) scale($scale) translate(-256 -256)">
  <!-- soil -->
  <rect x="56" y="350" width="400" height="110" rx="18" fill="#6b3b00"/>
  <!-- collar ring driven into the soil -->
  <path d="M150 330 v48 a106 30 0 0 0 212 0 v-48" fill="#f2b872"/>
  <ellipse cx="256" cy="330" rx="106" ry="30" fill="#ffe1c2"/>
  <ellipse cx="256" cy="330" rx="80" ry="19" fill="#4b2800"/>
  <!-- rising efflux -->
  <g fill="none" stroke="#ffffff" stroke-width="22" stroke-linecap="round">
    <path d="M206 286 c-24 -30 24 -52 0 -84 c-24 -30 24 -52 0 -84"/>
    <path d="M256 286 c-24 -34 24 -60 0 -100 c-24 -34 24 -60 0 -100"/>
    <path d="M306 286 c-24 -30 24 -52 0 -84 c-24 -30 24 -52 0 -84"/>
  </g>
</g>
</svg>
SVG
}
for kind in any maskable; do
  svg $kind > icon-$kind.svg
  for size in 192 512; do
    printf '<html><body style="margin:0;background:transparent"><img src="file://%s/icon-%s.svg" width="%s" height="%s"></body></html>' "$PWD" $kind $size $size > $tmp/page.html
    chromium --headless --no-sandbox --disable-gpu --hide-scrollbars --default-background-color=00000000 \
      --window-size=$size,$size --screenshot=$tmp/out.png file://$tmp/page.html 2>/dev/null
    name=icon-$size.png; [ $kind = maskable ] && name=icon-maskable-$size.png
    cp $tmp/out.png $out/$name
  done
done
rm -rf "$tmp"
