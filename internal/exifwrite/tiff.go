package exifwrite

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"sort"
)

// TIFF field types (TIFF 6.0 section 2; UTF8 from Exif 3.0).
const (
	TypeByte      uint16 = 1
	TypeASCII     uint16 = 2
	TypeShort     uint16 = 3
	TypeLong      uint16 = 4
	TypeRational  uint16 = 5
	TypeSByte     uint16 = 6
	TypeUndefined uint16 = 7
	TypeSShort    uint16 = 8
	TypeSLong     uint16 = 9
	TypeSRational uint16 = 10
	TypeFloat     uint16 = 11
	TypeDouble    uint16 = 12
	TypeUTF8      uint16 = 129
)

// Tags the writer sets itself (pointers and thumbnail location).
const (
	TagExifIFDPointer        uint16 = 0x8769
	TagGPSIFDPointer         uint16 = 0x8825
	TagInteropIFDPointer     uint16 = 0xA005
	TagJPEGInterchangeFormat uint16 = 0x0201
	TagJPEGInterchangeLength uint16 = 0x0202
	TagStripOffsets          uint16 = 0x0111
	TagStripByteCounts       uint16 = 0x0117
)

// ErrInvalid is wrapped by every error about an inconsistent payload or
// container input, so callers can test the kind with errors.Is.
var ErrInvalid = errors.New("exifwrite: invalid input")

// typeSize returns the size of one value of a TIFF type and the size of the
// unit whose bytes are swapped for byte order (a RATIONAL is two LONGs).
func typeSize(t uint16) (size, unit int, ok bool) {
	switch t {
	case TypeByte, TypeASCII, TypeSByte, TypeUndefined, TypeUTF8:
		return 1, 1, true
	case TypeShort, TypeSShort:
		return 2, 2, true
	case TypeLong, TypeSLong, TypeFloat:
		return 4, 4, true
	case TypeRational, TypeSRational:
		return 8, 4, true
	case TypeDouble:
		return 8, 8, true
	}
	return 0, 1, false
}

// Rational is an unsigned TIFF RATIONAL (numerator / denominator).
type Rational struct{ Num, Den uint32 }

// SRational is a signed TIFF SRATIONAL.
type SRational struct{ Num, Den int32 }

// IsZero reports whether r is the zero value {0, 0}, which Photo treats as
// "not set" (a real rational never has a zero denominator).
func (r Rational) IsZero() bool { return r.Num == 0 && r.Den == 0 }

// Float returns Num/Den (NaN or Inf for a zero denominator, kept on purpose).
func (r Rational) Float() float64 { return float64(r.Num) / float64(r.Den) }

// Entry is one IFD entry. Value holds the raw value bytes in BIG-ENDIAN order
// (for SHORT/LONG/RATIONAL/... each 2-, 4- or 8-byte unit is big-endian); the
// writer converts every unit to the payload's byte order. Keeping one
// canonical order lets an Entry be built before the byte order is chosen.
// Count is written as given; unless Payload.Raw is set it must equal
// len(Value) divided by the type's size.
type Entry struct {
	Tag   uint16
	Type  uint16
	Count uint32
	Value []byte
}

// ASCII returns an ASCII entry holding s plus the terminating NUL (TIFF 6.0
// section 2: the count includes the NUL).
func ASCII(tag uint16, s string) Entry {
	v := append([]byte(s), 0)
	return Entry{Tag: tag, Type: TypeASCII, Count: uint32(len(v)), Value: v}
}

// UTF8 returns an Exif 3.0 UTF-8 (type 129) entry, NUL-terminated like ASCII.
func UTF8(tag uint16, s string) Entry {
	v := append([]byte(s), 0)
	return Entry{Tag: tag, Type: TypeUTF8, Count: uint32(len(v)), Value: v}
}

// Bytes returns a BYTE entry.
func Bytes(tag uint16, v ...byte) Entry {
	return Entry{Tag: tag, Type: TypeByte, Count: uint32(len(v)), Value: append([]byte(nil), v...)}
}

// Undefined returns an UNDEFINED entry (e.g. ExifVersion "0232").
func Undefined(tag uint16, v []byte) Entry {
	return Entry{Tag: tag, Type: TypeUndefined, Count: uint32(len(v)), Value: append([]byte(nil), v...)}
}

// Short returns a SHORT entry.
func Short(tag uint16, v ...uint16) Entry {
	b := make([]byte, 2*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint16(b[2*i:], x)
	}
	return Entry{Tag: tag, Type: TypeShort, Count: uint32(len(v)), Value: b}
}

// Long returns a LONG entry.
func Long(tag uint16, v ...uint32) Entry {
	b := make([]byte, 4*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint32(b[4*i:], x)
	}
	return Entry{Tag: tag, Type: TypeLong, Count: uint32(len(v)), Value: b}
}

// SLong returns an SLONG entry.
func SLong(tag uint16, v ...int32) Entry {
	b := make([]byte, 4*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint32(b[4*i:], uint32(x))
	}
	return Entry{Tag: tag, Type: TypeSLong, Count: uint32(len(v)), Value: b}
}

// Rat returns a RATIONAL entry.
func Rat(tag uint16, v ...Rational) Entry {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint32(b[8*i:], x.Num)
		binary.BigEndian.PutUint32(b[8*i+4:], x.Den)
	}
	return Entry{Tag: tag, Type: TypeRational, Count: uint32(len(v)), Value: b}
}

// SRat returns an SRATIONAL entry.
func SRat(tag uint16, v ...SRational) Entry {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint32(b[8*i:], uint32(x.Num))
		binary.BigEndian.PutUint32(b[8*i+4:], uint32(x.Den))
	}
	return Entry{Tag: tag, Type: TypeSRational, Count: uint32(len(v)), Value: b}
}

// Double returns a DOUBLE entry.
func Double(tag uint16, v ...float64) Entry {
	b := make([]byte, 8*len(v))
	for i, x := range v {
		binary.BigEndian.PutUint64(b[8*i:], math.Float64bits(x))
	}
	return Entry{Tag: tag, Type: TypeDouble, Count: uint32(len(v)), Value: b}
}

// Payload is the content of one EXIF block: the four directories of a
// camera's EXIF and an optional JPEG thumbnail.
type Payload struct {
	// Order is binary.LittleEndian ("II") or binary.BigEndian ("MM"); nil
	// means big-endian, the TIFF default most cameras other than Canon use.
	Order binary.ByteOrder
	// IFD0 holds the primary image's tags; Exif, GPS and IFD1 are the Exif
	// private IFD, the GPS IFD and the thumbnail's IFD. Entries may be in any
	// order; they are written sorted by tag. An empty Exif or GPS slice
	// writes no directory and no pointer; IFD1 is written when it or
	// Thumbnail is non-empty.
	IFD0, Exif, GPS, IFD1 []Entry
	// Thumbnail is a complete JPEG stored after IFD1 and located by
	// JPEGInterchangeFormat/Length, which the writer adds to IFD1.
	Thumbnail []byte
	// Raw turns off every consistency check (count vs value length, unknown
	// types, duplicate or writer-owned tags) so damaged payloads can be
	// built. Writer-owned pointer tags given explicitly are then written as
	// given and the writer does not add its own.
	Raw bool
}

// Layout says where Build placed each part, as offsets from the start of
// the TIFF header (the "II"/"MM"); 0 means absent. A test that needs a loop
// or a bad pointer patches the bytes at these places.
type Layout struct {
	IFD0, Exif, GPS, IFD1 uint32
	// IFD0Next is the offset of IFD0's 4-byte next-IFD field (the IFD1 link).
	IFD0Next, IFD1Next uint32
	Thumbnail          uint32
	Strip              uint32
}

// Bytes returns the TIFF-structured payload (starting with II*\0 or MM\0*),
// as stored in a JPEG APP1 after "Exif\0\0", a PNG eXIf chunk, a WebP EXIF
// chunk or a HEIF Exif item after its offset field.
func (p Payload) Bytes() ([]byte, error) {
	b, _, err := p.Build()
	return b, err
}

// Build is Bytes that also returns the layout.
func (p Payload) Build() ([]byte, Layout, error) {
	return p.build(nil)
}

type ifdPlan struct {
	entries []Entry
	off     uint32 // offset of the entry count
	size    uint32 // 2 + 12n + 4
	values  uint32 // bytes of out-of-line values, each padded to even
}

func (p Payload) order() binary.ByteOrder {
	if p.Order == nil {
		return binary.BigEndian
	}
	return p.Order
}

func (p Payload) check(name string, es []Entry, owned ...uint16) error {
	if p.Raw {
		return nil
	}
	seen := map[uint16]bool{}
	for _, e := range es {
		size, _, ok := typeSize(e.Type)
		if !ok {
			return fmt.Errorf("%s tag 0x%04X: unknown type %d: %w", name, e.Tag, e.Type, ErrInvalid)
		}
		if uint64(e.Count)*uint64(size) != uint64(len(e.Value)) {
			return fmt.Errorf("%s tag 0x%04X: count %d of type %d needs %d bytes, value has %d: %w",
				name, e.Tag, e.Count, e.Type, uint64(e.Count)*uint64(size), len(e.Value), ErrInvalid)
		}
		if seen[e.Tag] {
			return fmt.Errorf("%s tag 0x%04X given twice: %w", name, e.Tag, ErrInvalid)
		}
		seen[e.Tag] = true
		for _, o := range owned {
			if e.Tag == o {
				return fmt.Errorf("%s tag 0x%04X is set by the writer (use Raw to force it): %w", name, e.Tag, ErrInvalid)
			}
		}
	}
	return nil
}

func has(es []Entry, tag uint16) bool {
	for _, e := range es {
		if e.Tag == tag {
			return true
		}
	}
	return false
}

// build lays out header, IFD0 (+values), Exif IFD, GPS IFD, IFD1, thumbnail
// and, for TIFF files, the image strip. Pointer values are patched once every
// offset is known.
func (p Payload) build(strip []byte) ([]byte, Layout, error) {
	var lay Layout
	o := p.order()
	owned0 := []uint16{TagExifIFDPointer, TagGPSIFDPointer}
	if strip != nil {
		owned0 = append(owned0, TagStripOffsets, TagStripByteCounts)
	}
	if err := p.check("IFD0", p.IFD0, owned0...); err != nil {
		return nil, lay, err
	}
	if err := p.check("Exif IFD", p.Exif, TagInteropIFDPointer); err != nil {
		return nil, lay, err
	}
	if err := p.check("GPS IFD", p.GPS); err != nil {
		return nil, lay, err
	}
	if err := p.check("IFD1", p.IFD1, TagJPEGInterchangeFormat, TagJPEGInterchangeLength); err != nil {
		return nil, lay, err
	}

	ifd0 := append([]Entry(nil), p.IFD0...)
	auto := func(es []Entry, e Entry) []Entry {
		if p.Raw && has(es, e.Tag) {
			return es
		}
		return append(es, e)
	}
	if len(p.Exif) > 0 {
		ifd0 = auto(ifd0, Long(TagExifIFDPointer, 0))
	}
	if len(p.GPS) > 0 {
		ifd0 = auto(ifd0, Long(TagGPSIFDPointer, 0))
	}
	if strip != nil {
		ifd0 = auto(ifd0, Long(TagStripOffsets, 0))
		ifd0 = auto(ifd0, Long(TagStripByteCounts, uint32(len(strip))))
	}
	ifd1 := append([]Entry(nil), p.IFD1...)
	if len(p.Thumbnail) > 0 {
		ifd1 = auto(ifd1, Long(TagJPEGInterchangeFormat, 0))
		ifd1 = auto(ifd1, Long(TagJPEGInterchangeLength, uint32(len(p.Thumbnail))))
	}

	plans := []*ifdPlan{{entries: ifd0}, nil, nil, nil}
	if len(p.Exif) > 0 {
		plans[1] = &ifdPlan{entries: append([]Entry(nil), p.Exif...)}
	}
	if len(p.GPS) > 0 {
		plans[2] = &ifdPlan{entries: append([]Entry(nil), p.GPS...)}
	}
	if len(ifd1) > 0 {
		plans[3] = &ifdPlan{entries: ifd1}
	}

	// Pass 1: sizes and offsets, in 64-bit arithmetic so an oversized input
	// is an error, not a wrapped offset.
	var pos uint64 = 8
	for _, pl := range plans {
		if pl == nil {
			continue
		}
		sort.SliceStable(pl.entries, func(i, j int) bool { return pl.entries[i].Tag < pl.entries[j].Tag })
		pl.off = uint32(pos)
		pl.size = uint32(2 + 12*len(pl.entries) + 4)
		var vals uint64
		for _, e := range pl.entries {
			if len(e.Value) > 4 {
				vals += uint64(len(e.Value) + len(e.Value)%2)
			}
		}
		pl.values = uint32(vals)
		pos += uint64(pl.size) + vals
		if pos > math.MaxUint32 {
			return nil, lay, fmt.Errorf("payload exceeds 4 GiB: %w", ErrInvalid)
		}
	}
	thumbOff := uint32(0)
	if len(p.Thumbnail) > 0 {
		thumbOff = uint32(pos)
		pos += uint64(len(p.Thumbnail) + len(p.Thumbnail)%2)
	}
	stripOff := uint32(0)
	if strip != nil {
		stripOff = uint32(pos)
		pos += uint64(len(strip) + len(strip)%2)
	}
	if pos > math.MaxUint32 {
		return nil, lay, fmt.Errorf("payload exceeds 4 GiB: %w", ErrInvalid)
	}

	ptr := func(pl *ifdPlan) uint32 {
		if pl == nil {
			return 0
		}
		return pl.off
	}
	lay.IFD0, lay.Exif, lay.GPS, lay.IFD1 = ptr(plans[0]), ptr(plans[1]), ptr(plans[2]), ptr(plans[3])
	lay.Thumbnail, lay.Strip = thumbOff, stripOff
	patch := map[uint16]uint32{
		TagExifIFDPointer: lay.Exif, TagGPSIFDPointer: lay.GPS,
		TagJPEGInterchangeFormat: thumbOff, TagStripOffsets: stripOff,
	}

	// Pass 2: write.
	out := make([]byte, pos)
	if isLittle(o) {
		copy(out, "II")
	} else {
		copy(out, "MM")
	}
	o.PutUint16(out[2:], 42)
	o.PutUint32(out[4:], 8)
	for i, pl := range plans {
		if pl == nil {
			continue
		}
		w := out[pl.off:]
		o.PutUint16(w, uint16(len(pl.entries)))
		valPos := pl.off + pl.size
		for k, e := range pl.entries {
			ent := w[2+12*k:]
			o.PutUint16(ent, e.Tag)
			o.PutUint16(ent[2:], e.Type)
			o.PutUint32(ent[4:], e.Count)
			v := e.Value
			if want, ok := patch[e.Tag]; ok && !(p.Raw && userGiven(i, e.Tag, p)) && e.Type == TypeLong && len(v) == 4 {
				v = make([]byte, 4)
				binary.BigEndian.PutUint32(v, want)
			}
			v = toOrder(o, e.Type, v)
			if len(v) <= 4 {
				copy(ent[8:12], v)
				continue
			}
			o.PutUint32(ent[8:], valPos)
			copy(out[valPos:], v)
			valPos += uint32(len(v) + len(v)%2)
		}
		next := pl.off + pl.size - 4
		switch i {
		case 0:
			lay.IFD0Next = next
			o.PutUint32(out[next:], lay.IFD1)
		case 3:
			lay.IFD1Next = next
		}
	}
	copy(out[thumbOff:], p.Thumbnail)
	if strip != nil {
		copy(out[stripOff:], strip)
	}
	return out, lay, nil
}

// userGiven reports whether a writer-owned tag in directory i came from the
// caller (only possible with Raw); such values are written untouched.
func userGiven(i int, tag uint16, p Payload) bool {
	switch i {
	case 0:
		return has(p.IFD0, tag)
	case 1:
		return has(p.Exif, tag)
	case 2:
		return has(p.GPS, tag)
	case 3:
		return has(p.IFD1, tag)
	}
	return false
}

// toOrder converts big-endian units to the payload's byte order.
func toOrder(o binary.ByteOrder, t uint16, v []byte) []byte {
	_, unit, _ := typeSize(t)
	if unit == 1 || !isLittle(o) {
		return v
	}
	w := make([]byte, len(v))
	copy(w, v)
	for i := 0; i+unit <= len(w); i += unit {
		for a, b := i, i+unit-1; a < b; a, b = a+1, b-1 {
			w[a], w[b] = w[b], w[a]
		}
	}
	return w
}

// isLittle tells the two byte orders apart by behaviour, so any
// binary.ByteOrder (including binary.NativeEndian) works.
func isLittle(o binary.ByteOrder) bool {
	var b [2]byte
	o.PutUint16(b[:], 1)
	return b[0] == 1
}
