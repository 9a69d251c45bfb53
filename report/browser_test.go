package report

import (
	"image"
	_ "image/png"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/testkit/browsertest"
)

func tail(s string, n int) string {
	if len(s) > n {
		return s[len(s)-n:]
	}
	return s
}

// pageProblems returns the lines of Chromium's log that report a problem
// with the page itself: console messages, uncaught errors, and resources
// refused by the Content-Security-Policy.
var pageProblem = regexp.MustCompile(`(?i)CONSOLE|Uncaught|Refused to|Content Security Policy|Not allowed to load|ERR_FILE_NOT_FOUND`)

func pageProblems(log string) []string {
	var out []string
	for _, line := range strings.Split(log, "\n") {
		if pageProblem.MatchString(line) {
			out = append(out, line)
		}
	}
	return out
}

// TestBrowserRendersSafely opens the report of the hostile fixture in
// headless Chromium. The browser's own DOM is the witness: it must hold
// every card and chart and no element or attribute injected through a
// photo's metadata; the log must show no console error and no resource
// refused; and a screenshot is kept as an artifact.
func TestBrowserRendersSafely(t *testing.T) {
	t.Parallel()
	bin := browsertest.Find(t)
	dir := t.TempDir()
	if err := os.MkdirAll(filepath.Join(dir, "thumbs"), 0o755); err != nil {
		t.Fatal(err)
	}
	img := testImage(900, 600)
	for i, o := range map[string]int{"0001": 1, "0002": 6} {
		if err := WriteThumbnail(filepath.Join(dir, "thumbs", i+".jpg"), nil, opener(img), o); err != nil {
			t.Fatal(err)
		}
	}
	a := fixtureAudit()
	page := filepath.Join(dir, "report.html")
	if err := WriteFileAtomic(page, func(w io.Writer) error { return WriteHTML(w, a) }); err != nil {
		t.Fatal(err)
	}

	dom, log := browsertest.Run(t, bin, page, "--dump-dom")
	if !strings.Contains(dom, "</html>") {
		t.Fatalf("no DOM dumped; log:\n%s", tail(log, 2000))
	}
	if p := pageProblems(log); len(p) > 0 {
		t.Errorf("the page logged problems:\n%s", strings.Join(p, "\n"))
	}

	els := browsertest.Elements(dom)
	count := func(pred func(browsertest.Element) bool) int {
		n := 0
		for _, e := range els {
			if pred(e) {
				n++
			}
		}
		return n
	}
	wantSky, wantClock, wantResets := 0, 0, 0
	for _, p := range a.Photos {
		if buildSky(p) != nil {
			wantSky++
		}
	}
	for _, c := range a.Cameras {
		if ch := buildClock(c).Chart; ch != nil {
			wantClock++
			wantResets += len(ch.Breaks)
		}
	}
	presence := []struct {
		what string
		got  int
		want int
	}{
		{"photo cards", count(func(e browsertest.Element) bool { return e.Name == "article" && e.HasClass("card") }), len(a.Photos)},
		{"sky charts", count(func(e browsertest.Element) bool { return e.Name == "figure" && e.HasClass("sky") }), wantSky},
		{"clock charts", count(func(e browsertest.Element) bool { return e.Name == "svg" && e.HasClass("clock") }), wantClock},
		{"clock reset lines", count(func(e browsertest.Element) bool { return e.Name == "path" && e.HasClass("reset") }), wantResets},
		{"sun-path tracks", count(func(e browsertest.Element) bool { return e.Name == "path" && e.HasClass("track") }), wantSky},
		{"thumbnails", count(func(e browsertest.Element) bool { return e.Name == "img" }), 2},
		{"methods section", count(func(e browsertest.Element) bool { return e.Name == "section" && e.Attrs["id"] == "methods" }), 1},
	}
	for _, p := range presence {
		if p.got != p.want {
			t.Errorf("%s: %d in the rendered DOM, want %d", p.what, p.got, p.want)
		}
	}
	for _, e := range els {
		switch e.Name {
		case "script", "iframe", "object", "embed", "frame", "base", "form", "link":
			t.Errorf("injected element <%s %v> in the rendered DOM", e.Name, e.Attrs)
		}
		for k, v := range e.Attrs {
			if strings.HasPrefix(k, "on") {
				t.Errorf("event handler attribute %s=%q on <%s>", k, v, e.Name)
			}
			if (k == "src" || k == "href" || k == "xlink:href") && !strings.HasPrefix(v, "thumbs/") {
				t.Errorf("<%s %s=%q>: only local thumbnails may be referenced", e.Name, k, v)
			}
		}
		if e.Name == "meta" && strings.EqualFold(e.Attrs["http-equiv"], "refresh") {
			t.Error("meta refresh in the DOM")
		}
	}
	if count(func(e browsertest.Element) bool { return e.Name == "style" }) != 1 {
		t.Error("want exactly the page's own <style> element")
	}
	// The hostile strings are there, as text.
	for _, s := range []string{"&lt;script&gt;alert('path')&lt;/script&gt;.jpg", "&lt;img src=x onerror=\"alert('camera')\"&gt;", "&lt;/svg&gt;&lt;script&gt;alert('explanation')&lt;/script&gt;"} {
		if !strings.Contains(dom, s) {
			t.Errorf("hostile string not shown as text: %s", s)
		}
	}

	// Screenshot, kept as an artifact.
	artDir := os.Getenv("GNOMON_ARTIFACTS")
	if artDir == "" {
		artDir = t.TempDir()
	} else if err := os.MkdirAll(artDir, 0o755); err != nil {
		t.Fatal(err)
	}
	shot := filepath.Join(artDir, "report-browser.png")
	_, log = browsertest.Run(t, bin, page, "--screenshot="+shot, "--window-size=1280,4000", "--hide-scrollbars")
	if p := pageProblems(log); len(p) > 0 {
		t.Errorf("the page logged problems:\n%s", strings.Join(p, "\n"))
	}
	f, err := os.Open(shot)
	if err != nil {
		t.Fatalf("no screenshot: %v", err)
	}
	defer f.Close()
	cfg, format, err := image.DecodeConfig(f)
	if err != nil || format != "png" || cfg.Width != 1280 || cfg.Height != 4000 {
		t.Errorf("screenshot %s: %s %dx%d, %v; want png 1280x4000", shot, format, cfg.Width, cfg.Height, err)
	}
	t.Logf("screenshot: %s", shot)
}

// TestBrowserDetectorWorks is the control for the test above: a page whose
// inline script the same policy refuses, and whose image is missing, must be
// reported by pageProblems, so a silent log really means a clean page.
func TestBrowserDetectorWorks(t *testing.T) {
	if testing.Short() {
		t.Skip("control run skipped in -short mode")
	}
	t.Parallel()
	bin := browsertest.Find(t)
	dir := t.TempDir()
	page := filepath.Join(dir, "control.html")
	html := `<!DOCTYPE html><html><head><meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src 'self' data:; style-src 'unsafe-inline'">
<title>control</title></head><body><p id="x">control</p><script>document.title = "ran"</script>
<img src="thumbs/missing.jpg" alt=""></body></html>`
	if err := os.WriteFile(page, []byte(html), 0o644); err != nil {
		t.Fatal(err)
	}
	dom, log := browsertest.Run(t, bin, page, "--dump-dom")
	if strings.Contains(dom, "<title>ran</title>") {
		t.Error("the inline script ran despite the policy")
	}
	if len(pageProblems(log)) == 0 {
		t.Errorf("the refused script left no trace in the log; the detector is blind:\n%s", tail(log, 3000))
	}
}
