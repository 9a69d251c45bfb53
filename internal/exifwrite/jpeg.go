package exifwrite

import (
	"bytes"
	"encoding/binary"
	"fmt"
)

// Identifiers of the APP1 segments (Exif 2.32, "JPEG Marker Segments";
// XMP Part 3, "JPEG").
var (
	exifID = []byte("Exif\x00\x00")
	xmpID  = []byte("http://ns.adobe.com/xap/1.0/\x00")
)

// Maximum sizes of what fits in one APP1 segment: the 16-bit length counts
// itself (2 bytes) and the identifier.
const (
	MaxJPEGExif = 0xFFFF - 2 - 6
	MaxJPEGXMP  = 0xFFFF - 2 - 29
)

// JPEG returns img (a complete JPEG) with its Exif APP1 replaced by payload,
// and, when xmp is non-nil, its XMP APP1 replaced by xmp. A nil payload
// removes the Exif segment. The Exif segment goes right after SOI, or after
// a leading JFIF APP0 (JFIF requires APP0 first); XMP follows the Exif
// segment. Everything from SOS on is copied unchanged.
func JPEG(payload, img, xmp []byte) ([]byte, error) {
	if len(payload) > MaxJPEGExif {
		return nil, fmt.Errorf("jpeg: Exif payload of %d bytes exceeds one APP1 segment (%d): %w", len(payload), MaxJPEGExif, ErrInvalid)
	}
	if len(xmp) > MaxJPEGXMP {
		return nil, fmt.Errorf("jpeg: XMP packet of %d bytes exceeds one APP1 segment (%d); extended XMP is not written: %w", len(xmp), MaxJPEGXMP, ErrInvalid)
	}
	if len(img) < 4 || img[0] != 0xFF || img[1] != 0xD8 {
		return nil, fmt.Errorf("jpeg: base image does not start with SOI: %w", ErrInvalid)
	}
	type seg struct {
		marker byte
		data   []byte // whole segment including marker and length
	}
	var segs []seg
	pos := 2
	rest := []byte(nil)
	for {
		if pos+4 > len(img) || img[pos] != 0xFF {
			return nil, fmt.Errorf("jpeg: base image: no marker at offset %d: %w", pos, ErrInvalid)
		}
		m := img[pos+1]
		if m == 0xFF { // fill byte (ISO/IEC 10918-1 B.1.1.2)
			pos++
			continue
		}
		if m == 0xD9 || m == 0xDA {
			rest = img[pos:]
			break
		}
		n := int(binary.BigEndian.Uint16(img[pos+2:]))
		if n < 2 || pos+2+n > len(img) {
			return nil, fmt.Errorf("jpeg: base image: segment 0x%02X at %d overruns the file: %w", m, pos, ErrInvalid)
		}
		segs = append(segs, seg{m, img[pos : pos+2+n]})
		pos += 2 + n
	}
	var out bytes.Buffer
	out.Write([]byte{0xFF, 0xD8})
	i := 0
	if len(segs) > 0 && segs[0].marker == 0xE0 && bytes.HasPrefix(segs[0].data[4:], []byte("JFIF\x00")) {
		out.Write(segs[0].data)
		i = 1
	}
	if payload != nil {
		out.Write(APP1(exifID, payload))
	}
	if xmp != nil {
		out.Write(APP1(xmpID, xmp))
	}
	for _, s := range segs[i:] {
		if s.marker == 0xE1 {
			body := s.data[4:]
			if bytes.HasPrefix(body, exifID) || (xmp != nil && bytes.HasPrefix(body, xmpID)) {
				continue
			}
		}
		out.Write(s.data)
	}
	out.Write(rest)
	return out.Bytes(), nil
}

// APP1 encodes one APP1 segment: marker, 16-bit length (counting itself),
// identifier, body. The caller keeps len(id)+len(body) <= 65533.
func APP1(id, body []byte) []byte {
	s := []byte{0xFF, 0xE1, 0, 0}
	binary.BigEndian.PutUint16(s[2:], uint16(2+len(id)+len(body)))
	s = append(s, id...)
	return append(s, body...)
}

// ExifAPP1 returns the APP1 segment carrying an Exif payload.
func ExifAPP1(payload []byte) []byte { return APP1(exifID, payload) }

// XMPAPP1 returns the APP1 segment carrying an XMP packet.
func XMPAPP1(xmp []byte) []byte { return APP1(xmpID, xmp) }

// InsertSegments returns img with the given encoded segments inserted, in
// order, right after SOI and nothing else changed. It exists to build
// unusual but legal layouts such as XMP before Exif.
func InsertSegments(img []byte, segs ...[]byte) ([]byte, error) {
	if len(img) < 2 || img[0] != 0xFF || img[1] != 0xD8 {
		return nil, fmt.Errorf("jpeg: base image does not start with SOI: %w", ErrInvalid)
	}
	out := []byte{0xFF, 0xD8}
	for _, s := range segs {
		out = append(out, s...)
	}
	return append(out, img[2:]...), nil
}
