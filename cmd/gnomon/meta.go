package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/report"
)

// runMeta prints the evidence exifread finds in each photo: a readable block
// per file, or a JSON array of records with --json. Directories are walked
// recursively without following symbolic links, so the walk cannot leave
// the tree it was given. A file that cannot be read still gets a record with
// its error; the exit status is 1 only when no input could be opened at all.
func runMeta(e env, args []string) int {
	fs := newFlagSet(e, "meta", "gnomon meta [--json] FILE|DIR...",
		"Print the normalised evidence read from photos: capture times, offsets, GPS,\n"+
			"camera and exposure, each value with where it came from and whether it is usable.\n"+
			"Files are opened read-only; nothing is written beside them.")
	asJSON := fs.Bool("json", false, "print a JSON array of records (snake_case fields) instead of text")
	noHash := fs.Bool("no-hash", false, "skip the SHA-256 of each file (faster, metadata only)")
	if code, done := parseFlags(fs, args); done {
		return code
	}
	if fs.NArg() == 0 {
		return usageErr(fs, "no FILE or DIR given")
	}
	paths, opened, werr := collectFiles(fs.Args())
	for _, err := range werr {
		fmt.Fprintf(e.stderr, "gnomon meta: %v\n", err)
	}
	recs := make([]exifread.Record, 0, len(paths))
	for _, p := range paths {
		recs = append(recs, exifread.ReadFile(p, exifread.Options{SkipHash: *noHash}))
	}
	if *asJSON {
		// The audit's writer: bytes that are not UTF-8 keep a "_raw_b64" sibling.
		if err := report.EncodeJSON(e.stdout, recs); err != nil {
			return fail(e.stderr, "meta", err)
		}
	} else {
		for i := range recs {
			printRecord(e.stdout, &recs[i])
		}
	}
	anyOpened := opened
	for _, r := range recs {
		if !isOpenErr(r.Err) {
			anyOpened = true
		}
	}
	if !anyOpened {
		return fail(e.stderr, "meta", errors.New("no input could be opened"))
	}
	return exitOK
}

func isOpenErr(err error) bool {
	var pe *fs.PathError
	return errors.As(err, &pe) && pe.Op == "open"
}

// collectFiles expands the arguments: files stay as given, directories are
// walked (sorted). Inside a walk no symbolic link is followed, not even one
// that points within the tree, so the walk can neither leave the tree nor
// visit a file twice. Arguments that cannot be stat'ed
// are kept as files so that they get a record carrying the error. opened
// reports whether any directory was walked.
func collectFiles(args []string) (files []string, opened bool, errs []error) {
	for _, a := range args {
		st, err := os.Stat(a) // an argument naming a symlink to a folder is walked
		if err != nil || !st.IsDir() {
			files = append(files, a)
			continue
		}
		root := a
		if lst, err := os.Lstat(a); err == nil && lst.Mode()&fs.ModeSymlink != 0 {
			if r, err := filepath.EvalSymlinks(a); err == nil {
				root = r
			}
		}
		opened = true
		var found []string
		err = filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				errs = append(errs, err)
				if d != nil && d.IsDir() {
					return fs.SkipDir
				}
				return nil
			}
			if d.Type().IsRegular() && !strings.EqualFold(filepath.Ext(p), ".xmp") {
				found = append(found, p)
			}
			return nil
		})
		if err != nil {
			errs = append(errs, err)
		}
		sort.Strings(found)
		files = append(files, found...)
	}
	return files, opened, errs
}

// printRecord writes one readable block.
func printRecord(w io.Writer, r *exifread.Record) {
	fmt.Fprintf(w, "== %s\n", r.Path)
	line := func(k, v string) {
		if v != "" {
			fmt.Fprintf(w, "  %-22s %s\n", k, v)
		}
	}
	line("container", r.Container)
	line("size", fmt.Sprintf("%d bytes", r.Size))
	line("sha256", r.SHA256)
	if !r.ModTime.IsZero() {
		line("modified (file system)", r.ModTime.UTC().Format(time.RFC3339))
	}
	line("extension", r.ExtensionMismatch)
	if r.Err != nil {
		line("ERROR", r.Err.Error())
	}
	for _, s := range r.Warnings {
		line("warning", s)
	}
	line("date/time original", wallText(r.DateTimeOriginal))
	line("date/time digitized", wallText(r.DateTimeDigitized))
	line("date/time (modified)", wallText(r.DateTime))
	g := r.GPS
	if p := g.Position; p != nil {
		v := "raw " + p.Raw
		if p.LatDeg != nil && p.LonDeg != nil {
			v = fmt.Sprintf("%.7f, %.7f", *p.LatDeg, *p.LonDeg)
		}
		line("GPS position", v+validText(p.Valid, p.Invalid, p.Source))
	}
	num := func(k string, n *exifread.Number, unit string) {
		if n != nil {
			line(k, fmt.Sprintf("%g%s (raw %s)%s", n.Value, unit, n.Raw, validText(n.Valid, n.Invalid, n.Source)))
		}
	}
	num("GPS altitude", g.AltitudeM, " m")
	if t := g.Time; t != nil {
		v := "date " + t.DateRaw + " time " + t.TimeRaw
		if t.Valid {
			v = t.UTC.Format("2006-01-02T15:04:05.999999999Z07:00")
		}
		line("GPS time (UTC)", v+validText(t.Valid, t.Invalid, t.Source))
	}
	if g.ImgDirectionDeg != nil {
		num("GPS image direction", g.ImgDirectionDeg, "° "+g.ImgDirectionRef)
	}
	num("GPS horizontal error", g.HPositioningErrM, " m")
	num("GPS DOP", g.DOP, "")
	line("GPS map datum", g.MapDatum)
	line("make", r.Make)
	line("model", r.Model)
	line("body serial", r.BodySerialNumber)
	line("lens", r.LensModel)
	line("image unique ID", r.ImageUniqueID)
	line("software", r.Software)
	if r.Orientation != 0 {
		line("orientation", fmt.Sprint(r.Orientation))
	}
	if r.PixelWidth != 0 || r.PixelHeight != 0 {
		line("pixels", fmt.Sprintf("%d x %d", r.PixelWidth, r.PixelHeight))
	}
	if r.ExposureTimeSec != nil {
		line("exposure time", fmt.Sprintf("%g s", *r.ExposureTimeSec))
	}
	if r.FNumber != nil {
		line("f-number", fmt.Sprintf("f/%g", *r.FNumber))
	}
	if r.ISO != 0 {
		line("ISO", fmt.Sprint(r.ISO))
	}
	if r.Flash != nil {
		line("flash", fmt.Sprintf("fired=%t (raw %d)", r.Flash.Fired, r.Flash.Raw))
	}
	if r.FocalLengthMM != nil {
		line("focal length", fmt.Sprintf("%g mm", *r.FocalLengthMM))
	}
	if r.FocalLength35mm != 0 {
		line("focal length (35 mm)", fmt.Sprintf("%d mm", r.FocalLength35mm))
	}
	if r.ThumbnailSize > 0 {
		line("thumbnail", fmt.Sprintf("%d bytes", r.ThumbnailSize))
	}
	fmt.Fprintln(w)
}

func validText(valid bool, invalid, source string) string {
	s := " [" + source + "]"
	if !valid {
		s += " INVALID: " + invalid
	}
	return s
}

func wallText(t *exifread.WallTime) string {
	if t == nil {
		return ""
	}
	v := fmt.Sprintf("%q", t.Raw)
	if t.Valid {
		v = fmt.Sprintf("%04d-%02d-%02d %02d:%02d:%02d", t.Year, t.Month, t.Day, t.Hour, t.Minute, t.Second)
		if t.SubSecRaw != "" {
			frac := strings.TrimRight(fmt.Sprintf("%09d", t.Nanosecond), "0")
			if frac == "" {
				frac = "0"
			}
			v += "." + frac
		}
		if t.OffsetSec != nil {
			v += " " + t.OffsetRaw
		} else {
			v += " (wall clock, zone unknown)"
		}
	}
	return v + validText(t.Valid, t.Invalid, t.Source)
}
