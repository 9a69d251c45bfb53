package exifread

import (
	"bytes"
	"compress/zlib"
	"encoding/binary"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// found is what a container walker located: the EXIF/TIFF payload (as a
// window of the source, so a TIFF file is never read whole), an XMP packet,
// and the problems met.
type found struct {
	container string
	exifSrc   io.ReaderAt
	exifBase  int64
	exifSize  int64
	exifMem   []byte // the payload when it was copied into memory
	xmp       []byte
	problems  []error
	warnings  []string
}

func (f *found) setExif(b []byte) {
	if f.exifSrc != nil {
		f.warnings = append(f.warnings, "more than one Exif block; the first is used")
		return
	}
	f.exifMem = b
	f.exifSrc = bytes.NewReader(b)
	f.exifSize = int64(len(b))
}

func (f *found) setXMP(b []byte) {
	if f.xmp != nil {
		f.warnings = append(f.warnings, "more than one XMP packet; the first is used")
		return
	}
	f.xmp = b
}

// sniff names the container from the first bytes.
func sniff(h []byte) string {
	switch {
	case len(h) >= 2 && h[0] == 0xFF && h[1] == 0xD8 && (len(h) == 2 || h[2] == 0xFF):
		return ContainerJPEG
	case len(h) >= 4 && (string(h[:4]) == "II*\x00" || string(h[:4]) == "MM\x00*" ||
		string(h[:4]) == "IIRO" || string(h[:4]) == "IIRS" || string(h[:4]) == "IIU\x00"):
		return ContainerTIFF
	case len(h) >= 8 && string(h[:8]) == "\x89PNG\r\n\x1a\n":
		return ContainerPNG
	case len(h) >= 12 && string(h[:4]) == "RIFF" && string(h[8:12]) == "WEBP":
		return ContainerWebP
	case len(h) >= 12 && string(h[4:8]) == "ftyp":
		brands := h[8:]
		if n := int(binary.BigEndian.Uint32(h)); n >= 16 && n <= len(h) {
			brands = h[8:n]
		}
		heif := false
		for i := 0; i+4 <= len(brands); i += 4 {
			if i == 4 {
				continue // minor version
			}
			switch string(brands[i : i+4]) {
			case "avif", "avis":
				return ContainerAVIF
			case "heic", "heix", "heim", "heis", "hevc", "hevx", "mif1", "msf1", "mif2", "MiHE":
				heif = true
			}
		}
		if heif {
			return ContainerHEIF
		}
	}
	return ContainerUnknown
}

// chunk hands the ln bytes at body of a PNG or WebP metadata chunk to use
// when they are within max (the option named limit), and notes a LimitError
// when they are not. It returns true when the file ends before the chunk
// does and the walk cannot go on.
func (f *found) chunk(r io.ReaderAt, where, limit string, max, body, ln, size int64, use func([]byte)) (stop bool) {
	if ln > max {
		f.problems = append(f.problems, &LimitError{Where: where, Limit: limit, Value: ln, Max: max})
		return false
	}
	b, err := readAt(r, body, ln, size, where)
	if err != nil {
		f.problems = append(f.problems, err)
		return true
	}
	use(b)
	return false
}

// exifChunk takes an EXIF chunk's TIFF payload, with or without the
// "Exif\0\0" prefix some writers keep.
func (f *found) exifChunk(b []byte) { f.setExif(trimExifPrefix(b)) }

// readAt reads exactly n bytes at off or reports a FormatError naming where.
func readAt(r io.ReaderAt, off, n int64, size int64, where string) ([]byte, error) {
	if off < 0 || n < 0 || off > size || n > size-off {
		return nil, formatErr(where, off, "need %d bytes at %d but the file has %d (truncated?)", n, off, size)
	}
	b := make([]byte, n)
	got, err := r.ReadAt(b, off)
	if int64(got) < n {
		if err == nil || errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return nil, &FormatError{Where: where, Offset: off, Err: err}
	}
	return b, nil
}

// trimExifPrefix removes an "Exif\0\0" prefix that some writers put before
// the TIFF header in containers that do not need it (PNG, WebP).
func trimExifPrefix(b []byte) []byte {
	if len(b) >= 6 && string(b[:4]) == "Exif" && b[4] == 0 {
		return b[6:]
	}
	return b
}

var xmpJPEGSig = []byte("http://ns.adobe.com/xap/1.0/\x00")

// walkJPEG scans every marker segment up to the start of scan for the Exif
// APP1 and the XMP APP1, wherever they sit. A file that ends after the
// metadata segments (common in circulated samples) yields a warning only.
func walkJPEG(r io.ReaderAt, size int64, opt Options) *found {
	f := &found{container: ContainerJPEG}
	off := int64(2)
	for seg := 0; ; seg++ {
		if seg >= opt.MaxSegments {
			f.problems = append(f.problems, &LimitError{Where: "jpeg", Limit: "MaxSegments", Value: int64(seg), Max: int64(opt.MaxSegments)})
			return f
		}
		if off >= size {
			f.warnings = append(f.warnings, fmt.Sprintf("jpeg: file ends at byte %d before the image data (truncated)", size))
			return f
		}
		hdr, err := readAt(r, off, min(4, size-off), size, "jpeg")
		if err != nil {
			f.problems = append(f.problems, err)
			return f
		}
		if hdr[0] != 0xFF {
			f.problems = append(f.problems, formatErr("jpeg", off, "expected a marker, found byte %#02x", hdr[0]))
			return f
		}
		if len(hdr) < 2 {
			f.warnings = append(f.warnings, fmt.Sprintf("jpeg: file ends at byte %d inside a marker (truncated)", size))
			return f
		}
		m := hdr[1]
		switch {
		case m == 0xFF: // fill byte
			off++
			continue
		case m == 0xD8 || m == 0x01 || (m >= 0xD0 && m <= 0xD7):
			off += 2
			continue
		case m == 0xD9 || m == 0xDA: // end of image, start of scan: metadata is over
			return f
		}
		if len(hdr) < 4 {
			f.warnings = append(f.warnings, fmt.Sprintf("jpeg: file ends at byte %d inside a segment header (truncated)", size))
			return f
		}
		n := int64(binary.BigEndian.Uint16(hdr[2:]))
		if n < 2 {
			f.problems = append(f.problems, formatErr("jpeg", off, "segment %#02x length %d", m, n))
			return f
		}
		body, end := off+4, off+2+n
		if m == 0xE1 {
			avail := min(end, size) - body
			b, err := readAt(r, body, avail, size, "jpeg APP1")
			if err != nil {
				f.problems = append(f.problems, err)
				return f
			}
			truncated := end > size
			switch {
			case len(b) >= 6 && string(b[:4]) == "Exif" && b[4] == 0:
				if truncated {
					f.problems = append(f.problems, formatErr("jpeg Exif APP1", off, "segment of %d bytes cut off by end of file at %d", n, size))
				}
				if f.exifSrc == nil {
					f.exifBase = body + 6 // for messages: file offset of the TIFF header
				}
				f.setExif(b[6:])
			case bytes.HasPrefix(b, xmpJPEGSig):
				if int64(len(b)) > opt.MaxXMPBytes {
					f.problems = append(f.problems, &LimitError{Where: "jpeg XMP", Limit: "MaxXMPBytes", Value: int64(len(b)), Max: opt.MaxXMPBytes})
				} else {
					f.setXMP(b[len(xmpJPEGSig):])
				}
			}
		}
		if end > size {
			f.warnings = append(f.warnings, fmt.Sprintf("jpeg: segment %#02x at byte %d runs past the end of the file (truncated)", m, off))
			return f
		}
		off = end
	}
}

// walkPNG reads chunk headers only, skipping image data, to find eXIf and
// an iTXt XMP packet (PNG 3rd edition, section 11.3.3.6 / 11.3.4.5).
func walkPNG(r io.ReaderAt, size int64, opt Options) *found {
	f := &found{container: ContainerPNG}
	off := int64(8)
	var rawProfile []byte
	for n := 0; off < size; n++ {
		if n >= opt.MaxSegments {
			f.problems = append(f.problems, &LimitError{Where: "png", Limit: "MaxSegments", Value: int64(n), Max: int64(opt.MaxSegments)})
			return f
		}
		h, err := readAt(r, off, 8, size, "png chunk")
		if err != nil {
			f.problems = append(f.problems, err)
			return f
		}
		ln := int64(binary.BigEndian.Uint32(h))
		typ := string(h[4:8])
		body := off + 8
		if ln > size-body {
			f.problems = append(f.problems, formatErr("png chunk "+typ, off, "length %d runs past the end of the file", ln))
			return f
		}
		switch typ {
		case "eXIf":
			if f.chunk(r, "png eXIf", "MaxExifBytes", opt.MaxExifBytes, body, ln, size, f.exifChunk) {
				return f
			}
		case "iTXt":
			if ln > opt.MaxXMPBytes {
				break // not noted: most iTXt chunks are other text, not XMP
			}
			b, err := readAt(r, body, ln, size, "png iTXt")
			if err != nil {
				f.problems = append(f.problems, err)
				return f
			}
			if x, ok, err := pngXMP(b, opt.MaxXMPBytes); err != nil {
				f.problems = append(f.problems, err)
			} else if ok {
				f.setXMP(x)
			}
		case "zTXt", "tEXt":
			// ImageMagick and GIMP write EXIF as a hex "Raw profile type exif"
			// text chunk (older than eXIf); read it when no eXIf is present.
			if ln > 4*opt.MaxExifBytes+4096 {
				break
			}
			hdr, err := readAt(r, body, min(ln, 32), size, "png "+typ)
			if err != nil {
				f.problems = append(f.problems, err)
				return f
			}
			if !bytes.HasPrefix(hdr, []byte("Raw profile type exif\x00")) && !bytes.HasPrefix(hdr, []byte("Raw profile type APP1\x00")) {
				break
			}
			b, err := readAt(r, body, ln, size, "png "+typ)
			if err != nil {
				f.problems = append(f.problems, err)
				return f
			}
			if pl, err := pngRawProfile(b, typ == "zTXt", opt.MaxExifBytes); err != nil {
				f.problems = append(f.problems, err)
			} else {
				rawProfile = pl
			}
		case "IEND":
			if f.exifSrc == nil && rawProfile != nil {
				f.setExif(rawProfile)
				f.warnings = append(f.warnings, "png: EXIF read from a 'Raw profile type exif' text chunk (no eXIf chunk)")
			}
			return f
		}
		off = body + ln + 4
	}
	f.warnings = append(f.warnings, "png: no IEND chunk (truncated)")
	return f
}

// pngRawProfile decodes the ImageMagick raw-profile text: "\nexif\n  LEN\nHEX…",
// the hex holding "Exif\0\0" and the TIFF payload.
func pngRawProfile(b []byte, compressed bool, max int64) ([]byte, error) {
	i := bytes.IndexByte(b, 0)
	text := b[i+1:]
	if compressed {
		if len(text) < 1 {
			return nil, formatErr("png zTXt", -1, "no compression method")
		}
		zr, err := zlib.NewReader(bytes.NewReader(text[1:]))
		if err != nil {
			return nil, &FormatError{Where: "png zTXt", Offset: -1, Err: err}
		}
		text, err = io.ReadAll(io.LimitReader(zr, 2*max+4096))
		if err != nil {
			return nil, &FormatError{Where: "png zTXt", Offset: -1, Err: err}
		}
	}
	fields := strings.Fields(string(text))
	if len(fields) < 3 {
		return nil, formatErr("png raw profile", -1, "header lacks name and length")
	}
	n, err := strconv.ParseInt(fields[1], 10, 64)
	if err != nil || n < 0 {
		return nil, formatErr("png raw profile", -1, "length %s", quoted(fields[1]))
	}
	if n > max {
		return nil, &LimitError{Where: "png raw profile", Limit: "MaxExifBytes", Value: n, Max: max}
	}
	hx := strings.Join(fields[2:], "")
	if int64(len(hx)) < 2*n {
		return nil, formatErr("png raw profile", -1, "%d hex digits for %d bytes", len(hx), n)
	}
	out, err := hex.DecodeString(hx[:2*n])
	if err != nil {
		return nil, &FormatError{Where: "png raw profile", Offset: -1, Err: err}
	}
	return trimExifPrefix(out), nil
}

// pngXMP returns the text of an iTXt chunk with keyword XML:com.adobe.xmp.
func pngXMP(b []byte, max int64) ([]byte, bool, error) {
	const kw = "XML:com.adobe.xmp\x00"
	if !bytes.HasPrefix(b, []byte(kw)) || len(b) < len(kw)+2 {
		return nil, false, nil
	}
	compressed := b[len(kw)] == 1
	rest := b[len(kw)+2:]
	// language tag and translated keyword, each NUL-terminated
	for i := 0; i < 2; i++ {
		j := bytes.IndexByte(rest, 0)
		if j < 0 {
			return nil, false, formatErr("png iTXt", -1, "XMP chunk lacks its language fields")
		}
		rest = rest[j+1:]
	}
	if !compressed {
		return rest, true, nil
	}
	zr, err := zlib.NewReader(bytes.NewReader(rest))
	if err != nil {
		return nil, false, &FormatError{Where: "png iTXt", Offset: -1, Err: err}
	}
	out, err := io.ReadAll(io.LimitReader(zr, max+1))
	if err != nil {
		return nil, false, &FormatError{Where: "png iTXt", Offset: -1, Err: err}
	}
	if int64(len(out)) > max {
		return nil, false, &LimitError{Where: "png iTXt XMP", Limit: "MaxXMPBytes", Value: int64(len(out)), Max: max}
	}
	return out, true, nil
}

// walkWebP reads the RIFF chunks of a WebP file for EXIF and "XMP ".
func walkWebP(r io.ReaderAt, size int64, opt Options) *found {
	f := &found{container: ContainerWebP}
	h, err := readAt(r, 0, 12, size, "webp")
	if err != nil {
		f.problems = append(f.problems, err)
		return f
	}
	end := int64(binary.LittleEndian.Uint32(h[4:])) + 8
	if end > size {
		f.warnings = append(f.warnings, fmt.Sprintf("webp: RIFF declares %d bytes, file has %d (truncated)", end, size))
		end = size
	}
	off := int64(12)
	for n := 0; off+8 <= end; n++ {
		if n >= opt.MaxSegments {
			f.problems = append(f.problems, &LimitError{Where: "webp", Limit: "MaxSegments", Value: int64(n), Max: int64(opt.MaxSegments)})
			return f
		}
		ch, err := readAt(r, off, 8, size, "webp chunk")
		if err != nil {
			f.problems = append(f.problems, err)
			return f
		}
		fourcc := string(ch[:4])
		ln := int64(binary.LittleEndian.Uint32(ch[4:]))
		body := off + 8
		if ln > end-body {
			f.problems = append(f.problems, formatErr("webp chunk "+strings.TrimSpace(fourcc), off, "length %d runs past the end of the file", ln))
			return f
		}
		switch fourcc {
		case "EXIF":
			if f.chunk(r, "webp EXIF", "MaxExifBytes", opt.MaxExifBytes, body, ln, size, f.exifChunk) {
				return f
			}
		case "XMP ":
			if f.chunk(r, "webp XMP", "MaxXMPBytes", opt.MaxXMPBytes, body, ln, size, f.setXMP) {
				return f
			}
		}
		off = body + ln + ln&1 // chunks are padded to even length
	}
	return f
}
