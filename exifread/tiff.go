package exifread

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"strings"
)

// This file is the bounded TIFF validator. It walks every directory of an
// EXIF/TIFF payload before anything else looks at it: offsets and sizes are
// computed in 64-bit arithmetic against the payload length, visited
// directory offsets are remembered (an IFD chain that loops is cut), and the
// number of entries, of directories and of declared value bytes are capped.
// Entries that fail are omitted and reported; the rest stay readable.

// TIFF field types (TIFF 6.0 section 2, plus EXIF 3.0's UTF-8 type 129).
const (
	tByte      = 1
	tASCII     = 2
	tShort     = 3
	tLong      = 4
	tRational  = 5
	tSByte     = 6
	tUndefined = 7
	tSShort    = 8
	tSLong     = 9
	tSRational = 10
	tFloat     = 11
	tDouble    = 12
	tIFD       = 13
	tUTF8      = 129
)

func typeSize(t uint16) int64 {
	switch t {
	case tByte, tASCII, tSByte, tUndefined, tUTF8:
		return 1
	case tShort, tSShort:
		return 2
	case tLong, tSLong, tFloat, tIFD:
		return 4
	case tRational, tSRational, tDouble:
		return 8
	}
	return 0
}

// entry is one validated directory entry. off is relative to the payload
// start; for values of 4 bytes or less the bytes are in inline.
type entry struct {
	tag    uint16
	typ    uint16
	count  uint32
	size   int64
	off    int64
	inline [4]byte
}

// tiffDir is one directory: its entries by tag (first occurrence wins).
type tiffDir struct {
	name    string
	entries map[uint16]entry
}

// tiffData is a walked payload: the directories the reader needs, and every
// problem met on the way.
type tiffData struct {
	src    io.ReaderAt
	base   int64 // payload start in src
	size   int64 // payload length
	order  binary.ByteOrder
	opt    Options
	dirs   map[string]*tiffDir
	seen   map[int64]bool
	nIFD   int
	nBytes int64
	// problems are *FormatError and *LimitError values, in order met.
	problems []error
	// types holds every field type met, so that the goexif cross-check can
	// be skipped for types goexif does not know.
	unknownTypes bool
	dropped      int // problems not kept beyond maxProblems
}

// IFD names.
const (
	ifd0    = "IFD0"
	ifd1    = "IFD1"
	ifdExif = "ExifIFD"
	ifdGPS  = "GPS"
	ifdIop  = "InteropIFD"
)

// Pointer tags.
const (
	tagExifIFD    = 0x8769
	tagGPSIFD     = 0x8825
	tagInteropIFD = 0xA005
)

// maxProblems bounds the problems kept per payload; a fuzzed or random
// directory would otherwise yield one message per entry.
const maxProblems = 16

func (d *tiffData) problem(err error) {
	if len(d.problems) < maxProblems {
		d.problems = append(d.problems, err)
		return
	}
	d.dropped++
}

// read returns n bytes at payload offset off, bounds checked.
func (d *tiffData) read(off, n int64) ([]byte, error) {
	if off < 0 || n < 0 || off > d.size || n > d.size-off {
		return nil, formatErr("tiff", d.base+off, "read of %d bytes at %d beyond payload of %d bytes", n, off, d.size)
	}
	buf := make([]byte, n)
	got, err := d.src.ReadAt(buf, d.base+off)
	if int64(got) < n {
		if err == nil || errors.Is(err, io.EOF) {
			err = io.ErrUnexpectedEOF
		}
		return nil, &FormatError{Where: "tiff", Offset: d.base + off, Err: err}
	}
	return buf, nil
}

// walkTIFF validates the payload of size bytes at base in src.
func walkTIFF(src io.ReaderAt, base, size int64, opt Options) (*tiffData, error) {
	d := &tiffData{src: src, base: base, size: size, opt: opt, dirs: map[string]*tiffDir{}, seen: map[int64]bool{}}
	hdr, err := d.read(0, 8)
	if err != nil {
		return nil, formatErr("tiff header", base, "payload of %d bytes too short", size)
	}
	switch string(hdr[:2]) {
	case "II":
		d.order = binary.LittleEndian
	case "MM":
		d.order = binary.BigEndian
	default:
		return nil, formatErr("tiff header", base, "byte order mark %q", hdr[:2])
	}
	switch magic := d.order.Uint16(hdr[2:]); magic {
	case 42, 0x4F52, 0x5352, 0x55: // TIFF; Olympus ORF "RO"/"SR"; Panasonic RW2
	default:
		return nil, formatErr("tiff header", base+2, "magic number %#x is not 42", magic)
	}
	first := int64(d.order.Uint32(hdr[4:]))
	next := d.walkDir(ifd0, first)
	if dir := d.dirs[ifd0]; dir != nil {
		d.walkSub(dir, tagExifIFD, ifdExif)
		d.walkSub(dir, tagGPSIFD, ifdGPS)
		if ex := d.dirs[ifdExif]; ex != nil {
			d.walkSub(ex, tagInteropIFD, ifdIop)
		}
	}
	if next != 0 {
		next = d.walkDir(ifd1, next)
	}
	// Further directories are walked only to validate the chain.
	for i := 2; next != 0; i++ {
		next = d.walkDir(fmt.Sprintf("IFD%d", i), next)
	}
	if d.dirs[ifd0] == nil {
		return d, d.problems[0]
	}
	return d, nil
}

func (d *tiffData) walkSub(parent *tiffDir, tag uint16, name string) {
	e, ok := parent.entries[tag]
	if !ok {
		return
	}
	if (e.typ != tLong && e.typ != tIFD && e.typ != tUndefined) || e.count < 1 {
		d.problem(formatErr("tiff "+parent.name, -1, "pointer tag %#04x has type %d count %d", tag, e.typ, e.count))
		return
	}
	off := int64(d.order.Uint32(e.inline[:]))
	if e.size > 4 {
		b, err := d.read(e.off, 4)
		if err != nil {
			d.problem(err)
			return
		}
		off = int64(d.order.Uint32(b))
	}
	d.walkDir(name, off)
}

// walkDir reads and validates the directory at off and returns the offset
// of the next directory (0 at the end of the chain or on any problem).
func (d *tiffData) walkDir(name string, off int64) int64 {
	where := "tiff " + name
	if d.seen[off] {
		d.problem(formatErr(where, d.base+off, "directory offset already visited: IFD chain loops"))
		return 0
	}
	d.seen[off] = true
	d.nIFD++
	if d.nIFD > d.opt.MaxIFDs {
		d.problem(&LimitError{Where: where, Limit: "MaxIFDs", Value: int64(d.nIFD), Max: int64(d.opt.MaxIFDs)})
		return 0
	}
	cb, err := d.read(off, 2)
	if err != nil {
		d.problem(formatErr(where, d.base+off, "directory offset %d outside payload of %d bytes", off, d.size))
		return 0
	}
	n := int64(d.order.Uint16(cb))
	if n > int64(d.opt.MaxEntriesPerIFD) {
		d.problem(&LimitError{Where: where, Limit: "MaxEntriesPerIFD", Value: n, Max: int64(d.opt.MaxEntriesPerIFD)})
		n = int64(d.opt.MaxEntriesPerIFD)
	}
	if avail := (d.size - off - 2) / 12; n > avail {
		d.problem(formatErr(where, d.base+off, "%d entries declared, only %d fit in the payload", n, avail))
		n = avail
	}
	tbl, err := d.read(off+2, n*12)
	if err != nil {
		d.problem(err)
		return 0
	}
	dir := &tiffDir{name: name, entries: make(map[uint16]entry, n)}
	for i := int64(0); i < n; i++ {
		b := tbl[i*12 : i*12+12]
		e := entry{tag: d.order.Uint16(b), typ: d.order.Uint16(b[2:]), count: d.order.Uint32(b[4:])}
		copy(e.inline[:], b[8:12])
		ts := typeSize(e.typ)
		if ts == 0 {
			d.unknownTypes = true
			d.problem(formatErr(where, d.base+off+2+i*12, "tag %#04x has unknown type %d; entry omitted", e.tag, e.typ))
			continue
		}
		if e.typ == tUTF8 {
			d.unknownTypes = true // goexif drops the directory for this type
		}
		e.size = int64(e.count) * ts // at most 2^32 * 8: no overflow in int64
		if e.size > 4 {
			e.off = int64(d.order.Uint32(b[8:]))
			if e.off > d.size || e.size > d.size-e.off {
				d.problem(formatErr(where, d.base+off+2+i*12, "tag %#04x: %d values of type %d (%d bytes) at offset %d overrun payload of %d bytes; entry omitted",
					e.tag, e.count, e.typ, e.size, e.off, d.size))
				continue
			}
			d.nBytes += e.size
			if d.nBytes > d.opt.MaxValueBytes {
				d.problem(&LimitError{Where: fmt.Sprintf("%s tag %#04x", where, e.tag), Limit: "MaxValueBytes", Value: d.nBytes, Max: d.opt.MaxValueBytes})
				d.nBytes -= e.size
				continue
			}
		}
		if _, dup := dir.entries[e.tag]; dup {
			continue
		}
		dir.entries[e.tag] = e
	}
	if _, dup := d.dirs[name]; !dup {
		d.dirs[name] = dir
	}
	nb, err := d.read(off+2+n*12, 4)
	if err != nil {
		return 0 // no next pointer: the chain ends here (common in truncated payloads)
	}
	return int64(d.order.Uint32(nb))
}

// get returns the entry of tag in directory dir.
func (d *tiffData) get(dir string, tag uint16) (entry, bool) {
	if d == nil {
		return entry{}, false
	}
	t := d.dirs[dir]
	if t == nil {
		return entry{}, false
	}
	e, ok := t.entries[tag]
	return e, ok
}

// alt returns the directory to read tag from: dir when it holds the tag,
// else the other of IFD0/ExifIFD when that one does. Some cameras put
// IFD0 tags in the Exif IFD or the reverse (a Kodak writes
// FocalLengthIn35mmFilm in IFD0, an HTC writes Make and Model in the Exif
// IFD); reading them where they are is what general readers do too.
func (d *tiffData) alt(dir string, tag uint16) string {
	if _, ok := d.get(dir, tag); ok {
		return dir
	}
	other := map[string]string{ifd0: ifdExif, ifdExif: ifd0}[dir]
	if _, ok := d.get(other, tag); ok && other != "" {
		return other
	}
	return dir
}

// bytesOf returns at most max bytes of e's value.
func (d *tiffData) bytesOf(e entry, max int64) ([]byte, error) {
	n := e.size
	if n > max {
		n = max
	}
	if e.size <= 4 {
		return e.inline[:n], nil
	}
	return d.read(e.off, n)
}

// str returns a text value (ASCII, UTF-8, UNDEFINED or BYTE), cut at the
// first NUL, at most 4 KiB.
func (d *tiffData) str(dir string, tag uint16) (string, bool) {
	e, ok := d.get(dir, tag)
	if !ok {
		return "", false
	}
	switch e.typ {
	case tASCII, tUTF8, tUndefined, tByte:
	default:
		d.problem(formatErr("tiff "+dir, -1, "tag %#04x: type %d where text was expected", tag, e.typ))
		return "", false
	}
	b, err := d.bytesOf(e, 4096)
	if err != nil {
		d.problem(err)
		return "", false
	}
	if i := strings.IndexByte(string(b), 0); i >= 0 {
		b = b[:i]
	}
	return string(b), true
}

// ints returns up to max integer values of an integer-typed entry.
func (d *tiffData) ints(dir string, tag uint16, max int) ([]int64, bool) {
	e, ok := d.get(dir, tag)
	if !ok {
		return nil, false
	}
	ts := typeSize(e.typ)
	switch e.typ {
	case tByte, tShort, tLong, tSByte, tSShort, tSLong, tUndefined:
	default:
		d.problem(formatErr("tiff "+dir, -1, "tag %#04x: type %d where an integer was expected", tag, e.typ))
		return nil, false
	}
	n := int64(e.count)
	if n > int64(max) {
		n = int64(max)
	}
	b, err := d.bytesOf(e, n*ts)
	if err != nil {
		d.problem(err)
		return nil, false
	}
	out := make([]int64, 0, n)
	for i := int64(0); i < n; i++ {
		p := b[i*ts:]
		switch e.typ {
		case tByte, tUndefined:
			out = append(out, int64(p[0]))
		case tSByte:
			out = append(out, int64(int8(p[0])))
		case tShort:
			out = append(out, int64(d.order.Uint16(p)))
		case tSShort:
			out = append(out, int64(int16(d.order.Uint16(p))))
		case tLong:
			out = append(out, int64(d.order.Uint32(p)))
		case tSLong:
			out = append(out, int64(int32(d.order.Uint32(p))))
		}
	}
	return out, len(out) > 0
}

// rat is a TIFF rational kept as numerator and denominator.
type rat struct{ num, den int64 }

func (r rat) String() string { return fmt.Sprintf("%d/%d", r.num, r.den) }

func (r rat) float() (float64, bool) {
	if r.den == 0 {
		return 0, false
	}
	return float64(r.num) / float64(r.den), true
}

// rats returns up to max rational values; integer types are accepted as n/1.
func (d *tiffData) rats(dir string, tag uint16, max int) ([]rat, bool) {
	e, ok := d.get(dir, tag)
	if !ok {
		return nil, false
	}
	if e.typ != tRational && e.typ != tSRational {
		is, ok := d.ints(dir, tag, max)
		if !ok {
			return nil, false
		}
		out := make([]rat, len(is))
		for i, v := range is {
			out[i] = rat{v, 1}
		}
		return out, true
	}
	n := int64(e.count)
	if n > int64(max) {
		n = int64(max)
	}
	b, err := d.bytesOf(e, n*8)
	if err != nil {
		d.problem(err)
		return nil, false
	}
	out := make([]rat, 0, n)
	for i := int64(0); i < n; i++ {
		p := b[i*8:]
		if e.typ == tRational {
			out = append(out, rat{int64(d.order.Uint32(p)), int64(d.order.Uint32(p[4:]))})
		} else {
			out = append(out, rat{int64(int32(d.order.Uint32(p))), int64(int32(d.order.Uint32(p[4:])))})
		}
	}
	return out, len(out) > 0
}
