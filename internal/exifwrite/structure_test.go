package exifwrite_test

import (
	"bytes"
	"encoding/binary"
	"errors"
	"hash/crc32"
	"image/color"
	"image/jpeg"
	"image/png"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/rwcarlsen/goexif/tiff"
	xtiff "golang.org/x/image/tiff"
	"golang.org/x/image/webp"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

func fullPayload(t *testing.T, o binary.ByteOrder) (exifwrite.Payload, []byte) {
	t.Helper()
	p := fixtures.Full()
	p.Thumbnail = fixtures.ThumbJPEG
	pl := p.Payload(o)
	b, err := pl.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	return pl, b
}

// canonical returns a goexif tag's value with every unit in big-endian
// order, the form exifwrite.Entry uses.
func canonical(tg *tiff.Tag, o binary.ByteOrder) []byte {
	unit := map[tiff.DataType]int{3: 2, 8: 2, 4: 4, 9: 4, 11: 4, 5: 4, 10: 4, 12: 8}[tg.Type]
	v := append([]byte(nil), tg.Val...)
	if unit > 1 && o == binary.LittleEndian {
		for i := 0; i+unit <= len(v); i += unit {
			for a, b := i, i+unit-1; a < b; a, b = a+1, b-1 {
				v[a], v[b] = v[b], v[a]
			}
		}
	}
	return v
}

// TestPayloadReadByGoexif decodes the payload with goexif's TIFF parser (a
// reader this project did not write) and checks every entry the writer was
// given, in every directory, for both byte orders.
func TestPayloadReadByGoexif(t *testing.T) {
	for _, tc := range []struct {
		name   string
		order  binary.ByteOrder
		source string
	}{
		{"big-endian", binary.BigEndian, "goexif tiff.Decode/DecodeDir"},
		{"little-endian", binary.LittleEndian, "goexif tiff.Decode/DecodeDir"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			pl, b := fullPayload(t, tc.order)
			tf, err := tiff.Decode(bytes.NewReader(b))
			if err != nil {
				t.Fatalf("%s: %v", tc.source, err)
			}
			if tf.Order != tc.order || len(tf.Dirs) != 2 {
				t.Fatalf("%s: order %v, %d IFDs in the chain; want %v and 2 (IFD0, IFD1)", tc.source, tf.Order, len(tf.Dirs), tc.order)
			}
			tags := func(d *tiff.Dir) map[uint16]*tiff.Tag {
				m := map[uint16]*tiff.Tag{}
				for _, tg := range d.Tags {
					m[tg.Id] = tg
				}
				return m
			}
			ifd0, ifd1 := tags(tf.Dirs[0]), tags(tf.Dirs[1])
			sub := func(ptr uint16) map[uint16]*tiff.Tag {
				off, err := ifd0[ptr].Int64(0)
				if err != nil {
					t.Fatalf("pointer 0x%04X: %v", ptr, err)
				}
				// DecodeDir reads value offsets relative to its reader, so
				// hand it the whole payload positioned at the directory.
				r := bytes.NewReader(b)
				if _, err := r.Seek(off, 0); err != nil {
					t.Fatal(err)
				}
				d, _, err := tiff.DecodeDir(r, tc.order)
				if err != nil {
					t.Fatalf("%s at 0x%X: %v", tc.source, off, err)
				}
				return tags(d)
			}
			dirs := []struct {
				name    string
				entries []exifwrite.Entry
				got     map[uint16]*tiff.Tag
			}{
				{"IFD0", pl.IFD0, ifd0},
				{"Exif", pl.Exif, sub(exifwrite.TagExifIFDPointer)},
				{"GPS", pl.GPS, sub(exifwrite.TagGPSIFDPointer)},
				{"IFD1", pl.IFD1, ifd1},
			}
			for _, d := range dirs {
				for _, e := range d.entries {
					g, ok := d.got[e.Tag]
					if !ok {
						t.Errorf("%s tag 0x%04X: goexif does not see it", d.name, e.Tag)
						continue
					}
					if uint16(g.Type) != e.Type || g.Count != e.Count || !bytes.Equal(canonical(g, tc.order), e.Value) {
						t.Errorf("%s tag 0x%04X: goexif reads type %d count %d value % X; written type %d count %d value % X",
							d.name, e.Tag, g.Type, g.Count, canonical(g, tc.order), e.Type, e.Count, e.Value)
					}
				}
			}
			// The thumbnail is where IFD1 says.
			off, _ := ifd1[exifwrite.TagJPEGInterchangeFormat].Int64(0)
			n, _ := ifd1[exifwrite.TagJPEGInterchangeLength].Int64(0)
			if off <= 0 || off+n > int64(len(b)) || !bytes.Equal(b[off:off+n], fixtures.ThumbJPEG) {
				t.Errorf("thumbnail not at JPEGInterchangeFormat %d length %d", off, n)
			}
		})
	}
}

// TestEntryEncoding checks single entries against the TIFF 6.0 rules by
// hand: a value of 4 bytes or fewer sits left-justified in the entry's value
// field; longer values are stored at an even offset named by that field.
func TestEntryEncoding(t *testing.T) {
	for _, tc := range []struct {
		name   string
		order  binary.ByteOrder
		entry  exifwrite.Entry
		want   string // hex of the 12-byte entry
		source string
	}{
		{"SHORT II", binary.LittleEndian, exifwrite.Short(0x0112, 6), "120103000100000006000000", "TIFF 6.0 section 2, by hand"},
		{"SHORT MM", binary.BigEndian, exifwrite.Short(0x0112, 6), "011200030000000100060000", "TIFF 6.0 section 2, by hand"},
		{"ASCII 4 inline", binary.BigEndian, exifwrite.ASCII(0x010F, "abc"), "010F00020000000461626300", "TIFF 6.0 section 2, by hand"},
		{"LONG II", binary.LittleEndian, exifwrite.Long(0xA002, 0x01020304), "02A004000100000004030201", "TIFF 6.0 section 2, by hand"},
		{"RATIONAL out of line", binary.LittleEndian, exifwrite.Rat(0x829A, exifwrite.Rational{Num: 1, Den: 500}), "9A82050001000000" + "1A000000", "TIFF 6.0 section 2: offset 8+2+12+4 = 26 = 0x1A"},
		{"UTF-8 type 129", binary.BigEndian, exifwrite.UTF8(0x010F, "é"), "010F008100000003C3A90000", "Exif 3.0 UTF-8 type 129, by hand"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			b, err := exifwrite.Payload{Order: tc.order, IFD0: []exifwrite.Entry{tc.entry}}.Bytes()
			if err != nil {
				t.Fatal(err)
			}
			got := strings.ToUpper(hexs(b[10:22]))
			want := strings.ToUpper(tc.want)
			if got != want {
				t.Errorf("entry = %s, want %s (%s)", got, want, tc.source)
			}
		})
	}
}

func hexs(b []byte) string {
	const digits = "0123456789ABCDEF"
	out := make([]byte, 0, 2*len(b))
	for _, c := range b {
		out = append(out, digits[c>>4], digits[c&15])
	}
	return string(out)
}

// TestHeaderAndLayout: the 8-byte TIFF header (TIFF 6.0 section 2) and the
// Layout offsets used to build damaged payloads.
func TestHeaderAndLayout(t *testing.T) {
	for _, tc := range []struct {
		order  binary.ByteOrder
		header string
	}{
		{binary.LittleEndian, "49492A0008000000"},
		{binary.BigEndian, "4D4D002A00000008"},
	} {
		p := fixtures.Full()
		p.Thumbnail = fixtures.ThumbJPEG
		b, lay, err := p.Payload(tc.order).Build()
		if err != nil {
			t.Fatal(err)
		}
		if got := hexs(b[:8]); got != tc.header {
			t.Errorf("header %s, want %s (TIFF 6.0 section 2)", got, tc.header)
		}
		if lay.IFD0 != 8 || lay.Exif == 0 || lay.GPS == 0 || lay.IFD1 == 0 || lay.Thumbnail == 0 {
			t.Fatalf("layout %+v has a missing part", lay)
		}
		if got := tc.order.Uint32(b[lay.IFD0Next:]); got != lay.IFD1 {
			t.Errorf("IFD0 next-IFD link = %d, want IFD1 at %d", got, lay.IFD1)
		}
		if got := tc.order.Uint32(b[lay.IFD1Next:]); got != 0 {
			t.Errorf("IFD1 next-IFD link = %d, want 0 (end of chain)", got)
		}
		for _, off := range []uint32{lay.IFD0, lay.Exif, lay.GPS, lay.IFD1} {
			if off%2 != 0 {
				t.Errorf("IFD at odd offset %d (TIFF 6.0: word boundary)", off)
			}
		}
	}
}

// TestRawDamage: with Raw set, a lying count and an explicit pointer are
// written exactly as given, so reader tests can build the damage they need.
func TestRawDamage(t *testing.T) {
	lie := exifwrite.Entry{Tag: 0x829A, Type: exifwrite.TypeRational, Count: 0x7FFFFFFF, Value: []byte{0, 0, 0, 1, 0, 0, 0, 2}}
	pl := exifwrite.Payload{Order: binary.BigEndian, Raw: true,
		IFD0: []exifwrite.Entry{exifwrite.Long(exifwrite.TagExifIFDPointer, 8)}, // points back at IFD0
		Exif: []exifwrite.Entry{lie}}
	b, lay, err := pl.Build()
	if err != nil {
		t.Fatal(err)
	}
	// IFD0's only entry is the pointer, kept at 8 (a loop).
	if got := binary.BigEndian.Uint32(b[lay.IFD0+2+8:]); got != 8 {
		t.Errorf("explicit Exif pointer written as %d, want 8", got)
	}
	if got := binary.BigEndian.Uint32(b[lay.Exif+2+4:]); got != 0x7FFFFFFF {
		t.Errorf("lying count written as %d", got)
	}
	// Without Raw the same input is refused.
	pl.Raw = false
	if _, err := pl.Bytes(); !errors.Is(err, exifwrite.ErrInvalid) {
		t.Errorf("inconsistent payload accepted without Raw: %v", err)
	}
}

func TestInvalidInput(t *testing.T) {
	_, good := fullPayload(t, binary.BigEndian)
	badCRC := append([]byte(nil), fixtures.BasePNG...)
	badCRC[len(badCRC)-1] ^= 0xFF // IEND's CRC
	for _, tc := range []struct {
		name string
		run  func() error
	}{
		{"count/value mismatch", func() error {
			_, err := exifwrite.Payload{IFD0: []exifwrite.Entry{{Tag: 1, Type: exifwrite.TypeShort, Count: 2, Value: []byte{0, 1}}}}.Bytes()
			return err
		}},
		{"unknown type", func() error {
			_, err := exifwrite.Payload{IFD0: []exifwrite.Entry{{Tag: 1, Type: 99, Count: 1, Value: []byte{0}}}}.Bytes()
			return err
		}},
		{"duplicate tag", func() error {
			_, err := exifwrite.Payload{IFD0: []exifwrite.Entry{exifwrite.Short(1, 1), exifwrite.Short(1, 2)}}.Bytes()
			return err
		}},
		{"writer-owned pointer", func() error {
			_, err := exifwrite.Payload{IFD0: []exifwrite.Entry{exifwrite.Long(exifwrite.TagGPSIFDPointer, 0)}}.Bytes()
			return err
		}},
		{"JPEG payload over one APP1", func() error {
			_, err := exifwrite.JPEG(make([]byte, exifwrite.MaxJPEGExif+1), fixtures.BaseJPEG, nil)
			return err
		}},
		{"JPEG base not a JPEG", func() error { _, err := exifwrite.JPEG(good, fixtures.BasePNG, nil); return err }},
		{"JPEG base truncated in a segment", func() error { _, err := exifwrite.JPEG(good, fixtures.BaseJPEG[:30], nil); return err }},
		{"PNG bad CRC", func() error { _, err := exifwrite.PNG(good, badCRC); return err }},
		{"PNG not a PNG", func() error { _, err := exifwrite.PNG(good, fixtures.BaseJPEG); return err }},
		{"WebP zero width", func() error { _, err := exifwrite.WebP(good, 0, 5); return err }},
		{"WebP beyond VP8L limit", func() error { _, err := exifwrite.WebP(good, 16385, 5); return err }},
		{"TIFF nil image", func() error { _, err := exifwrite.TIFF(exifwrite.Payload{}, nil); return err }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if err := tc.run(); !errors.Is(err, exifwrite.ErrInvalid) {
				t.Errorf("error = %v, want one wrapping ErrInvalid", err)
			}
		})
	}
}

// TestJPEGContainer: image/jpeg (the standard library's decoder) still
// decodes the result, the Exif APP1 follows JFIF APP0, its length field is
// right, and replacing twice leaves one Exif segment.
func TestJPEGContainer(t *testing.T) {
	// image/jpeg writes no JFIF APP0; a JFIF 1.02 APP0 (16 bytes: "JFIF\0",
	// version 1.02, no units, density 1x1, no thumbnail) is added by hand for
	// the second base.
	app0 := []byte{0xFF, 0xE0, 0, 16, 'J', 'F', 'I', 'F', 0, 1, 2, 0, 0, 1, 0, 1, 0, 0}
	jfif, err := exifwrite.InsertSegments(fixtures.BaseJPEG, app0)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		base []byte
		want string
	}{
		{"no APP0", fixtures.BaseJPEG, "Exif,XMP"},
		{"JFIF APP0 stays first", jfif, "APP0,Exif,XMP"},
	} {
		t.Run(tc.name, func(t *testing.T) { checkJPEG(t, tc.base, tc.want) })
	}
}

func checkJPEG(t *testing.T, base []byte, wantOrder string) {
	_, pl := fullPayload(t, binary.BigEndian)
	xmp := exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2024-06-21T14:03:27+02:00"})
	once, err := exifwrite.JPEG(pl, base, xmp)
	if err != nil {
		t.Fatal(err)
	}
	twice, err := exifwrite.JPEG(pl, once, xmp)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(once, twice) {
		t.Errorf("replacing Exif and XMP again changed the file (%d -> %d bytes)", len(once), len(twice))
	}
	if _, err := jpeg.Decode(bytes.NewReader(once)); err != nil {
		t.Errorf("image/jpeg cannot decode the result: %v", err)
	}
	var segs []string
	for pos := 2; pos+4 <= len(once); {
		m := once[pos+1]
		if m == 0xDA {
			break
		}
		n := int(binary.BigEndian.Uint16(once[pos+2:]))
		body := once[pos+4 : pos+2+n]
		switch {
		case m == 0xE1 && bytes.HasPrefix(body, []byte("Exif\x00\x00")):
			segs = append(segs, "Exif")
			if !bytes.Equal(body[6:], pl) {
				t.Errorf("Exif APP1 body differs from the payload")
			}
		case m == 0xE1 && bytes.HasPrefix(body, []byte("http://ns.adobe.com/xap/1.0/\x00")):
			segs = append(segs, "XMP")
		case m == 0xE0:
			segs = append(segs, "APP0")
		}
		pos += 2 + n
	}
	if got := strings.Join(segs, ","); got != wantOrder {
		t.Errorf("APPn order %s, want %s (JFIF 1.02: APP0 right after SOI; Exif 2.32: APP1 next)", got, wantOrder)
	}
	removed, err := exifwrite.JPEG(nil, once, nil)
	if err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(removed, []byte("Exif\x00\x00")) || !bytes.Contains(removed, []byte("http://ns.adobe.com/xap/1.0/")) {
		t.Errorf("nil payload should remove Exif and keep XMP when xmp is nil")
	}
}

// TestPNGContainer walks the chunks with the PNG spec's CRC (ISO 3309 CRC-32,
// hash/crc32's IEEE table), checks eXIf precedes IDAT, and has image/png
// decode the result.
func TestPNGContainer(t *testing.T) {
	_, pl := fullPayload(t, binary.LittleEndian)
	out, err := exifwrite.PNG(pl, fixtures.BasePNG)
	if err != nil {
		t.Fatal(err)
	}
	// Re-inserting replaces instead of adding a second eXIf.
	if again, err := exifwrite.PNG(pl, out); err != nil || !bytes.Equal(again, out) {
		t.Errorf("second PNG() changed the file: %v", err)
	}
	var order []string
	pos := 8
	for pos < len(out) {
		n := int(binary.BigEndian.Uint32(out[pos:]))
		typ := string(out[pos+4 : pos+8])
		if crc32.ChecksumIEEE(out[pos+4:pos+8+n]) != binary.BigEndian.Uint32(out[pos+8+n:]) {
			t.Errorf("chunk %s: CRC mismatch", typ)
		}
		if typ == "eXIf" && !bytes.Equal(out[pos+8:pos+8+n], pl) {
			t.Errorf("eXIf data differs from the payload")
		}
		order = append(order, typ)
		pos += 12 + n
	}
	if pos != len(out) {
		t.Errorf("chunks end at %d, file at %d", pos, len(out))
	}
	got := strings.Join(order, ",")
	if !strings.Contains(got, "eXIf,IDAT") || strings.Count(got, "eXIf") != 1 {
		t.Errorf("chunk order %s: want one eXIf right before the first IDAT", got)
	}
	if _, err := png.Decode(bytes.NewReader(out)); err != nil {
		t.Errorf("image/png cannot decode the result: %v", err)
	}
	// Well-known: every PNG ends with the 12 bytes 00000000 49454E44 AE426082.
	if got := hexs(exifwrite.PNGChunk("IEND", nil)); got != "0000000049454E44AE426082" {
		t.Errorf("IEND chunk = %s (PNG spec section 11.2.5, common knowledge)", got)
	}
}

// TestWebPContainer checks the RIFF sizes by hand and has
// golang.org/x/image/webp decode the VP8L image.
func TestWebPContainer(t *testing.T) {
	_, pl := fullPayload(t, binary.BigEndian)
	for _, sz := range [][2]int{{1, 1}, {16, 16}, {333, 7}, {7, 333}, {16384, 1}} {
		out, err := exifwrite.WebP(pl, sz[0], sz[1])
		if err != nil {
			t.Fatal(err)
		}
		if string(out[:4]) != "RIFF" || string(out[8:12]) != "WEBP" {
			t.Fatalf("%v: not RIFF/WEBP", sz)
		}
		if got := binary.LittleEndian.Uint32(out[4:]); int(got) != len(out)-8 {
			t.Errorf("%v: RIFF size %d, want file size - 8 = %d", sz, got, len(out)-8)
		}
		var chunks []string
		pos := 12
		for pos+8 <= len(out) {
			n := int(binary.LittleEndian.Uint32(out[pos+4:]))
			id := string(out[pos : pos+4])
			chunks = append(chunks, id)
			if id == "VP8X" {
				if out[pos+8]&0x08 == 0 {
					t.Errorf("%v: VP8X lacks the EXIF flag", sz)
				}
				w := int(out[pos+12]) | int(out[pos+13])<<8 | int(out[pos+14])<<16
				h := int(out[pos+15]) | int(out[pos+16])<<8 | int(out[pos+17])<<16
				if w+1 != sz[0] || h+1 != sz[1] {
					t.Errorf("%v: VP8X canvas %dx%d", sz, w+1, h+1)
				}
			}
			if id == "EXIF" && !bytes.Equal(out[pos+8:pos+8+n], pl) {
				t.Errorf("%v: EXIF chunk differs from payload", sz)
			}
			pos += 8 + n + n%2
		}
		if pos != len(out) || strings.Join(chunks, ",") != "VP8X,VP8L,EXIF" {
			t.Errorf("%v: chunks %v end at %d of %d", sz, chunks, pos, len(out))
		}
		img, err := webp.Decode(bytes.NewReader(out))
		if err != nil {
			t.Fatalf("%v: x/image/webp: %v", sz, err)
		}
		if b := img.Bounds(); b.Dx() != sz[0] || b.Dy() != sz[1] {
			t.Errorf("%v: decoded %v", sz, b)
		}
		r, g, bl, a := img.At(sz[0]-1, sz[1]-1).RGBA()
		if r>>8 != 0x80 || g>>8 != 0x90 || bl>>8 != 0xA0 || a>>8 != 0xFF {
			t.Errorf("%v: pixel %x %x %x %x, want 80 90 A0 FF", sz, r>>8, g>>8, bl>>8, a>>8)
		}
	}
}

// TestTIFFContainer: golang.org/x/image/tiff decodes the file to the same
// pixels, and goexif's TIFF parser finds the EXIF pointer in IFD0.
func TestTIFFContainer(t *testing.T) {
	src := fixtures.Gradient(16, 16)
	p := fixtures.Full()
	out, err := exifwrite.TIFF(p.Payload(binary.BigEndian), src)
	if err != nil {
		t.Fatal(err)
	}
	img, err := xtiff.Decode(bytes.NewReader(out))
	if err != nil {
		t.Fatalf("x/image/tiff: %v", err)
	}
	for y := 0; y < 16; y++ {
		for x := 0; x < 16; x++ {
			if !sameRGB(img.At(x, y), src.At(x, y)) {
				t.Fatalf("pixel (%d,%d) = %v, want %v", x, y, img.At(x, y), src.At(x, y))
			}
		}
	}
	tf, err := tiff.Decode(bytes.NewReader(out))
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, tg := range tf.Dirs[0].Tags {
		found = found || tg.Id == exifwrite.TagExifIFDPointer
	}
	if !found {
		t.Error("IFD0 of the TIFF lacks the Exif IFD pointer")
	}
}

func sameRGB(a, b color.Color) bool {
	r1, g1, b1, _ := a.RGBA()
	r2, g2, b2, _ := b.RGBA()
	return r1>>8 == r2>>8 && g1>>8 == g2>>8 && b1>>8 == b2>>8
}

// heifDump is libheif's view of one file, parsed from heif_info_fixtures.txt
// (heif-info -d output committed by gen_fixtures.sh).
type heifDump struct {
	topSizes []int            // sizes of the top-level boxes, in order
	itemType map[int]string   // item_ID -> item_type
	extents  map[int][2]int64 // item ID -> first extent (offset incl. base_offset, length)
	method   map[int]int      // item ID -> construction method
}

func parseHeifDump(t *testing.T) map[string]*heifDump {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join(testdata, "heif_info_fixtures.txt"))
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]*heifDump{}
	var cur *heifDump
	var lastTop bool
	var infeID, ilocID int
	var base int64
	reNum := regexp.MustCompile(`-?\d+`)
	for _, line := range strings.Split(string(raw), "\n") {
		if name, ok := strings.CutPrefix(line, "=== "); ok {
			cur = &heifDump{itemType: map[int]string{}, extents: map[int][2]int64{}, method: map[int]int{}}
			out[name] = cur
			continue
		}
		if cur == nil {
			continue
		}
		trim := strings.TrimLeft(line, "| ")
		num := func() int { v, _ := strconv.Atoi(reNum.FindString(trim)); return v }
		switch {
		case strings.HasPrefix(line, "Box: "):
			lastTop = true
		case strings.HasPrefix(line, "size: ") && lastTop:
			cur.topSizes = append(cur.topSizes, num())
			lastTop = false
		case strings.HasPrefix(trim, "item_ID: "):
			infeID = num()
		case strings.HasPrefix(trim, "item_type: "):
			cur.itemType[infeID] = strings.TrimSpace(strings.TrimPrefix(trim, "item_type: "))
		case strings.HasPrefix(trim, "item ID: "):
			ilocID = num()
		case strings.HasPrefix(trim, "construction method: "):
			cur.method[ilocID] = num()
		case strings.HasPrefix(trim, "base_offset: "):
			base = int64(num())
		case strings.HasPrefix(trim, "extents: "):
			f := reNum.FindAllString(trim, 2)
			o, _ := strconv.ParseInt(f[0], 10, 64)
			n, _ := strconv.ParseInt(f[1], 10, 64)
			cur.extents[ilocID] = [2]int64{base + o, n}
		}
	}
	return out
}

// exifItem finds the Exif item in libheif's view and returns the TIFF
// payload it addresses in data (ISO/IEC 23008-12 A.2.1: a 4-byte
// exif_tiff_header_offset, then the bytes).
func exifItem(t *testing.T, d *heifDump, data []byte) []byte {
	t.Helper()
	for id, typ := range d.itemType {
		if typ != "Exif" {
			continue
		}
		ext := d.extents[id]
		start := ext[0]
		if d.method[id] == 1 { // relative to the idat payload
			i := bytes.Index(data, []byte("idat"))
			if i < 0 {
				t.Fatal("no idat box")
			}
			start += int64(i + 4)
		}
		if start+ext[1] > int64(len(data)) || ext[1] < 4 {
			t.Fatalf("Exif extent %v outside the file", ext)
		}
		item := data[start : start+ext[1]]
		skip := int64(binary.BigEndian.Uint32(item))
		return item[4+skip:]
	}
	t.Fatal("libheif lists no Exif item")
	return nil
}

// TestHEIFReadByLibheif: libheif 1.15's box dump (committed) of the writer's
// HEIF files agrees with the files: top-level box sizes tile the file and the
// Exif item libheif locates holds exactly the payload. The same is checked
// on the HEIC libheif's heif-enc made from jpeg_full_mm.jpg, which shows that
// libheif took our JPEG's Exif segment byte for byte.
func TestHEIFReadByLibheif(t *testing.T) {
	dumps := parseHeifDump(t)
	_, be := fullPayload(t, binary.BigEndian)
	p := fixtures.Full()
	le, err := p.Payload(binary.LittleEndian).Bytes()
	if err != nil {
		t.Fatal(err)
	}
	p.Thumbnail = nil
	beNoThumb, err := p.Payload(binary.BigEndian).Bytes()
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		file string
		want []byte
	}{
		{"heif_mdat.heic", beNoThumb},
		{"heif_idat_prefix.heic", le}, // the offset field (6) skips "Exif\0\0"
		{"heifenc_from_jpeg.heic", be},
	} {
		t.Run(tc.file, func(t *testing.T) {
			d, ok := dumps[tc.file]
			if !ok {
				t.Fatal("no heif-info dump")
			}
			data, err := os.ReadFile(filepath.Join(testdata, "fixtures", tc.file))
			if err != nil {
				t.Fatal(err)
			}
			pos := 0
			for i, sz := range d.topSizes {
				if pos+8 > len(data) || int(binary.BigEndian.Uint32(data[pos:])) != sz {
					t.Fatalf("top-level box %d: libheif says size %d, file disagrees at offset %d", i, sz, pos)
				}
				pos += sz
			}
			if pos != len(data) {
				t.Errorf("libheif's boxes cover %d of %d bytes", pos, len(data))
			}
			got := exifItem(t, d, data)
			want := tc.want
			if !bytes.Equal(got, want) {
				t.Errorf("Exif item (%d bytes) is not the payload (%d bytes)", len(got), len(want))
			}
		})
	}
}

// TestSolidVP8LColours decodes bare VP8L streams (simple-format WebP: RIFF,
// WEBP, one VP8L chunk) with golang.org/x/image/webp, covering both
// one-symbol code forms (symbols 0/1 take 1 bit, others 8 bits).
func TestSolidVP8LColours(t *testing.T) {
	for _, c := range [][3]byte{{0, 0, 0}, {1, 1, 1}, {255, 255, 255}, {0, 1, 2}, {200, 0, 37}} {
		bs := exifwrite.SolidVP8L(3, 2, c[0], c[1], c[2])
		chunk := append([]byte("VP8L"), 0, 0, 0, 0)
		binary.LittleEndian.PutUint32(chunk[4:], uint32(len(bs)))
		chunk = append(chunk, bs...)
		if len(bs)%2 == 1 {
			chunk = append(chunk, 0)
		}
		file := append([]byte("RIFF"), 0, 0, 0, 0)
		binary.LittleEndian.PutUint32(file[4:], uint32(4+len(chunk)))
		file = append(append(file, "WEBP"...), chunk...)
		img, err := webp.Decode(bytes.NewReader(file))
		if err != nil {
			t.Fatalf("%v: x/image/webp: %v", c, err)
		}
		r, g, b, a := img.At(2, 1).RGBA()
		if byte(r>>8) != c[0] || byte(g>>8) != c[1] || byte(b>>8) != c[2] || a>>8 != 0xFF {
			t.Errorf("%v: decoded %d %d %d %d", c, r>>8, g>>8, b>>8, a>>8)
		}
	}
}
