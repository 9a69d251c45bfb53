package report

import (
	"bytes"
	"regexp"
	"strings"
	"testing"
)

func renderHTML(t *testing.T, a *Audit) string {
	t.Helper()
	var b bytes.Buffer
	if err := WriteHTML(&b, a); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// TestHTMLEscapes checks the raw page text: nothing from the fixture's
// hostile strings appears as markup, and the page asks for nothing remote.
func TestHTMLEscapes(t *testing.T) {
	page := renderHTML(t, fixtureAudit())
	if page != renderHTML(t, fixtureAudit()) {
		t.Fatal("two writes differ")
	}
	tests := []struct {
		name    string
		re      string
		wantHit bool
		source  string
	}{
		{"no script element", `(?i)<script`, false, "HTML Living Standard §4.12.1: only <script> runs code"},
		{"no event handler attribute", `(?i)<[a-z][^>]*\son[a-z]+\s*=`, false, "HTML Living Standard §8.1.8.1 event handler content attributes"},
		{"no iframe/object/embed", `(?i)<(iframe|object|embed|frame|base|link|form)\b`, false, "elements that load or redirect"},
		{"no javascript: URL", `(?i)(src|href)\s*=\s*"?\s*javascript:`, false, "WHATWG URL: javascript: scheme"},
		{"no remote resource", `(?i)(src|href)\s*=\s*"?(https?:|//)|url\(`, false, "issue 5: works offline"},
		{"strict CSP", `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src 'self' data:; style-src 'unsafe-inline'`, true, "CSP Level 3: default-src 'none' forbids scripts"},
		{"path shown as text", regexp.QuoteMeta(`&lt;script&gt;alert(&#39;path&#39;)&lt;/script&gt;.jpg`), true, "html/template text escaping"},
		{"RTL override made visible", regexp.QuoteMeta(`holiday⟦U&#43;202E⟧gpj.exe`), true, "Unicode UAX #9 explicit directional formatting"},
		{"invalid bytes made visible", regexp.QuoteMeta(`bad⟦0xFF⟧⟦0xFE⟧name.jpg`), true, "RFC 3629: bytes that are not UTF-8"},
		{"raw RTL override absent", "\u202e", false, "UAX #9"},
		{"thumbnail linked", `<img src="thumbs/0001.jpg"`, true, "Photo.Thumbnail"},
	}
	for _, tc := range tests {
		hit := regexp.MustCompile(tc.re).FindString(page)
		if (hit != "") != tc.wantHit {
			t.Errorf("%s: match %q, want match=%v (%s)", tc.name, hit, tc.wantHit, tc.source)
		}
	}
	if strings.Count(page, `<article class="card`) != len(fixtureAudit().Photos) {
		t.Errorf("want one card per photo")
	}
}

// TestHTMLMethods: the methods section names every published method with its
// citation and carries the cautions the brief requires.
func TestHTMLMethods(t *testing.T) {
	page := renderHTML(t, &Audit{})
	for _, want := range []struct{ text, source string }{
		{"Reda and A. Andreas", "NREL SPA, NREL/TP-560-34302"},
		{"±0.0003°", "SPA report abstract"},
		{"Espenak and J. Meeus", "NASA/TP-2006-214141"},
		{"World Magnetic Model 2025", "NOAA NCEI / BGS"},
		{"IANA time zone database", "IANA tz"},
		{"Theil–Sen", "Theil 1950; Sen 1968"},
		{"ISO 2720", "ISO 2720:1974"},
		{"K = 12.5", "ISO 2720 calibration constant"},
		{"Circular 171", "USNO Circular 171"},
		{"Snyder", "USGS PP 1395"},
		{"confirmed by a qualified examiner", "brief: caution"},
		{"rules of evidence", "brief: caution"},
		{"never show that a photograph is authentic", "brief: caution"},
		{"No files were found.", "empty audit: the page says so"},
	} {
		if !strings.Contains(page, want.text) {
			t.Errorf("methods section lacks %q (%s)", want.text, want.source)
		}
	}
}

func TestVisible(t *testing.T) {
	long := strings.Repeat("a", 2500)
	tests := []struct{ in, want, source string }{
		{"plain.jpg", "plain.jpg", "unchanged"},
		{"a\u202Eb", "a⟦U+202E⟧b", "UAX #9: RIGHT-TO-LEFT OVERRIDE"},
		{"a\u2067b\u2069", "a⟦U+2067⟧b⟦U+2069⟧", "UAX #9: isolates"},
		{"x\u200By", "x⟦U+200B⟧y", "Unicode: ZERO WIDTH SPACE"},
		{"tab\there", "tab⟦U+0009⟧here", "C0 control"},
		{"\x1b[31m", "⟦U+001B⟧[31m", "ANSI escape"},
		{"\xff", "⟦0xFF⟧", "RFC 3629: invalid byte"},
		{"שלום", "שלום", "right-to-left letters are text, not controls"},
		{long, strings.Repeat("a", 2000) + " … (500 more bytes, see report.json)", "display limit"},
	}
	for _, tc := range tests {
		if got := Visible(tc.in); got != tc.want {
			t.Errorf("Visible(%.40q) = %.60q, want %.60q (%s)", tc.in, got, tc.want, tc.source)
		}
	}
}

func TestSafeThumb(t *testing.T) {
	tests := []struct{ in, want string }{
		{"thumbs/0001.jpg", "thumbs/0001.jpg"},
		{"javascript:alert(1)", ""},
		{"/etc/passwd", ""},
		{"../evidence/a.jpg", ""},
		{"thumbs/../../x.jpg", ""},
		{"thumbs\\a.jpg", ""},
		{"data:image/png;base64,AAAA", ""},
		{"thumbs/a\nb.jpg", ""},
		{"", ""},
		{"</title><script>x</script>", ""},
		{"thumbs/./a.jpg", ""},
		{"thumbs//a.jpg", ""},
		{"a.jpg", "a.jpg"},
		{"thumbs/ünï.jpg", ""},
	}
	for _, tc := range tests {
		if got := safeThumb(tc.in); got != tc.want {
			t.Errorf("safeThumb(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
}

func TestFormatOffset(t *testing.T) {
	tests := []struct {
		sec        float64
		want, tick string
	}{
		{0, "+0 s", "0"},
		{-12, "−12 s", "−12 s"},
		{450, "+7 min 30 s", "+7 min 30 s"},
		{-7200, "−2 h 00 min 00 s", "−2 h"},
		{-43200, "−12 h 00 min 00 s", "−12 h"},
		{90061, "+1 d 1 h 01 min 01 s", "+1 d 1 h 1 min 1 s"},
	}
	for _, tc := range tests {
		if got := fmtOffset(tc.sec); got != tc.want {
			t.Errorf("fmtOffset(%v) = %q, want %q", tc.sec, got, tc.want)
		}
		if got := fmtTick(tc.sec); got != tc.tick {
			t.Errorf("fmtTick(%v) = %q, want %q", tc.sec, got, tc.tick)
		}
	}
}

// TestSkyGeometry checks the polar chart's projection on known directions:
// north is up, east is right, the zenith is the centre and the horizon ring
// is at 90/110 of the rim radius.
func TestSkyGeometry(t *testing.T) {
	tests := []struct {
		az, alt      float64
		wantX, wantY float64
		source       string
	}{
		{0, 90, skyC, skyC, "zenith at the centre"},
		{0, 0, skyC, skyC - skyR*90/110, "north on the horizon: straight up"},
		{90, 0, skyC + skyR*90/110, skyC, "east on the horizon: right"},
		{180, -20, skyC, skyC + skyR, "south at the chart floor: bottom rim"},
		{270, -60, skyC - skyR, skyC, "below the floor: clamped to the rim"},
	}
	for _, tc := range tests {
		x, y := skyXY(tc.az, skyRadius(tc.alt))
		if d := (x-tc.wantX)*(x-tc.wantX) + (y-tc.wantY)*(y-tc.wantY); d > 1e-9 {
			t.Errorf("az %v alt %v: (%v, %v), want (%v, %v) (%s)", tc.az, tc.alt, x, y, tc.wantX, tc.wantY, tc.source)
		}
	}
}

// TestSheetText: a card shows the examiner's sheet values as written beside
// the derived direction, with the magnetic declination applied and its
// WMM2025 1-sigma error (issue 10). The figures are a hand-made row.
func TestSheetText(t *testing.T) {
	b, h, l := 212.0, 2.0, 3.1
	m := Measured{Object: "pole", Sheet: SheetValues{Kind: "shadow", North: "magnetic", Bearing: &b, ObjectHeight: &h, ShadowLength: &l, BearingSD: 2},
		NorthCorrection: -14.2961, NorthCorrectionSD: 0.3755}
	got := sheetText(m)
	for _, want := range []string{"shadow bearing 212.0° from magnetic north (σ 2.0°)", "shadow length 3.1 for height 2",
		"magnetic declination −14.30° ± 0.38° (World Magnetic Model 2025, 1σ"} {
		if !strings.Contains(got, want) {
			t.Errorf("sheetText = %q, lacks %q", got, want)
		}
	}
	if got := sheetText(Measured{}); got != "" {
		t.Errorf("no sheet values: %q, want empty", got)
	}
}

// TestCardStyleSaysWhatAnItemIs: an unreadable item's card says whether it
// is a damaged photo (evidence that should have been readable) or not a
// photo at all (issue 18: both were "Could not read"). Extensions by common
// practice (.mp4 and .mov are video containers, .txt is text).
func TestCardStyleSaysWhatAnItemIs(t *testing.T) {
	tests := []struct {
		path, container, verdict, want string
	}{
		{"DCIM/IMG_0001.JPG", "jpeg", "unreadable", "Damaged photo"},
		{"DCIM/IMG_0002.JPG", "unknown", "unreadable", "Damaged photo: its bytes are no image"},
		{"DCIM/MVI_0003.MOV", "unknown", "unreadable", "Not a photo: a video, not read yet"},
		{"notes.txt", "unknown", "unreadable", "Not a photo: a text file"},
		{"DCIM/IMG_0004.JPG", "jpeg", "consistent", "Sun agrees"},
	}
	for _, tc := range tests {
		p := Photo{Path: tc.path, Container: tc.container, Verdict: tc.verdict}
		if got := cardStyle(&p).Label; got != tc.want {
			t.Errorf("%s (%s, %s): %q, want %q", tc.path, tc.container, tc.verdict, got, tc.want)
		}
	}
}

// TestFigureWholeNumbers: a figure with no uncertainty that is a whole
// number (the shot-order check's file number) is written as an integer
// (issue 10: "file numbers as integers"), in the card and in the CSV.
func TestFigureWholeNumbers(t *testing.T) {
	n := 1234.0
	if got := fmtFigure(&n, nil); got != "1234" {
		t.Errorf("card: %q, want 1234", got)
	}
	if got := checksCell([]Check{{Kind: "shot_order", Status: "conflicts", Figure: &n, Unit: "file number"}}); got != "shot_order=conflicts(1234 file number)" {
		t.Errorf("csv: %q", got)
	}
	x := 2.345
	if got := fmtFigure(&x, nil); got != "2.35" {
		t.Errorf("card: %q, want 2.35 (two decimals without an uncertainty)", got)
	}
}
