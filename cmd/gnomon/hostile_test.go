package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"maps"
	"math"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"
	"unicode"
	"unicode/utf8"

	"github.com/gnomon-forensics/gnomon/internal/testkit/browsertest"
	"github.com/gnomon-forensics/gnomon/internal/testkit/hostile"
	"github.com/gnomon-forensics/gnomon/report"
)

// TestHostileCorpus audits the damaged and hostile corpus of issue 6
// (internal/testkit/hostile) end to end and checks what the issue demands of every
// report. Each check names its source: the issue text, RFC 4180 (CSV),
// RFC 8259 (JSON), RFC 7946 (GeoJSON), OWASP's CSV-injection guidance.
func TestHostileCorpus(t *testing.T) {
	base := t.TempDir()
	dir := filepath.Join(base, "evidence")
	items, err := hostile.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = os.Chmod(filepath.Join(dir, "special", "denied.jpg"), 0o644) }) // so TempDir can remove it

	// The corpus as found on disk (the walk is the witness, not the manifest).
	found := hostileWalk(t, dir)
	manifest := map[string]hostile.Item{}
	for _, it := range items {
		manifest[it.Name] = it
		if _, ok := found[it.Name]; !ok {
			t.Errorf("manifest item %q not on disk", it.Name)
		}
	}
	for name := range found {
		if _, ok := manifest[name]; !ok {
			t.Errorf("item %q on disk is not in the manifest", name)
		}
	}
	before := treeState(t, dir)

	// Issue 6 "Nothing crashes, hangs": the run must end. 60 s is a hang
	// guard, not a speed assertion.
	out := filepath.Join(base, "report")
	type result struct {
		code           int
		stdout, stderr string
	}
	done := make(chan result, 1)
	go func() {
		var r result
		defer func() {
			if p := recover(); p != nil {
				r.code, r.stderr = -1, fmt.Sprint("panic: ", p)
			}
			done <- r
		}()
		r.code, r.stdout, r.stderr = captureRun("audit", dir, "--out", out, "--quiet")
	}()
	var res result
	start := time.Now()
	select {
	case res = <-done:
	case <-time.After(hangGuard()):
		t.Fatalf("gnomon audit did not finish within %v on the hostile corpus (hang guard)", hangGuard())
	}
	t.Logf("audit of %d items took %v (logged, not asserted)", len(found), time.Since(start).Round(time.Millisecond))
	// Exit 0 also witnesses the decompression-bomb guard: decoding
	// bomb/png-100000x100000.png would make image/png allocate 40 GB for
	// its pixels before reading any, which this process would not survive.
	if res.code != 0 {
		t.Fatalf("audit exit %d (issue 6: the batch must complete); stderr:\n%s", res.code, res.stderr)
	}

	// Issue 6 "Evidence is never modified": contents, modes, mtimes, link targets.
	checkTreeUnchanged(t, before, treeState(t, dir))

	a := checkHostileJSON(t, out)
	checkHostileRows(t, a, found, manifest)
	checkHostileCSV(t, out, a)
	checkHostileGeoJSON(t, out)
	checkHostileHTML(t, out)
}

// hangGuard is how long the audit may run before the test calls it hung:
// 60 s, generous for 130 small files (it is not a speed assertion), times
// 10 under the race detector, which the Go documentation says slows
// programs 2-20 times ("Data Race Detector", go.dev/doc/articles/race_detector).
func hangGuard() time.Duration {
	d := 60 * time.Second
	if bi, ok := debug.ReadBuildInfo(); ok {
		for _, s := range bi.Settings {
			if s.Key == "-race" && s.Value == "true" {
				d *= 10
			}
		}
	}
	return d
}

// checkTreeUnchanged reports every item of an evidence tree (treeState)
// that changed, vanished or appeared between before and after.
func checkTreeUnchanged(t *testing.T, before, after map[string]string) {
	t.Helper()
	if maps.Equal(before, after) {
		return
	}
	for p, s := range before {
		if a, ok := after[p]; !ok {
			t.Errorf("evidence lost an item: %q", p)
		} else if a != s {
			t.Errorf("evidence changed: %q: %s → %s", p, s, a)
		}
	}
	for p := range after {
		if _, ok := before[p]; !ok {
			t.Errorf("evidence gained an item: %q", p)
		}
	}
}

// hostileWalk lists every non-folder item under dir by its slash path
// relative to dir (exact bytes), without following links or opening
// anything: the items a report must account for (issue 6: "every file is
// accounted for").
func hostileWalk(t *testing.T, dir string) map[string]fs.FileMode {
	t.Helper()
	m := map[string]fs.FileMode{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			return nil
		}
		rel, err := filepath.Rel(dir, p)
		if err != nil {
			return err
		}
		m[filepath.ToSlash(rel)] = d.Type()
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// treeState records every item under dir (folders too) by Lstat:
// mode, size and modification time; the SHA-256 of regular files that can
// be opened; the target of links. The FIFO is never opened.
func treeState(t *testing.T, dir string) map[string]string {
	t.Helper()
	m := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		st, err := os.Lstat(p)
		if err != nil {
			return err
		}
		h := "-"
		switch {
		case st.Mode().IsRegular():
			b, err := os.ReadFile(p)
			switch {
			case errors.Is(err, fs.ErrPermission):
				h = "unreadable-by-test"
			case err != nil:
				return err
			default:
				s := sha256.Sum256(b)
				h = hex.EncodeToString(s[:])
			}
		case st.Mode()&fs.ModeSymlink != 0:
			target, err := os.Readlink(p)
			if err != nil {
				return err
			}
			h = "-> " + target
		}
		m[p] = h + " " + st.Mode().String() + " " + strconv.FormatInt(st.Size(), 10) + " " + st.ModTime().UTC().Format(time.RFC3339Nano)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// checkHostileJSON: report.json is valid JSON (RFC 8259) and survives
// report.ReadJSON + report.WriteJSON byte for byte (issue 6: "JSON stays
// valid for any byte sequence ... with the raw bytes recoverable").
func checkHostileJSON(t *testing.T, out string) *report.Audit {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(out, "report.json"))
	if err != nil {
		t.Fatal(err)
	}
	if !json.Valid(b) {
		t.Fatal("report.json is not valid JSON (RFC 8259)")
	}
	if !utf8.Valid(b) {
		t.Error("report.json is not UTF-8 (RFC 8259 section 8.1 requires UTF-8)")
	}
	a, err := report.ReadJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatalf("report.ReadJSON: %v", err)
	}
	var again bytes.Buffer
	if err := report.WriteJSON(&again, a); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(again.Bytes(), b) {
		t.Error("report.json does not round-trip byte-identical through ReadJSON + WriteJSON (issue 6: raw bytes recoverable)")
	}
	return a
}

// checkHostileRows: one row per item found, counts that add up, a reason
// for every unreadable row, and each item's expected outcome (issue 6,
// "Every file is accounted for: it gets a report row with a clear reason,
// and the summary's counts add up").
func checkHostileRows(t *testing.T, a *report.Audit, found map[string]fs.FileMode, manifest map[string]hostile.Item) {
	t.Helper()
	rows := map[string]report.Photo{}
	for _, p := range a.Photos {
		if _, dup := rows[p.Path]; dup {
			t.Errorf("two rows for %q", p.Path)
		}
		rows[p.Path] = p
	}
	for name := range found {
		if _, ok := rows[name]; !ok {
			t.Errorf("lost: no report row for %q", name)
		}
	}
	for name := range rows {
		if _, ok := found[name]; !ok {
			t.Errorf("row %q matches no item in the folder (bytes of the name not restored?)", name)
		}
	}
	// Crafted 200 KB tag values stay in the files (and in gnomon meta); a
	// report row quotes them only in part, so that no row becomes
	// unreadable and no per-photo text grows with the evidence. The bounds
	// are generous: a real make|model|serial is well under 100 bytes
	// (common practice).
	const maxCameraBytes, maxNoteBytes, maxExplanationBytes = 256, 2 << 10, 8 << 10
	for _, p := range a.Photos {
		if len(p.Camera) > maxCameraBytes {
			t.Errorf("%q: camera id of %d bytes", p.Path, len(p.Camera))
		}
		if len(p.Explanation) > maxExplanationBytes {
			t.Errorf("%q: explanation of %d bytes", p.Path, len(p.Explanation))
		}
		for _, n := range p.FileNotes {
			if len(n) > maxNoteBytes {
				t.Errorf("%q: file note of %d bytes: %.80s…", p.Path, len(n), n)
			}
		}
		for _, ch := range p.Checks {
			if len(ch.Sentence) > maxNoteBytes {
				t.Errorf("%q: %s sentence of %d bytes", p.Path, ch.Kind, len(ch.Sentence))
			}
		}
	}
	c := a.Run.Counts
	sum := 0
	for _, n := range c.ByVerdict {
		sum += n
	}
	if c.Files != sum || c.Files != len(a.Photos) || c.Files != len(found) {
		t.Errorf("counts do not add up: files %d, sum of by_verdict %d, rows %d, items found %d", c.Files, sum, len(a.Photos), len(found))
	}
	root := os.Geteuid() == 0
	for name, it := range manifest {
		p, ok := rows[name]
		if !ok {
			continue
		}
		why := strings.ToLower(p.Error + " " + p.Explanation)
		unreadable := p.Verdict == "unreadable"
		if unreadable && strings.TrimSpace(p.Error) == "" && strings.TrimSpace(p.Explanation) == "" {
			t.Errorf("%q (%s): unreadable without a reason", name, it.Kind)
		}
		switch it.Expect {
		case hostile.ExpectRead:
			if unreadable {
				t.Errorf("%q (%s): verdict unreadable (%s), want its metadata read", name, it.Kind, why)
			}
			// A renamed file is itself a fact for the examiner.
			if it.Kind == "wrong-extension" && !strings.Contains(strings.Join(p.FileNotes, " "), "extension") {
				t.Errorf("%q (%s): file_notes %q do not name the extension that does not fit", name, it.Kind, p.FileNotes)
			}
		case hostile.ExpectUnreadable:
			if !unreadable {
				t.Errorf("%q (%s): verdict %q, want unreadable", name, it.Kind, p.Verdict)
			}
		case hostile.ExpectDenied:
			if root {
				t.Logf("%q: running as root, so permission bits do not stop reading; TestAuditPermissionDenied checks this case as an unprivileged user (verdict here %q)", name, p.Verdict)
				continue
			}
			if !unreadable {
				t.Errorf("%q (%s): verdict %q, want unreadable (permission denied)", name, it.Kind, p.Verdict)
			}
		}
		if it.Why != "" && !strings.Contains(why, strings.ToLower(it.Why)) {
			t.Errorf("%q (%s): reason %q does not say %q", name, it.Kind, why, it.Why)
		}
	}
	// No position out of range reaches a row (RFC 7946 section 4 ranges;
	// the same document feeds the GeoJSON).
	for _, p := range a.Photos {
		if p.Lat != nil && (math.IsNaN(*p.Lat) || *p.Lat < -90 || *p.Lat > 90) || p.Lon != nil && (math.IsNaN(*p.Lon) || *p.Lon < -180 || *p.Lon > 180) {
			t.Errorf("%q: position %s, %s out of range", p.Path, fptr(p.Lat), fptr(p.Lon))
		}
	}
	// Positive controls: the hostile strings did reach the document, so the
	// CSV and HTML checks below test something.
	if cam := rows["meta/markup.jpg"].Camera; !strings.Contains(cam, hostile.ScriptMake) {
		t.Errorf("meta/markup.jpg camera %q lacks the markup payload: the injection checks would be vacuous", cam)
	}
}

// checkHostileCSV: report.csv parses as RFC 4180 (Go's encoding/csv; the
// writer ends lines with \n, which the reader accepts), has one row per
// photo, and no text cell can start a formula unless neutralised with an
// apostrophe (OWASP CSV injection: = + - @ tab CR, also after leading
// spaces; numeric columns are numbers we formatted, per report.NeutraliseCell).
func checkHostileCSV(t *testing.T, out string, a *report.Audit) {
	t.Helper()
	f, err := os.Open(filepath.Join(out, "report.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("report.csv is not RFC 4180 CSV: %v", err)
	}
	if len(recs) == 0 || !slices.Equal(recs[0], report.CSVColumns()) {
		t.Fatalf("report.csv header %q, want %q", recs[0], report.CSVColumns())
	}
	if len(recs)-1 != len(a.Photos) {
		t.Errorf("report.csv has %d rows, report.json %d photos", len(recs)-1, len(a.Photos))
	}
	numeric := map[string]bool{"size": true, "lat": true, "lon": true, "sun_azimuth": true, "sun_altitude": true,
		"offset_s": true, "offset_low_s": true, "offset_high_s": true}
	cols := report.CSVColumns()
	// encoding/csv drops a \r before \n inside quoted fields, so the
	// expected paths are compared in that form.
	want := map[string]int{}
	for _, p := range a.Photos {
		want[strings.ReplaceAll(report.NeutraliseCell(p.Path), "\r\n", "\n")]++
	}
	for ri, rec := range recs[1:] {
		for ci, cell := range rec {
			col := cols[ci]
			if numeric[col] {
				if cell == "" || cell == "NaN" || cell == "'+Inf" || cell == "'-Inf" {
					continue
				}
				if _, err := strconv.ParseFloat(cell, 64); err != nil {
					t.Errorf("row %d %s: numeric cell %q is not a number", ri+1, col, cell)
				}
				continue
			}
			if formulaStart(cell) && !strings.HasPrefix(cell, "'") {
				t.Errorf("row %d %s: cell %q starts a formula without an apostrophe (OWASP CSV injection)", ri+1, col, clip(cell))
			}
		}
		want[rec[0]]--
	}
	for p, n := range want {
		if n != 0 {
			t.Errorf("report.csv path cell %q: %+d rows against report.json", clip(p), n)
		}
	}
}

// formulaStart is OWASP's list of characters that make a spreadsheet read
// a cell as a formula: = + - @ tab CR, and their full-width forms, also
// after leading white space.
func formulaStart(s string) bool {
	if s == "" {
		return false
	}
	if s[0] == '\t' || s[0] == '\r' {
		return true
	}
	r, _ := utf8.DecodeRuneInString(strings.TrimLeftFunc(s, unicode.IsSpace))
	return strings.ContainsRune("=+-@\t\r＝＋－＠", r)
}

func fptr(f *float64) string {
	if f == nil {
		return "null"
	}
	return strconv.FormatFloat(*f, 'g', -1, 64)
}

func clip(s string) string {
	if len(s) > 80 {
		return s[:80] + "…"
	}
	return s
}

// checkHostileGeoJSON: report.geojson is an RFC 7946 FeatureCollection;
// every Point has finite coordinates in range (RFC 7946 sections 3.1.1 and
// 4: longitude, latitude in WGS 84 degrees); a null geometry carries a
// skipped_reason (issue 6: "GeoJSON skips invalid coordinates with a reason").
func checkHostileGeoJSON(t *testing.T, out string) {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(out, "report.geojson"))
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Type     string `json:"type"`
		Features []struct {
			Type     string `json:"type"`
			Geometry *struct {
				Type        string    `json:"type"`
				Coordinates []float64 `json:"coordinates"`
			} `json:"geometry"`
			Properties map[string]any `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(b, &fc); err != nil {
		t.Fatalf("report.geojson: %v", err)
	}
	if fc.Type != "FeatureCollection" {
		t.Errorf("report.geojson type %q, want FeatureCollection (RFC 7946 section 3.3)", fc.Type)
	}
	skipped := 0
	for i, f := range fc.Features {
		if f.Type != "Feature" {
			t.Errorf("feature %d: type %q", i, f.Type)
		}
		g := f.Geometry
		if g == nil {
			if r, _ := f.Properties["skipped_reason"].(string); r == "" {
				t.Errorf("feature %d (%v): null geometry without a skipped_reason", i, f.Properties["path"])
			}
			skipped++
			continue
		}
		c := g.Coordinates
		if g.Type != "Point" || len(c) < 2 || len(c) > 3 {
			t.Errorf("feature %d: geometry %s %v", i, g.Type, c)
			continue
		}
		for _, v := range c {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("feature %d: non-finite coordinate %v", i, c)
			}
		}
		if c[0] < -180 || c[0] > 180 || c[1] < -90 || c[1] > 90 {
			t.Errorf("feature %d (%v): coordinates %v out of range (RFC 7946 section 4)", i, f.Properties["path"], c)
		}
	}
	if skipped == 0 {
		// Issue 6: invalid coordinates are skipped "with a reason".
		t.Errorf("gps/out-of-range.jpg (latitude 123.4°, longitude 200.5°) has no skipped GeoJSON feature with a reason")
	}
}

// checkHostileHTML opens report.html in headless Chromium, as
// report/browser_test.go does, and checks the browser's own DOM: no
// element or attribute injected through metadata or file names exists
// (issue 6: "the browser test proves no element injected through a
// photo's metadata exists in the rendered page").
func checkHostileHTML(t *testing.T, out string) {
	t.Helper()
	bin, ok := browsertest.Lookup()
	if !ok {
		t.Log("HTML browser check skipped: no chromium found (CI installs the Debian package \"chromium\"; or set GNOMON_CHROMIUM)")
		return
	}
	page := filepath.Join(out, "report.html")
	dom, _ := browsertest.Run(t, bin, page, "--dump-dom")
	if !strings.Contains(dom, "</html>") {
		t.Fatal("Chromium dumped no DOM")
	}
	// The payloads are there, as text (positive control).
	if !strings.Contains(dom, "&lt;x-gnomon-injected") {
		t.Error("the custom-element payload is not shown as text in the page: the injection check would be vacuous")
	}
	for _, e := range browsertest.Elements(dom) {
		switch e.Name {
		case "script", "iframe", "object", "embed", "frame", "base", "form", "link":
			t.Errorf("injected element <%s %v> in the rendered DOM", e.Name, e.Attrs)
		}
		if slices.Contains(hostile.InjectedNames, e.Name) {
			t.Errorf("element named from a payload: <%s %v>", e.Name, e.Attrs)
		}
		for k, v := range e.Attrs {
			if strings.HasPrefix(k, "on") {
				t.Errorf("event handler attribute %s=%q on <%s>", k, v, e.Name)
			}
			if k == "id" && v == "pwn" {
				t.Errorf("<%s id=pwn>: an attribute from a payload", e.Name)
			}
			if (k == "src" || k == "href" || k == "xlink:href" || k == "srcset" || k == "action") && !strings.HasPrefix(v, "thumbnails/") && !strings.HasPrefix(v, "#") {
				t.Errorf("<%s %s=%q>: only local thumbnails and in-page anchors may be referenced", e.Name, k, v)
			}
		}
		if e.Name == "meta" && strings.EqualFold(e.Attrs["http-equiv"], "refresh") {
			t.Error("meta refresh in the DOM")
		}
	}
	if dir := os.Getenv("GNOMON_ARTIFACTS"); dir != "" {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		shot := filepath.Join(dir, "hostile-report.png")
		browsertest.Run(t, bin, page, "--screenshot="+shot, "--window-size=1280,4000", "--hide-scrollbars")
		if st, err := os.Stat(shot); err != nil || st.Size() == 0 {
			t.Errorf("no screenshot at %s: %v", shot, err)
		} else {
			t.Logf("screenshot: %s", shot)
		}
	}
}

// TestHostileDetectors is the control for the detectors above: a formula
// cell and an injected element must be seen, so a silent run means a clean
// report, not a blind check.
func TestHostileDetectors(t *testing.T) {
	formulas := []struct {
		cell    string
		formula bool
		source  string
	}{
		{"=1+1", true, "OWASP CSV injection: ="},
		{"+cmd|' /C calc'!A0", true, "OWASP CSV injection: + (DDE)"},
		{"-2+3", true, "OWASP CSV injection: -"},
		{"@SUM(1)", true, "OWASP CSV injection: @"},
		{"\t=1", true, "OWASP CSV injection: tab"},
		{"\r=1", true, "OWASP CSV injection: carriage return"},
		{"  =1", true, "report.NeutraliseCell doc: after leading white space"},
		{"＝1", true, "report.NeutraliseCell doc: full-width forms"},
		{"'=1+1", false, "OWASP: apostrophe prefix makes text"},
		{"IMG_0001.jpg", false, "plain text"},
		{"", false, "empty cell"},
	}
	for _, f := range formulas {
		if got := formulaStart(f.cell); got != f.formula {
			t.Errorf("formulaStart(%q) = %v, want %v (%s)", f.cell, got, f.formula, f.source)
		}
	}
	dom := `<html><body><p title="a &lt;script&gt; b">&lt;script&gt;x</p><img src="thumbnails/1.jpg" onerror="alert(1)"><x-gnomon-injected id="pwn"></x-gnomon-injected><script>1</script></body></html>`
	var names []string
	var handler bool
	for _, e := range browsertest.Elements(dom) {
		names = append(names, e.Name)
		if _, ok := e.Attrs["onerror"]; ok {
			handler = true
		}
	}
	want := []string{"html", "body", "p", "img", "x-gnomon-injected", "script"}
	if !slices.Equal(names, want) || !handler {
		t.Errorf("browsertest.Elements found %v (onerror seen: %v), want %v with onerror (serialised-DOM rules of the HTML Standard: text escapes '<')", names, handler, want)
	}
}
