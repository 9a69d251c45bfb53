package main

import (
	"encoding/binary"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

// writePhoto writes a JPEG by Acme One with a capture time and, when lat/lon
// are not both zero, a GPS position.
func writePhoto(t *testing.T, p string, wall string, lat, lon float64) {
	t.Helper()
	ph := exifwrite.Photo{Make: "Acme", Model: "One", DateTimeOriginal: wall, OffsetTimeOriginal: "+02:00"}
	if lat != 0 || lon != 0 {
		ph.GPS = &exifwrite.GPS{LatDeg: lat, LonDeg: lon}
	}
	writeJPEG(t, p, ph)
}

// writeJPEG writes a small JPEG carrying ph's EXIF at p, creating its
// folders.
func writeJPEG(t *testing.T, p string, ph exifwrite.Photo) {
	t.Helper()
	payload, err := ph.Payload(binary.BigEndian).Bytes()
	if err != nil {
		t.Fatal(err)
	}
	b, err := exifwrite.JPEG(payload, fixtures.BaseJPEG, nil)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

// auditDoc is the part of report.json these tests read.
type auditDoc struct {
	Run struct {
		SheetErrors []string `json:"sheet_errors"`
		Notes       []string `json:"notes"`
	} `json:"run"`
	Photos []struct {
		Path     string            `json:"path"`
		Root     string            `json:"root"`
		ID       string            `json:"id"`
		Verdict  string            `json:"verdict"`
		Measured []json.RawMessage `json:"measured"`
	} `json:"photos"`
}

func readAuditJSON(t *testing.T, out string) auditDoc {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var d auditDoc
	if err := json.Unmarshal(b, &d); err != nil {
		t.Fatal(err)
	}
	return d
}

func writeFile(t *testing.T, p, s string) string {
	t.Helper()
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

// TestAuditTwoCardsSameName: two inputs both holding DCIM/IMG_0001.JPG
// hold two photos. A row naming one of them by the template's name reaches
// that one only; a row naming the shared relative path is an error that
// names both candidates and reaches neither (before, it reached both, and
// card2's photo was judged against card1's measurements).
func TestAuditTwoCardsSameName(t *testing.T) {
	base := t.TempDir()
	card1, card2 := filepath.Join(base, "card1"), filepath.Join(base, "card2")
	writePhoto(t, filepath.Join(card1, "DCIM", "IMG_0001.JPG"), "2026:06:20 15:10:00", 46.2, 6.15)
	writePhoto(t, filepath.Join(card2, "DCIM", "IMG_0001.JPG"), "2026:06:20 15:10:00", 62.0, 25.7)
	writePhoto(t, filepath.Join(card2, "DCIM", "IMG_0002.JPG"), "2026:06:20 15:20:00", 62.0, 25.7)

	// The template names every photo so that no two collide.
	code, tmpl, stderr := captureRun("sheet", card1, card2)
	if code != 0 {
		t.Fatalf("sheet: exit %d: %s", code, stderr)
	}
	for _, want := range []string{"\r\ncard1/DCIM/IMG_0001.JPG,", "\r\ncard2/DCIM/IMG_0001.JPG,", "\r\ncard2/DCIM/IMG_0002.JPG,"} {
		if !strings.Contains(tmpl, want) {
			t.Errorf("template lacks a row starting %q:\n%s", want, tmpl)
		}
	}

	sheetPath := writeFile(t, filepath.Join(base, "m.csv"), "photo,sun_azimuth,sun_altitude\n"+
		"card1/DCIM/IMG_0001.JPG,200,60\n"+ // line 2: card1's photo only
		"DCIM/IMG_0001.JPG,210,55\n"+ // line 3: either card's: refused
		"IMG_0002.JPG,220,50\n") // line 4: one photo of that name
	out := filepath.Join(base, "report")
	if code, _, stderr := captureRun("audit", card1, card2, "--shadows", sheetPath, "--out", out, "--quiet", "--formats", "json"); code != 0 {
		t.Fatalf("audit: exit %d: %s", code, stderr)
	}
	d := readAuditJSON(t, out)
	measured := map[string]int{}
	for _, p := range d.Photos {
		measured[p.ID] = len(p.Measured)
	}
	want := map[string]int{"card1/DCIM/IMG_0001.JPG": 1, "card2/DCIM/IMG_0001.JPG": 0, "card2/DCIM/IMG_0002.JPG": 1}
	for id, n := range want {
		if measured[id] != n {
			t.Errorf("%s: %d measurements, want %d (all: %v)", id, measured[id], n, measured)
		}
	}
	errs := strings.Join(d.Run.SheetErrors, "\n")
	if !strings.Contains(errs, `m.csv:3:1 (photo): names several photos`) ||
		!strings.Contains(errs, "card1/DCIM/IMG_0001.JPG, card2/DCIM/IMG_0001.JPG") {
		t.Errorf("sheet errors do not name line 3 and both candidates: %q", d.Run.SheetErrors)
	}
}

// TestAuditInputsOnce: the same folder given three ways is read once, and
// an input inside another is refused as bad usage.
func TestAuditInputsOnce(t *testing.T) {
	base := t.TempDir()
	t.Chdir(base)
	for i, name := range []string{"a.jpg", "b.jpg", "sub/c.jpg", "sub/d.jpg"} {
		writePhoto(t, filepath.Join(base, "ph", name), "2026:06:20 15:1"+string(rune('0'+i))+":00", 46.2, 6.15)
	}
	out := filepath.Join(base, "report")
	if code, _, stderr := captureRun("audit", "ph", "ph/", "./ph", "--out", out, "--quiet", "--formats", "json"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	d := readAuditJSON(t, out)
	if n := len(d.Photos); n != 4 {
		t.Errorf("%d rows for 4 files", n)
	}
	wantNotes := []string{`The input "ph/" is the same as "ph" and was read once.`, `The input "./ph" is the same as "ph" and was read once.`}
	if strings.Join(d.Run.Notes, "\n") != strings.Join(wantNotes, "\n") {
		t.Errorf("notes %q, want %q", d.Run.Notes, wantNotes)
	}

	for _, args := range [][]string{{"ph", "ph/sub"}, {"ph/sub/c.jpg", "ph"}} {
		code, _, stderr := captureRun(append([]string{"audit", "--out", filepath.Join(base, "r2"), "--quiet"}, args...)...)
		first, _, _ := strings.Cut(stderr, "\n")
		if code != exitUsage || !strings.Contains(first, "lies inside another input") {
			t.Errorf("audit %v: exit %d, first line %q; want exit 2 and the reason", args, code, first)
		}
		if _, err := os.Stat(filepath.Join(base, "r2")); err == nil {
			t.Errorf("audit %v: a report folder was created", args)
		}
	}
}

// TestAuditSheetGate: a sheet that cannot be used ends the run (exit 1, a
// one-line reason, no report), and --strict ends it at any sheet problem.
func TestAuditSheetGate(t *testing.T) {
	base := t.TempDir()
	ev := filepath.Join(base, "ev")
	writePhoto(t, filepath.Join(ev, "IMG_1.jpg"), "2026:06:20 15:10:00", 46.2, 6.15)
	writePhoto(t, filepath.Join(ev, "IMG_2.jpg"), "2026:06:20 15:20:00", 46.2, 6.15)
	good := "photo,sun_azimuth,sun_altitude\nIMG_1.jpg,200,60\n"
	cases := []struct {
		name   string
		sheet  string // contents; "" means the photo itself
		strict bool
		code   int
		reason string
	}{
		{"a photo given as the sheet", "", false, exitFailure, "not a text file"},
		{"no photo column", "object,sun_azimuth\nlamp,100\n", false, exitFailure, `no "photo" column`},
		{"only unfilled rows", "photo,note\nIMG_1.jpg,hello\n", false, exitFailure, "no row gives a measurement"},
		{"every row names no photo", "photo,sun_azimuth\nIMG_9.jpg,100\n", false, exitFailure, "none of its 1 rows can be applied"},
		{"a bad cell, not strict: reported, run goes on", good + "IMG_2.jpg,abc,10\n", false, exitOK, ""},
		{"a bad cell, strict", good + "IMG_2.jpg,abc,10\n", true, exitFailure, "a strict run stops at any"},
		// The run completes; --strict may still fail it for a verdict.
		{"a good sheet, strict", good, true, -1, ""},
	}
	for i, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sheetPath := filepath.Join(ev, "IMG_1.jpg")
			if c.sheet != "" {
				sheetPath = writeFile(t, filepath.Join(base, "s"+string(rune('a'+i))+".csv"), c.sheet)
			}
			out := filepath.Join(base, "out"+string(rune('a'+i)))
			args := []string{"audit", ev, "--shadows", sheetPath, "--out", out, "--quiet", "--formats", "json"}
			if c.strict {
				args = append(args, "--strict")
			}
			code, _, stderr := captureRun(args...)
			if c.code == -1 {
				if _, err := os.Stat(filepath.Join(out, "report.json")); err != nil || strings.Contains(stderr, "sheet") {
					t.Errorf("exit %d, stderr %q, report %v: want a completed run", code, stderr, err)
				}
				return
			}
			if code != c.code {
				t.Fatalf("exit %d, want %d; stderr %q", code, c.code, stderr)
			}
			if c.code == exitOK {
				return
			}
			if strings.Count(stderr, "\n") != 1 || !strings.Contains(stderr, c.reason) {
				t.Errorf("stderr %q: want one line holding %q", stderr, c.reason)
			}
			if _, err := os.Stat(out); err == nil {
				t.Errorf("the failed run left its report folder")
			}
		})
	}
}

// TestAuditSidecarStrict: a valid .xmp sidecar has its own verdict, not
// "unreadable", so --strict passes on a folder that holds one (it failed
// before, the sidecar counting as a file that could not be read).
func TestAuditSidecarStrict(t *testing.T) {
	base := t.TempDir()
	ev := filepath.Join(base, "ev")
	writePhoto(t, filepath.Join(ev, "IMG_1.jpg"), "2026:06:20 15:10:00", 0, 0) // no witness: unverified
	// An XMP packet as Adobe's XMP Specification Part 1 (2012) writes one.
	writeFile(t, filepath.Join(ev, "IMG_1.xmp"), `<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">`+
		`<rdf:Description xmlns:exif="http://ns.adobe.com/exif/1.0/" exif:DateTimeOriginal="2026-06-20T15:10:00+02:00"/></rdf:RDF></x:xmpmeta>`)
	out := filepath.Join(base, "report")
	code, _, stderr := captureRun("audit", ev, "--out", out, "--quiet", "--formats", "json", "--strict")
	if code != exitOK {
		t.Fatalf("--strict: exit %d: %s", code, stderr)
	}
	got := map[string]string{}
	for _, p := range readAuditJSON(t, out).Photos {
		got[p.Path] = p.Verdict
	}
	if got["IMG_1.xmp"] != "sidecar" || got["IMG_1.jpg"] != "unverified" {
		t.Errorf("verdicts %v: want the sidecar as sidecar, the photo unverified", got)
	}
}
