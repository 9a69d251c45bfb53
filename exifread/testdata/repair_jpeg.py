#!/usr/bin/python3
"""Make a repaired copy of a JPEG that is cut off after its metadata.

Usage: repair_jpeg.py IN.jpg OUT.jpg

Many sample photos in circulation end right after their Exif segment (or in
the middle of a later segment), and exiftool then reports only "JPEG format
error". The copy keeps SOI and every *complete* marker segment in order, byte
for byte, stops at the first incomplete segment (or copies everything from SOS
on when the scan is reached), and appends an EOI marker (FFD9). The Exif APP1
bytes are therefore unchanged; the script checks that before writing.
Prints a one-line summary of what was dropped.
"""
import sys

src, dst = sys.argv[1:3]
data = open(src, "rb").read()
if data[:2] != b"\xff\xd8":
    sys.exit(f"{src}: no SOI")
out = bytearray(b"\xff\xd8")
pos = 2
reason = "reached end of file"
need_eoi = True
while pos < len(data):
    if data[pos] != 0xFF:
        reason = f"no marker at offset {pos}"
        break
    m = data[pos + 1] if pos + 1 < len(data) else None
    if m is None:
        reason = f"file ends inside a marker at {pos}"
        break
    if m == 0xFF:  # fill byte
        pos += 1
        continue
    if m == 0xD9:
        reason = "EOI already present"
        break
    if m == 0xDA:
        out += data[pos:]
        reason = "scan reached; copied as is"
        need_eoi = not data.endswith(b"\xff\xd9")
        pos = len(data)
        break
    if pos + 4 > len(data):
        reason = f"file ends inside the length of segment FF{m:02X} at {pos}"
        break
    n = int.from_bytes(data[pos + 2:pos + 4], "big")
    if pos + 2 + n > len(data):
        reason = f"segment FF{m:02X} at {pos} needs {n} bytes, file has {len(data) - pos - 2}"
        break
    out += data[pos:pos + 2 + n]
    pos += 2 + n
# Always append EOI: a segment's last bytes may happen to be FF D9 (an
# embedded thumbnail's EOI), which is not the file's EOI.
if need_eoi:
    out += b"\xff\xd9"


def exif_segment(b):
    p = 2
    while p + 4 <= len(b) and b[p] == 0xFF:
        m, n = b[p + 1], int.from_bytes(b[p + 2:p + 4], "big")
        if m in (0xDA, 0xD9):
            return None
        if m == 0xE1 and b[p + 4:p + 10] == b"Exif\x00\x00":
            return bytes(b[p:p + 2 + n])
        p += 2 + n
    return None


if exif_segment(data) != exif_segment(out):
    sys.exit(f"{src}: Exif segment would change; not writing")
open(dst, "wb").write(out)
print(f"{src}: kept {len(out) - 2} of {len(data)} bytes + EOI ({reason})")
