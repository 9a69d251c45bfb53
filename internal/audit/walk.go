package audit

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"
)

// Entry is one item found under an input: a file to read, or something
// that could not be read, with why. Every item the walk meets becomes an
// entry, so that the report accounts for the whole evidence folder.
//
// An item is identified by its input and its path inside it, never by the
// relative path alone: two memory cards both holding DCIM/IMG_0001.JPG
// hold two different photos. ID is that identity written as one slash
// path (the input's label, then Rel), the name the sheet template gives
// the photo and the key the sheet's rows are matched to.
type Entry struct {
	Root string // the input as given on the command line
	Abs  string // absolute path of the item
	Rel  string // slash path relative to Root; the base name for a file input
	// ID is Input.Label joined with Rel for a folder input, and the label
	// alone for a file input (whose label ends with the file's name).
	ID string
	// Err says why the item is not read as a photo (not a regular file,
	// permission denied, a link out of the tree); nil for a readable file.
	Err error
	// SidecarOf names the photo (Rel) whose .xmp sidecar this is, "" otherwise.
	SidecarOf string
}

// ErrNotRegular marks an item that is not a regular file (a FIFO, a device,
// a socket): reading it could block or mean nothing.
var ErrNotRegular = errors.New("not a regular file")

// ErrLinkOutside marks a symbolic link whose target lies outside the audited
// folder (or cannot be resolved): it is not followed.
var ErrLinkOutside = errors.New("symbolic link leading outside the audited folder; not followed")

// ErrLinkBroken marks a symbolic link that loops or points to nothing: it
// has no target to read.
var ErrLinkBroken = errors.New("symbolic link that loops or points to nothing; not followed")

// ErrLinkDir marks a symbolic link to a folder: folders are reached through
// their real paths only, so that no loop can form.
var ErrLinkDir = errors.New("symbolic link to a folder; not followed (its contents are audited through their real path)")

// ErrNestedInput marks an input that lies inside another input: its files
// would be counted twice, once under each, and a camera's clock model would
// take each photo for two witnesses. It is a usage error.
var ErrNestedInput = errors.New("lies inside another input; give only the outer folder")

// Input is one input of the command line after the duplicates are gone.
type Input struct {
	Arg   string // as given
	Abs   string // absolute, cleaned
	Real  string // Abs with every symbolic link resolved
	IsDir bool
	// Label names the input in the items' IDs: the last element of Abs,
	// or as many last elements as it takes to tell it from every other
	// input's (/a/card and /b/card are "a/card" and "b/card").
	Label string
	// Same lists the other arguments that name this input ("ph/" and
	// "./ph" beside "ph"): read once, under Arg.
	Same []string
}

// Inputs resolves the inputs given on the command line. Inputs with the
// same real path ("ph", "ph/", "./ph", a link to ph) are one input, kept
// under its first spelling. An input that cannot be examined (it does not
// exist, permission denied) is left out and its error returned, joined with
// the others', so that a caller that can go on without it may; an input
// inside another makes an error wrapping ErrNestedInput.
func Inputs(args []string) ([]Input, error) {
	var ins []Input
	var errs []error
	seen := map[string]int{} // real path → index in ins
	for _, a := range args {
		in, err := resolveInput(a)
		if err != nil {
			errs = append(errs, fmt.Errorf("input %q: %w", a, unwrapPath(err)))
			continue
		}
		if i, ok := seen[in.Real]; ok {
			ins[i].Same = append(ins[i].Same, a)
			continue
		}
		seen[in.Real] = len(ins)
		ins = append(ins, in)
	}
	for _, in := range ins {
		for _, out := range ins {
			if out.IsDir && in.Real != out.Real && within(in.Real, out.Real) {
				return nil, fmt.Errorf("input %q %w %q", in.Arg, ErrNestedInput, out.Arg)
			}
		}
	}
	label(ins)
	return ins, errors.Join(errs...)
}

// resolveInput examines one argument: its absolute and real paths, and
// whether it is a folder.
func resolveInput(a string) (Input, error) {
	abs, err := filepath.Abs(a)
	if err != nil {
		return Input{}, err
	}
	st, err := os.Stat(abs)
	if err != nil {
		return Input{}, err
	}
	real, err := filepath.EvalSymlinks(abs)
	if err != nil {
		return Input{}, err
	}
	return Input{Arg: a, Abs: abs, Real: real, IsDir: st.IsDir()}, nil
}

// unwrapPath drops the *fs.PathError wrapper, whose path repeats the
// input's name in a message that already gives it.
func unwrapPath(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// label gives every input the shortest tail of its absolute path that no
// other input shares; distinct inputs have distinct absolute paths, so one
// always exists.
func label(ins []Input) {
	parts := make([][]string, len(ins))
	for i, in := range ins {
		parts[i] = strings.Split(strings.Trim(filepath.ToSlash(in.Abs), "/"), "/")
	}
	tail := func(p []string, k int) string { return strings.Join(p[max(0, len(p)-k):], "/") }
	for i := range ins {
		k := 1
		for ; k < len(parts[i]); k++ {
			clash := false
			for j := range ins {
				clash = clash || (j != i && tail(parts[j], k) == tail(parts[i], k))
			}
			if !clash {
				break
			}
		}
		ins[i].Label = tail(parts[i], k)
		if ins[i].Label == "" {
			ins[i].Label = "/" // the file system's root
		}
	}
}

// Walk resolves args (see Inputs) and lists every item under them; any
// input problem ends it. See WalkInputs.
func Walk(args []string) ([]Entry, error) {
	ins, err := Inputs(args)
	if err != nil {
		return nil, err
	}
	return WalkInputs(ins)
}

// WalkInputs lists every item under the inputs, sorted by input then by
// relative path. Symbolic links to files inside the same input are read;
// links to folders and links leaving the input are listed with a reason and
// not followed, so the walk cannot loop. It fails only when an input itself
// cannot be examined.
func WalkInputs(ins []Input) ([]Entry, error) {
	var all []Entry
	for _, in := range ins {
		es, err := walkOne(in)
		if err != nil {
			return nil, err
		}
		sort.Slice(es, func(i, j int) bool { return es[i].Rel < es[j].Rel })
		all = append(all, es...)
	}
	markSidecars(all)
	return all, nil
}

// walkOne lists the items under one input. A folder is walked through its
// real path: filepath.WalkDir does not descend into a root that is a
// symbolic link, and an input named through a link is the examiner's
// explicit choice.
func walkOne(in Input) ([]Entry, error) {
	abs := in.Real
	st, err := os.Stat(abs)
	if err != nil {
		return nil, fmt.Errorf("input %q: %w", in.Arg, err)
	}
	if !st.IsDir() {
		e := Entry{Root: in.Arg, Abs: abs, Rel: filepath.Base(in.Abs), ID: in.Label}
		if !st.Mode().IsRegular() {
			e.Err = ErrNotRegular
		}
		return []Entry{e}, nil
	}
	var es []Entry
	err = filepath.WalkDir(abs, func(p string, d fs.DirEntry, werr error) error {
		rel, rerr := filepath.Rel(abs, p)
		if rerr != nil {
			return rerr
		}
		rel = filepath.ToSlash(rel)
		e := Entry{Root: in.Arg, Abs: p, Rel: rel, ID: path.Join(in.Label, rel)}
		if werr != nil {
			if p == abs {
				return werr
			}
			e.Err = werr
			es = append(es, e)
			if d != nil && d.IsDir() {
				return fs.SkipDir
			}
			return nil
		}
		if d.IsDir() {
			return nil
		}
		switch t := d.Type(); {
		case t&fs.ModeSymlink != 0:
			e.Err = checkLink(p, in.Real)
		case !t.IsRegular():
			e.Err = ErrNotRegular
		}
		es = append(es, e)
		return nil
	})
	if err != nil {
		return nil, fmt.Errorf("input %q: %w", in.Arg, err)
	}
	return es, nil
}

// checkLink decides whether the link at p may be read: only when it resolves
// to a regular file inside root (a real path).
func checkLink(p, root string) error {
	target, err := filepath.EvalSymlinks(p)
	if err != nil {
		return fmt.Errorf("%w: %v", ErrLinkBroken, err)
	}
	if !within(target, root) {
		return ErrLinkOutside
	}
	st, err := os.Stat(target)
	switch {
	case err != nil:
		return err
	case st.IsDir():
		return ErrLinkDir
	case !st.Mode().IsRegular():
		return ErrNotRegular
	}
	return nil
}

// within reports whether path p lies inside (or is) dir; both must be clean
// absolute paths.
func within(p, dir string) bool {
	if p == dir {
		return true
	}
	return strings.HasPrefix(p, strings.TrimSuffix(dir, string(filepath.Separator))+string(filepath.Separator))
}

// Inside reports whether path p (resolved through symbolic links as far as
// it exists) lies inside any of the folders dirs. The audit uses it to
// refuse writing a report into the evidence.
func Inside(p string, dirs []string) (string, bool) {
	rp := resolve(p)
	for _, d := range dirs {
		st, err := os.Stat(d)
		if err != nil || !st.IsDir() {
			continue
		}
		if within(rp, resolve(d)) {
			return d, true
		}
	}
	return "", false
}

// resolve returns p made absolute with every existing ancestor's symbolic
// links resolved, so that a path that does not exist yet can still be
// compared with real folders.
func resolve(p string) string {
	abs, err := filepath.Abs(p)
	if err != nil {
		return p
	}
	var tail []string
	cur := abs
	for {
		if r, err := filepath.EvalSymlinks(cur); err == nil {
			return filepath.Join(append([]string{r}, tail...)...)
		}
		parent := filepath.Dir(cur)
		if parent == cur {
			return abs
		}
		tail = append([]string{filepath.Base(cur)}, tail...)
		cur = parent
	}
}

// markSidecars notes .xmp files that sit beside a photo of the same name
// (IMG_1.jpg.xmp or IMG_1.xmp): exifread reads them with that photo.
func markSidecars(es []Entry) {
	byRel := map[string]bool{}    // root + rel of every item
	byStem := map[string]string{} // root + rel without extension → rel, for non-.xmp items
	for _, e := range es {
		byRel[e.Root+"\x00"+e.Rel] = true
		if !isXMP(e.Rel) {
			byStem[e.Root+"\x00"+strings.TrimSuffix(e.Rel, filepath.Ext(e.Rel))] = e.Rel
		}
	}
	for i, e := range es {
		if !isXMP(e.Rel) {
			continue
		}
		stem := strings.TrimSuffix(e.Rel, filepath.Ext(e.Rel))
		if byRel[e.Root+"\x00"+stem] {
			es[i].SidecarOf = stem
		} else if rel, ok := byStem[e.Root+"\x00"+stem]; ok {
			es[i].SidecarOf = rel
		}
	}
}

func isXMP(name string) bool { return strings.EqualFold(filepath.Ext(name), ".xmp") }
