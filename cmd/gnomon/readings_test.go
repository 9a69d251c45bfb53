package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// TestAuditRepeatedHour audits three New York photos stamped 2025-11-02
// 01:30:00 without an offset tag, an hour New York lived twice (15 U.S.C.
// §260a; tz database America/New_York: back from 02:00 EDT to 01:00 EST at
// 06:00 UTC). The GPS clock of the first says 06:30:05 UTC (the standard-time
// reading, 01:30 EST, is right), of the second 05:30:04 UTC (the daylight
// reading, 01:30 EDT); the third has no witness. A few seconds of GPS fix
// lag is common practice. Before, all were judged on the first reading: the
// first was called dst_slip. Every report carries both readings and the
// zone's note.
func TestAuditRepeatedHour(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "evidence")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	const lat, lon = 40.7128, -74.006
	gps := func(h, m, s uint32) *exifwrite.GPS {
		return &exifwrite.GPS{LatDeg: lat, LonDeg: lon, DateStamp: "2025:11:02",
			TimeStamp: [3]exifwrite.Rational{{Num: h, Den: 1}, {Num: m, Den: 1}, {Num: s, Den: 1}}}
	}
	photos := map[string]exifwrite.Photo{
		"est.jpg":  {Make: "Acme", Model: "A", DateTimeOriginal: "2025:11:02 01:30:00", GPS: gps(6, 30, 5)},
		"edt.jpg":  {Make: "Acme", Model: "B", DateTimeOriginal: "2025:11:02 01:30:00", GPS: gps(5, 30, 4)},
		"none.jpg": {Make: "Acme", Model: "C", DateTimeOriginal: "2025:11:02 01:30:00", GPS: &exifwrite.GPS{LatDeg: lat, LonDeg: lon}},
	}
	for name, ph := range photos {
		writeJPEG(t, filepath.Join(dir, name), ph)
	}
	out := filepath.Join(t.TempDir(), "report")
	if code, _, stderr := captureRun("audit", dir, "--out", out, "--quiet", "--formats", "json,csv,html", "--thumbnails=false"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Photos []struct {
			Path, Verdict string
			ClaimedUTC    string   `json:"claimed_utc"`
			ClaimNotes    []string `json:"claim_notes"`
			Readings      []struct {
				UTC, Verdict    string
				UTCOffset       string `json:"utc_offset"`
				Abbreviation    string
				Used            bool
				WallTimeExisted bool `json:"wall_time_existed"`
			}
		}
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	want := map[string]struct {
		verdict, claimed string
		used             int
	}{
		"est.jpg":  {"consistent", "2025-11-02T06:30:00Z", 1},
		"edt.jpg":  {"consistent", "2025-11-02T05:30:00Z", 0},
		"none.jpg": {"ambiguous", "", -1},
	}
	for _, p := range doc.Photos {
		w := want[p.Path]
		if p.Verdict != w.verdict || p.ClaimedUTC != w.claimed {
			t.Errorf("%s: verdict %s claimed %q, want %s %q", p.Path, p.Verdict, p.ClaimedUTC, w.verdict, w.claimed)
		}
		if len(p.Readings) != 2 || p.Readings[0].UTC != "2025-11-02T05:30:00Z" || p.Readings[0].UTCOffset != "-04:00" || p.Readings[0].Abbreviation != "EDT" ||
			p.Readings[1].UTC != "2025-11-02T06:30:00Z" || p.Readings[1].UTCOffset != "-05:00" || p.Readings[1].Abbreviation != "EST" {
			t.Errorf("%s: readings %+v, want 05:30 EDT and 06:30 EST", p.Path, p.Readings)
			continue
		}
		for i, r := range p.Readings {
			if r.Used != (i == w.used) || !r.WallTimeExisted || r.Verdict == "" {
				t.Errorf("%s: reading %d %+v (used should be %v)", p.Path, i, r, i == w.used)
			}
		}
		if len(p.ClaimNotes) == 0 || !strings.Contains(p.ClaimNotes[0], "came twice") {
			t.Errorf("%s: claim notes %q", p.Path, p.ClaimNotes)
		}
	}
	if len(doc.Photos) != 3 {
		t.Fatalf("%d photos", len(doc.Photos))
	}

	f, err := os.Open(filepath.Join(out, "report.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	for _, r := range recs[1:] {
		cell := r[col["readings"]]
		if !strings.Contains(cell, "2025-11-02T05:30:00Z (UTC-04:00 EDT)") || !strings.Contains(cell, "2025-11-02T06:30:00Z (UTC-05:00 EST)") ||
			strings.Contains(cell, "(used)") == (r[col["path"]] == "none.jpg") || !strings.Contains(r[col["claim_notes"]], "came twice") {
			t.Errorf("%s: CSV readings %q, notes %q", r[col["path"]], cell, r[col["claim_notes"]])
		}
	}

	h, err := os.ReadFile(filepath.Join(out, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{"Two readings", "Reading used", "came twice", "2025-11-02T06:30:00Z"} {
		if !strings.Contains(string(h), s) {
			t.Errorf("report.html lacks %q", s)
		}
	}
}

// TestAuditRepeatedHourByCamera: a camera whose clock stayed on daylight
// time (UTC−4) after New York fell back on 2025-11-02 (15 U.S.C. §260a):
// four photos on 1 November with GPS clocks that agree with EDT, then one at
// 01:30 on 2 November with no witness of its own. By its camera's clock that
// photo was taken near 05:30 UTC, which fits only the EDT reading; it keeps
// the verdict ambiguous (no witness of its own, like an unverified photo)
// and says so, with the camera's window.
func TestAuditRepeatedHourByCamera(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "evidence")
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	const lat, lon = 40.7128, -74.006
	photos := map[string]exifwrite.Photo{}
	for i, h := range []uint32{10, 12, 14, 16} { // EDT hours on 1 November; UTC = EDT + 4 h
		photos[fmt.Sprintf("IMG_%04d.jpg", i+1)] = exifwrite.Photo{Make: "Acme", Model: "D",
			DateTimeOriginal: fmt.Sprintf("2025:11:01 %02d:00:00", h),
			GPS: &exifwrite.GPS{LatDeg: lat, LonDeg: lon, DateStamp: "2025:11:01",
				TimeStamp: [3]exifwrite.Rational{{Num: h + 4, Den: 1}, {Num: 0, Den: 1}, {Num: 3, Den: 1}}}}
	}
	photos["IMG_0005.jpg"] = exifwrite.Photo{Make: "Acme", Model: "D", DateTimeOriginal: "2025:11:02 01:30:00",
		GPS: &exifwrite.GPS{LatDeg: lat, LonDeg: lon}}
	for name, ph := range photos {
		writeJPEG(t, filepath.Join(dir, name), ph)
	}
	out := filepath.Join(t.TempDir(), "report")
	if code, _, stderr := captureRun("audit", dir, "--out", out, "--quiet", "--formats", "json"); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Photos []struct {
			Path, Verdict, Explanation string
			Earliest                   string `json:"corrected_utc_earliest"`
			Latest                     string `json:"corrected_utc_latest"`
		}
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	for _, p := range doc.Photos {
		if p.Path != "IMG_0005.jpg" {
			if p.Verdict != "consistent" {
				t.Errorf("%s: %s (%s), want consistent", p.Path, p.Verdict, p.Explanation)
			}
			continue
		}
		if p.Verdict != "ambiguous" || !strings.Contains(p.Explanation, "fits only the reading UTC−04:00 (EDT), 2025-11-02 05:30:00 UTC") {
			t.Errorf("%s: %s: %s", p.Path, p.Verdict, p.Explanation)
		}
		e, _ := time.Parse(time.RFC3339, p.Earliest)
		l, _ := time.Parse(time.RFC3339, p.Latest)
		edt := time.Date(2025, 11, 2, 5, 30, 0, 0, time.UTC)
		if e.After(edt) || l.Before(edt) || !l.Before(edt.Add(time.Hour)) {
			t.Errorf("%s: camera window %s to %s, want one holding 05:30 UTC and not 06:30 UTC", p.Path, p.Earliest, p.Latest)
		}
	}
}
