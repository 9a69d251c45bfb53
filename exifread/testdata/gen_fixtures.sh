#!/usr/bin/env bash
# Regenerates the writer fixtures and the reference reader's view of them:
#   exifread/testdata/fixtures/*          (package exifwrite/fixtures, via its gen command)
#   exifread/testdata/fixtures/heifenc_from_jpeg.heic  (libheif's heif-enc from jpeg_full_mm.jpg)
#   exifread/testdata/exiftool_fixtures.json            (exiftool -n -json -G1 over all fixtures)
#   exifread/testdata/heif_info_fixtures.txt            (libheif heif-info -d box dumps of the HEIF fixtures)
# Needs: go, exiftool (libimage-exiftool-perl), heif-enc/heif-info (libheif-examples), /usr/bin/python3.
# Tests read only the committed outputs, so CI needs none of these tools.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
root="$(cd "$here/../.." && pwd)"
fx="$here/fixtures"
cd "$root"
mkdir -p "$fx"

echo "== writing fixtures with package exifwrite"
go run ./internal/exifwrite/fixtures/gen -out "$fx"

echo "== real HEIC from libheif (heif-enc copies the JPEG's Exif into an Exif item)"
heifver="$(heif-enc --help 2>&1 | head -1 | sed 's/.*libheif version: *//')"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
heif-enc -q 50 -o "$tmp/h.heic" "$fx/jpeg_full_mm.jpg" >/dev/null
# Keep the committed file when libheif produced the same bytes, so reruns do
# not churn it; otherwise replace it.
if ! cmp -s "$tmp/h.heic" "$fx/heifenc_from_jpeg.heic" 2>/dev/null; then
  cp "$tmp/h.heic" "$fx/heifenc_from_jpeg.heic"
fi
heif-info "$fx/heifenc_from_jpeg.heic" | grep -q 'Exif:' || { echo "heif-enc output has no Exif item" >&2; exit 1; }

echo "== libheif's box dump of every HEIF fixture"
{
  echo "# heif-info -d (libheif $heifver) over the HEIF fixtures, written by gen_fixtures.sh."
  echo "# heif_mdat.heic and heif_idat_prefix.heic carry no coded image: heif-info dumps their boxes"
  echo "# but then refuses to open them ('No hvcC'); heifenc_from_jpeg.heic is a complete image."
  for f in heif_mdat.heic heif_idat_prefix.heic heifenc_from_jpeg.heic; do
    echo "=== $f"
    (cd "$fx" && heif-info -d "$f" 2>&1 || true)
  done
} > "$here/heif_info_fixtures.txt"
for f in heif_mdat.heic heif_idat_prefix.heic; do
  (cd "$fx" && heif-info -d "$f" 2>&1 || true) | grep -q 'item_type: Exif' || { echo "libheif finds no Exif item in $f" >&2; exit 1; }
done

echo "== exiftool over the fixtures"
tags=()
while read -r t; do [ -n "$t" ] && tags+=("-$t"); done < "$here/exiftool_tags.txt"
export EXIFTOOL_CMD="exiftool -n -json -G1 -Validate <tags of exiftool_tags.txt>"
exiftool -n -json -G1 -Validate "${tags[@]}" "$fx"/* |
  /usr/bin/python3 "$here/exiftool_json.py" "$here/exiftool_fixtures.json" \
    "exifread/testdata/gen_fixtures.sh" \
    "Fixtures written by package exifwrite (files under fixtures/, byte-identical to what exifwrite/fixtures.All builds), plus heifenc_from_jpeg.heic made by libheif $heifver heif-enc from jpeg_full_mm.jpg. Values are exiftool's raw values (-n); numeric-looking strings such as SubSecTimeOriginal '250' are printed by exiftool as JSON numbers. exiftool $(exiftool -ver) cannot read an Exif item stored with construction_method 1 (idat), so heif_idat_prefix.heic has a Warning and no EXIF values here; its structure is checked in heif_info_fixtures.txt." \
    "$fx" "libheif_version=$heifver"
