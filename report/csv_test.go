package report

import (
	"bytes"
	"encoding/csv"
	"slices"
	"strings"
	"testing"
	"unicode"
	"unicode/utf8"
)

func TestNeutraliseCell(t *testing.T) {
	tests := []struct {
		in, want, source string
	}{
		{"=1+1", "'=1+1", "OWASP CSV Injection: leading ="},
		{"+1", "'+1", "OWASP CSV Injection: leading +"},
		{"-2+3", "'-2+3", "OWASP CSV Injection: leading -"},
		{"@SUM(A1)", "'@SUM(A1)", "OWASP CSV Injection: leading @"},
		{"\t=1", "'\t=1", "OWASP CSV Injection: leading tab"},
		{"\r=1", "'\r=1", "OWASP CSV Injection: leading carriage return"},
		{"  =cmd|' /C calc'!A0", "'  =cmd|' /C calc'!A0", "OWASP: formula after leading spaces"},
		{"\n@x", "'\n@x", "formula after a leading newline"},
		{"＝1+1", "'＝1+1", "full-width equals sign, from memory (some spreadsheets accept it)"},
		{"IMG_0001.JPG", "IMG_0001.JPG", "plain text is untouched"},
		{"a=b", "a=b", "= not in first place"},
		{"", "", "empty cell"},
		{"   ", "   ", "only spaces"},
		{"2025-06-14T09:00:00Z", "2025-06-14T09:00:00Z", "an ISO 8601 time starts with a digit"},
		{"\xff=1", "\xff=1", "invalid UTF-8 first is not a formula start"},
	}
	for _, tc := range tests {
		if got := NeutraliseCell(tc.in); got != tc.want {
			t.Errorf("NeutraliseCell(%q) = %q, want %q (%s)", tc.in, got, tc.want, tc.source)
		}
	}
}

func readCSV(t *testing.T, a *Audit) [][]string {
	t.Helper()
	var b bytes.Buffer
	if err := WriteCSV(&b, a); err != nil {
		t.Fatal(err)
	}
	r := csv.NewReader(&b) // encoding/csv reads RFC 4180
	r.FieldsPerRecord = len(csvHeader)
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatalf("output is not RFC 4180 CSV with %d fields: %v", len(csvHeader), err)
	}
	return recs
}

func col(name string) int { return slices.Index(csvHeader, name) }

// TestCSVHostile: every text cell is safe to open in a spreadsheet, numeric
// cells stay numbers (negative offsets too), and awkward file names survive.
func TestCSVHostile(t *testing.T) {
	a := fixtureAudit()
	a.Photos = append(a.Photos, Photo{Path: "line\nbreak, \"quoted\".jpg", Verdict: "unverified"})
	recs := readCSV(t, a)
	if len(recs) != len(a.Photos)+1 {
		t.Fatalf("%d records, want header + %d", len(recs), len(a.Photos))
	}
	if !slices.Equal(recs[0], csvHeader) {
		t.Errorf("header %q", recs[0])
	}
	numeric := map[int]bool{}
	for _, n := range []string{"size", "lat", "lon", "sun_azimuth", "sun_altitude", "offset_s", "offset_low_s", "offset_high_s"} {
		numeric[col(n)] = true
	}
	for _, rec := range recs[1:] {
		for i, cell := range rec {
			if numeric[i] {
				continue
			}
			if strings.HasPrefix(cell, "'") {
				continue
			}
			trim := strings.TrimLeftFunc(cell, unicode.IsSpace)
			if r, _ := utf8.DecodeRuneInString(trim); trim != "" && strings.ContainsRune("=+-@\t\r＝＋－＠", r) {
				t.Errorf("column %s: cell %q would run as a formula (OWASP CSV Injection)", csvHeader[i], cell)
			}
		}
	}
	paths := map[string][]string{}
	for _, rec := range recs[1:] {
		paths[rec[col("path")]] = rec
	}
	tests := []struct {
		path, column, want, source string
	}{
		{"market/DSC_2001.NEF", "offset_s", "-7200", "negative offset stays numeric"},
		{"market/DSC_2001.NEF", "offset_low_s", "-7390", "negative offset stays numeric"},
		{"quay/IMG_0101.JPG", "lat", "43.21", "numbers in shortest exact form (strconv)"},
		{"quay/IMG_0101.JPG", "checks", "shadow=agrees(-10±150 s); gps_clock=agrees(1.0±1.0 s)", "checks column format (package doc); figures by GUM §7.2.6 (uncertainty to two significant digits, value to the same place)"},
		{hostScript, "claimed_local", "'" + hostFormula, "formula from EXIF neutralised"},
		{hostScript, "file_notes", "extension .jpg suggests jpeg but the bytes are png; " + hostFormula2 + "; " + hostInvalid, "notes joined; a formula after the first note cannot start the cell"},
		{hostScript, "camera", hostImg, "markup is plain text in CSV"},
		{hostInvalid, "camera", "'-2+3", "text that looks numeric is still neutralised"},
		{hostInvalid, "explanation", "'@no independent evidence", "leading @"},
		{hostInvalid, "lat", "NaN", "non-finite number"},
		{hostInvalid, "lon", "200", "out-of-range kept as read"},
		{"line\nbreak, \"quoted\".jpg", "verdict", "unverified", "RFC 4180 §2.6-2.7: quoted newline, comma and quote"},
		{"misc/truncated.jpg", "lat", "", "unknown number is an empty cell"},
	}
	for _, tc := range tests {
		rec, ok := paths[tc.path]
		if !ok {
			t.Errorf("no row for path %q", tc.path)
			continue
		}
		if got := rec[col(tc.column)]; got != tc.want {
			t.Errorf("%q %s = %q, want %q (%s)", tc.path, tc.column, got, tc.want, tc.source)
		}
	}
}

func TestCSVDeterministic(t *testing.T) {
	var x, y bytes.Buffer
	a := fixtureAudit()
	if err := WriteCSV(&x, a); err != nil {
		t.Fatal(err)
	}
	if err := WriteCSV(&y, a); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(x.Bytes(), y.Bytes()) {
		t.Fatal("two writes differ")
	}
	if !bytes.Contains(x.Bytes(), []byte("bad\xff\xfename.jpg")) {
		t.Error("raw bytes of an invalid UTF-8 name not kept")
	}
}
