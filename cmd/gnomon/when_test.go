package main

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// srcSPART names the witness of CLI round trips: the forward sun comes from
// spa.At, which package spa checks against the SPA report and astropy.
const srcSPART = "round trip through spa (itself checked against the SPA report and astropy)"

// captureRun runs gnomon in-process and returns its exit status and output.
func TestWhenExitCodes(t *testing.T) {
	place := []string{"--lat", "48.85", "--lon", "2.35"}
	with := func(extra ...string) []string { return append(append([]string{"when"}, place...), extra...) }
	tests := []struct {
		name   string
		args   []string
		want   int
		reason string // in the first line of stderr for exit 2
	}{
		{"help", []string{"when", "-h"}, exitOK, ""},
		{"azimuth and altitude", with("--date", "2024-06-03", "--azimuth", "117.4", "--altitude", "50"), exitOK, ""},
		{"altitude only, range", with("--from", "2024-06-01", "--to", "2024-06-03", "--altitude", "40"), exitOK, ""},
		{"shadow", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "1", "--shadow-length", "1.1"), exitOK, ""},
		{"shadow on slope", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "1", "--shadow-length", "1.1", "--slope", "10", "--slope-toward", "270"), exitOK, ""},
		{"zone", with("--date", "2024-06-03", "--azimuth", "180", "--zone", "Europe/Paris"), exitOK, ""},
		{"three years", with("--from", "2022-01-01", "--to", "2024-12-31", "--azimuth", "180", "--altitude", "20", "--json"), exitOK, ""},
		{"missing lat", []string{"when", "--lon", "1", "--date", "2024-06-03", "--azimuth", "1"}, exitUsage, "--lat is required"},
		{"lat beyond 90", []string{"when", "--lat", "91", "--lon", "1", "--date", "2024-06-03", "--azimuth", "1"}, exitUsage, "--lat 91 is outside"},
		{"lon beyond 180", []string{"when", "--lat", "1", "--lon", "200", "--date", "2024-06-03", "--azimuth", "1"}, exitUsage, "--lon 200 is outside"},
		{"unparseable date", with("--date", "03/06/2024", "--azimuth", "1"), exitUsage, "is not a calendar date"},
		{"impossible date", with("--date", "2023-02-29", "--azimuth", "1"), exitUsage, "is not a calendar date"},
		{"from after to", with("--from", "2024-06-05", "--to", "2024-06-03", "--azimuth", "1"), exitUsage, "is after --to"},
		{"from without to", with("--from", "2024-06-05", "--azimuth", "1"), exitUsage, "go together"},
		{"date and range", with("--date", "2024-06-05", "--from", "2024-06-05", "--to", "2024-06-06", "--azimuth", "1"), exitUsage, "not both"},
		{"no date", with("--azimuth", "1"), exitUsage, "a date is required"},
		{"range too long", with("--from", "2020-01-01", "--to", "2024-01-01", "--azimuth", "1"), exitUsage, "longer than"},
		{"missing measurement", with("--date", "2024-06-03"), exitUsage, "a measurement is required"},
		{"negative height", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "-1", "--shadow-length", "1"), exitUsage, "--height -1 must be positive"},
		{"shadow incomplete", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "1"), exitUsage, "--shadow-length missing"},
		{"shadow and azimuth", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "1", "--shadow-length", "1", "--azimuth", "3"), exitUsage, "not both"},
		{"slope without direction", with("--date", "2024-06-03", "--shadow-bearing", "300", "--height", "1", "--shadow-length", "1", "--slope", "5"), exitUsage, "go together"},
		{"altitude beyond 90", with("--date", "2024-06-03", "--altitude", "95"), exitUsage, "--altitude 95 is outside"},
		{"azimuth beyond 360", with("--date", "2024-06-03", "--azimuth", "361"), exitUsage, "--azimuth 361 is outside 0..360"},
		{"negative shadow bearing", with("--date", "2024-06-03", "--shadow-bearing", "-5", "--height", "1", "--shadow-length", "1"), exitUsage, "bearings must be degrees in 0..360"},
		{"zero sd", with("--date", "2024-06-03", "--azimuth", "100", "--azimuth-sd", "0"), exitUsage, "--azimuth-sd 0 must be"},
		{"unknown zone", with("--date", "2024-06-03", "--azimuth", "100", "--zone", "Atlantis/Capital"), exitUsage, "unknown --zone"},
		{"unknown flag", with("--date", "2024-06-03", "--azimuth", "100", "--colour"), exitUsage, "flag provided but not defined"},
		{"extra argument", with("--date", "2024-06-03", "--azimuth", "100", "now"), exitUsage, "unexpected argument"},
	}
	for _, tc := range tests {
		code, _, stderr := captureRun(tc.args...)
		if code != tc.want {
			t.Errorf("%s: exit %d, want %d; stderr:\n%s", tc.name, code, tc.want, stderr)
			continue
		}
		if tc.want == exitUsage {
			checkUsageError(t, tc.name, "when", stderr, tc.reason)
		}
	}
}

func decodeWhen(t *testing.T, out string) []map[string]any {
	t.Helper()
	var doc map[string]json.RawMessage
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, out)
	}
	raw, ok := doc["matches"]
	if !ok {
		t.Fatalf("no \"matches\" key: %s", out)
	}
	if strings.TrimSpace(string(raw)) == "null" {
		t.Fatalf("matches is null, want a list: %s", out)
	}
	var ms []map[string]any
	if err := json.Unmarshal(raw, &ms); err != nil {
		t.Fatalf("matches is not a list of objects: %v", err)
	}
	for _, m := range ms {
		for _, k := range []string{"best", "earliest", "latest"} {
			s, ok := m[k].(string)
			if !ok || !strings.HasSuffix(s, "Z") {
				t.Fatalf("%s = %v, want an RFC 3339 UTC string", k, m[k])
			}
			if _, err := time.Parse(time.RFC3339, s); err != nil {
				t.Fatalf("%s: %v", k, err)
			}
		}
		for _, k := range []string{"azimuth", "altitude"} {
			if _, ok := m[k].(float64); !ok {
				t.Fatalf("%s = %v, want a number", k, m[k])
			}
		}
	}
	return ms
}

func TestWhenJSONRoundTrip(t *testing.T) {
	tests := []struct {
		source   string
		lat, lon float64
		truth    time.Time
		zone     string
		args     func(p spa.Position) []string
		want     int // number of matches in the day
	}{
		{srcSPART, 48.85, 2.35, time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC), "",
			func(p spa.Position) []string {
				return []string{"--azimuth", f6(p.AzimuthDeg), "--altitude", f6(p.AltitudeDeg), "--azimuth-sd", "0.5", "--altitude-sd", "0.5"}
			}, 1},
		{srcSPART + "; common knowledge: an altitude is reached twice a day", 48.85, 2.35, time.Date(2024, 6, 3, 9, 17, 0, 0, time.UTC), "",
			func(p spa.Position) []string { return []string{"--altitude", f6(p.AltitudeDeg)} }, 2},
		{srcSPART, 39.742476, -105.1786, time.Date(2003, 10, 17, 19, 30, 30, 0, time.UTC), "America/Denver",
			func(p spa.Position) []string {
				return []string{"--azimuth", f6(p.AzimuthDeg), "--altitude", f6(p.AltitudeDeg)}
			}, 1},
		{srcSPART + "; common knowledge: midnight sun at 78° N in June", 78.2, 15.6, time.Date(2024, 6, 20, 23, 0, 0, 0, time.UTC), "",
			func(p spa.Position) []string {
				return []string{"--azimuth", f6(p.AzimuthDeg), "--altitude", f6(p.AltitudeDeg)}
			}, 1},
	}
	for _, tc := range tests {
		p := spa.At(tc.truth, spa.NewObserver(tc.lat, tc.lon, 0), spa.DeltaT(tc.truth))
		day := tc.truth.UTC().Format("2006-01-02")
		args := []string{"when", "--lat", f6(tc.lat), "--lon", f6(tc.lon), "--date", day, "--json"}
		if tc.zone != "" {
			loc, err := zone.NewDB().Load(tc.zone)
			if err != nil {
				t.Fatal(err)
			}
			args = append(args, "--zone", tc.zone)
			args[6] = tc.truth.In(loc).Format("2006-01-02")
		}
		code, out, stderr := captureRun(append(args, tc.args(p)...)...)
		if code != exitOK {
			t.Fatalf("%s: exit %d: %s", tc.source, code, stderr)
		}
		ms := decodeWhen(t, out)
		if len(ms) != tc.want {
			t.Errorf("%s: %d matches, want %d: %s", tc.source, len(ms), tc.want, out)
		}
		found := false
		for _, m := range ms {
			e, _ := time.Parse(time.RFC3339, m["earliest"].(string))
			l, _ := time.Parse(time.RFC3339, m["latest"].(string))
			if !tc.truth.Before(e) && !tc.truth.After(l) {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: no match contains %s: %s", tc.source, tc.truth, out)
		}
	}
}

func TestWhenNothingFits(t *testing.T) {
	// common knowledge: polar night at 78° N in December.
	code, out, stderr := captureRun("when", "--lat", "78.2", "--lon", "15.6", "--date", "2024-12-20", "--azimuth", "180", "--altitude", "5", "--json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if ms := decodeWhen(t, out); len(ms) != 0 {
		t.Errorf("common knowledge: polar night: want no matches, got %s", out)
	}
	if !strings.Contains(out, `"matches": []`) {
		t.Errorf("want an empty list, got %s", out)
	}
	code, out, _ = captureRun("when", "--lat", "78.2", "--lon", "15.6", "--date", "2024-12-20", "--azimuth", "180", "--altitude", "5")
	if code != exitOK || !strings.Contains(out, "no time in the range fits") {
		t.Errorf("table for no match: exit %d\n%s", code, out)
	}
}

// TestWhenJSONEchoesQuery: --json repeats the question (place, days,
// zone, inputs as given, the sun direction they make), and a measurement
// that fits no time gets no match but its closest time with the misfit.
// At 48.85° N the sun climbs to at most 64.6° (90° − 48.85° + 23.44°;
// common knowledge), so an altitude of 70° fits no time.
func TestWhenJSONEchoesQuery(t *testing.T) {
	code, out, stderr := captureRun("when", "--lat", "48.85", "--lon", "2.35", "--date", "2024-06-03", "--azimuth", "117.4", "--altitude", "70", "--altitude-sd", "0.5", "--zone", "Europe/Paris", "--json")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var doc struct {
		Query struct {
			Lat, Lon       float64
			From, To, Zone string
			Inputs         map[string]float64
			Azimuth        *float64
			AltitudeSD     *float64 `json:"altitude_sd"`
		}
		Matches []map[string]any
		Closest *struct {
			Misfit    float64
			MisfitDof int     `json:"misfit_dof"`
			PValue    float64 `json:"p_value"`
			Fits      bool
		}
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	q := doc.Query
	if q.Lat != 48.85 || q.Lon != 2.35 || q.From != "2024-06-03" || q.To != "2024-06-03" || q.Zone != "Europe/Paris" ||
		q.Inputs["azimuth"] != 117.4 || q.Inputs["altitude"] != 70 || q.Inputs["altitude-sd"] != 0.5 ||
		q.Azimuth == nil || *q.Azimuth != 117.4 || q.AltitudeSD == nil || *q.AltitudeSD != 0.5 {
		t.Errorf("query not echoed: %s", out)
	}
	if len(doc.Matches) != 0 || doc.Closest == nil || doc.Closest.Fits || doc.Closest.PValue >= 0.05 || doc.Closest.MisfitDof != 1 || doc.Closest.Misfit < 30 {
		t.Errorf("common knowledge: 70° is out of reach at 48.85° N: want no match and a closest misfit: %s", out)
	}
}

func TestWhenTable(t *testing.T) {
	code, out, stderr := captureRun("when", "--lat", "48.85", "--lon", "2.35", "--date", "2024-06-03", "--altitude", "40", "--zone", "Europe/Paris")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, want := range []string{"earliest (UTC)", "best (UTC)", "latest (UTC)", "azimuth °", "altitude °", "best (local)", "CEST", "χ² below 3.841", "χ² within 3.841 of the best"} {
		if !strings.Contains(out, want) {
			t.Errorf("table lacks %q:\n%s", want, out)
		}
	}
	// Rows align: every data row has the same length up to the local column.
	lines := strings.Split(strings.TrimSpace(out), "\n")
	var widths []int
	for _, l := range lines {
		if i := strings.Index(l, "  2024-"); i == 3 {
			widths = append(widths, strings.Index(l, "CEST"))
		}
	}
	if len(widths) != 2 || widths[0] != widths[1] {
		t.Errorf("rows misaligned or missing (%v):\n%s", widths, out)
	}
}

func f6(x float64) string { return fmt.Sprintf("%.6f", x) }
