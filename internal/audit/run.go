// Package audit runs the main job end to end: it walks the evidence folders,
// reads every file (exifread), examines every photo (solarcheck), fits every
// camera's clock, and builds the report document (report.Audit). It writes
// nothing but the thumbnails it is asked for, and those only into the folder
// it is given; the command (cmd/gnomon) decides where the reports go.
package audit

import (
	"context"
	"fmt"
	"runtime"
	"sync"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
)

// Options configure a run.
type Options struct {
	// Workers is how many files are read and examined at once; 0 means one
	// per core.
	Workers int
	// Examiner runs the checks; it holds the zone finder.
	Examiner *solarcheck.Examiner
	// Sheet is the examiner's measurement sheet, nil for none.
	Sheet *sheet.Sheet
	// Read bounds the metadata reader.
	Read exifread.Options
	// Thumbs, when set, is called by the worker that read entry i, with its
	// record, so the caller can write a thumbnail while the file's preview is
	// at hand. It returns the thumbnail's path relative to the report folder
	// ("" for none). It must be safe for concurrent use.
	Thumbs func(i int, e Entry, rec *exifread.Record) string
	// Progress is called once per finished entry (from any goroutine).
	Progress func()
}

// Item is everything known about one entry after the run.
type Item struct {
	Entry Entry
	// Record holds the file facts of the read (path, size, SHA-256, mod
	// time, container, extension mismatch, error, warnings, orientation);
	// for a photo that was examined, its metadata lives on in Finding.
	Record    exifread.Record
	Finding   solarcheck.Finding
	Thumbnail string
}

// Result is a finished run.
type Result struct {
	Items   []Item // in the order of the entries (sorted by input and path)
	Cameras []solarcheck.Camera
	// SheetProblems are the sheet's errors as "file:line:column: reason",
	// including rows naming no photo of the audit.
	SheetProblems []string
}

// Run reads and examines every entry. It stops early, returning ctx.Err(),
// when ctx is cancelled; a run that returns an error has no usable result.
func Run(ctx context.Context, entries []Entry, o Options) (*Result, error) {
	rows, problems := resolveSheet(o.Sheet, entries)
	items := make([]Item, len(entries))
	err := parallel(ctx, len(entries), o.Workers, func(i int) {
		items[i] = o.process(i, entries[i], rows[entries[i].key()])
		if o.Progress != nil {
			o.Progress()
		}
	})
	if err != nil {
		return nil, err
	}

	findings := make([]solarcheck.Finding, len(items))
	for i := range items {
		findings[i] = items[i].Finding
	}
	cams := o.Examiner.ModelCameras(findings)
	for i := range items {
		items[i].Finding = findings[i]
	}
	return &Result{Items: items, Cameras: cams, SheetProblems: problems}, nil
}

// key identifies an entry for the sheet: its path relative to its input.
func (e Entry) key() string { return e.Rel }

// process reads and examines one entry.
func (o Options) process(i int, e Entry, rows []sheet.Row) Item {
	it := Item{Entry: e}
	switch {
	case e.Err != nil:
		it.Record = exifread.Record{Path: e.Abs, Container: exifread.ContainerUnknown, Err: e.Err, Error: exifread.Message(e.Err.Error())}
		it.Finding = solarcheck.Finding{Path: e.Rel, Verdict: solarcheck.Unreadable, Explanation: "Not read: " + e.Err.Error() + "."}
		return it
	}
	rec := exifread.ReadFile(e.Abs, o.Read)
	if e.SidecarOf != "" {
		// Hashed like every file; its "unsupported container" is expected
		// (an XMP file is not a photo) and would only contradict the row.
		rec.Err, rec.Error = nil, ""
		it.Record = slim(rec)
		it.Finding = solarcheck.Finding{Path: e.Rel, Verdict: solarcheck.Unreadable,
			Explanation: fmt.Sprintf("XMP sidecar of %s: not a photo; its contents are read with that photo.", e.SidecarOf)}
		return it
	}
	if o.Thumbs != nil && rec.Err == nil {
		it.Thumbnail = o.Thumbs(i, e, &rec)
	}
	rec.Thumbnail = nil // the preview has served; do not keep it for the whole batch
	it.Finding = o.Examiner.Examine(solarcheck.Photo{Path: e.Rel, Record: rec, Rows: rows})
	it.Record = slim(rec)
	return it
}

// slim keeps the file facts of a record that the report needs after the
// examination (hash, size, container, errors and warnings) and drops the
// metadata, which the finding now carries: on a batch of 100,000 photos
// the full records would be held until the report is built.
func slim(r exifread.Record) exifread.Record {
	return exifread.Record{Path: r.Path, Size: r.Size, SHA256: r.SHA256, ModTime: r.ModTime,
		Container: r.Container, ExtensionMismatch: r.ExtensionMismatch, Err: r.Err, Error: r.Error,
		Warnings: r.Warnings, Orientation: r.Orientation}
}

// resolveSheet matches the sheet's rows to the entries.
func resolveSheet(s *sheet.Sheet, entries []Entry) (map[string][]sheet.Row, []string) {
	if s == nil {
		return nil, nil
	}
	var problems []string
	for _, p := range s.Problems {
		problems = append(problems, p.Error())
	}
	paths := make([]string, 0, len(entries))
	for _, e := range entries {
		if e.Err == nil && e.SidecarOf == "" {
			paths = append(paths, e.key())
		}
	}
	rows, err := s.Resolve(paths)
	if err != nil {
		for _, e := range unwrapAll(err) {
			problems = append(problems, e.Error())
		}
	}
	return rows, problems
}

// unwrapAll splits an errors.Join result into its parts.
func unwrapAll(err error) []error {
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		return j.Unwrap()
	}
	return []error{err}
}

// parallel calls fn(i) for i in 0..n-1 on up to workers goroutines (0: one
// per core) and waits for them. Once ctx is cancelled no further i is
// started, the calls under way finish, and ctx.Err() is returned.
func parallel(ctx context.Context, n, workers int, fn func(i int)) error {
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	next := make(chan int)
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range next {
				fn(i)
			}
		}()
	}
feed:
	for i := 0; i < n; i++ {
		select {
		case next <- i:
		case <-ctx.Done():
			break feed
		}
	}
	close(next)
	wg.Wait()
	return ctx.Err()
}
