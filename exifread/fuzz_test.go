package exifread

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

// Fuzz targets for each container walker, the TIFF validator, the XMP
// parser and the whole reader. Their seed corpora (goexif's corrupt and
// sample JPEGs, and the exifwrite fixtures) run in plain `go test`.
// The property checked: no panic, no internal panic caught by Read's
// recover, and every returned slice within the input.

// seedFiles returns goexif's corrupt samples and a few good ones, or nothing
// when the module directory cannot be found (the fixtures still seed).
func seedFiles() [][]byte {
	dir := findGoexif()
	if dir == "" {
		return nil
	}
	var seeds [][]byte
	for _, pat := range []string{"exif/corrupt/*.jpg", "exif/samples/f1-exif.jpg", "exif/samples/has-lens-info.jpg", "exif/samples/geodegrees_as_string.jpg", "exif/sample1.jpg", "tiff/sample1.tif"} {
		m, _ := filepath.Glob(filepath.Join(dir, pat))
		for _, p := range m {
			if b, err := os.ReadFile(p); err == nil && len(b) < 1<<20 {
				seeds = append(seeds, b)
			}
		}
	}
	return seeds
}

func fixtureSeeds(f *testing.F, keep func(name string) bool) {
	all, err := fixtures.All()
	if err != nil {
		f.Fatal(err)
	}
	for _, x := range all {
		if keep(x.Name) {
			f.Add(x.Data)
		}
	}
}

func ext(exts ...string) func(string) bool {
	return func(n string) bool {
		for _, e := range exts {
			if strings.HasSuffix(n, e) {
				return true
			}
		}
		return false
	}
}

func checkRecord(t *testing.T, rec Record) {
	if rec.Err != nil && strings.Contains(rec.Err.Error(), "internal panic") {
		t.Fatalf("panic inside the reader: %v", rec.Err)
	}
	for _, w := range rec.Warnings {
		if strings.Contains(w, "goexif panicked") {
			t.Fatalf("goexif panicked on a validated payload: %s", w)
		}
	}
}

func FuzzJPEG(f *testing.F) {
	for _, s := range seedFiles() {
		f.Add(s)
	}
	fixtureSeeds(f, ext(".jpg"))
	opt := Options{}.withDefaults()
	f.Fuzz(func(t *testing.T, b []byte) {
		if len(b) < 2 {
			return
		}
		fd := walkJPEG(bytes.NewReader(b), int64(len(b)), opt)
		if int64(len(fd.exifMem)) > int64(len(b)) || len(fd.xmp) > len(b) {
			t.Fatalf("payload larger than input")
		}
		checkRecord(t, Read(bytes.NewReader(b), int64(len(b)), Options{SkipHash: true}))
	})
}

func FuzzTIFF(f *testing.F) {
	for _, s := range seedFiles() {
		if i := bytes.Index(s, []byte("Exif\x00\x00")); i >= 0 {
			f.Add(s[i+6:])
		}
	}
	if pl, err := fullPayload(); err == nil {
		f.Add(pl)
	}
	f.Add(handTIFF(5, 100))
	opt := Options{}.withDefaults()
	f.Fuzz(func(t *testing.T, b []byte) {
		d, _ := walkTIFF(bytes.NewReader(b), 0, int64(len(b)), opt)
		if d == nil {
			return
		}
		var rec Record
		fromEXIF(&rec, d)
		if int64(len(rec.Thumbnail)) > int64(len(b)) {
			t.Fatalf("thumbnail larger than input")
		}
		if d.nBytes > opt.MaxValueBytes {
			t.Fatalf("value bytes %d over the limit", d.nBytes)
		}
	})
}

func FuzzHEIF(f *testing.F) {
	fixtureSeeds(f, ext(".heic"))
	if pl, err := fullPayload(); err == nil {
		if h, err := exifwrite.HEIFWith(pl, exifwrite.HEIFOptions{Idat: true}); err == nil {
			f.Add(h)
		}
	}
	opt := Options{}.withDefaults()
	f.Fuzz(func(t *testing.T, b []byte) {
		fd := walkHEIF(bytes.NewReader(b), int64(len(b)), ContainerHEIF, opt)
		if int64(len(fd.exifMem)) > opt.MaxExifBytes || int64(len(fd.xmp)) > opt.MaxXMPBytes {
			t.Fatalf("payload over its limit")
		}
		checkRecord(t, Read(bytes.NewReader(b), int64(len(b)), Options{SkipHash: true}))
	})
}

func FuzzPNG(f *testing.F) {
	fixtureSeeds(f, ext(".png"))
	opt := Options{}.withDefaults()
	f.Fuzz(func(t *testing.T, b []byte) {
		fd := walkPNG(bytes.NewReader(b), int64(len(b)), opt)
		if int64(len(fd.xmp)) > opt.MaxXMPBytes {
			t.Fatalf("xmp over its limit")
		}
		checkRecord(t, Read(bytes.NewReader(b), int64(len(b)), Options{SkipHash: true}))
	})
}

func FuzzWebP(f *testing.F) {
	fixtureSeeds(f, ext(".webp"))
	opt := Options{}.withDefaults()
	f.Fuzz(func(t *testing.T, b []byte) {
		fd := walkWebP(bytes.NewReader(b), int64(len(b)), opt)
		if len(fd.exifMem) > len(b) {
			t.Fatalf("payload larger than input")
		}
		checkRecord(t, Read(bytes.NewReader(b), int64(len(b)), Options{SkipHash: true}))
	})
}

func FuzzXMP(f *testing.F) {
	fixtureSeeds(f, ext(".xmp"))
	lat := 1.5
	f.Add(exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2020-01-01T00:00:00.123+05:30", LatDeg: &lat, LonDeg: &lat}))
	f.Add([]byte(`<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"><rdf:Description xmlns:exif="http://ns.adobe.com/exif/1.0/"><exif:GPSTimeStamp>2020-01-01T10:00:00+02:00</exif:GPSTimeStamp></rdf:Description></rdf:RDF></x:xmpmeta>`))
	f.Fuzz(func(t *testing.T, b []byte) {
		var rec Record
		applyXMP(&rec, b, SourceXMP)
		if rec.DateTimeOriginal != nil && rec.DateTimeOriginal.Valid {
			if _, err := rec.DateTimeOriginal.In(nil); err == nil {
				t.Fatalf("In(nil) accepted")
			}
		}
	})
}

func FuzzRead(f *testing.F) {
	for _, s := range seedFiles() {
		f.Add(s)
	}
	fixtureSeeds(f, func(string) bool { return true })
	f.Fuzz(func(t *testing.T, b []byte) {
		rec := Read(bytes.NewReader(b), int64(len(b)), Options{})
		checkRecord(t, rec)
		if len(rec.SHA256) != 64 {
			t.Fatalf("sha256 %q", rec.SHA256)
		}
	})
}
