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
	// Photo names the photo so that no two photos of the audit share it:
	// its input's label, then its path inside the input, slash form.
	Photo string
	// ClaimedLocal is the capture time as the camera wrote it, e.g.
	// "2026-05-03 14:22:05", "" when the file holds none; ClaimTag is the
	// tag it comes from (exifread.Record.CaptureTime).
	ClaimedLocal, ClaimTag string
	Lat, Lon               *float64 // the GPS tag's position, nil when the photo has none
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

// templateNote says, as a person would, what the file claims and what the
// examiner must supply: "camera clock says 2025-01-10 11:00:00; no GPS
// position: give lat/lon".
func templateNote(r TemplateRow) string {
	var when, where string
	switch {
	case r.ClaimedLocal == "":
		when = "no capture time in the file"
	case r.ClaimTag == "DateTime":
		when = "the file's DateTime tag (when the file was last changed: maybe an edit) says " + r.ClaimedLocal
	default:
		when = "camera clock says " + r.ClaimedLocal
	}
	if r.Lat != nil && r.Lon != nil {
		where = "GPS says lat " + coord(*r.Lat) + " lon " + coord(*r.Lon)
	} else {
		where = "no GPS position: give lat/lon"
	}
	return when + "; " + where
}

// coord writes a coordinate to six decimals (about 0.1 m), without the
// trailing zeros, so 9.19 is not shown as 9.190000.
func coord(deg float64) string {
	s := strconv.FormatFloat(deg, 'f', 6, 64)
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}
