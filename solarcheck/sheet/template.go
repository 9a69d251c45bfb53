package sheet

import (
	"encoding/csv"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// TemplateRow is what the template says about one photo before the
// examiner measures anything.
type TemplateRow struct {
	Photo        string   // path relative to the audited folder, slash form
	ClaimedLocal string   // the wall time as the camera wrote it, e.g. "2026-05-03 14:22:05"
	Lat, Lon     *float64 // the GPS tag's position, nil when the photo has none
}

// formulaStarts are the first characters that make a spreadsheet treat a
// cell as a formula (OWASP, "CSV Injection"); tab and carriage return are
// included because some spreadsheets strip them and then evaluate.
const formulaStarts = "=+-@\t\r"

// neutralise prefixes an apostrophe to a text cell that a spreadsheet
// would run as a formula. Parse removes it again (see unneutralise).
func neutralise(t string) string {
	if t != "" && strings.ContainsRune(formulaStarts, rune(t[0])) {
		return "'" + t
	}
	return t
}

// WriteTemplate writes the binding header (in the order of Columns()) and one
// row per photo, separated by commas and quoted per RFC 4180 by
// encoding/csv, with CRLF line ends as RFC 4180 specifies.
//
// Only photo and note are filled in; every measurement column is left blank.
// The claimed time and the GPS position go into the note rather than into
// the time, lat and lon columns: those columns are the examiner's overrides,
// and pre-filling them with the metadata's own values would make the
// metadata look like independent evidence when the sheet is read back.
// Text cells that start with = + - @ tab or CR are neutralised against
// formula injection with a leading apostrophe, which Parse removes.
func WriteTemplate(w io.Writer, rows []TemplateRow) error {
	cw := csv.NewWriter(w)
	cw.UseCRLF = true
	if err := cw.Write(columns[:]); err != nil {
		return fmt.Errorf("sheet template: %w", err)
	}
	rec := make([]string, len(columns))
	for _, r := range rows {
		for i := range rec {
			rec[i] = ""
		}
		rec[0] = neutralise(r.Photo)
		rec[len(rec)-1] = neutralise(templateNote(r))
		if err := cw.Write(rec); err != nil {
			return fmt.Errorf("sheet template: %w", err)
		}
	}
	cw.Flush()
	if err := cw.Error(); err != nil {
		return fmt.Errorf("sheet template: %w", err)
	}
	return nil
}

func templateNote(r TemplateRow) string {
	var parts []string
	if r.ClaimedLocal != "" {
		parts = append(parts, "claimed "+r.ClaimedLocal+" (camera clock)")
	} else {
		parts = append(parts, "no time in metadata")
	}
	if r.Lat != nil && r.Lon != nil {
		parts = append(parts, "at "+strconv.FormatFloat(*r.Lat, 'f', 6, 64)+" "+strconv.FormatFloat(*r.Lon, 'f', 6, 64)+" (GPS tag)")
	} else {
		parts = append(parts, "no GPS position")
	}
	return strings.Join(parts, " ")
}
