#!/usr/bin/env bash
# Reference tables from a general-purpose reader (Debian's libimage-exiftool-perl):
#   exiftool_goexif_samples.json  every *.jpg in goexif's exif/ and exif/samples/ folders
#   exiftool_libjxl_png.json      every PNG of Debian's libjxl-testdata in which exiftool finds EXIF
# Values are exiftool's raw values (-n), grouped by location (-G1: IFD0, ExifIFD, GPS,
# IFD1, MakerNotes, XMP-*, Composite, ...), all occurrences kept (-a).
# Needs: go (to locate the goexif module), exiftool, /usr/bin/python3, libjxl-testdata.
# Tests read only the committed JSON, so CI needs none of these tools.
set -euo pipefail
here="$(cd "$(dirname "$0")" && pwd)"
cd "$here/../.."

tags=()
while read -r t; do [ -n "$t" ] && tags+=("-$t"); done < "$here/exiftool_tags.txt"
export EXIFTOOL_CMD="exiftool -n -json -G1 -a <tags of exiftool_tags.txt>"
tmp="$(mktemp -d)"
trap 'rm -rf "$tmp"' EXIT
ver="$(exiftool -ver)"

# --- goexif samples --------------------------------------------------------
gdir="$(go list -m -f '{{.Dir}}' github.com/rwcarlsen/goexif)"
gver="$(go list -m -f '{{.Version}}' github.com/rwcarlsen/goexif)"
cd "$gdir"
mapfile -t samples < <(ls exif/*.jpg exif/samples/*.jpg | sort)
# exiftool answers "JPEG format error" (and no metadata) for files cut off
# inside a segment; those get a repaired copy (complete segments + EOI, Exif
# bytes unchanged) made by repair_jpeg.py.
: > "$tmp/repaired.tsv"
inputs=()
for s in "${samples[@]}"; do
  w="$(exiftool -q -q -s3 -Warning -Error "$s" || true)"
  if [[ "$w" == *"JPEG format error"* || "$w" == *"Error"* ]]; then
    mkdir -p "$tmp/rep/$(dirname "$s")"
    how="$(/usr/bin/python3 "$here/repair_jpeg.py" "$s" "$tmp/rep/$s" | sed 's/^[^:]*: //')"
    printf '%s\t%s\t%s\n' "$tmp/rep/$s" "$s" "exiftool $ver said '$w' on the original; read a repaired copy: $how" >> "$tmp/repaired.tsv"
    inputs+=("$tmp/rep/$s")
  else
    inputs+=("$gdir/$s")
  fi
done
nrep="$(wc -l < "$tmp/repaired.tsv")"
cd "$here/../.."
exiftool -n -json -G1 -a "${tags[@]}" "${inputs[@]}" 2>/dev/null |
  REPAIRED_LIST="$tmp/repaired.tsv" /usr/bin/python3 "$here/exiftool_json.py" "$here/exiftool_goexif_samples.json" \
    "exifread/testdata/gen_exiftool_tables.sh" \
    "Every *.jpg in the exif/ and exif/samples/ folders of github.com/rwcarlsen/goexif $gver (paths relative to the module directory). $nrep of ${#samples[@]} files end inside a segment after their Exif APP1; exiftool reports only 'JPEG format error' for them, so it read repaired copies (every complete segment in order, then an EOI marker; the Exif APP1 bytes unchanged, verified by repair_jpeg.py): those rows have repaired_copy=true and say what was dropped. Values are exiftool's raw values (-n); numeric-looking strings (e.g. SubSecTime '398') come out as JSON numbers." \
    "$gdir" "goexif_version=$gver" "goexif_module=github.com/rwcarlsen/goexif"

# --- libjxl-testdata PNGs --------------------------------------------------
jdir=/usr/share/libjxl-testdata
if [ ! -d "$jdir" ]; then
  echo "libjxl-testdata not installed; exiftool_libjxl_png.json not regenerated" >&2
  exit 0
fi
jver="$(dpkg-query -W -f '${Version}' libjxl-testdata 2>/dev/null || echo unknown)"
# Which chunk carries the EXIF, and where it sits relative to IDAT.
/usr/bin/python3 - "$jdir" > "$tmp/facts.tsv" <<'PY'
import json, os, struct, sys
base = sys.argv[1]
for root, _, files in os.walk(base):
    for fn in sorted(files):
        if not fn.endswith(".png"):
            continue
        p = os.path.join(root, fn)
        d = open(p, "rb").read()
        pos, seen_idat, carriers = 8, False, []
        while pos + 8 <= len(d):
            n = struct.unpack(">I", d[pos:pos + 4])[0]
            t = d[pos + 4:pos + 8].decode("latin1")
            body = d[pos + 8:pos + 8 + min(n, 40)]
            where = "after_IDAT" if seen_idat else "before_IDAT"
            if t == "eXIf":
                carriers.append({"chunk": "eXIf", "position": where, "length": n})
            elif t in ("zTXt", "tEXt", "iTXt") and body.lower().startswith(b"raw profile type exif"):
                carriers.append({"chunk": t + " 'Raw profile type exif' (hex text, ImageMagick style)", "position": where, "length": n})
            if t == "IDAT":
                seen_idat = True
            pos += 12 + n
        if carriers:
            print(os.path.relpath(p, base) + "\t" + json.dumps({"exif_carriers": carriers}))
PY
cut -f1 "$tmp/facts.tsv" | sed "s|^|$jdir/|" > "$tmp/pngs.txt"
mapfile -t pngs < "$tmp/pngs.txt"
exiftool -n -json -G1 -a "${tags[@]}" "${pngs[@]}" 2>/dev/null |
  FACTS_LIST="$tmp/facts.tsv" /usr/bin/python3 "$here/exiftool_json.py" "$here/exiftool_libjxl_png.json" \
    "exifread/testdata/gen_exiftool_tables.sh" \
    "Every PNG under /usr/share/libjxl-testdata (Debian package libjxl-testdata $jver; paths relative to that folder) that carries EXIF in an eXIf chunk or in a 'Raw profile type exif' text chunk; exif_carriers says which chunk and whether it comes before or after the first IDAT (PNG 3rd edition wants eXIf before IDAT; exiftool reads both and warns). jxl/flower/flower.png has its EXIF (GPS, OffsetTime) only in a zTXt raw profile; jxl/flower/flower_alpha.png has the same EXIF in an eXIf chunk after IDAT. Values are exiftool's raw values (-n)." \
    "$jdir" "libjxl_testdata_version=$jver"
