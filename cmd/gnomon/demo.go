package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"path/filepath"
	"runtime"
	"syscall"

	"github.com/gnomon-forensics/gnomon/internal/democase"
)

func runDemo(e env, args []string) int {
	fs := newFlagSet(e, "demo", "gnomon demo [--out DIR]",
		"Build an invented case (fictional demo data: a boatyard's storm-damage claim, 37 photos from\n"+
			"9 sources with planted clock faults and a filled measurement sheet) in a fresh folder, audit it,\n"+
			"and print where the report is. DIR/CASE.txt tells the story and lists the planted faults.")
	out := fs.String("out", "gnomon-demo", "folder `DIR` to create for the case and its report (must not exist, or be empty)")
	quiet := fs.Bool("quiet", false, "no progress on stderr")
	if _, code, done := parseNoArgs(fs, args); done {
		return code
	}
	c, err := democase.Build(*out, democase.Options{})
	if errors.Is(err, democase.ErrNotEmpty) {
		return usageErr(fs, "%v", err)
	}
	if err != nil {
		return fail(e.stderr, "demo", err)
	}
	reportDir := filepath.Join(*out, "report")
	cfg := auditConfig{
		inputs:     []string{c.PhotosDir},
		sheetPath:  c.SheetPath,
		out:        reportDir,
		formats:    map[string]bool{"html": true, "csv": true, "json": true, "geojson": true},
		workers:    runtime.NumCPU(),
		quiet:      *quiet,
		thumbnails: true,
		args:       []string{"gnomon", "audit", c.PhotosDir, "--shadows", c.SheetPath, "--out", reportDir},
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	sum, err := doAudit(ctx, e, cfg)
	if err != nil {
		return fail(e.stderr, "demo", err)
	}
	if !*quiet {
		sum.print(e.stderr)
	}
	fmt.Fprintf(e.stdout, "demo case (fictional): %s\n", c.Dir)
	fmt.Fprintf(e.stdout, "  story and planted faults: %s\n", c.StoryPath)
	fmt.Fprintf(e.stdout, "  measurement sheet:        %s\n", c.SheetPath)
	fmt.Fprintf(e.stdout, "report: %s\n", filepath.Join(reportDir, "report.html"))
	return exitOK
}
