package exifread

import (
	"os"
	"path/filepath"
	"testing"
)

// TestCaptureTime: the capture time is DateTimeOriginal when usable, then
// DateTimeDigitized, then DateTime. EXIF 2.32 (CIPA DC-008-2019), the tag
// descriptions (from memory): DateTimeOriginal is when the image was
// generated, DateTimeDigitized when it was stored digitally, DateTime when
// the file was last changed.
func TestCaptureTime(t *testing.T) {
	ok := func(raw string) *WallTime { return &WallTime{Raw: raw, Valid: true} }
	bad := &WallTime{Raw: "0000:00:00 00:00:00", Invalid: "zero date"}
	cases := []struct {
		source  string
		rec     Record
		wantTag string
		wantErr string
	}{
		{"EXIF 2.32: original first", Record{DateTimeOriginal: ok("a"), DateTimeDigitized: ok("b"), DateTime: ok("c")}, "DateTimeOriginal", ""},
		{"EXIF 2.32: digitized when no original", Record{DateTimeDigitized: ok("b"), DateTime: ok("c")}, "DateTimeDigitized", ""},
		{"an unusable original is passed over", Record{DateTimeOriginal: bad, DateTime: ok("c")}, "DateTime", ""},
		{"none usable: the first reason", Record{DateTimeOriginal: bad}, "", `DateTimeOriginal "0000:00:00 00:00:00" is not usable: zero date`},
		{"none at all", Record{}, "", "no capture time tag"},
	}
	for _, c := range cases {
		w, tag, err := c.rec.CaptureTime()
		if tag != c.wantTag || (err == nil) != (c.wantErr == "") || (err != nil && err.Error() != c.wantErr) || (w == nil) != (c.wantTag == "") {
			t.Errorf("%s: got %v %q %v, want %q %q", c.source, w, tag, err, c.wantTag, c.wantErr)
		}
	}
}

// TestCheckSidecar: a sidecar is usable when it holds an XMP property.
func TestCheckSidecar(t *testing.T) {
	dir := t.TempDir()
	write := func(name, s string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	cases := []struct {
		source string
		path   string
		ok     bool
	}{
		{"fixture written by gen_fixtures.sh", filepath.Join("testdata", "fixtures", "sidecar_noexif.xmp"), true},
		{"empty file", write("empty.xmp", ""), false},
		{"namespace declarations only", write("ns.xmp", `<x:xmpmeta xmlns:x="adobe:ns:meta/"/>`), false},
		{"not XML", write("bin.xmp", "\x00\x01<<<"), false},
	}
	for _, c := range cases {
		if err := CheckSidecar(c.path, Options{}); (err == nil) != c.ok {
			t.Errorf("%s: %v, want usable %v", c.source, err, c.ok)
		}
	}
}
