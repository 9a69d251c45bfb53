package hostile

import (
	"bytes"
	"crypto/sha256"
	"fmt"
	"image"
	_ "image/jpeg"
	_ "image/png"
	"io/fs"
	"os"
	"path/filepath"
	"testing"
	"unicode/utf8"
)

// treeHash hashes names, types, modes, link targets and contents of every
// item under dir (never opening the FIFO).
func treeHash(t *testing.T, dir string) []byte {
	t.Helper()
	h := sha256.New()
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		st, err := os.Lstat(p)
		if err != nil {
			return err
		}
		fmt.Fprintf(h, "%q %v\n", rel, st.Mode())
		switch {
		case st.Mode()&fs.ModeSymlink != 0:
			l, _ := os.Readlink(p)
			fmt.Fprintf(h, "-> %q\n", l)
		case st.Mode().IsRegular() && st.Mode().Perm() != 0:
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			h.Write(b)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return h.Sum(nil)
}

// TestWriteDeterministic: two corpora built by the same code are identical
// (names, modes, link targets, bytes) and the manifest lists every item on
// disk exactly once.
func TestWriteDeterministic(t *testing.T) {
	a, b := filepath.Join(t.TempDir(), "a"), filepath.Join(t.TempDir(), "b")
	ia, err := Write(a)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = os.Chmod(filepath.Join(a, "special", "denied.jpg"), 0o644) })
	ib, err := Write(b)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = os.Chmod(filepath.Join(b, "special", "denied.jpg"), 0o644) })
	if !bytes.Equal(treeHash(t, a), treeHash(t, b)) {
		t.Error("two builds differ")
	}
	if fmt.Sprint(ia) != fmt.Sprint(ib) {
		t.Error("two manifests differ")
	}
	seen := map[string]bool{}
	for _, it := range ia {
		if seen[it.Name] {
			t.Errorf("%q listed twice", it.Name)
		}
		seen[it.Name] = true
		if _, err := os.Lstat(filepath.Join(a, filepath.FromSlash(it.Name))); err != nil {
			t.Errorf("%q: %v", it.Name, err)
		}
		switch it.Expect {
		case ExpectRead, ExpectUnreadable, ExpectRow, ExpectDenied:
		default:
			t.Errorf("%q: unknown Expect %q", it.Name, it.Expect)
		}
	}
	n := 0
	_ = filepath.WalkDir(a, func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			n++
		}
		return nil
	})
	if n != len(ia) {
		t.Errorf("%d items on disk, %d in the manifest", n, len(ia))
	}
}

// TestCorpusAgainstOutsideReaders checks what the corpus claims about its
// files with readers this project did not write (Go's image/jpeg and
// image/png, and unicode/utf8): the control photos decode, the wrong
// extensions hold the other format, the bombs declare more than
// report.MaxDecodePixels (120 MP, not imported to keep this package
// independent of report), the truncations do not decode, and the name
// items include invalid UTF-8.
func TestCorpusAgainstOutsideReaders(t *testing.T) {
	dir := t.TempDir()
	if _, err := Write(dir); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = os.Chmod(filepath.Join(dir, "special", "denied.jpg"), 0o644) })
	cases := []struct {
		name, format string
		minPixels    int64 // 0: must decode fully; >0: header declares at least this many
		wantFail     bool
		source       string
	}{
		{"truncated/whole.jpg", "jpeg", 0, false, "image/jpeg (Go standard library)"},
		{"ext/png-named.jpg", "png", 0, false, "image/png (Go standard library)"},
		{"ext/jpeg-named.heic", "jpeg", 0, false, "image/jpeg (Go standard library)"},
		{"bomb/png-100000x100000.png", "png", 120_000_001, false, "image/png DecodeConfig"},
		{"bomb/jpeg-65500x65500.jpg", "jpeg", 120_000_001, false, "image/jpeg DecodeConfig"},
		{"truncated/jpeg-01715-boundary-FFC0.jpg", "", 0, true, "image/jpeg: cut before the frame header"},
		{"ext/text-named.jpg", "", 0, true, "no Go image decoder accepts text"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			b, err := os.ReadFile(filepath.Join(dir, c.name))
			if err != nil {
				t.Fatal(err)
			}
			if c.minPixels > 0 {
				cfg, f, err := image.DecodeConfig(bytes.NewReader(b))
				if err != nil || f != c.format || int64(cfg.Width)*int64(cfg.Height) < c.minPixels {
					t.Errorf("%s: %s %dx%d %v; want %s declaring ≥ %d px", c.source, f, cfg.Width, cfg.Height, err, c.format, c.minPixels)
				}
				return
			}
			_, f, err := image.Decode(bytes.NewReader(b))
			if c.wantFail {
				if err == nil {
					t.Errorf("%s: decoded as %s, want failure", c.source, f)
				}
				return
			}
			if err != nil || f != c.format {
				t.Errorf("%s: %s, %v; want %s", c.source, f, err, c.format)
			}
		})
	}
	items, _ := Write(filepath.Join(t.TempDir(), "again"))
	bad := 0
	for _, it := range items {
		if it.Kind == "name" && !utf8.ValidString(it.Name) {
			bad++
		}
	}
	if bad < 3 {
		t.Errorf("%d name items are invalid UTF-8 (unicode/utf8), want at least 3", bad)
	}
}
