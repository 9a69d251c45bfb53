package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const metaFixtureDir = "../../exifread/testdata/fixtures"

func TestMetaJSON(t *testing.T) {
	code, out, errOut := captureRun("meta", "--json", filepath.Join(metaFixtureDir, "jpeg_full_mm.jpg"), filepath.Join(metaFixtureDir, "heif_mdat.heic"), "does-not-exist.jpg")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var recs []map[string]any
	if err := json.Unmarshal([]byte(out), &recs); err != nil {
		t.Fatalf("not a JSON array: %v\n%s", err, out)
	}
	if len(recs) != 3 {
		t.Fatalf("%d records, want 3", len(recs))
	}
	for _, r := range recs {
		for _, k := range []string{"path", "sha256", "container", "error", "date_time_original", "gps", "make"} {
			if _, ok := r[k]; !ok {
				t.Errorf("record %v lacks %q", r["path"], k)
			}
		}
	}
	// Values written by exifwrite into the fixtures (exifwrite/fixtures.Full).
	for _, tc := range []struct {
		i         int
		container string
		make      string
		errNull   bool
	}{
		{0, "jpeg", "Gnomon Test Optics", true},
		{1, "heif", "Gnomon Test Optics", true},
		{2, "unknown", "", false},
	} {
		r := recs[tc.i]
		if r["container"] != tc.container || r["make"] != tc.make || (r["error"] == nil) != tc.errNull {
			t.Errorf("record %d: container %v make %v error %v", tc.i, r["container"], r["make"], r["error"])
		}
	}
	dto := recs[0]["date_time_original"].(map[string]any)
	if dto["raw"] != "2024:06:21 14:03:27" || dto["offset_sec"] != float64(7200) || dto["source"] != "exif" {
		t.Errorf("date_time_original = %v (written: 2024:06:21 14:03:27 +02:00)", dto)
	}
	if len(recs[0]["sha256"].(string)) != 64 {
		t.Errorf("sha256 %v", recs[0]["sha256"])
	}
}

func TestMetaText(t *testing.T) {
	code, out, _ := captureRun("meta", filepath.Join(metaFixtureDir, "jpeg_le_xmp.jpg"))
	if code != exitOK {
		t.Fatalf("exit %d", code)
	}
	// Values written by exifwrite (exifwrite/fixtures: jpeg_le_xmp.jpg).
	for _, want := range []string{"== ", "container              jpeg", "2023-12-31 20:59:59 -03:00", "-33.8688000, -70.6693000 [exif]", "° M (raw 90/1)"} {
		if !strings.Contains(out, want) {
			t.Errorf("output lacks %q:\n%s", want, out)
		}
	}
}

func TestMetaExitCodes(t *testing.T) {
	for _, tc := range []struct {
		name string
		args []string
		code int
	}{
		{"no args", []string{"meta"}, exitUsage},
		{"bad flag", []string{"meta", "--nope", "x"}, exitUsage},
		{"help", []string{"meta", "-h"}, exitOK},
		{"nothing opens", []string{"meta", "missing-1.jpg", "missing-2.jpg"}, exitFailure},
		{"a damaged file still opens", []string{"meta", "meta.go"}, exitOK},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if code, _, _ := captureRun(tc.args...); code != tc.code {
				t.Errorf("exit %d, want %d", code, tc.code)
			}
		})
	}
}

// TestMetaWalk: folders are walked recursively, symlinks are not followed,
// sidecars are not listed as photos.
func TestMetaWalk(t *testing.T) {
	dir := t.TempDir()
	outside := t.TempDir()
	data, err := os.ReadFile(filepath.Join(metaFixtureDir, "png_exif.png"))
	if err != nil {
		t.Fatal(err)
	}
	must := func(err error) {
		if err != nil {
			t.Fatal(err)
		}
	}
	must(os.MkdirAll(filepath.Join(dir, "a", "b"), 0o755))
	must(os.WriteFile(filepath.Join(dir, "a", "b", "deep.png"), data, 0o644))
	must(os.WriteFile(filepath.Join(dir, "top.png"), data, 0o644))
	must(os.WriteFile(filepath.Join(dir, "top.xmp"), []byte("<x/>"), 0o644))
	must(os.WriteFile(filepath.Join(outside, "secret.png"), data, 0o644))
	must(os.Symlink(filepath.Join(outside, "secret.png"), filepath.Join(dir, "link.png")))
	must(os.Symlink(outside, filepath.Join(dir, "linkdir")))
	code, out, errOut := captureRun("meta", "--json", "--no-hash", dir)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var recs []struct {
		Path string `json:"path"`
	}
	if err := json.Unmarshal([]byte(out), &recs); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, r := range recs {
		rel, _ := filepath.Rel(dir, r.Path)
		got = append(got, rel)
	}
	want := []string{filepath.Join("a", "b", "deep.png"), "top.png"}
	if strings.Join(got, ",") != strings.Join(want, ",") {
		t.Errorf("walked %v, want %v", got, want)
	}
	// A symlink given as an argument is the user's explicit choice: walked.
	must(os.Symlink(dir, filepath.Join(outside, "tree")))
	code, out, _ = captureRun("meta", "--json", "--no-hash", filepath.Join(outside, "tree"))
	if err := json.Unmarshal([]byte(out), &recs); err != nil || code != exitOK || len(recs) != 2 {
		t.Errorf("explicit symlinked folder: exit %d, %d records", code, len(recs))
	}
}
