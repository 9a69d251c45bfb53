// Package browsertest opens report pages in headless Chromium for the
// tests of package report and of the audit command, and reads the DOM the
// browser serialises. It is imported only by tests.
package browsertest

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"strings"
	"testing"
	"time"
)

// Lookup returns the Chromium binary: $GNOMON_CHROMIUM, else the first of
// the usual names on PATH. CI installs the Debian package "chromium".
func Lookup() (string, bool) {
	if p := os.Getenv("GNOMON_CHROMIUM"); p != "" {
		return p, true
	}
	for _, name := range []string{"/usr/bin/chromium", "chromium", "chromium-browser", "google-chrome"} {
		if p, err := exec.LookPath(name); err == nil {
			return p, true
		}
	}
	return "", false
}

// Find returns the Chromium binary, or skips the test with a message.
func Find(t testing.TB) string {
	t.Helper()
	bin, ok := Lookup()
	if !ok {
		t.Skip("browser test skipped: no chromium found (install the Debian package \"chromium\" or set GNOMON_CHROMIUM)")
	}
	return bin
}

// Run runs headless Chromium on a local file with a fresh profile, the
// network-quiet flags and logging to stderr, and returns what it printed.
func Run(t testing.TB, bin, page string, extra ...string) (stdout, stderr string) {
	t.Helper()
	args := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--user-data-dir=" + t.TempDir(), "--enable-logging=stderr", "--v=0"}
	args = append(args, extra...)
	args = append(args, "file://"+page)
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, args...)
	var out, errb bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &errb
	if err := cmd.Run(); err != nil {
		log := errb.String()
		if len(log) > 2000 {
			log = log[len(log)-2000:]
		}
		t.Fatalf("chromium %v: %v\n%s", extra, err, log)
	}
	return out.String(), errb.String()
}

// Element is a start tag seen in a serialised DOM.
type Element struct {
	Name  string
	Attrs map[string]string
}

// HasClass reports whether e's class attribute lists c.
func (e Element) HasClass(c string) bool {
	return strings.Contains(" "+e.Attrs["class"]+" ", " "+c+" ")
}

// Elements lists the start tags of a DOM as Chromium serialises it
// (--dump-dom). In that serialisation text nodes escape '<' (HTML Standard,
// serialising HTML fragments), so every '<' followed by a letter starts an
// element; attribute values are quoted and may hold '>'.
func Elements(dom string) []Element {
	var out []Element
	for i := 0; i < len(dom); i++ {
		if dom[i] != '<' || i+1 >= len(dom) || !isLetter(dom[i+1]) {
			continue
		}
		j := i + 1
		for j < len(dom) && !strings.ContainsRune(" \t\n\r/>", rune(dom[j])) {
			j++
		}
		el := Element{Name: strings.ToLower(dom[i+1 : j]), Attrs: map[string]string{}}
		for j < len(dom) && dom[j] != '>' {
			if strings.ContainsRune(" \t\n\r/", rune(dom[j])) {
				j++
				continue
			}
			k := j
			for k < len(dom) && !strings.ContainsRune(" \t\n\r/>=", rune(dom[k])) {
				k++
			}
			name := strings.ToLower(dom[j:k])
			val := ""
			if k < len(dom) && dom[k] == '=' {
				k++
				if k < len(dom) && (dom[k] == '"' || dom[k] == '\'') {
					q := dom[k]
					end := strings.IndexByte(dom[k+1:], q)
					if end < 0 {
						end = len(dom) - k - 1
					}
					val = dom[k+1 : k+1+end]
					k += end + 2
				} else {
					v := k
					for k < len(dom) && !strings.ContainsRune(" \t\n\r>", rune(dom[k])) {
						k++
					}
					val = dom[v:k]
				}
			}
			el.Attrs[name] = val
			j = k
		}
		out = append(out, el)
		i = j
	}
	return out
}

func isLetter(b byte) bool { return b >= 'a' && b <= 'z' || b >= 'A' && b <= 'Z' }
