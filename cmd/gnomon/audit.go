package main

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/audit"
	"github.com/gnomon-forensics/gnomon/internal/selftest"
	"github.com/gnomon-forensics/gnomon/report"
	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// auditGCPercent is the audit's garbage-collection target (runtime/debug
// SetGCPercent): the heap may grow to 1.5 times the live data, not 2 times.
const auditGCPercent = 50

// allFormats are the report files an audit can write, in writing order.
var allFormats = []string{"json", "csv", "geojson", "html"}

// auditConfig is an audit as the flags describe it.
type auditConfig struct {
	inputs     []string
	sheetPath  string
	out        string
	formats    map[string]bool
	workers    int
	quiet      bool
	strict     bool
	thumbnails bool
	args       []string // the command line, for the report
}

func runAudit(e env, args []string) int {
	fs := newFlagSet(e, "audit", "gnomon audit DIR|FILE... [--shadows SHEET.csv] [--out REPORTDIR] [--formats html,csv,json,geojson] [-j N] [--quiet] [--strict]",
		"Read every photo under the inputs, check each claimed capture time against the sun and the other\n"+
			"witnesses, fit each camera's clock, and write the reports. Evidence is opened read-only; the report\n"+
			"folder may not lie inside an input; an input inside another is refused, one given twice is read once.\n"+
			"Exit 0 when the run completed, 1 when it failed (an unusable sheet fails it; with --strict, so does\n"+
			"any sheet problem or any verdict but consistent, unverified and sidecar), 2 for bad usage.")
	cfg := auditConfig{args: append([]string{"gnomon", "audit"}, args...)}
	fs.StringVar(&cfg.sheetPath, "shadows", "", "the examiner's measurement sheet, `SHEET.csv` (a template comes from gnomon sheet)")
	fs.StringVar(&cfg.out, "out", "gnomon-report", "report folder `REPORTDIR` to create (must not exist, or be empty)")
	formats := fs.String("formats", strings.Join([]string{"html", "csv", "json", "geojson"}, ","), "comma-separated `FORMATS` to write: html, csv, json, geojson")
	fs.IntVar(&cfg.workers, "j", runtime.NumCPU(), "read `N` files at once")
	fs.BoolVar(&cfg.quiet, "quiet", false, "no progress or summary on stderr")
	fs.BoolVar(&cfg.strict, "strict", false, "exit 1 when any verdict calls for attention (not consistent, unverified or sidecar); stop at any problem of the sheet")
	fs.BoolVar(&cfg.thumbnails, "thumbnails", true, "write thumbnails for the HTML report")
	if code, done := parseFlags(fs, interleave(args)); done {
		return code
	}
	cfg.inputs = fs.Args()
	if len(cfg.inputs) == 0 {
		return usageErr(fs, "no input folder or file given")
	}
	if cfg.workers < 1 {
		return usageErr(fs, "-j must be at least 1, got %d", cfg.workers)
	}
	var err error
	if cfg.formats, err = parseFormats(*formats); err != nil {
		return usageErr(fs, "%v", err)
	}
	// Checked here, before anything is written, so that an input inside
	// another is a usage error; doAudit resolves them again.
	if _, err = audit.Inputs(cfg.inputs); err != nil {
		if errors.Is(err, audit.ErrNestedInput) {
			return usageErr(fs, "%v", err)
		}
		return fail(e.stderr, "audit", err)
	}
	if err := checkOut(cfg.out, cfg.inputs); err != nil {
		return usageErr(fs, "%v", err)
	}

	// The Go collector lets the heap grow to twice what is live by default;
	// the audit holds its whole report document (a few KB per photo), so
	// that doubling is most of its peak memory on a large batch. A lower
	// target trades a little collection time for it (measured on 100,000
	// small photos: 971 MB at 100, 743 MB at 50, the same wall time). A
	// fixed soft memory limit was tried and rejected: once the live data
	// passes it the collector runs almost constantly (the same batch took
	// 4.7 times as long under a 200 MiB limit). GOGC, when set, wins.
	if e.getenv("GOGC") == "" {
		defer debug.SetGCPercent(debug.SetGCPercent(auditGCPercent))
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	sum, err := doAudit(ctx, e, cfg)
	if err != nil {
		if errors.Is(err, context.Canceled) {
			fmt.Fprintln(e.stderr, "gnomon audit: interrupted; no report was written (partial files removed)")
			return exitFailure
		}
		return fail(e.stderr, "audit", err)
	}
	if !cfg.quiet {
		sum.print(e.stderr)
	}
	if cfg.strict && sum.flagged > 0 {
		return exitFailure
	}
	return exitOK
}

// interleave lets flags follow the inputs ("gnomon audit DIR --out R"), as
// examiners type them: the flag package stops at the first non-flag.
func interleave(args []string) []string {
	var flags, rest []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			rest = append(rest, args[i+1:]...)
			break
		}
		if strings.HasPrefix(a, "-") && a != "-" {
			flags = append(flags, a)
			if !strings.Contains(a, "=") && i+1 < len(args) && takesValue(a) {
				flags = append(flags, args[i+1])
				i++
			}
			continue
		}
		rest = append(rest, a)
	}
	return append(append(flags, "--"), rest...)
}

// takesValue reports whether the audit flag a is followed by a value.
func takesValue(a string) bool {
	switch strings.TrimLeft(a, "-") {
	case "shadows", "out", "formats", "j":
		return true
	}
	return false
}

func parseFormats(s string) (map[string]bool, error) {
	m := map[string]bool{}
	for _, f := range strings.Split(s, ",") {
		f = strings.ToLower(strings.TrimSpace(f))
		if f == "" {
			continue
		}
		ok := false
		for _, a := range allFormats {
			ok = ok || a == f
		}
		if !ok {
			return nil, fmt.Errorf("unknown report format %q (want html, csv, json or geojson)", f)
		}
		m[f] = true
	}
	if len(m) == 0 {
		return nil, errors.New("--formats names no format")
	}
	return m, nil
}

// checkOut refuses a report folder inside an input folder, or one that
// already holds files (a report must never mix with an earlier one).
func checkOut(out string, inputs []string) error {
	if in, bad := audit.Inside(out, inputs); bad {
		return fmt.Errorf("report folder %q lies inside input %q: reports are never written into evidence", out, in)
	}
	des, err := os.ReadDir(out)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return nil
	case err != nil:
		return fmt.Errorf("report folder %q: %w", out, err)
	case len(des) > 0:
		return fmt.Errorf("report folder %q already exists and is not empty", out)
	}
	return nil
}

// summary is what the audit tells the examiner at the end.
type summary struct {
	files, cameras, unreadable, flagged int
	byVerdict                           map[string]int
	out                                 string
	written                             []string
	sheetProblems                       int
	selfTestOK                          bool
}

func (s summary) print(w io.Writer) {
	fmt.Fprintf(w, "\naudited %d files; %d cameras modelled; %d unreadable\n", s.files, s.cameras, s.unreadable)
	keys := make([]string, 0, len(s.byVerdict))
	for k := range s.byVerdict {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		fmt.Fprintf(w, "  %-16s %d\n", k, s.byVerdict[k])
	}
	if s.sheetProblems > 0 {
		fmt.Fprintf(w, "the measurement sheet had %d problems (listed in the report)\n", s.sheetProblems)
	}
	if !s.selfTestOK {
		fmt.Fprintln(w, "WARNING: the built-in self-test failed; see the report header")
	}
	fmt.Fprintf(w, "reports in %s: %s\n", s.out, strings.Join(s.written, ", "))
	fmt.Fprintln(w, "Findings are investigative aids, to be confirmed by a qualified examiner under local rules of evidence.")
}

// doAudit runs the audit described by cfg and writes its reports. On any
// error (including cancellation) it removes what it wrote.
func doAudit(ctx context.Context, e env, cfg auditConfig) (sum summary, err error) {
	started := runClock(e)
	createdOut := false
	if _, statErr := os.Stat(cfg.out); errors.Is(statErr, os.ErrNotExist) {
		createdOut = true
	}
	if err := os.MkdirAll(cfg.out, 0o755); err != nil {
		return sum, fmt.Errorf("report folder: %w", err)
	}
	thumbDir := filepath.Join(cfg.out, "thumbnails")
	defer func() {
		if err != nil {
			// A failed or interrupted run leaves no report that looks
			// complete: the reports already renamed into place go too.
			for _, w := range sum.written {
				os.Remove(filepath.Join(cfg.out, w))
			}
			os.RemoveAll(thumbDir)
			if createdOut {
				os.Remove(cfg.out) // only if empty
			}
		}
	}()

	ins, err := audit.Inputs(cfg.inputs)
	if err != nil {
		return sum, err
	}
	entries, err := audit.WalkInputs(ins)
	if err != nil {
		return sum, err
	}
	var notes []string
	for _, in := range ins {
		for _, same := range in.Same {
			notes = append(notes, fmt.Sprintf("The input %q is the same as %q and was read once.", same, in.Arg))
		}
	}
	var sh *sheet.Sheet
	var sheetSHA string
	if cfg.sheetPath != "" {
		if sh, sheetSHA, err = loadSheet(cfg.sheetPath); err != nil {
			return sum, err
		}
	}

	zones := zone.NewFinder(nil)
	// The self-test reads the zone map (a few hundredths of a second); run it while the
	// files are read rather than before.
	stDone := make(chan selftest.Result, 1)
	go func() { stDone <- selftest.Run(zones) }()
	x := solarcheck.NewExaminer(solarcheck.Options{Zones: zones})

	opt := audit.Options{Workers: cfg.workers, Examiner: x, Sheet: sh, StrictSheet: cfg.strict, SpoolDir: cfg.out}
	// Thumbnails are made while each file is read, except on a batch too
	// large for every photo to get a card: then only the carded photos get
	// one, after the run (audit.LateThumbnails).
	thumbs := cfg.thumbnails && cfg.formats["html"]
	lateThumbs := thumbs && len(entries) > report.MaxCards
	if thumbs {
		if err := os.MkdirAll(thumbDir, 0o755); err != nil {
			return sum, fmt.Errorf("thumbnails: %w", err)
		}
		if !lateThumbs {
			opt.Thumbs = thumbWriter(thumbDir)
		}
	}
	prog := newProgress(e.stderr, len(entries), "reading", cfg.quiet)
	opt.Progress = prog.step
	res, err := audit.Run(ctx, entries, opt)
	prog.finish()
	if err != nil {
		return sum, err
	}
	defer res.Close()
	var st selftest.Result
	select {
	case st = <-stDone:
	case <-ctx.Done(): // the self-test may still be loading the zone map
		return sum, ctx.Err()
	}

	zmap, zerr := zones.ZoneMapVersion()
	if zerr != nil {
		zmap = "unavailable: " + zerr.Error()
	}
	h := audit.Header{
		Tool:        report.Tool{Name: "gnomon", Version: version, GoVersion: runtime.Version()},
		Started:     started,
		Finished:    runClock(e),
		CommandLine: cfg.args,
		Inputs:      cfg.inputs,
		Sheet:       cfg.sheetPath,
		SheetSHA256: sheetSHA,
		DeltaTModel: "Espenak & Meeus (2006) polynomials",
		TZData:      zones.DB().Version(),
		ZoneMap:     zmap,
		Magnetic:    "WMM2025 (NOAA NCEI and BGS), valid 2025.0-2030.0",
		SelfTest:    selfTestReport(st),
		Notes:       notes,
	}
	head := audit.Head(res, h)
	if lateThumbs {
		if err := audit.LateThumbnails(ctx, res, cfg.workers, opt.Read, thumbWriter(thumbDir)); err != nil {
			return sum, err
		}
	}
	var names []string
	for _, f := range allFormats {
		if cfg.formats[f] {
			names = append(names, "report."+f)
		}
	}
	// Every report is written in one pass over the photos; a report is
	// named in sum.written as soon as it may exist, so that a failure
	// removes it.
	sum.written = names
	wprog := newProgress(e.stderr, len(entries), "writing reports", cfg.quiet)
	err = writeReports(ctx, cfg.out, names, res, head, wprog)
	wprog.finish()
	if err != nil {
		return sum, err
	}

	sum.files, sum.cameras, sum.byVerdict, sum.out = head.Run.Counts.Files, head.Run.Counts.Cameras, head.Run.Counts.ByVerdict, cfg.out
	sum.unreadable = sum.byVerdict[string(solarcheck.Unreadable)]
	sum.sheetProblems = len(res.SheetProblems)
	sum.selfTestOK = st.Passed
	for v, n := range sum.byVerdict {
		if report.Flagged(v) {
			sum.flagged += n
		}
	}
	return sum, nil
}

// ctxWriter fails every write once ctx is done, so that a report writer
// stops promptly on an interrupt and WriteFileAtomic removes its temporary
// file.
type ctxWriter struct {
	ctx context.Context
	w   io.Writer
}

func (c ctxWriter) Write(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	return c.w.Write(p)
}

// writeReports writes the named reports into dir in one pass over the
// photos: each file has its own goroutine and report.Sink, fed through a
// short channel, and is put in place by report.WriteFileAtomic only once
// complete. The photos stream through; none is held beyond the HTML
// page's cards. On any error (an interrupt included) every writer stops,
// leaving no partial file. prog steps once per photo.
func writeReports(ctx context.Context, dir string, names []string, res *audit.Result, head *report.Audit, prog progress) error {
	ctx, cancel := context.WithCancelCause(ctx)
	defer cancel(nil)
	carded := res.Carded()
	feeds := make([]chan *report.Photo, len(names))
	var wg sync.WaitGroup
	for i, name := range names {
		feeds[i] = make(chan *report.Photo, 64)
		wg.Add(1)
		go func(name string, feed <-chan *report.Photo) {
			defer wg.Done()
			err := report.WriteFileAtomic(filepath.Join(dir, name), func(w io.Writer) error {
				// A report stops at its next write once the run is
				// interrupted.
				cw := ctxWriter{ctx, w}
				var s report.Sink
				switch name {
				case "report.json":
					s = report.NewJSONSink(cw, head)
				case "report.csv":
					s = report.NewCSVSink(cw)
				case "report.geojson":
					s = report.NewGeoJSONSink(cw)
				default:
					s = report.NewHTMLSink(cw, head, carded)
				}
				for p := range feed {
					if err := s.Photo(p); err != nil {
						return err
					}
				}
				if err := ctx.Err(); err != nil {
					return err // the feed was cut short
				}
				return s.Close()
			})
			if err != nil {
				cancel(fmt.Errorf("writing %s: %w", name, err))
				for range feed { // let the producer finish its pass
				}
			}
		}(name, feeds[i])
	}
	withHTML := slices.Contains(names, "report.html")
	feedErr := res.Photos(ctx, withHTML, func(p *report.Photo) error {
		for _, f := range feeds {
			select {
			case f <- p:
			case <-ctx.Done():
				return context.Cause(ctx)
			}
		}
		prog.step()
		return nil
	})
	if feedErr != nil {
		cancel(feedErr) // no writer may finish a report that lacks photos
	}
	for _, f := range feeds {
		close(f)
	}
	wg.Wait()
	// The cause is the interrupt, the first failed writer, or the feed.
	return context.Cause(ctx)
}

// loadSheet parses the measurement sheet, read-only, and hashes it.
func loadSheet(p string) (*sheet.Sheet, string, error) {
	b, err := os.ReadFile(p)
	if err != nil {
		return nil, "", fmt.Errorf("measurement sheet: %w", err)
	}
	sum := sha256.Sum256(b)
	s, _ := sheet.Parse(strings.NewReader(string(b)), p) // problems are kept in s.Problems
	return s, hex.EncodeToString(sum[:]), nil
}

// thumbWriter writes entry i's thumbnail as thumbnails/NNNNNN.jpg; the
// number is the entry's place in the sorted walk, so reruns name them alike.
func thumbWriter(dir string) func(int, audit.Entry, *exifread.Record) string {
	return func(i int, en audit.Entry, rec *exifread.Record) string {
		name := fmt.Sprintf("%06d.jpg", i)
		open := func() (io.ReadCloser, error) { return os.Open(en.Abs) }
		if err := report.WriteThumbnail(filepath.Join(dir, name), rec.Thumbnail, open, rec.Orientation); err != nil {
			return ""
		}
		return "thumbnails/" + name
	}
}

func selfTestReport(r selftest.Result) report.SelfTest {
	st := report.SelfTest{Passed: r.Passed}
	for _, c := range r.Checks {
		st.Checks = append(st.Checks, report.SelfCheck{Name: c.Name, Source: c.Source, Passed: c.Passed, Detail: c.Detail})
	}
	return st
}

// runClock is the wall clock for the report header: SOURCE_DATE_EPOCH
// (seconds since 1970) pins it so that reruns are byte-identical.
func runClock(e env) time.Time {
	if s := e.getenv("SOURCE_DATE_EPOCH"); s != "" {
		if n, err := strconv.ParseInt(s, 10, 64); err == nil {
			return time.Unix(n, 0).UTC()
		}
	}
	return time.Now().UTC().Truncate(time.Second)
}
