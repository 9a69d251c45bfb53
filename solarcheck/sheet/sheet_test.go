package sheet

import (
	"bytes"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

const header = "photo,object,object_height,shadow_length,shadow_bearing,bearing_ref,sun_azimuth,sun_altitude,lat,lon,time,note\n"

func TestParseRowKinds(t *testing.T) {
	// BOM, CRLF line ends, a quoted note holding a comma, a quote and a line
	// break, and columns in a non-template order.
	src := "\uFEFFphoto,object,object_height,shadow_length,shadow_bearing,bearing_ref,sun_azimuth,sun_altitude,lat,lon,time,note\r\n" +
		"a/IMG_1.jpg,pole,2.0,3.5,47.5,,,,,,,\"first, \"\"tall\"\"\r\nsecond line\"\r\n" +
		"a/IMG_1.jpg,fence,,,50,MAGNETIC,,,,,,\r\n" +
		"IMG_2.jpg,,,,,,181.25,33,,,,\r\n" +
		"IMG_3.jpg,,,,,,,,48.8584,2.2945,2026-05-03T14:22:05+02:00,\r\n" +
		"IMG_4.jpg,,,,,,,,,,2026-05-03 14:22:05,\r\n" +
		"IMG_5.jpg,,,,,,,,,,,just a note\r\n"
	s, err := Parse(strings.NewReader(src), "m.csv")
	if err != nil {
		t.Fatalf("unexpected problems: %v", err)
	}
	cases := []struct {
		source string
		line   int
		kind   Kind
		check  func(Row) bool
	}{
		{"RFC 4180 §2 rules 6-7 (quoted comma, doubled quote, line break); BOM dropped", 2, KindShadow, func(r Row) bool {
			return r.Photo == "a/IMG_1.jpg" && *r.ObjectHeight == 2 && *r.ShadowLength == 3.5 && *r.ShadowBearingDeg == 47.5 &&
				r.BearingRef == RefTrue && r.BearingSDDeg == 2 && r.LengthSDPct == 5 && r.Note == "first, \"tall\"\nsecond line" // encoding/csv turns a quoted CRLF into LF
		}},
		{"physical line after a two-line cell (csv.Reader.FieldPos)", 4, KindShadowBearing, func(r Row) bool {
			return r.BearingRef == RefMagnetic && r.ShadowLength == nil
		}},
		{"sighting row", 5, KindSighting, func(r Row) bool { return *r.SunAzimuthDeg == 181.25 && *r.SunAltitudeDeg == 33 }},
		{"override with RFC 3339 time", 6, KindOverride, func(r Row) bool {
			return *r.Lat == 48.8584 && r.Time.HasOffset && r.Time.Instant.UTC().Hour() == 12
		}},
		{"override with wall time", 7, KindOverride, func(r Row) bool { return !r.Time.HasOffset && r.Time.Instant.Hour() == 14 }},
	}
	if len(s.Rows) != len(cases) {
		t.Fatalf("got %d rows, want %d (unfilled row skipped)", len(s.Rows), len(cases))
	}
	for i, c := range cases {
		r := s.Rows[i]
		if r.Line != c.line || r.Kind != c.kind || !c.check(r) {
			t.Errorf("%s: row %d = line %d kind %v %+v", c.source, i, r.Line, r.Kind, r)
		}
	}
}

func TestParseBadCells(t *testing.T) {
	cases := []struct {
		source string
		body   string // rows after the header; the header is line 1
		want   string // ParseError text prefix: file:line:column (name)
		kind   error
	}{
		{"package doc: numbers", "x.jpg,p,abc,3,40,,,,,,,\n", "s.csv:2:3 (object_height)", ErrNotNumber},
		{"package doc: no Inf/NaN", "x.jpg,p,2,NaN,40,,,,,,,\n", "s.csv:2:4 (shadow_length)", ErrNotNumber},
		{"package doc: no decimal comma with ','", "x.jpg,p,2,\"3,5\",40,,,,,,,\n", "s.csv:2:4 (shadow_length)", ErrNotNumber},
		{"bearing 0..360", "x.jpg,p,2,3,361,,,,,,,\n", "s.csv:2:5 (shadow_bearing)", ErrOutOfRange},
		{"altitude -90..90", "x.jpg,,,,,,10,90.5,,,,\n", "s.csv:2:8 (sun_altitude)", ErrOutOfRange},
		{"latitude -90..90", "x.jpg,,,,,,,,91,10,,\n", "s.csv:2:9 (lat)", ErrOutOfRange},
		{"longitude -180..180", "x.jpg,,,,,,,,10,-180.5,,\n", "s.csv:2:10 (lon)", ErrOutOfRange},
		{"heights > 0", "x.jpg,p,0,3,40,,,,,,,\n", "s.csv:2:3 (object_height)", ErrNotPositive},
		{"lengths > 0", "x.jpg,p,2,-3,40,,,,,,,\n", "s.csv:2:4 (shadow_length)", ErrNotPositive},
		{"bearing_ref vocabulary", "x.jpg,p,2,3,40,north,,,,,,\n", "s.csv:2:6 (bearing_ref)", ErrUnknownRef},
		{"shadow and sighting conflict", "x.jpg,p,2,3,40,,120,,,,,\n", "s.csv:2:7 (sun_azimuth)", ErrConflict},
		{"height without length", "x.jpg,p,2,,40,,,,,,,\n", "s.csv:2:4 (shadow_length)", ErrIncomplete},
		{"lat without lon", "x.jpg,,,,,,,,45,,,\n", "s.csv:2:10 (lon)", ErrIncomplete},
		{"settings without a measurement", "x.jpg,p,,,,magnetic,,,,,,\n", "s.csv:2:6 (bearing_ref)", ErrIncomplete},
		{"time syntax", "x.jpg,,,,,,,,,,03/05/2026 14:22,\n", "s.csv:2:11 (time)", ErrBadTime},
		{"missing photo", ",p,2,3,40,,,,,,,\n", "s.csv:2:1 (photo)", ErrMissing},
		{"duplicate row", "x.jpg,p,2,3,40,,,,,,,\nx.jpg,p,2,3,40,TRUE,,,,,,\n", "s.csv:3:1 (photo)", ErrDuplicate},
		{"extra cells", "x.jpg,p,2,3,40,,,,,,,,surplus\n", "s.csv:2:13", ErrExtraField},
		{"RFC 4180 §2 rule 5: bare quote", "x.jpg,p\"q,2,3,40,,,,,,,\n", "s.csv:2: CSV syntax error", ErrSyntax},
		{"line counted after multi-line cell", "x.jpg,,,,,,,,,,,\"a\nb\nc\"\ny.jpg,p,x,3,40,,,,,,,\n", "s.csv:5:3 (object_height)", ErrNotNumber},
		{"invalid UTF-8", "x.jpg,p\xff,2,3,40,,,,,,,\n", "s.csv:2:2 (object)", ErrEncoding},
	}
	for _, c := range cases {
		src := header + c.body + "good.jpg,p,2,3,40,,,,,,,\n"
		s, err := Parse(strings.NewReader(src), "s.csv")
		if !errors.Is(err, c.kind) {
			t.Errorf("%s: error %v, want kind %v", c.source, err, c.kind)
			continue
		}
		var pe *ParseError
		if !errors.As(err, &pe) || !strings.HasPrefix(pe.Error(), c.want) {
			t.Errorf("%s: first problem %q, want prefix %q", c.source, pe, c.want)
		}
		last := s.Rows[len(s.Rows)-1]
		if last.Photo != "good.jpg" {
			t.Errorf("%s: the good row after the bad one was not returned", c.source)
		}
	}
}

func TestParseHeader(t *testing.T) {
	cases := []struct {
		source string
		src    string
		kind   error
		want   string
		rows   int
	}{
		{"package doc: unknown column reported, rows kept", "photo,colour,sun_azimuth\nx.jpg,red,100\n", ErrUnknownColumn, `h.csv:1:2: unknown column (ignored): "colour"`, 1},
		{"package doc: repeated column", "photo,sun_azimuth,SUN_AZIMUTH\nx.jpg,100,200\n", ErrDuplicateColumn, "h.csv:1:3 (SUN_AZIMUTH)", 1},
		{"package doc: photo column required", "object,sun_azimuth\np,100\n", ErrMissing, "h.csv:1:", 0},
		{"empty file", "", ErrNoHeader, "h.csv:1:", 0},
		// The first bytes of any JFIF file (JPEG File Interchange Format
		// 1.02: SOI, APP0 marker, length 16, "JFIF\0"): a photo given as
		// the sheet.
		{"a photo given as the sheet", "\xff\xd8\xff\xe0\x00\x10JFIF\x00\x01\x01", ErrNotText, "h.csv:1: not a text file", 0},
		{"NUL further down", "photo,sun_azimuth\nx.jpg,100\ny.jpg\x00,100\n", ErrNotText, "h.csv:3: not a text file", 0},
		{"Latin-1 header", "photo,not\xe9\n", ErrNotText, "h.csv:1: not a text file", 0},
	}
	for _, c := range cases {
		s, err := Parse(strings.NewReader(c.src), "h.csv")
		var pe *ParseError
		if !errors.Is(err, c.kind) || !errors.As(err, &pe) || !strings.HasPrefix(pe.Error(), c.want) || len(s.Rows) != c.rows {
			t.Errorf("%s: err %v rows %d", c.source, err, len(s.Rows))
		}
		// Every header problem that leaves no rows makes the sheet unusable;
		// one that keeps rows does not.
		if (s.Unusable != nil) != (c.rows == 0) {
			t.Errorf("%s: Unusable = %v with %d rows", c.source, s.Unusable, len(s.Rows))
		}
	}
}

func TestQuote(t *testing.T) {
	long := strings.Repeat("ab", 100)
	cases := []struct {
		source, cell, want string
	}{
		{"plain cell: strconv.Quote", "abc", `"abc"`},
		{"control and invalid bytes escaped", "a\x1b[31m\xff", `"a\x1b[31m\xff"`},
		{"cut after 40 characters", long, strconv.Quote(long[:40]) + "…"},
		{"40 characters: not cut", long[:40], strconv.Quote(long[:40])},
		{"characters, not bytes, are counted", strings.Repeat("é", 41), strconv.Quote(strings.Repeat("é", 40)) + "…"},
	}
	for _, c := range cases {
		if got := Quote(c.cell); got != c.want {
			t.Errorf("%s: Quote = %s, want %s", c.source, got, c.want)
		}
	}
	// A message about a bad cell quotes it cut and escaped.
	_, err := Parse(strings.NewReader("photo,sun_azimuth\nx.jpg,"+long+"\x01\n"), "q.csv")
	if want := `q.csv:2:2 (sun_azimuth): not a number: ` + strconv.Quote(long[:40]) + "…"; err == nil || err.Error() != want {
		t.Errorf("bad cell message %v, want %s", err, want)
	}
}

func TestSemicolonAndDecimalComma(t *testing.T) {
	cases := []struct {
		source string
		src    string
		sep    rune
		az     float64
		kind   error // nil: accepted
	}{
		{"package doc: ';' detected, decimal comma", "photo;sun_azimuth;note\nx.jpg;181,5;\"a;b\"\n", ';', 181.5, nil},
		{"package doc: ';' detected, decimal point still fine", "photo;sun_azimuth\r\nx.jpg;181.5\r\n", ';', 181.5, nil},
		{"package doc: no digit grouping", "photo;sun_azimuth\nx.jpg;1.181,5\n", ';', 0, ErrNotNumber},
		{"package doc: separator decided outside quotes", "\"photo\",\"sun_azimuth;x\"\nx.jpg,10\n", ',', 0, ErrUnknownColumn},
		{"package doc: tie goes to ','", "photo\nx.jpg\n", ',', 0, nil},
	}
	for _, c := range cases {
		s, err := Parse(strings.NewReader(c.src), "d.csv")
		if s.Separator != c.sep {
			t.Errorf("%s: separator %q, want %q", c.source, s.Separator, c.sep)
		}
		if c.kind != nil {
			if !errors.Is(err, c.kind) {
				t.Errorf("%s: err %v, want %v", c.source, err, c.kind)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", c.source, err)
			continue
		}
		if c.az != 0 && (len(s.Rows) != 1 || math.Abs(*s.Rows[0].SunAzimuthDeg-c.az) > 1e-12) {
			t.Errorf("%s: rows %+v", c.source, s.Rows)
		}
	}
}

// names gives each relative path an ID under the input label in.
func names(in string, rels ...string) []Name {
	out := make([]Name, len(rels))
	for i, r := range rels {
		out[i] = Name{ID: in + "/" + r, Rel: r}
	}
	return out
}

func TestResolve(t *testing.T) {
	paths := append(names("card1", "day1/IMG_0001.jpg", "day2/IMG_0001.jpg", "day2/IMG_0002.jpg", "top.jpg", "DCIM/IMG_7.JPG"),
		names("card2", "DCIM/IMG_7.JPG")...)
	src := "photo,sun_azimuth\n" +
		"day1/IMG_0001.jpg,10\n" + // line 2 exact
		"IMG_0002.jpg,20\n" + // line 3 unique base
		"IMG_0001.jpg,30\n" + // line 4 ambiguous
		"nope.jpg,40\n" + // line 5 unknown
		".\\day2\\IMG_0001.jpg,50\n" + // line 6 Windows-style relative path
		"day3/top.jpg,60\n" + // line 7 path that does not exist
		"DCIM/IMG_7.JPG,70\n" + // line 8 the same relative path under two inputs
		"card2/DCIM/IMG_7.JPG,80\n" // line 9 named by ID: card2's only
	s, err := Parse(strings.NewReader(src), "r.csv")
	if err != nil {
		t.Fatal(err)
	}
	got, err := s.Resolve(paths)
	cases := []struct {
		source string
		id     string
		n      int
	}{
		{"exact relative path", "card1/day1/IMG_0001.jpg", 1},
		{"unique bare name", "card1/day2/IMG_0002.jpg", 1},
		{"backslashes and ./ cleaned", "card1/day2/IMG_0001.jpg", 1},
		{"no match", "card1/top.jpg", 0},
		{"ambiguous relative path applied to neither", "card1/DCIM/IMG_7.JPG", 0},
		{"ID names one photo", "card2/DCIM/IMG_7.JPG", 1},
	}
	for _, c := range cases {
		if len(got[c.id]) != c.n {
			t.Errorf("%s: %s has %d rows, want %d", c.source, c.id, len(got[c.id]), c.n)
		}
	}
	if r := got["card2/DCIM/IMG_7.JPG"]; len(r) == 1 && *r[0].SunAzimuthDeg != 80 {
		t.Errorf("card2's photo got the row of line %d, want line 9", r[0].Line)
	}
	msgs := err.Error()
	for _, want := range []string{
		"r.csv:4:1 (photo): names several photos",
		"r.csv:5:1 (photo): no photo", "r.csv:7:1 (photo): no photo",
		`r.csv:8:1 (photo): names several photos; write the photo as the sheet template names it: "DCIM/IMG_7.JPG" matches card1/DCIM/IMG_7.JPG, card2/DCIM/IMG_7.JPG; the row is applied to none`,
	} {
		if !strings.Contains(msgs, want) {
			t.Errorf("missing %q in %s", want, msgs)
		}
	}
	if !errors.Is(err, ErrAmbiguousPhoto) || !errors.Is(err, ErrUnknownPhoto) {
		t.Errorf("kinds not testable: %v", err)
	}
}

func TestWriteTemplate(t *testing.T) {
	lat, lon := 48.8584, 2.2945
	var buf bytes.Buffer
	err := WriteTemplate(&buf, []TemplateRow{
		{Photo: "a,b.jpg", ClaimedLocal: "2026-05-03 14:22:05", ClaimTag: "DateTimeOriginal", Lat: &lat, Lon: &lon},
		{Photo: "=HYPERLINK(1).jpg"},
		{Photo: "c.jpg", ClaimedLocal: "2026-05-04 09:00:00", ClaimTag: "DateTime"},
	})
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(buf.String(), "\r\n")
	cases := []struct {
		source string
		got    string
		want   string
	}{
		{"binding header", lines[0], strings.Join(Columns(), ",")},
		{"RFC 4180 §2 rule 6: field with comma quoted", lines[1], "\"a,b.jpg\",,,,,,,,,,,,,,,,camera clock says 2026-05-03 14:22:05; GPS says lat 48.8584 lon 2.2945"},
		{"OWASP CSV injection: leading = neutralised", lines[2], "'=HYPERLINK(1).jpg,,,,,,,,,,,,,,,,no capture time in the file; no GPS position: give lat/lon"},
		{"EXIF 2.32 DateTime is the file's change time, said so", lines[3], "c.jpg,,,,,,,,,,,,,,,,the file's DateTime tag (when the file was last changed: maybe an edit) says 2026-05-04 09:00:00; no GPS position: give lat/lon"},
	}
	for _, c := range cases {
		if c.got != c.want {
			t.Errorf("%s:\n got %q\nwant %q", c.source, c.got, c.want)
		}
	}
	// Read back: an unfilled template has no rows and no problems; once a
	// measurement is added, the neutralised name comes back as written.
	s, err := Parse(bytes.NewReader(buf.Bytes()), "t.csv")
	if err != nil || len(s.Rows) != 0 {
		t.Fatalf("unfilled template: %v, %d rows", err, len(s.Rows))
	}
	filled := strings.Replace(buf.String(), "'=HYPERLINK(1).jpg,,,,,,,,,,,", "'=HYPERLINK(1).jpg,,,,,,,,,,181,", 1)
	s, err = Parse(strings.NewReader(filled), "t.csv")
	if err != nil || len(s.Rows) != 1 || s.Rows[0].Photo != "=HYPERLINK(1).jpg" {
		t.Fatalf("filled template: %v %+v", err, s.Rows)
	}
}

func TestUncertaintyColumns(t *testing.T) {
	cases := []struct {
		source string
		row    string
		want   string
		kind   error
	}{
		{"package doc: bearing_sd > 0", "x.jpg,10,0,\n", "u.csv:2:3 (bearing_sd)", ErrNotPositive},
		{"package doc: bearing_sd ≤ 90", "x.jpg,10,95,\n", "u.csv:2:3 (bearing_sd)", ErrOutOfRange},
		{"package doc: length_sd_pct ≤ 100", "x.jpg,10,,101\n", "u.csv:2:4 (length_sd_pct)", ErrOutOfRange},
		{"package doc: length_sd_pct > 0", "x.jpg,10,,-1\n", "u.csv:2:4 (length_sd_pct)", ErrNotPositive},
	}
	for _, c := range cases {
		_, err := Parse(strings.NewReader("photo,shadow_bearing,bearing_sd,length_sd_pct\n"+c.row), "u.csv")
		var pe *ParseError
		if !errors.Is(err, c.kind) || !errors.As(err, &pe) || !strings.HasPrefix(pe.Error(), c.want) {
			t.Errorf("%s: %v", c.source, err)
		}
	}
	s, err := Parse(strings.NewReader("photo,shadow_bearing,bearing_sd,length_sd_pct,slope,slope_toward\nx.jpg,10,0.5,2,\"7,5\",180\n"), "u.csv")
	if err == nil || len(s.Rows) != 0 {
		t.Errorf("quoted decimal comma in a ',' sheet accepted: %+v", s.Rows)
	}
	s, err = Parse(strings.NewReader("photo;shadow_bearing;bearing_sd;length_sd_pct;slope;slope_toward\nx.jpg;10;0,5;2;7,5;180\n"), "u.csv")
	if err != nil || len(s.Rows) != 1 || s.Rows[0].BearingSDDeg != 0.5 || s.Rows[0].LengthSDPct != 2 || s.Rows[0].SlopeDeg != 7.5 || s.Rows[0].SlopeTowardDeg != 180 {
		t.Errorf("explicit uncertainties and slope: %v %+v", err, s.Rows)
	}
}

func TestResolveConflictingOverrides(t *testing.T) {
	src := "photo,sun_azimuth,lat,lon,time\n" +
		"a.jpg,100,45,7,\n" + // line 2 sets the place
		"a.jpg,110,45,7,\n" + // line 3 same place: fine
		"dir/a.jpg,120,46,7,\n" + // line 4 same photo, other place: dropped
		"a.jpg,,,,2026-05-03T10:00:00Z\n" + // line 5 sets the time
		"a.jpg,,,,2026-05-03T12:00:00+02:00\n" + // line 6 same instant: fine
		"a.jpg,,,,2026-05-03 12:00:00\n" // line 7 wall time, not the same statement: dropped
	s, err := Parse(strings.NewReader(src), "o.csv")
	if err != nil {
		t.Fatal(err)
	}
	got, err := s.Resolve(names("in", "dir/a.jpg"))
	if n := len(got["in/dir/a.jpg"]); n != 4 {
		t.Errorf("kept %d rows, want 4", n)
	}
	for _, want := range []string{"o.csv:4:3 (lat): override differs", "o.csv:7:5 (time): override differs"} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("package doc (Resolve): missing %q in %v", want, err)
		}
	}
	if !errors.Is(err, ErrConflictingOverride) {
		t.Errorf("kind: %v", err)
	}
}
