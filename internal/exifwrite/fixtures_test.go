package exifwrite_test

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

const testdata = "../../exifread/testdata"

// exiftoolTable is the layout of the tables written by
// testdata/exiftool_json.py.
type exiftoolTable struct {
	Generator       string `json:"generator"`
	ExiftoolVersion string `json:"exiftool_version"`
	Note            string `json:"note"`
	Files           []struct {
		File     string         `json:"file"`
		Repaired bool           `json:"repaired_copy"`
		Exiftool map[string]any `json:"exiftool"`
	} `json:"files"`
}

func loadExiftool(t *testing.T, name string) (exiftoolTable, map[string]map[string]any) {
	t.Helper()
	raw, err := os.ReadFile(filepath.Join(testdata, name))
	if err != nil {
		t.Fatalf("reading the committed exiftool table: %v", err)
	}
	var tab exiftoolTable
	if err := json.Unmarshal(raw, &tab); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	if tab.ExiftoolVersion == "" || tab.Generator == "" || len(tab.Files) == 0 {
		t.Fatalf("%s: header or files missing", name)
	}
	byName := map[string]map[string]any{}
	for _, f := range tab.Files {
		byName[f.File] = f.Exiftool
	}
	return tab, byName
}

// TestFixturesMatchCommittedFiles: the writer still produces, byte for
// byte, the files that exiftool and libheif read when the tables were
// generated; any change to the writer's output shows up here and requires
// re-running testdata/gen_fixtures.sh (and so a new outside reading).
func TestFixturesMatchCommittedFiles(t *testing.T) {
	all, err := fixtures.All()
	if err != nil {
		t.Fatal(err)
	}
	_, table := loadExiftool(t, "exiftool_fixtures.json")
	for _, f := range all {
		t.Run(f.Name, func(t *testing.T) {
			committed, err := os.ReadFile(filepath.Join(testdata, "fixtures", f.Name))
			if err != nil {
				t.Fatalf("committed fixture missing (run exifread/testdata/gen_fixtures.sh): %v", err)
			}
			if !bytes.Equal(committed, f.Data) {
				t.Errorf("writer output (%d bytes) differs from the committed fixture (%d bytes) at byte %d; rerun gen_fixtures.sh and review exiftool's reading",
					len(f.Data), len(committed), firstDiff(committed, f.Data))
			}
			if _, ok := table[f.Name]; !ok {
				t.Errorf("exiftool_fixtures.json has no row for %s", f.Name)
			}
		})
	}
}

func firstDiff(a, b []byte) int {
	for i := range min(len(a), len(b)) {
		if a[i] != b[i] {
			return i
		}
	}
	return min(len(a), len(b))
}

// want is one expected exiftool value: a string, a number (compared within
// tol) or an "h:m:s" GPS time compared numerically.
type want struct {
	key    string
	val    any
	tol    float64
	source string
}

const srcExiftool = "exiftool via testdata/gen_fixtures.sh"

// expectEXIF lists what exiftool must report (with -n -G1) for a payload
// built from p; tolerances state the writer's documented rounding.
func expectEXIF(p *exifwrite.Photo, o binary.ByteOrder) []want {
	var w []want
	s := func(key, v string) {
		if v != "" {
			w = append(w, want{key, v, 0, srcExiftool})
		}
	}
	n := func(key string, v, tol float64) { w = append(w, want{key, v, tol, srcExiftool}) }
	r := func(key string, v exifwrite.Rational) {
		if !v.IsZero() {
			n(key, v.Float(), 1e-12)
		}
	}
	bo := "MM"
	if o == binary.LittleEndian {
		bo = "II"
	}
	s("File:ExifByteOrder", bo)
	s("IFD0:Make", p.Make)
	s("IFD0:Model", p.Model)
	s("IFD0:Software", p.Software)
	s("IFD0:ModifyDate", p.DateTime)
	if p.Orientation != 0 {
		n("IFD0:Orientation", float64(p.Orientation), 0)
	}
	s("ExifIFD:ExifVersion", "0232")
	s("ExifIFD:DateTimeOriginal", p.DateTimeOriginal)
	s("ExifIFD:CreateDate", p.DateTimeDigitized)
	s("ExifIFD:SubSecTime", p.SubSec)
	s("ExifIFD:SubSecTimeOriginal", p.SubSecOriginal)
	s("ExifIFD:SubSecTimeDigitized", p.SubSecDigitized)
	s("ExifIFD:OffsetTime", p.OffsetTime)
	s("ExifIFD:OffsetTimeOriginal", p.OffsetTimeOriginal)
	s("ExifIFD:OffsetTimeDigitized", p.OffsetTimeDigitized)
	r("ExifIFD:ExposureTime", p.ExposureTime)
	r("ExifIFD:FNumber", p.FNumber)
	r("ExifIFD:FocalLength", p.FocalLength)
	if p.ISO > 0 {
		n("ExifIFD:ISO", float64(p.ISO), 0)
	}
	if p.Flash != nil {
		n("ExifIFD:Flash", float64(*p.Flash), 0)
	}
	if p.FocalLength35 > 0 {
		n("ExifIFD:FocalLengthIn35mmFormat", float64(p.FocalLength35), 0)
	}
	if p.PixelWidth > 0 {
		n("ExifIFD:ExifImageWidth", float64(p.PixelWidth), 0)
	}
	if p.PixelHeight > 0 {
		n("ExifIFD:ExifImageHeight", float64(p.PixelHeight), 0)
	}
	s("ExifIFD:SerialNumber", p.BodySerial)
	s("ExifIFD:LensModel", p.LensModel)
	s("ExifIFD:ImageUniqueID", p.ImageUniqueID)
	if len(p.Thumbnail) > 0 {
		n("IFD1:ThumbnailLength", float64(len(p.Thumbnail)), 0)
	}
	if g := p.GPS; g != nil {
		// DMS rounds to 1e-4 arc-second: 2.8e-8 degree at most.
		const gpsTol = 3e-8
		n("GPS:GPSLatitude", math.Abs(g.LatDeg), gpsTol)
		n("GPS:GPSLongitude", math.Abs(g.LonDeg), gpsTol)
		n("Composite:GPSLatitude", g.LatDeg, gpsTol)
		n("Composite:GPSLongitude", g.LonDeg, gpsTol)
		s("GPS:GPSLatitudeRef", map[bool]string{false: "N", true: "S"}[g.LatDeg < 0])
		s("GPS:GPSLongitudeRef", map[bool]string{false: "E", true: "W"}[g.LonDeg < 0])
		if g.AltitudeM != nil {
			n("GPS:GPSAltitude", math.Abs(*g.AltitudeM), 5e-4)
			n("Composite:GPSAltitude", *g.AltitudeM, 5e-4)
			ref := 0.0
			if *g.AltitudeM < 0 {
				ref = 1
			}
			n("GPS:GPSAltitudeRef", ref, 0)
		}
		s("GPS:GPSDateStamp", g.DateStamp)
		if g.TimeStamp != [3]exifwrite.Rational{} {
			w = append(w, want{"GPS:GPSTimeStamp", g.TimeStamp, 1e-9, srcExiftool})
		}
		r("GPS:GPSImgDirection", g.ImgDirection)
		s("GPS:GPSImgDirectionRef", g.ImgDirectionRef)
		r("GPS:GPSHPositioningError", g.HPosError)
		r("GPS:GPSDOP", g.DOP)
		s("GPS:GPSMapDatum", g.MapDatum)
	}
	return w
}

// exifDate is how exiftool prints an XMP date: the EXIF "YYYY:MM:DD
// HH:MM:SS" form with the XMP fraction and offset kept.
func exifDate(xmpDate string) string {
	if len(xmpDate) < 10 {
		return xmpDate
	}
	d := strings.ReplaceAll(xmpDate[:10], "-", ":")
	return d + strings.Replace(xmpDate[10:], "T", " ", 1)
}

func expectXMP(x *exifwrite.XMPFields) []want {
	const src = srcExiftool + " (XMP)"
	var w []want
	s := func(key, v string) {
		if v != "" {
			w = append(w, want{key, v, 0, src})
		}
	}
	s("XMP-exif:DateTimeOriginal", exifDate(x.DateTimeOriginal))
	s("XMP-xmp:CreateDate", exifDate(x.CreateDate))
	s("XMP-xmp:ModifyDate", exifDate(x.ModifyDate))
	s("XMP-photoshop:DateCreated", exifDate(x.DateCreated))
	s("XMP-tiff:Make", x.Make)
	s("XMP-tiff:Model", x.Model)
	// XMPCoordinate rounds to 1e-7 minute: 1.7e-9 degree at most.
	if x.LatDeg != nil {
		w = append(w, want{"XMP-exif:GPSLatitude", *x.LatDeg, 2e-9, src})
	}
	if x.LonDeg != nil {
		w = append(w, want{"XMP-exif:GPSLongitude", *x.LonDeg, 2e-9, src})
	}
	if x.AltitudeM != nil {
		w = append(w, want{"XMP-exif:GPSAltitude", math.Abs(*x.AltitudeM), 5e-4, src})
		ref := 0.0
		if *x.AltitudeM < 0 {
			ref = 1
		}
		w = append(w, want{"XMP-exif:GPSAltitudeRef", ref, 0, src})
	}
	return w
}

// knownValidate lists exiftool's -validate verdict ("errors warnings
// minor") for fixtures that are not clean, with the reason.
var knownValidate = map[string]string{
	// exiftool 12.57 cannot follow iloc construction_method 1.
	"heif_idat_prefix.heic": "0 1 0",
	// ComponentsConfiguration is for compressed data (minor) and exiftool
	// wants GPSProcessingMethod in TIFF files; the writer writes neither rule.
	"tiff_exif.tif": "0 2 1",
}

// TestFixturesReadByExiftool compares, field by field, what exiftool read
// from each committed fixture with what the writer was asked to write, and
// fails on any EXIF or XMP tag exiftool found that was not asked for.
func TestFixturesReadByExiftool(t *testing.T) {
	all, err := fixtures.All()
	if err != nil {
		t.Fatal(err)
	}
	tab, table := loadExiftool(t, "exiftool_fixtures.json")
	// The HEIC that libheif's heif-enc made from jpeg_full_mm.jpg must carry
	// the same EXIF (heif-enc copies the JPEG's Exif segment).
	full := fixtures.Full()
	full.Thumbnail = fixtures.ThumbJPEG
	all = append(all, fixtures.Fixture{Name: "heifenc_from_jpeg.heic", Photo: &full, Order: binary.BigEndian})
	for _, f := range all {
		t.Run(f.Name, func(t *testing.T) {
			got, ok := table[f.Name]
			if !ok {
				t.Fatalf("no exiftool row")
			}
			wantValidate := "0 0 0"
			if v, ok := knownValidate[f.Name]; ok {
				wantValidate = v
			}
			if v := fmt.Sprint(got["ExifTool:Validate"]); v != wantValidate {
				t.Errorf("exiftool %s -validate = %q, want %q (warning: %v)", tab.ExiftoolVersion, v, wantValidate, got["ExifTool:Warning"])
			}
			var ws []want
			if f.Photo != nil && f.Name != "heif_idat_prefix.heic" {
				ws = append(ws, expectEXIF(f.Photo, f.Order)...)
			}
			if f.XMP != nil {
				ws = append(ws, expectXMP(f.XMP)...)
			}
			if strings.HasSuffix(f.Name, ".tif") { // the image itself is in IFD0
				ws = append(ws, want{"IFD0:ImageWidth", 16.0, 0, srcExiftool}, want{"IFD0:ImageHeight", 16.0, 0, srcExiftool})
			}
			expected := map[string]bool{}
			for _, w := range ws {
				expected[w.key] = true
				g, ok := got[w.key]
				if !ok {
					t.Errorf("%s: exiftool reports no value (source: %s)", w.key, w.source)
					continue
				}
				if err := sameValue(w, g); err != nil {
					t.Errorf("%s: %v (source: %s)", w.key, err, w.source)
				}
			}
			for k := range got {
				grp, _, _ := strings.Cut(k, ":")
				if (grp == "IFD0" || grp == "ExifIFD" || grp == "GPS" || grp == "IFD1" || strings.HasPrefix(grp, "XMP")) &&
					!expected[k] && k != "IFD1:ThumbnailOffset" {
					t.Errorf("exiftool found %s = %v, which the writer was not asked to write", k, got[k])
				}
			}
		})
	}
}

func sameValue(w want, got any) error {
	switch v := w.val.(type) {
	case string:
		switch g := got.(type) {
		case string:
			if g != v {
				return fmt.Errorf("got %q, want %q", g, v)
			}
		case float64: // exiftool prints numeric-looking strings as numbers
			f, err := strconv.ParseFloat(v, 64)
			if err != nil || f != g {
				return fmt.Errorf("got %v, want %q", g, v)
			}
		default:
			return fmt.Errorf("got %v (%T), want %q", got, got, v)
		}
	case float64:
		g, ok := got.(float64)
		if !ok {
			return fmt.Errorf("got %v (%T), want number %v", got, got, v)
		}
		if math.Abs(g-v) > w.tol {
			return fmt.Errorf("got %v, want %v ± %g", g, v, w.tol)
		}
	case [3]exifwrite.Rational:
		gs, ok := got.(string)
		parts := strings.Split(gs, ":")
		if !ok || len(parts) != 3 {
			return fmt.Errorf("got %v, want h:m:s", got)
		}
		for i, p := range parts {
			f, err := strconv.ParseFloat(p, 64)
			if err != nil || math.Abs(f-v[i].Float()) > w.tol {
				return fmt.Errorf("got %q, want %v:%v:%v", gs, v[0].Float(), v[1].Float(), v[2].Float())
			}
		}
	default:
		return fmt.Errorf("test bug: unhandled %T", w.val)
	}
	return nil
}

// TestFixtureFolderHasNoStrays keeps the committed folder and the fixture list in
// step: every committed file is either built by fixtures.All or made by
// libheif in gen_fixtures.sh.
func TestFixtureFolderHasNoStrays(t *testing.T) {
	all, err := fixtures.All()
	if err != nil {
		t.Fatal(err)
	}
	known := map[string]bool{"heifenc_from_jpeg.heic": true}
	for _, f := range all {
		known[f.Name] = true
	}
	ents, err := os.ReadDir(filepath.Join(testdata, "fixtures"))
	if err != nil {
		t.Fatal(err)
	}
	var stray []string
	for _, e := range ents {
		if !known[e.Name()] {
			stray = append(stray, e.Name())
		}
	}
	sort.Strings(stray)
	if len(stray) > 0 {
		t.Errorf("files in testdata/fixtures not produced by the generator: %v", stray)
	}
}

// TestReferenceTablesWellFormed guards the committed reference tables that
// the reader's tests rely on: headers name the tool and version, every
// goexif sample row names a file in the module's exif/ or exif/samples/
// folder, and every repaired row says what the repair dropped.
func TestReferenceTablesWellFormed(t *testing.T) {
	for _, tc := range []struct {
		name     string
		minFiles int
		prefix   []string
	}{
		{"exiftool_goexif_samples.json", 58, []string{"exif/"}},
		{"exiftool_libjxl_png.json", 2, []string{"jxl/", "external/"}},
		{"exiftool_fixtures.json", 12, []string{""}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			raw, err := os.ReadFile(filepath.Join(testdata, tc.name))
			if err != nil {
				t.Fatal(err)
			}
			var tab struct {
				Generator       string           `json:"generator"`
				ExiftoolVersion string           `json:"exiftool_version"`
				Note            string           `json:"note"`
				Files           []map[string]any `json:"files"`
			}
			if err := json.Unmarshal(raw, &tab); err != nil {
				t.Fatal(err)
			}
			if !strings.HasPrefix(tab.Generator, "exifread/testdata/gen_") || tab.ExiftoolVersion == "" || tab.Note == "" {
				t.Errorf("header incomplete: generator %q, version %q", tab.Generator, tab.ExiftoolVersion)
			}
			if len(tab.Files) < tc.minFiles {
				t.Errorf("%d files, want at least %d", len(tab.Files), tc.minFiles)
			}
			for _, f := range tab.Files {
				name, _ := f["file"].(string)
				ok := false
				for _, p := range tc.prefix {
					ok = ok || strings.HasPrefix(name, p)
				}
				if !ok || strings.Contains(name, "..") || strings.HasPrefix(name, "/") {
					t.Errorf("row %q: not a path relative to the source folder", name)
				}
				if f["repaired_copy"] == true {
					if s, _ := f["repair"].(string); !strings.Contains(s, "EOI") {
						t.Errorf("row %q: repaired without saying how", name)
					}
				}
				if _, ok := f["exiftool"].(map[string]any); !ok {
					t.Errorf("row %q: no exiftool values", name)
				}
			}
		})
	}
}
