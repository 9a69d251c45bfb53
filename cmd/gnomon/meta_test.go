package main

import (
	"encoding/base64"
	"encoding/binary"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
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
	// A missing input is one line on stderr naming it, not a record.
	if len(recs) != 2 {
		t.Fatalf("%d records, want 2", len(recs))
	}
	if errOut != "gnomon meta: input \"does-not-exist.jpg\": no such file or directory\n" {
		t.Errorf("stderr %q: want one line naming the missing input", errOut)
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
	for _, want := range []string{"== ", "container              jpeg", "2023-12-31 20:59:59 -03:00", "-33.8688000, -70.6693000 [exif]", "° M (raw 90/1)",
		"exposure time          1/500 s", // ExposureTime 1/500 as written; shown as photographers write it (common practice)
	} {
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
		{"a folder inside another", []string{"meta", ".", "../.."}, exitUsage},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if code, _, _ := captureRun(tc.args...); code != tc.code {
				t.Errorf("exit %d, want %d", code, tc.code)
			}
		})
	}
	// Nothing read: one line naming the path, nothing on stdout, exit 1.
	code, out, errOut := captureRun("meta", "/nonexistent/x.jpg")
	if code != exitFailure || out != "" || errOut != "gnomon meta: input \"/nonexistent/x.jpg\": no such file or directory\n" {
		t.Errorf("missing file: exit %d, stdout %q, stderr %q", code, out, errOut)
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

// TestMetaJSONKeepsBytes: meta --json writes through the audit's JSON
// writer, so a camera make in Latin-1 (not UTF-8) and a file name with such
// a byte keep their exact bytes in a "_raw_b64" sibling instead of being
// silently replaced by U+FFFD (issue 10, defect 7).
func TestMetaJSONKeepsBytes(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "caf\xe9.jpg")
	payload, err := exifwrite.Photo{Make: "Caf\xe9 Optik", DateTimeOriginal: "2026:06:20 15:10:00"}.Payload(binary.BigEndian).Bytes()
	if err != nil {
		t.Fatal(err)
	}
	b, err := exifwrite.JPEG(payload, fixtures.BaseJPEG, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(name, b, 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errOut := captureRun("meta", "--json", "--no-hash", name)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, errOut)
	}
	var recs []map[string]any
	if err := json.Unmarshal([]byte(out), &recs); err != nil || len(recs) != 1 {
		t.Fatalf("not a JSON array of one record (%v):\n%s", err, out)
	}
	for _, tc := range []struct{ member, want, source string }{
		// "Caf\xe9 Optik" in base64: coreutils `printf 'Caf\351 Optik' | base64`.
		{"make_raw_b64", "Q2Fm6SBPcHRpaw==", "coreutils base64"},
		{"make", "Caf\ufffd Optik", "encoding/json's replacement of an invalid byte (U+FFFD)"},
		{"path_raw_b64", base64.StdEncoding.EncodeToString([]byte(name)), "RFC 4648 §4 (encoding/base64)"},
	} {
		if got := recs[0][tc.member]; got != tc.want {
			t.Errorf("%s = %v, want %q (%s)", tc.member, got, tc.want, tc.source)
		}
	}
	if w := recs[0]["warnings"]; w == nil {
		t.Errorf("warnings = null, want [] (absent lists are written as [], as in report.json)")
	}
}
