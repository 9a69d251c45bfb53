package report

import (
	"bytes"
	"fmt"
	"image/color"
	"io"
	"path/filepath"
	"testing"

	"github.com/disintegration/imaging"
)

// benchAudit repeats the fixture's photos to n photos with distinct paths.
func benchAudit(n int) *Audit {
	a := fixtureAudit()
	base := a.Photos
	a.Photos = make([]Photo, 0, n)
	for i := range n {
		p := base[i%len(base)]
		p.Path = fmt.Sprintf("roll%03d/%s", i/len(base), p.Path)
		a.Photos = append(a.Photos, p)
	}
	return a
}

func benchWriter(b *testing.B, write func(io.Writer, *Audit) error) {
	a := benchAudit(1000)
	b.ReportAllocs()
	for b.Loop() {
		if err := write(io.Discard, a); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWriteJSON1000(b *testing.B)    { benchWriter(b, WriteJSON) }
func BenchmarkWriteCSV1000(b *testing.B)     { benchWriter(b, WriteCSV) }
func BenchmarkWriteGeoJSON1000(b *testing.B) { benchWriter(b, WriteGeoJSON) }
func BenchmarkWriteHTML1000(b *testing.B)    { benchWriter(b, WriteHTML) }

func BenchmarkWriteThumbnail(b *testing.B) {
	preview := jpegBytes(b, 640, 480)
	full := jpegBytes(b, 4000, 3000) // 12 megapixels
	for _, bc := range []struct {
		name     string
		embedded []byte
	}{{"embedded-preview", preview}, {"decode-12MP", nil}} {
		b.Run(bc.name, func(b *testing.B) {
			dst := filepath.Join(b.TempDir(), "t.jpg")
			for b.Loop() {
				if err := WriteThumbnail(dst, bc.embedded, opener(full), 6); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func jpegBytes(b *testing.B, w, h int) []byte {
	img := imaging.New(w, h, color.NRGBA{90, 140, 200, 255})
	var buf bytes.Buffer
	if err := imaging.Encode(&buf, img, imaging.JPEG); err != nil {
		b.Fatal(err)
	}
	return buf.Bytes()
}
