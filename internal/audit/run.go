// Package audit runs the main job end to end: it walks the evidence folders,
// reads every file (exifread), examines every photo (solarcheck), fits every
// camera's clock, and hands the photos to the report writers one at a time,
// in report order. It writes nothing but its spool file and the thumbnails
// it is asked for, both only into the folders it is given; the command
// (cmd/gnomon) decides where the reports go.
//
// Memory stays flat in the batch size: between examining the photos and
// writing the reports, the findings wait in a spool file (records of this
// package, encoding/gob, in the report folder), and only a few numbers per photo stay in memory (the
// walk's entry, the camera-model input, the final verdict). A batch of
// 100,000 files is audited in a few hundred megabytes; see
// testdata/bench_scale.sh.
package audit

import (
	"context"
	"fmt"
	"os"

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
	// Sheet is the examiner's measurement sheet, nil for none. Run refuses
	// a sheet that is unusable (sheet.Sheet.Unusable) or none of whose rows
	// reaches a photo: going on would report every photo as if nothing had
	// been measured.
	Sheet *sheet.Sheet
	// StrictSheet makes any problem of the sheet (a bad cell, a row naming
	// no photo or several) end the run before any file is read.
	StrictSheet bool
	// Read bounds the metadata reader.
	Read exifread.Options
	// SpoolDir is the folder for the spool file that holds the findings
	// until the reports are written (the report folder; never an input).
	// The file is removed by Result.Close, or by Run when it fails.
	SpoolDir string
	// Thumbs, when set, is called by the worker that read entry i, with its
	// record, so the caller can write a thumbnail while the file's preview is
	// at hand. It returns the thumbnail's path relative to the report folder
	// ("" for none). It must be safe for concurrent use.
	Thumbs func(i int, e Entry, rec *exifread.Record) string
	// Progress is called once per finished entry (from any goroutine).
	Progress func()
}

// Result is a finished run: the photos wait in the spool, in report order,
// for Photos to hand them out. Close removes the spool.
type Result struct {
	// Verdicts are the final verdicts (after the camera models), in report
	// order: the counts and the choice of HTML cards need them before any
	// photo is written.
	Verdicts []string
	Cameras  *solarcheck.Cameras
	// photoClock[c] is the camera-model place of the photo whose stored
	// record has Clock == c.
	photoClock []solarcheck.CameraPhoto
	// SheetProblems are the sheet's errors as "file:line:column: reason",
	// including rows naming no photo of the audit.
	SheetProblems []string
	// cameraNames gives each camera id the name its first photo wrote
	// ("Brisa BR-10, serial BR10-2290"), for report.Camera.Name.
	cameraNames map[string]string

	entries []Entry // as the walk gave them
	// order is the report order: order[k] is the index in entries of the
	// k-th photo of the report (sorted by relative path, then input root).
	order []int
	x     *solarcheck.Examiner
	spool *spool
	late  map[int]string // report position → thumbnail written after the run
}

// stored is one entry between examination and report: the file facts the
// report needs and the finding before its camera's model is applied. The
// spool keeps it as a record (spool.go).
type stored struct {
	SHA256    string
	Size      int64
	Container string
	Error     string   // why the file could not be read; "" when fine
	Notes     []string // report.Photo.FileNotes
	Thumbnail string
	// Clock is the index of the finding's solarcheck.ClockInput among
	// those the run collected (and of its place in Result.photoClock); -1
	// when it has none.
	Clock   int
	Finding solarcheck.Finding
}

// spoolWindow is how many finished entries may wait for an earlier one
// still being read (a slow file, a large video being hashed) before the
// workers pause: the spool is written in report order, and the wait must
// not grow with the batch.
const spoolWindow = 1024

// Run reads and examines every entry, fits every camera's clock and works
// out the final verdicts. It stops early, returning ctx.Err(), when ctx is
// cancelled; a run that returns an error has no usable result and leaves
// no spool.
func Run(ctx context.Context, entries []Entry, o Options) (res *Result, err error) {
	rows, problems, err := resolveSheet(o.Sheet, entries, o.StrictSheet)
	if err != nil {
		return nil, err
	}
	sp, err := createSpool(o.SpoolDir)
	if err != nil {
		return nil, err
	}
	defer func() {
		if err != nil {
			sp.remove()
		}
	}()
	res = &Result{entries: entries, order: reportOrder(entries), SheetProblems: problems, x: o.Examiner, spool: sp, cameraNames: map[string]string{}}

	var clocks []solarcheck.ClockInput
	cameraIDs := map[string]string{} // one copy of each camera id, not one per photo
	err = inOrder(ctx, len(entries), o.Workers, spoolWindow,
		func(k int) stored {
			i := res.order[k]
			s := o.process(i, entries[i], rows[entries[i].ID])
			if o.Progress != nil {
				o.Progress()
			}
			return s
		},
		func(k int, s stored) error {
			s.Clock = -1
			if id := s.Finding.Camera; id != "" {
				if _, seen := res.cameraNames[id]; !seen {
					res.cameraNames[id] = s.Finding.CameraName
				}
			}
			if in, ok := o.Examiner.ClockInput(&s.Finding); ok {
				if id, seen := cameraIDs[in.Camera]; seen {
					in.Camera = id
				} else {
					cameraIDs[in.Camera] = in.Camera
				}
				s.Clock = len(clocks)
				clocks = append(clocks, in)
			}
			return sp.add(&s)
		})
	if err != nil {
		return nil, err
	}
	if err := sp.finish(); err != nil {
		return nil, err
	}
	res.Cameras, res.photoClock = o.Examiner.FitCameras(clocks)
	res.Verdicts = make([]string, 0, len(entries))
	verdicts := map[solarcheck.Verdict]string{} // one copy of each word
	err = res.each(ctx, func(k int, s *stored) error {
		v, ok := verdicts[s.Finding.Verdict]
		if !ok {
			v = string(s.Finding.Verdict)
			verdicts[s.Finding.Verdict] = v
		}
		res.Verdicts = append(res.Verdicts, v)
		return nil
	})
	if err != nil {
		return nil, err
	}
	return res, nil
}

// Close removes the spool file.
func (r *Result) Close() error { return r.spool.remove() }

// each hands every spooled entry, in report order and with its camera's
// model applied, to fn; it stops at fn's first error or when ctx is done.
func (r *Result) each(ctx context.Context, fn func(k int, s *stored) error) error {
	rd, err := r.spool.reader()
	if err != nil {
		return err
	}
	defer rd.close()
	for k := range r.order {
		if err := ctx.Err(); err != nil {
			return err
		}
		var s stored
		if err := rd.next(&s); err != nil {
			return fmt.Errorf("spool, entry %d of %d: %w", k+1, len(r.order), err)
		}
		if s.Clock >= 0 {
			r.x.Apply(r.photoClock[s.Clock], &s.Finding)
		}
		if err := fn(k, &s); err != nil {
			return err
		}
	}
	return nil
}

// process reads and examines one entry.
func (o Options) process(i int, e Entry, rows []sheet.Row) stored {
	if e.Err != nil {
		return stored{Container: exifread.ContainerUnknown, Error: e.Err.Error(),
			Finding: solarcheck.Finding{Path: e.ID, Verdict: solarcheck.Unreadable, Explanation: "Not read: " + e.Err.Error() + "."}}
	}
	rec := exifread.ReadFile(e.Abs, o.Read)
	s := stored{SHA256: rec.SHA256, Size: rec.Size, Container: rec.Container, Error: string(rec.Error)}
	if rec.ExtensionMismatch != "" {
		s.Notes = append(s.Notes, rec.ExtensionMismatch)
	}
	s.Notes = append(s.Notes, rec.Warnings...)
	if e.SidecarOf != "" {
		// Hashed like every file; its "unsupported container" is expected
		// (an XMP file is not a photo) and would only contradict the row.
		// A sidecar that gives its photo nothing (empty, not XML) is
		// unreadable evidence like any damaged file.
		if err := exifread.CheckSidecar(e.Abs, o.Read); err != nil {
			s.Error = err.Error()
			s.Finding = solarcheck.Finding{Path: e.ID, Verdict: solarcheck.Unreadable,
				Explanation: fmt.Sprintf("XMP sidecar of %s that gives it nothing: %v.", e.SidecarOf, err)}
			return s
		}
		s.Error = ""
		s.Finding = solarcheck.Finding{Path: e.ID, Verdict: solarcheck.Sidecar,
			Explanation: fmt.Sprintf("XMP sidecar of %s: not a photo; its contents are read with that photo.", e.SidecarOf)}
		return s
	}
	if o.Thumbs != nil && rec.Err == nil {
		s.Thumbnail = o.Thumbs(i, e, &rec)
	}
	rec.Thumbnail = nil // the preview has served
	ms, ov := examinerInput(rows)
	s.Finding = o.Examiner.Examine(solarcheck.Photo{Path: e.ID, Record: rec, Measurements: ms, Override: ov})
	return s
}

// resolveSheet matches the sheet's rows to the entries by their IDs (see
// Entry). It fails when the sheet is unusable, when no row reaches a photo,
// and, when strict, at the sheet's first problem; otherwise the problems
// are listed for the report.
func resolveSheet(s *sheet.Sheet, entries []Entry, strict bool) (map[string][]sheet.Row, []string, error) {
	if s == nil {
		return nil, nil, nil
	}
	if s.Unusable != nil {
		return nil, nil, fmt.Errorf("measurement sheet unusable: %w", s.Unusable)
	}
	var problems []string
	for _, p := range s.Problems {
		problems = append(problems, p.Error())
	}
	names := make([]sheet.Name, 0, len(entries))
	for _, e := range entries {
		if e.Err == nil && e.SidecarOf == "" {
			names = append(names, sheet.Name{ID: e.ID, Rel: e.Rel})
		}
	}
	rows, err := s.Resolve(names)
	if err != nil {
		for _, e := range unwrapAll(err) {
			problems = append(problems, e.Error())
		}
	}
	used := 0
	for _, rs := range rows {
		used += len(rs)
	}
	switch {
	case len(s.Rows) == 0:
		return nil, nil, fmt.Errorf("measurement sheet %s: no row gives a measurement or an override (%d problems; the first: %s)", s.File, len(problems), firstOr(problems, "none"))
	case used == 0:
		return nil, nil, fmt.Errorf("measurement sheet %s: none of its %d rows can be applied to a photo of the audit (the first problem: %s)", s.File, len(s.Rows), firstOr(problems, "none"))
	case strict && len(problems) > 0:
		return nil, nil, fmt.Errorf("measurement sheet %s has %d problems and a strict run stops at any (the first: %s)", s.File, len(problems), problems[0])
	}
	return rows, problems, nil
}

// firstOr returns the first of list, or none when it is empty.
func firstOr(list []string, none string) string {
	if len(list) == 0 {
		return none
	}
	return list[0]
}

// unwrapAll splits an errors.Join result into its parts.
func unwrapAll(err error) []error {
	if j, ok := err.(interface{ Unwrap() []error }); ok {
		return j.Unwrap()
	}
	return []error{err}
}

// removeQuietly removes a file, ignoring a file already gone.
func removeQuietly(p string) error {
	if err := os.Remove(p); err != nil && !os.IsNotExist(err) {
		return err
	}
	return nil
}
