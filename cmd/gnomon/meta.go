package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/audit"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"github.com/gnomon-forensics/gnomon/report"
)

// runMeta prints the evidence exifread finds in each photo: a readable block
// per file, or a JSON array of records with --json. Folders are walked as
// the audit walks them (audit.Walk: links to files inside the folder are
// read, other links are not followed). An input that does not exist, and an
// item that is not read (a link leaving the folder, a FIFO), get one line
// on stderr naming the path; a file that opens but cannot be parsed still
// gets a record with its error. The exit status is 1 when no file could be
// opened at all.
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
	ins, inErr := audit.Inputs(fs.Args())
	if errors.Is(inErr, audit.ErrNestedInput) {
		return usageErr(fs, "%v", inErr)
	}
	if inErr != nil {
		for _, line := range strings.Split(inErr.Error(), "\n") {
			fmt.Fprintf(e.stderr, "gnomon meta: %s\n", line)
		}
	}
	recs := []exifread.Record{}
	for _, in := range ins {
		entries, err := audit.WalkInputs([]audit.Input{in})
		if err != nil {
			fmt.Fprintf(e.stderr, "gnomon meta: %v\n", err)
			continue
		}
		for _, en := range entries {
			shown := en.Root // a file input, as given
			if in.IsDir {
				shown = filepath.Join(en.Root, filepath.FromSlash(en.Rel))
			}
			switch {
			case en.SidecarOf != "":
				continue // read with its photo
			case en.Err != nil:
				fmt.Fprintf(e.stderr, "gnomon meta: %s: %v\n", shown, en.Err)
				continue
			}
			rec := exifread.ReadFile(en.Abs, exifread.Options{SkipHash: *noHash})
			rec.Path = shown
			recs = append(recs, rec)
		}
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
	for _, r := range recs {
		if !isOpenErr(r.Err) {
			return exitOK
		}
	}
	if len(recs) == 0 && inErr != nil {
		return exitFailure // the missing inputs are named above
	}
	return fail(e.stderr, "meta", errors.New("no file could be read"))
}

func isOpenErr(err error) bool {
	var pe *fs.PathError
	return errors.As(err, &pe) && pe.Op == "open"
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
		line("exposure time", figure.Exposure(*r.ExposureTimeSec)) // "1/60 s", as photographers write it
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
