package audit

import (
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"syscall"
	"testing"
)

// TestWalk builds a folder with the awkward items evidence folders hold and
// checks that every one is listed, with the right reason, and that the walk
// ends (symbolic-link loops cannot trap it).
func TestWalk(t *testing.T) {
	root := filepath.Join(t.TempDir(), "ev")
	outside := t.TempDir()
	must := func(err error) {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
	}
	must(os.MkdirAll(filepath.Join(root, "a", "b"), 0o755))
	must(os.WriteFile(filepath.Join(root, "a", "IMG_1.jpg"), []byte("x"), 0o644))
	must(os.WriteFile(filepath.Join(root, "a", "IMG_1.xmp"), []byte("x"), 0o644))
	must(os.WriteFile(filepath.Join(root, "a", "b", "IMG_2.jpg"), []byte("x"), 0o644))
	must(os.WriteFile(filepath.Join(root, "a", "b", "IMG_2.jpg.xmp"), []byte("x"), 0o644))
	must(os.WriteFile(filepath.Join(outside, "secret.txt"), []byte("x"), 0o644))
	must(os.Symlink(filepath.Join(root, "a"), filepath.Join(root, "a", "b", "loop")))         // folder link: a loop
	must(os.Symlink(filepath.Join(outside, "secret.txt"), filepath.Join(root, "escape.txt"))) // leaves the tree
	must(os.Symlink(filepath.Join(root, "a", "IMG_1.jpg"), filepath.Join(root, "alias.jpg"))) // inside: read
	must(os.Symlink(filepath.Join(root, "nowhere"), filepath.Join(root, "dangling.jpg")))
	must(syscall.Mkfifo(filepath.Join(root, "pipe"), 0o644))

	es, err := Walk([]string{root})
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]Entry{}
	for _, e := range es {
		got[e.Rel] = e
	}
	cases := []struct {
		rel       string
		want      error // nil: readable
		sidecarOf string
	}{
		{"a/IMG_1.jpg", nil, ""},
		{"a/IMG_1.xmp", nil, "a/IMG_1.jpg"},
		{"a/b/IMG_2.jpg", nil, ""},
		{"a/b/IMG_2.jpg.xmp", nil, "a/b/IMG_2.jpg"},
		{"a/b/loop", ErrLinkDir, ""},
		{"escape.txt", ErrLinkOutside, ""},
		{"alias.jpg", nil, ""},
		{"dangling.jpg", ErrLinkBroken, ""},
		{"pipe", ErrNotRegular, ""},
	}
	for _, c := range cases {
		e, ok := got[c.rel]
		if !ok {
			t.Errorf("%s: not listed", c.rel)
			continue
		}
		if (c.want == nil) != (e.Err == nil) || (c.want != nil && !errors.Is(e.Err, c.want)) {
			t.Errorf("%s: error %v, want %v", c.rel, e.Err, c.want)
		}
		if e.SidecarOf != c.sidecarOf {
			t.Errorf("%s: sidecar of %q, want %q", c.rel, e.SidecarOf, c.sidecarOf)
		}
	}
	if len(es) != len(cases) {
		t.Errorf("%d entries, want %d: %+v", len(es), len(cases), es)
	}
	for i := 1; i < len(es); i++ {
		if es[i-1].Rel >= es[i].Rel {
			t.Errorf("entries not sorted: %q before %q", es[i-1].Rel, es[i].Rel)
		}
	}
}

func TestWalkUnreadableFolder(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("running as root: permission bits do not stop reading")
	}
	root := t.TempDir()
	locked := filepath.Join(root, "locked")
	if err := os.Mkdir(locked, 0o000); err != nil {
		t.Fatal(err)
	}
	defer os.Chmod(locked, 0o755)
	es, err := Walk([]string{root})
	if err != nil {
		t.Fatal(err)
	}
	if len(es) != 1 || es[0].Err == nil {
		t.Fatalf("entries %+v: want one entry with a permission error", es)
	}
}

func TestInside(t *testing.T) {
	root := t.TempDir()
	ev := filepath.Join(root, "ev")
	if err := os.MkdirAll(filepath.Join(ev, "sub"), 0o755); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(root, "link")
	if err := os.Symlink(ev, link); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		out  string
		want bool
	}{
		{filepath.Join(ev, "report"), true},
		{filepath.Join(ev, "sub", "new", "report"), true},
		{filepath.Join(link, "report"), true}, // through a link to the evidence
		{ev, true},
		{filepath.Join(root, "ev-report"), false}, // a sibling sharing the prefix
		{filepath.Join(root, "report"), false},
	}
	for _, c := range cases {
		if _, got := Inside(c.out, []string{ev}); got != c.want {
			t.Errorf("Inside(%q) = %v, want %v", c.out, got, c.want)
		}
	}
}

// TestInputs: one input per real folder, whatever its spelling; an input
// inside another refused; labels that tell inputs apart.
func TestInputs(t *testing.T) {
	base := t.TempDir()
	t.Chdir(base)
	for _, d := range []string{"ph/sub", "a/card", "b/card", "x/a/card"} {
		if err := os.MkdirAll(filepath.Join(base, d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.WriteFile(filepath.Join(base, "ph", "sub", "f.jpg"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(filepath.Join(base, "ph"), filepath.Join(base, "alias")); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name   string
		args   []string
		labels []string // nil: an error is wanted
		nested bool
	}{
		{"one folder spelt four ways", []string{"ph", "ph/", "./ph", "alias"}, []string{"ph"}, false},
		{"equal base names: parents added", []string{"a/card", "b/card"}, []string{"a/card", "b/card"}, false},
		{"as many parents as it takes", []string{"a/card", "x/a/card", "b/card"}, []string{filepath.Base(base) + "/a/card", "x/a/card", "b/card"}, false},
		{"a folder inside another", []string{"ph", "ph/sub"}, nil, true},
		{"a file inside a folder", []string{"ph/sub/f.jpg", "ph"}, nil, true},
		{"a file input is labelled by its name", []string{"ph/sub/f.jpg"}, []string{"f.jpg"}, false},
		{"missing input", []string{"ph", "nothing"}, nil, false},
	}
	for _, c := range cases {
		ins, err := Inputs(c.args)
		if c.labels == nil {
			if err == nil || errors.Is(err, ErrNestedInput) != c.nested {
				t.Errorf("%s: err %v, want an error (nested: %v)", c.name, err, c.nested)
			}
			continue
		}
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		var got []string
		for _, in := range ins {
			got = append(got, in.Label)
		}
		if !slices.Equal(got, c.labels) {
			t.Errorf("%s: labels %q, want %q", c.name, got, c.labels)
		}
	}
	// The missing input is named, and the others are still returned.
	ins, err := Inputs([]string{"ph", "nothing"})
	if len(ins) != 1 || err == nil || !strings.Contains(err.Error(), `input "nothing"`) {
		t.Errorf("missing input: %d inputs, err %v", len(ins), err)
	}
}

// TestWalkIDs: an entry's ID is its input's label and its path inside it.
func TestWalkIDs(t *testing.T) {
	base := t.TempDir()
	for _, p := range []string{"a/card/DCIM/IMG_1.JPG", "b/card/DCIM/IMG_1.JPG"} {
		if err := os.MkdirAll(filepath.Dir(filepath.Join(base, p)), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(base, p), []byte("x"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	es, err := Walk([]string{filepath.Join(base, "a", "card"), filepath.Join(base, "b", "card"), filepath.Join(base, "a", "card", "DCIM", "..")})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range es {
		got = append(got, e.ID+" = "+e.Rel)
	}
	want := []string{"a/card/DCIM/IMG_1.JPG = DCIM/IMG_1.JPG", "b/card/DCIM/IMG_1.JPG = DCIM/IMG_1.JPG"}
	if !slices.Equal(got, want) {
		t.Errorf("entries %q, want %q", got, want)
	}
}
