package main

import (
	"errors"
	"fmt"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/audit"
	"github.com/gnomon-forensics/gnomon/solarcheck/sheet"
)

func runSheet(e env, args []string) int {
	fs := newFlagSet(e, "sheet", "gnomon sheet DIR|FILE...",
		"Write to stdout a measurement-sheet template (CSV, RFC 4180) with one row per photo under the\n"+
			"inputs: the photo's name (its input folder's name and its path inside it) and a note with its\n"+
			"claimed local time and GPS place. Fill in one row per measured object (copy a row for a second\n"+
			"object); pass the sheet to `gnomon audit --shadows`. The columns are listed in the README.")
	if code, done := parseFlags(fs, args); done {
		return code
	}
	if fs.NArg() == 0 {
		return usageErr(fs, "no input folder or file given")
	}
	entries, err := audit.Walk(fs.Args())
	if errors.Is(err, audit.ErrNestedInput) {
		return usageErr(fs, "%v", err)
	}
	if err != nil {
		return fail(e.stderr, "sheet", err)
	}
	var rows []sheet.TemplateRow
	for _, en := range entries {
		if en.Err != nil || en.SidecarOf != "" {
			continue
		}
		rec := exifread.ReadFile(en.Abs, exifread.Options{SkipHash: true, SkipCrossCheck: true})
		if rec.Container == exifread.ContainerUnknown {
			continue
		}
		r := sheet.TemplateRow{Photo: en.ID}
		if w, tag, err := rec.CaptureTime(); err == nil {
			r.ClaimedLocal = fmt.Sprintf("%04d-%02d-%02d %02d:%02d:%02d", w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second)
			r.ClaimTag = tag
		}
		if p := rec.GPS.Position; p != nil && p.Valid {
			r.Lat, r.Lon = p.LatDeg, p.LonDeg
		}
		rows = append(rows, r)
	}
	if err := sheet.WriteTemplate(e.stdout, rows); err != nil {
		return fail(e.stderr, "sheet", err)
	}
	return exitOK
}
