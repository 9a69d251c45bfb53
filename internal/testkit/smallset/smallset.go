// Package smallset writes a large folder of small JPEG photos (about 1 to
// 6 KB each) with camera-like EXIF, for the scale benchmark
// (testdata/bench_scale.sh) and the interrupt test of cmd/gnomon. The
// pictures are invented noise; the metadata is written by exifwrite.
//
// The batch is deterministic: the same n gives the same bytes. Photos come
// from four invented cameras, so that the audit models camera clocks on
// large evidence sets: camera A is right, camera B runs five minutes fast,
// camera C drifts about ten seconds a day, camera D has no GPS (its photos
// have no independent witness). Files go into sub-folders of at most 1,000,
// as cameras and card readers write them.
package smallset

import (
	"encoding/binary"
	"fmt"
	"os"
	"path/filepath"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/testkit/benchset"
)

// Options shape the batch.
type Options struct {
	// Big is how many extra large photos to add (BigBase, about 1.3 MB
	// each), so that hashing takes measurable time.
	Big int
}

// Bases returns k small noise JPEGs of growing size (about 1 to 6 KB,
// measured for k = 8).
func Bases(k int) ([][]byte, error) {
	var out [][]byte
	for i := 0; i < k; i++ {
		w := 40 + i*100/max(k-1, 1) // 40..140 pixels wide
		b, err := benchset.NoiseJPEG(w, w*3/4, 85, uint64(i))
		if err != nil {
			return nil, err
		}
		out = append(out, b)
	}
	return out, nil
}

// BigBase is one picture of about 1.3 MB (1800×1200 noise at quality 95).
func BigBase() ([]byte, error) { return benchset.NoiseJPEG(1800, 1200, 95, 99) }

type cam struct {
	letter, serial string
	offset         time.Duration // claimed minus true
	driftPerDay    time.Duration
	gps            bool
}

var cams = []cam{
	{"A", "SS-0001", 0, 0, true},
	{"B", "SS-0002", 5 * time.Minute, 0, true},
	{"C", "SS-0003", 0, 10 * time.Second, true},
	{"D", "SS-0004", 0, 0, false},
}

// Write writes n small photos (and o.Big large ones) under dir, which it
// creates. It returns the number of files written.
func Write(dir string, n int, o Options) (int, error) {
	bases, err := Bases(8)
	if err != nil {
		return 0, err
	}
	var big []byte
	if o.Big > 0 {
		if big, err = BigBase(); err != nil {
			return 0, err
		}
	}
	start := time.Date(2024, 6, 1, 5, 0, 0, 0, time.UTC) // 07:00 at +02:00
	count := 0
	for i := 0; i < n+o.Big; i++ {
		c := cams[i%len(cams)]
		k := i / len(cams) // this camera's shot number
		// A shot every 3 minutes from 07:00 to 18:57 local, day after day.
		day, slot := k/240, k%240
		truth := start.AddDate(0, 0, day).Add(time.Duration(slot) * 3 * time.Minute)
		claimed := truth.Add(c.offset + time.Duration(day)*c.driftPerDay)
		local := claimed.In(time.FixedZone("", 2*3600))
		dt := local.Format("2006:01:02 15:04:05")
		p := exifwrite.Photo{
			Make: "Smallset Optics", Model: "SS-" + c.letter, BodySerial: c.serial, Software: "smallset",
			Orientation: 1, DateTimeOriginal: dt, DateTimeDigitized: dt, DateTime: dt,
			OffsetTimeOriginal: "+02:00", OffsetTime: "+02:00",
			ExposureTime: exifwrite.Rational{Num: 1, Den: 250}, FNumber: exifwrite.Rational{Num: 8, Den: 1},
			ISO: 100, Flash: exifwrite.Ptr(16), FocalLength: exifwrite.Rational{Num: 35, Den: 1},
			PixelWidth: 4000, PixelHeight: 3000,
		}
		if c.gps {
			u := truth.UTC()
			p.GPS = &exifwrite.GPS{
				LatDeg: 46.5 + float64(k%500)*1e-4, LonDeg: 6.6 + float64(k%700)*1e-4, AltitudeM: exifwrite.Ptr(400.0),
				DateStamp: u.Format("2006:01:02"),
				TimeStamp: [3]exifwrite.Rational{{Num: uint32(u.Hour()), Den: 1}, {Num: uint32(u.Minute()), Den: 1}, {Num: uint32(u.Second()), Den: 1}},
				MapDatum:  "WGS-84",
			}
		}
		pl, err := p.Payload(binary.LittleEndian).Bytes()
		if err != nil {
			return count, err
		}
		base := bases[k%len(bases)]
		if i >= n {
			base = big
		}
		b, err := exifwrite.JPEG(pl, base, nil)
		if err != nil {
			return count, err
		}
		sub := filepath.Join(dir, fmt.Sprintf("%03d%s", i/4000, c.letter))
		if err := os.MkdirAll(sub, 0o755); err != nil {
			return count, err
		}
		name := fmt.Sprintf("DSC_%04d.jpg", k%10000)
		if err := os.WriteFile(filepath.Join(sub, name), b, 0o644); err != nil {
			return count, err
		}
		count++
	}
	return count, nil
}
