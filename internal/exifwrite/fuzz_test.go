package exifwrite_test

import (
	"bytes"
	"encoding/binary"
	"errors"
	"testing"

	"github.com/rwcarlsen/goexif/tiff"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// FuzzPayload builds IFD0 entries from fuzz bytes (tag, type, count, value
// split arbitrarily). Whatever the input, Bytes either refuses it with
// ErrInvalid or returns a payload that goexif's TIFF parser reads back with
// the same tags, types, counts and values.
func FuzzPayload(f *testing.F) {
	f.Add([]byte{0x01, 0x0F, 0, 2, 0, 0, 0, 3, 'a', 'b', 0}, true)
	f.Add([]byte{0x82, 0x9A, 0, 5, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 1, 0xF4}, false)
	f.Add([]byte{0x01, 0x12, 0, 3, 0, 0, 0, 1, 0, 6, 0x01, 0x13, 0, 3, 0, 0, 0, 1, 0, 1}, true)
	f.Fuzz(func(t *testing.T, in []byte, little bool) {
		var es []exifwrite.Entry
		for len(in) >= 8 && len(es) < 64 {
			e := exifwrite.Entry{Tag: binary.BigEndian.Uint16(in), Type: binary.BigEndian.Uint16(in[2:]), Count: binary.BigEndian.Uint32(in[4:]) % 512}
			in = in[8:]
			n := min(len(in), 4096)
			if sz := map[uint16]int{1: 1, 2: 1, 3: 2, 4: 4, 5: 8, 6: 1, 7: 1, 8: 2, 9: 4, 10: 8, 11: 4, 12: 8, 129: 1}[e.Type]; sz > 0 {
				n = min(n, int(e.Count)*sz)
			}
			e.Value, in = in[:n], in[n:]
			es = append(es, e)
		}
		var o binary.ByteOrder = binary.BigEndian
		if little {
			o = binary.LittleEndian
		}
		b, err := exifwrite.Payload{Order: o, IFD0: es}.Bytes()
		if err != nil {
			if !errors.Is(err, exifwrite.ErrInvalid) {
				t.Fatalf("error not wrapping ErrInvalid: %v", err)
			}
			return
		}
		tf, err := tiff.Decode(bytes.NewReader(b))
		if len(es) == 0 {
			return
		}
		if err != nil {
			// goexif refuses zero-length values and types it does not know
			// (129); anything else is the writer's fault.
			for _, e := range es {
				if e.Count == 0 || e.Type == exifwrite.TypeUTF8 {
					return
				}
			}
			t.Fatalf("goexif cannot read the payload: %v", err)
		}
		got := map[uint16]*tiff.Tag{}
		for _, tg := range tf.Dirs[0].Tags {
			got[tg.Id] = tg
		}
		for _, e := range es {
			g := got[e.Tag]
			if g == nil || uint16(g.Type) != e.Type || g.Count != e.Count || !bytes.Equal(canonical(g, o), e.Value) {
				t.Fatalf("tag 0x%04X written type %d count %d % X; goexif read %+v", e.Tag, e.Type, e.Count, e.Value, g)
			}
		}
	})
}

func BenchmarkPhotoJPEG(b *testing.B) {
	base := tinyJPEG()
	p := exifwrite.Photo{Make: "Invented Cameras", Model: "IC-1", DateTimeOriginal: "2024:06:21 14:03:27",
		ExposureTime: exifwrite.Rational{Num: 1, Den: 250}, GPS: &exifwrite.GPS{LatDeg: 46.5, LonDeg: 6.6}}
	for b.Loop() {
		pl, err := p.Payload(binary.BigEndian).Bytes()
		if err != nil {
			b.Fatal(err)
		}
		if _, err := exifwrite.JPEG(pl, base, nil); err != nil {
			b.Fatal(err)
		}
	}
}
