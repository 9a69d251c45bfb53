package main

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// makeEvidence writes a small evidence folder: photos made with our EXIF
// writer, one non-photo file and a nested folder.
func makeEvidence(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "evidence")
	if err := os.MkdirAll(filepath.Join(dir, "sub"), 0o755); err != nil {
		t.Fatal(err)
	}
	lat, lon := 46.2, 6.15
	photos := map[string]exifwrite.Photo{
		"IMG_0001.jpg": {Make: "Acme", Model: "One", DateTimeOriginal: "2026:06:20 15:10:00", OffsetTimeOriginal: "+02:00",
			GPS: &exifwrite.GPS{LatDeg: lat, LonDeg: lon, DateStamp: "2026:06:20", TimeStamp: [3]exifwrite.Rational{{Num: 13, Den: 1}, {Num: 10, Den: 1}, {Num: 0, Den: 1}}}},
		"sub/IMG_0002.jpg": {Make: "Acme", Model: "One", DateTimeOriginal: "2026:06:20 15:40:00"},
	}
	for name, ph := range photos {
		writeJPEG(t, filepath.Join(dir, name), ph)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.txt"), []byte("=HYPERLINK(\"x\")\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	return dir
}

// TestAuditLeavesEvidenceUntouched hashes the whole input tree (contents,
// modes and modification times) before and after an audit.
func TestAuditLeavesEvidenceUntouched(t *testing.T) {
	dir := makeEvidence(t)
	before := treeState(t, dir)
	out := filepath.Join(t.TempDir(), "report")
	if code, _, stderr := captureRun("audit", dir, "--out", out, "--quiet"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	checkTreeUnchanged(t, before, treeState(t, dir))
	// The report folder holds the four reports and the thumbnails, and
	// nothing else: no spool or temporary file is left behind.
	des, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, de := range des {
		got = append(got, de.Name())
	}
	want := []string{"report.csv", "report.geojson", "report.html", "report.json", "thumbnails"}
	if strings.Join(got, " ") != strings.Join(want, " ") {
		t.Errorf("report folder holds %q, want %q", got, want)
	}
}

// TestAuditRerunIdentical: the same inputs and command line give
// byte-identical JSON, CSV and GeoJSON when SOURCE_DATE_EPOCH pins the clock.
func TestAuditRerunIdentical(t *testing.T) {
	dir := makeEvidence(t)
	base := t.TempDir()
	out := filepath.Join(base, "report")
	envs := map[string]string{"SOURCE_DATE_EPOCH": "1767225600"}
	var first map[string][]byte
	for i := 0; i < 2; i++ {
		if code, _, stderr := captureRunEnv(envs, "audit", dir, "--out", out, "--quiet", "-j", []string{"1", "2"}[i]); code != 0 {
			t.Fatalf("run %d: exit %d: %s", i, code, stderr)
		}
		got := map[string][]byte{}
		for _, f := range []string{"report.json", "report.csv", "report.geojson"} {
			b, err := os.ReadFile(filepath.Join(out, f))
			if err != nil {
				t.Fatal(err)
			}
			got[f] = b
		}
		if err := os.RemoveAll(out); err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = got
			continue
		}
		for f, b := range got {
			if f == "report.json" {
				// The command lines differ in -j; compare the rest.
				b, first[f] = dropCommandLine(t, b), dropCommandLine(t, first[f])
			}
			if !bytes.Equal(b, first[f]) {
				t.Errorf("%s differs between runs", f)
			}
		}
	}
}

func dropCommandLine(t *testing.T, b []byte) []byte {
	t.Helper()
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	delete(m["run"].(map[string]any), "command_line")
	out, _ := json.Marshal(m)
	return out
}

func TestAuditRefusesOutputInsideEvidence(t *testing.T) {
	dir := makeEvidence(t)
	before := treeState(t, dir)
	code, _, stderr := captureRun("audit", dir, "--out", filepath.Join(dir, "sub", "report"), "--quiet")
	if code != exitUsage || !strings.Contains(stderr, "inside input") {
		t.Fatalf("exit %d, stderr %q; want exit 2 naming the input", code, stderr)
	}
	checkTreeUnchanged(t, before, treeState(t, dir))
}

func TestAuditUsage(t *testing.T) {
	cases := []struct {
		name string
		args []string
		want int
	}{
		{"no input", []string{"audit"}, exitUsage},
		{"bad format", []string{"audit", ".", "--formats", "pdf"}, exitUsage},
		{"bad workers", []string{"audit", ".", "-j", "0"}, exitUsage},
		{"missing input", []string{"audit", "/nonexistent/evidence", "--out", "/tmp/gnomon-never", "--quiet"}, exitFailure},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			code, _, stderr := captureRun(c.args...)
			if code != c.want {
				t.Fatalf("exit %d, want %d; stderr %q", code, c.want, stderr)
			}
			if lines := strings.SplitN(stderr, "\n", 2); lines[0] == "" {
				t.Error("no one-line reason on stderr")
			}
		})
	}
}

// TestAuditAccountsForEveryFile: each item in the folder has a report row,
// and the counts add up.
func TestAuditAccountsForEveryFile(t *testing.T) {
	dir := makeEvidence(t)
	out := filepath.Join(t.TempDir(), "report")
	if code, _, stderr := captureRun("audit", dir, "--out", out, "--quiet", "--formats", "json"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Run struct {
			Counts struct {
				Files     int            `json:"files"`
				ByVerdict map[string]int `json:"by_verdict"`
			} `json:"counts"`
		} `json:"run"`
		Photos []struct {
			Path, Verdict, SHA256 string
		} `json:"photos"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	paths := map[string]string{}
	for _, p := range doc.Photos {
		paths[p.Path] = p.Verdict
		if len(p.SHA256) != 64 {
			t.Errorf("%s: sha256 %q", p.Path, p.SHA256)
		}
	}
	for _, want := range []string{"IMG_0001.jpg", "sub/IMG_0002.jpg", "notes.txt"} {
		if _, ok := paths[want]; !ok {
			t.Errorf("no row for %s (rows: %v)", want, paths)
		}
	}
	if paths["notes.txt"] != "unreadable" {
		t.Errorf("notes.txt verdict %q, want unreadable", paths["notes.txt"])
	}
	sum := 0
	for _, n := range doc.Run.Counts.ByVerdict {
		sum += n
	}
	if sum != doc.Run.Counts.Files || doc.Run.Counts.Files != len(doc.Photos) {
		t.Errorf("counts do not add up: %d by verdict, %d files, %d rows", sum, doc.Run.Counts.Files, len(doc.Photos))
	}
}
