// Package benchset writes a folder of realistic multi-megabyte JPEG photos
// with camera-like EXIF, for the reader's benchmarks and for timing the
// reference reader on the same files (testdata/bench_vs_exiftool.sh).
// The pictures are invented: smooth gradients with sensor-like noise, so
// that the JPEG encoder produces files of the size a camera does.
package benchset

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/color"
	"image/jpeg"
	"math/rand/v2"
	"os"
	"path/filepath"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// Base encodes one w×h picture as a JPEG at quality 92.
func Base(w, h int) ([]byte, error) { return NoiseJPEG(w, h, 92, 1) }

// NoiseJPEG encodes a w×h gradient with sensor-like noise at the given
// quality; seed picks the noise, so the same arguments give the same bytes.
// Noise keeps the encoder from compressing the picture to nothing, so the
// file is about the size a camera writes for that many pixels. It is the
// one noise-picture maker of the test kit (package smallset uses it too).
func NoiseJPEG(w, h, quality int, seed uint64) ([]byte, error) {
	rng := rand.New(rand.NewPCG(seed, 2))
	m := image.NewRGBA(image.Rect(0, 0, w, h))
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			n := func() uint8 { return uint8(rng.IntN(48)) }
			m.SetRGBA(x, y, color.RGBA{uint8(x*160/w) + n(), uint8(y*160/h) + n(), 120 + n(), 255})
		}
	}
	var buf bytes.Buffer
	if err := jpeg.Encode(&buf, m, &jpeg.Options{Quality: quality}); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Write writes n photos named IMG_0001.jpg … into dir, each the base picture
// with its own EXIF (times a minute apart, a GPS track, exposure values).
// thumb, when not nil, is embedded as the IFD1 preview, as cameras do.
func Write(dir string, n int, base, thumb []byte) error {
	for i := 0; i < n; i++ {
		mins := i
		dt := fmt.Sprintf("2024:06:21 %02d:%02d:%02d", 8+mins/60%12, mins%60, i%60)
		p := exifwrite.Photo{
			Make: "Gnomon Test Optics", Model: "GT-1 Mark II", BodySerial: "GT1-000042", LensModel: "GT 24-70mm F2.8",
			Software: "benchset", Orientation: 1,
			DateTimeOriginal: dt, DateTimeDigitized: dt, DateTime: dt,
			SubSecOriginal: "120", OffsetTimeOriginal: "+02:00", OffsetTimeDigitized: "+02:00", OffsetTime: "+02:00",
			ExposureTime: exifwrite.Rational{Num: 1, Den: 250}, FNumber: exifwrite.Rational{Num: 8, Den: 1},
			ISO: 100, Flash: exifwrite.Ptr(16), FocalLength: exifwrite.Rational{Num: 35, Den: 1}, FocalLength35: 35,
			PixelWidth: 4000, PixelHeight: 3000, Thumbnail: thumb,
			GPS: &exifwrite.GPS{LatDeg: 46.5 + float64(i)*1e-4, LonDeg: 6.6 + float64(i)*1e-4, AltitudeM: exifwrite.Ptr(400.0),
				DateStamp: "2024:06:21", TimeStamp: [3]exifwrite.Rational{{Num: uint32(6 + mins/60%12), Den: 1}, {Num: uint32(mins % 60), Den: 1}, {Num: uint32(i % 60), Den: 1}},
				ImgDirection: exifwrite.Rational{Num: uint32(i % 360), Den: 1}, ImgDirectionRef: "T", MapDatum: "WGS-84"},
		}
		pl, err := p.Payload(binary.BigEndian).Bytes()
		if err != nil {
			return err
		}
		b, err := exifwrite.JPEG(pl, base, nil)
		if err != nil {
			return err
		}
		if err := os.WriteFile(filepath.Join(dir, fmt.Sprintf("IMG_%04d.jpg", i+1)), b, 0o644); err != nil {
			return err
		}
	}
	return nil
}
