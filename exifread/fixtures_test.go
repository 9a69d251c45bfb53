package exifread

import (
	"bytes"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

// The fixtures are built by package exifwrite from known values; each field
// the reader returns is compared with the value written (source: "written by
// exifwrite"). The container is compared with what the file name says.

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

func ratF(r exifwrite.Rational) float64 { return float64(r.Num) / float64(r.Den) }

// wantWall checks one EXIF date with its sub-seconds and offset as written.
func wantWall(t *testing.T, name string, got *WallTime, raw, sub, off, source string) {
	t.Helper()
	if raw == "" {
		return
	}
	if got == nil {
		t.Errorf("%s: missing, want %q", name, raw)
		return
	}
	if !got.Valid || got.Source != source {
		t.Errorf("%s: valid=%v (%s) source=%q, want valid from %s", name, got.Valid, got.Invalid, got.Source, source)
	}
	if source == SourceEXIF && got.Raw != raw {
		t.Errorf("%s raw = %q, want %q", name, got.Raw, raw)
	}
	if sub != "" {
		ns, _ := subSecNanos(sub)
		if got.Nanosecond != ns || got.SubSecRaw != sub {
			t.Errorf("%s sub-seconds = %d (%q), want %d (%q)", name, got.Nanosecond, got.SubSecRaw, ns, sub)
		}
	}
	if off != "" {
		if got.OffsetSec == nil || got.OffsetRaw != off {
			t.Errorf("%s offset = %v %q, want %q", name, got.OffsetSec, got.OffsetRaw, off)
		}
	} else if got.OffsetSec != nil && got.OffsetSource == "" {
		t.Errorf("%s has offset %d, none written", name, *got.OffsetSec)
	}
}

func checkPhoto(t *testing.T, rec Record, p *exifwrite.Photo) {
	t.Helper()
	wantWall(t, "DateTimeOriginal", rec.DateTimeOriginal, p.DateTimeOriginal, p.SubSecOriginal, p.OffsetTimeOriginal, SourceEXIF)
	wantWall(t, "DateTimeDigitized", rec.DateTimeDigitized, p.DateTimeDigitized, p.SubSecDigitized, p.OffsetTimeDigitized, SourceEXIF)
	wantWall(t, "DateTime", rec.DateTime, p.DateTime, p.SubSec, p.OffsetTime, SourceEXIF)
	strs := []struct{ name, got, want string }{
		{"Make", rec.Make, p.Make}, {"Model", rec.Model, p.Model}, {"BodySerialNumber", rec.BodySerialNumber, p.BodySerial},
		{"LensModel", rec.LensModel, p.LensModel}, {"Software", rec.Software, p.Software}, {"ImageUniqueID", rec.ImageUniqueID, p.ImageUniqueID},
	}
	for _, s := range strs {
		if s.got != s.want {
			t.Errorf("%s = %q, want %q", s.name, s.got, s.want)
		}
	}
	ints := []struct {
		name      string
		got, want int
	}{
		{"Orientation", rec.Orientation, p.Orientation}, {"ISO", rec.ISO, p.ISO}, {"FocalLength35mm", rec.FocalLength35mm, p.FocalLength35},
	}
	if p.PixelWidth != 0 {
		ints = append(ints, struct {
			name      string
			got, want int
		}{"PixelWidth", rec.PixelWidth, p.PixelWidth}, struct {
			name      string
			got, want int
		}{"PixelHeight", rec.PixelHeight, p.PixelHeight})
	}
	for _, s := range ints {
		if s.got != s.want {
			t.Errorf("%s = %d, want %d", s.name, s.got, s.want)
		}
	}
	flts := []struct {
		name string
		got  *float64
		want exifwrite.Rational
	}{{"ExposureTimeSec", rec.ExposureTimeSec, p.ExposureTime}, {"FNumber", rec.FNumber, p.FNumber}, {"FocalLengthMM", rec.FocalLengthMM, p.FocalLength}}
	for _, f := range flts {
		if f.want.IsZero() {
			continue
		}
		if f.got == nil || !near(*f.got, ratF(f.want), 1e-12) {
			t.Errorf("%s = %v, want %v", f.name, f.got, ratF(f.want))
		}
	}
	if p.Flash != nil && (rec.Flash == nil || rec.Flash.Raw != *p.Flash || rec.Flash.Fired != (*p.Flash&1 == 1)) {
		t.Errorf("Flash = %+v, want raw %d", rec.Flash, *p.Flash)
	}
	if len(p.Thumbnail) > 0 && !bytes.Equal(rec.Thumbnail, p.Thumbnail) {
		t.Errorf("thumbnail: %d bytes, want the %d written", len(rec.Thumbnail), len(p.Thumbnail))
	}
	g := p.GPS
	if g == nil {
		return
	}
	pos := rec.GPS.Position
	// DMS stores seconds in units of 1e-4": 1.4e-8 degree at most.
	if pos == nil || !pos.Valid || pos.LatDeg == nil || pos.LonDeg == nil || !near(*pos.LatDeg, g.LatDeg, 2e-8) || !near(*pos.LonDeg, g.LonDeg, 2e-8) {
		t.Errorf("position = %+v, want %v, %v", pos, g.LatDeg, g.LonDeg)
	}
	if g.AltitudeM != nil {
		if a := rec.GPS.AltitudeM; a == nil || !a.Valid || !near(a.Value, *g.AltitudeM, 1e-3) {
			t.Errorf("altitude = %+v, want %v", a, *g.AltitudeM)
		}
	}
	if g.DateStamp != "" {
		h, m, s := ratF(g.TimeStamp[0]), ratF(g.TimeStamp[1]), ratF(g.TimeStamp[2])
		gt := rec.GPS.Time
		want := g.DateStamp[:4] + "-" + g.DateStamp[5:7] + "-" + g.DateStamp[8:10]
		if gt == nil || !gt.Valid || gt.UTC.Format("2006-01-02") != want ||
			!near(float64(gt.UTC.Hour()*3600+gt.UTC.Minute()*60)+float64(gt.UTC.Second())+float64(gt.UTC.Nanosecond())/1e9, h*3600+m*60+s, 1e-6) {
			t.Errorf("GPS time = %+v, want %s %v:%v:%v UTC", gt, want, h, m, s)
		}
	}
	if !g.ImgDirection.IsZero() {
		d := rec.GPS.ImgDirectionDeg
		if d == nil || !d.Valid || !near(d.Value, ratF(g.ImgDirection), 1e-9) || rec.GPS.ImgDirectionRef != g.ImgDirectionRef {
			t.Errorf("direction = %+v %q, want %v %q", d, rec.GPS.ImgDirectionRef, ratF(g.ImgDirection), g.ImgDirectionRef)
		}
	}
	if !g.HPosError.IsZero() {
		if e := rec.GPS.HPositioningErrM; e == nil || !near(e.Value, ratF(g.HPosError), 1e-9) {
			t.Errorf("h positioning error = %+v, want %v", e, ratF(g.HPosError))
		}
	}
	if !g.DOP.IsZero() {
		if e := rec.GPS.DOP; e == nil || !near(e.Value, ratF(g.DOP), 1e-9) {
			t.Errorf("DOP = %+v, want %v", e, ratF(g.DOP))
		}
	}
	if rec.GPS.MapDatum != g.MapDatum {
		t.Errorf("map datum = %q, want %q", rec.GPS.MapDatum, g.MapDatum)
	}
}

// checkXMP checks the values an XMP packet supplied where the EXIF had none.
func checkXMP(t *testing.T, rec Record, x *exifwrite.XMPFields, exifHasTime bool, source string) {
	t.Helper()
	if x.DateTimeOriginal != "" {
		w := rec.DateTimeOriginal
		if w == nil || !w.Valid {
			t.Fatalf("DateTimeOriginal = %+v, want from XMP %q", w, x.DateTimeOriginal)
		}
		// The expected wall clock comes from the standard library's RFC 3339
		// parser, not from this reader: every XMP date the fixtures write is
		// in the full form (date, time, zone), where XMP Part 1 §8.2.1.1 and
		// RFC 3339 agree.
		want, err := time.Parse(time.RFC3339Nano, x.DateTimeOriginal)
		if err != nil {
			t.Fatalf("fixture XMP date %q is not full RFC 3339: %v", x.DateTimeOriginal, err)
		}
		if w.Year != want.Year() || time.Month(w.Month) != want.Month() || w.Day != want.Day() || w.Hour != want.Hour() || w.Minute != want.Minute() || w.Second != want.Second() {
			t.Errorf("DateTimeOriginal = %+v, want wall clock of %q", w, x.DateTimeOriginal)
		}
		if !exifHasTime && (w.Source != source || w.Nanosecond != want.Nanosecond()) {
			t.Errorf("DateTimeOriginal source %q ns %d, want %q ns %d", w.Source, w.Nanosecond, source, want.Nanosecond())
		}
		// The offset written in the XMP date must be on the record, from
		// wherever it was taken.
		if _, off := want.Zone(); w.OffsetSec == nil || *w.OffsetSec != off {
			t.Errorf("DateTimeOriginal offset = %v, want %d from %q", w.OffsetSec, off, x.DateTimeOriginal)
		}
	}
	if x.LatDeg != nil && !exifHasTime {
		p := rec.GPS.Position
		// XMPCoordinate rounds to 1e-7 minute = 1.7e-9 degree.
		if p == nil || !p.Valid || p.Source != source || !near(*p.LatDeg, *x.LatDeg, 1e-8) || !near(*p.LonDeg, *x.LonDeg, 1e-8) {
			t.Errorf("position = %+v, want %v, %v from %s", p, *x.LatDeg, *x.LonDeg, source)
		}
	}
	if x.AltitudeM != nil && !exifHasTime {
		if a := rec.GPS.AltitudeM; a == nil || !near(a.Value, *x.AltitudeM, 1e-6) {
			t.Errorf("altitude = %+v, want %v", a, *x.AltitudeM)
		}
	}
	if x.Make != "" && !exifHasTime && (rec.Make != x.Make || rec.XMPSources["make"] != source) {
		t.Errorf("Make = %q (source %q), want %q from %s", rec.Make, rec.XMPSources["make"], x.Make, source)
	}
}

func TestFixturesWrittenByExifwrite(t *testing.T) {
	all, err := fixtures.All()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, f := range all {
		if err := os.WriteFile(filepath.Join(dir, f.Name), f.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	wantContainer := map[string]string{".jpg": ContainerJPEG, ".png": ContainerPNG, ".webp": ContainerWebP, ".heic": ContainerHEIF, ".tif": ContainerTIFF}
	for _, f := range all {
		if strings.HasSuffix(f.Name, ".xmp") {
			continue
		}
		t.Run(f.Name, func(t *testing.T) {
			rec := ReadFile(filepath.Join(dir, f.Name), Options{})
			if rec.Err != nil {
				t.Fatalf("error: %v", rec.Err)
			}
			if want := wantContainer[filepath.Ext(f.Name)]; rec.Container != want {
				t.Errorf("container = %q, want %q", rec.Container, want)
			}
			if rec.ExtensionMismatch != "" {
				t.Errorf("extension mismatch noted: %s", rec.ExtensionMismatch)
			}
			for _, w := range rec.Warnings {
				if strings.HasPrefix(w, "cross-check") {
					t.Errorf("goexif disagrees: %s", w)
				}
			}
			if f.Photo != nil {
				checkPhoto(t, rec, f.Photo)
			}
			if f.XMP != nil {
				checkXMP(t, rec, f.XMP, f.Photo != nil, SourceXMP)
			}
			if f.Name == "sidecar_noexif.jpg" {
				for _, s := range all {
					if s.Name == "sidecar_noexif.xmp" {
						checkXMP(t, rec, s.XMP, false, SourceSidecar)
					}
				}
			}
		})
	}
}

// TestSidecarNames: both "<file>.xmp" and "<basename>.xmp" are found.
func TestSidecarNames(t *testing.T) {
	lat, lon := 10.5, -20.25
	x := exifwrite.XMPFields{DateTimeOriginal: "2021-07-04T08:09:10-05:00", LatDeg: &lat, LonDeg: &lon}
	for _, name := range []string{"a.jpg.xmp", "a.xmp"} {
		t.Run(name, func(t *testing.T) {
			dir := t.TempDir()
			if err := os.WriteFile(filepath.Join(dir, "a.jpg"), fixtures.BaseJPEG, 0o644); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(dir, name), exifwrite.XMP(x), 0o644); err != nil {
				t.Fatal(err)
			}
			rec := ReadFile(filepath.Join(dir, "a.jpg"), Options{})
			checkXMP(t, rec, &x, false, SourceSidecar)
			if u, ok := rec.DateTimeOriginal.UTC(); !ok || u.Format("2006-01-02T15:04:05Z07:00") != "2021-07-04T13:09:10Z" {
				t.Errorf("UTC() = %v %v, want 2021-07-04T13:09:10Z (common knowledge: -05:00 is 5 h behind UTC)", u, ok)
			}
		})
	}
}

// TestExtensionMismatch: the container comes from the bytes.
func TestExtensionMismatch(t *testing.T) {
	pl, err := fixtures.Full().Payload(nil).Bytes()
	if err != nil {
		t.Fatal(err)
	}
	png, err := exifwrite.PNG(pl, fixtures.BasePNG)
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	p := filepath.Join(dir, "photo.jpg")
	if err := os.WriteFile(p, png, 0o644); err != nil {
		t.Fatal(err)
	}
	rec := ReadFile(p, Options{})
	if rec.Container != ContainerPNG || !strings.Contains(rec.ExtensionMismatch, "jpeg") {
		t.Errorf("container %q, mismatch %q; want png with a note", rec.Container, rec.ExtensionMismatch)
	}
	if rec.Make != "Gnomon Test Optics" {
		t.Errorf("Make = %q", rec.Make)
	}
}

// TestReadOnly: reading leaves the folder as it was (no file added or changed).
func TestReadOnly(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "x.jpg")
	if err := os.WriteFile(p, fixtures.BaseJPEG, 0o444); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadDir(dir)
	st0, _ := os.Stat(p)
	rec := ReadFile(p, Options{})
	after, _ := os.ReadDir(dir)
	st1, _ := os.Stat(p)
	if len(before) != len(after) || !st0.ModTime().Equal(st1.ModTime()) || st0.Size() != st1.Size() {
		t.Errorf("folder changed: %d -> %d entries", len(before), len(after))
	}
	if rec.Size != int64(len(fixtures.BaseJPEG)) || len(rec.SHA256) != 64 {
		t.Errorf("size %d sha %q", rec.Size, rec.SHA256)
	}
}

// TestSidecarPrecedence: EXIF first, then the embedded XMP, then the sidecar.
func TestSidecarPrecedence(t *testing.T) {
	dir := t.TempDir()
	img, err := exifwrite.JPEG(nil, fixtures.BaseJPEG, exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2020-01-01T10:00:00Z"}))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "p.jpg"), img, 0o644); err != nil {
		t.Fatal(err)
	}
	lat := 12.0
	side := exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2021-01-01T10:00:00Z", LatDeg: &lat, LonDeg: &lat})
	if err := os.WriteFile(filepath.Join(dir, "p.xmp"), side, 0o644); err != nil {
		t.Fatal(err)
	}
	rec := ReadFile(filepath.Join(dir, "p.jpg"), Options{})
	if w := rec.DateTimeOriginal; w == nil || w.Year != 2020 || w.Source != SourceXMP {
		t.Errorf("DateTimeOriginal %+v, want 2020 from the embedded XMP", w)
	}
	if p := rec.GPS.Position; p == nil || p.Source != SourceSidecar || *p.LatDeg != 12 {
		t.Errorf("position %+v, want 12,12 from the sidecar", p)
	}
	rec = ReadFile(filepath.Join(dir, "p.jpg"), Options{SkipSidecar: true})
	if rec.GPS.Position != nil {
		t.Errorf("SkipSidecar still read the sidecar")
	}
}
