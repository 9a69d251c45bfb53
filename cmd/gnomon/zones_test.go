package main

import (
	"encoding/binary"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestSunWallTimeInFoldOrGap: a wall time read in --zone that the zone
// repeated or skipped is never shifted silently: the answer says which
// reading was used and gives the other. Facts: 15 U.S.C. §260a (US daylight
// time from 2:00 local on the second Sunday of March to 2:00 local on the
// first Sunday of November), EST = UTC−5, EDT = UTC−4; so in New York
// 2025-11-02 01:30 came at 05:30 and 06:30 UTC, and 2025-03-09 02:30 never
// came (02:30 EDT would be 06:30 UTC, 02:30 EST 07:30 UTC).
func TestSunWallTimeInFoldOrGap(t *testing.T) {
	tests := []struct {
		time, used, other string
		note              []string
	}{
		{"2025-11-02T01:30:00", "2025-11-02T05:30:00Z", "2025-11-02T06:30:00Z", []string{"came twice", "the other reading"}},
		{"2025-03-09T02:30:00", "2025-03-09T06:30:00Z", "2025-03-09T07:30:00Z", []string{"never came", "the other reading"}},
		{"2025-06-01T12:00:00", "2025-06-01T16:00:00Z", "", nil},
	}
	for _, tc := range tests {
		args := []string{"sun", "--time", tc.time, "--zone", "America/New_York", "--lat", "40.71", "--lon", "-74.01"}
		m := sunJSONOf(t, args...)
		if m["time"] != tc.used {
			t.Errorf("%s: time %v, want %s (15 U.S.C. §260a)", tc.time, m["time"], tc.used)
		}
		note, _ := m["time_reading"].(string)
		others, _ := m["other_times"].([]any)
		if tc.other == "" {
			if note != "" || others != nil {
				t.Errorf("%s: an ordinary wall time has a note %q / others %v", tc.time, note, others)
			}
			continue
		}
		if len(others) != 1 || others[0] != tc.other {
			t.Errorf("%s: other_times %v, want [%s]", tc.time, others, tc.other)
		}
		for _, s := range tc.note {
			if !strings.Contains(note, s) {
				t.Errorf("%s: time_reading %q lacks %q", tc.time, note, s)
			}
		}
		_, out, _ := captureRun(args...)
		if !strings.Contains(out, note) {
			t.Errorf("%s: the table does not carry the note:\n%s", tc.time, out)
		}
	}
}

// TestWhenDayWithoutMidnight: Havana skipped midnight on 2025-03-09 (tz
// database, northamerica, Rule Cuba 2012 max: forward at 0:00 standard time
// on the second Sunday of March; CST = UTC−5, CDT = UTC−4), so that date ran
// from 05:00 UTC to 03:59:59 UTC next day. Every match must lie on it and
// the answer must say how the day was bounded. (time.Date read the missing
// midnight as 23:00 on 8 March, and the search ran over the wrong day.)
func TestWhenDayWithoutMidnight(t *testing.T) {
	args := []string{"when", "--lat", "23.13", "--lon", "-82.38", "--date", "2025-03-09", "--altitude", "40", "--zone", "America/Havana"}
	code, out, stderr := captureRun(append(args, "--json")...)
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var j struct {
		Matches []struct{ Best, Earliest, Latest string }
		Notes   []string
	}
	if err := json.Unmarshal([]byte(out), &j); err != nil {
		t.Fatal(err)
	}
	start, end := time.Date(2025, 3, 9, 5, 0, 0, 0, time.UTC), time.Date(2025, 3, 10, 3, 59, 59, 0, time.UTC)
	if len(j.Matches) != 2 { // common knowledge: an altitude below the noon sun's is reached twice a day
		t.Fatalf("%d matches, want 2: %s", len(j.Matches), out)
	}
	for _, m := range j.Matches {
		b, _ := time.Parse(time.RFC3339, m.Best)
		if b.Before(start) || b.After(end) {
			t.Errorf("match at %s is not on 2025-03-09 in Havana [%s, %s]", m.Best, start, end)
		}
	}
	if len(j.Notes) != 1 || !strings.Contains(j.Notes[0], "never came") || !strings.Contains(j.Notes[0], "2025-03-09T05:00:00Z") {
		t.Fatalf("notes %q: want one saying midnight never came and the day starts at 05:00 UTC", j.Notes)
	}
	_, table, _ := captureRun(args...)
	if !strings.Contains(table, j.Notes[0]) {
		t.Errorf("the table does not carry the note:\n%s", table)
	}
}

// TestZonesIgnoreHostZoneinfo runs the built binary, which carries no
// time/tzdata of its own, with $ZONEINFO pointing at a doctored database in
// which America/New_York is a fixed UTC+09:00. time.LoadLocation reads
// $ZONEINFO first, so an answer that used it would change; the embedded tz
// database gives noon EDT (UTC−4, 15 U.S.C. §260a) = 16:00 UTC for sun and
// the EDT day 2025-06-01 = 04:00 UTC to 03:59:59 UTC for when.
func TestZonesIgnoreHostZoneinfo(t *testing.T) {
	dir := t.TempDir()
	bin := buildGnomon(t, dir)
	zi := filepath.Join(dir, "zoneinfo")
	if err := os.MkdirAll(filepath.Join(zi, "America"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(zi, "America", "New_York"), fixedTZif(9*3600, "DOC"), 0o644); err != nil {
		t.Fatal(err)
	}
	run := func(args ...string) string {
		t.Helper()
		cmd := exec.Command(bin, args...)
		cmd.Env = append(os.Environ(), "ZONEINFO="+zi)
		out, err := cmd.Output()
		if err != nil {
			t.Fatalf("%v: %v", args, err)
		}
		return string(out)
	}
	// The doctored file is a real zone file: Go's own reader accepts it.
	if loc, err := time.LoadLocationFromTZData("America/New_York", fixedTZif(9*3600, "DOC")); err != nil {
		t.Fatalf("doctored file unreadable: %v", err)
	} else if _, off := time.Date(2025, 6, 1, 12, 0, 0, 0, loc).Zone(); off != 9*3600 {
		t.Fatalf("doctored file gives offset %d", off)
	}

	sun := run("sun", "--time", "2025-06-01T12:00:00", "--zone", "America/New_York", "--lat", "40.71", "--lon", "-74.01", "--json")
	var s struct{ Time string }
	if err := json.Unmarshal([]byte(sun), &s); err != nil || s.Time != "2025-06-01T16:00:00Z" {
		t.Errorf("sun with a doctored ZONEINFO: time %q (%v), want 2025-06-01T16:00:00Z\n%s", s.Time, err, sun)
	}
	when := run("when", "--lat", "40.71", "--lon", "-74.01", "--date", "2025-06-01", "--altitude", "30", "--zone", "America/New_York", "--json")
	var w struct{ Matches []struct{ Best string } }
	if err := json.Unmarshal([]byte(when), &w); err != nil || len(w.Matches) != 2 {
		t.Fatalf("when with a doctored ZONEINFO: %v\n%s", err, when)
	}
	start, end := time.Date(2025, 6, 1, 4, 0, 0, 0, time.UTC), time.Date(2025, 6, 2, 3, 59, 59, 0, time.UTC)
	for _, m := range w.Matches {
		b, _ := time.Parse(time.RFC3339, m.Best)
		if b.Before(start) || b.After(end) {
			t.Errorf("when with a doctored ZONEINFO: match %s outside the EDT day [%s, %s]", m.Best, start, end)
		}
	}
}

// fixedTZif returns a version 1 TZif file (RFC 8536 §3) for a zone with one
// fixed offset and no transitions.
func fixedTZif(offsetSec int32, abbrev string) []byte {
	b := []byte("TZif")
	b = append(b, 0) // version 1
	b = append(b, make([]byte, 15)...)
	for _, n := range []uint32{0, 0, 0, 0, 1, uint32(len(abbrev) + 1)} { // isut, isstd, leap, time, type, char counts
		b = binary.BigEndian.AppendUint32(b, n)
	}
	b = binary.BigEndian.AppendUint32(b, uint32(offsetSec)) // ttinfo: utoff
	b = append(b, 0, 0)                                     // isdst, desigidx
	return append(b, abbrev+"\x00"...)
}
