package sheet

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"
)

// MaxBytes is the largest sheet Parse reads. A hand-made sheet is a few
// kilobytes; the limit only keeps a wrong file from exhausting memory.
const MaxBytes = 32 << 20

// Column names, binding: later checks and the template use them.
const (
	ColPhoto         = "photo"
	ColObject        = "object"
	ColObjectHeight  = "object_height"
	ColShadowLength  = "shadow_length"
	ColShadowBearing = "shadow_bearing"
	ColBearingRef    = "bearing_ref"
	ColBearingSD     = "bearing_sd"
	ColLengthSDPct   = "length_sd_pct"
	ColSlope         = "slope"
	ColSlopeToward   = "slope_toward"
	ColSunAzimuth    = "sun_azimuth"
	ColSunAltitude   = "sun_altitude"
	ColDeclination   = "declination"
	ColLat           = "lat"
	ColLon           = "lon"
	ColTime          = "time"
	ColNote          = "note"
)

// columns lists the binding column names in the order WriteTemplate uses.
var columns = [...]string{
	ColPhoto, ColObject, ColObjectHeight, ColShadowLength, ColShadowBearing,
	ColBearingRef, ColBearingSD, ColLengthSDPct, ColSlope, ColSlopeToward,
	ColSunAzimuth, ColSunAltitude, ColDeclination, ColLat, ColLon, ColTime, ColNote,
}

// Columns returns the binding column names in the order WriteTemplate
// writes them (a fresh slice: the list itself cannot be changed).
func Columns() []string { return append([]string(nil), columns[:]...) }

// Defaults for empty uncertainty cells.
const (
	DefaultBearingSDDeg = 2.0 // 1-sigma bearing error of a compass or map reading, degrees
	DefaultLengthSDPct  = 5.0 // 1-sigma length error, per cent of the length
)

// Ref says which north a shadow bearing is measured from.
type Ref string

// Bearing references.
const (
	RefTrue     Ref = "true"
	RefMagnetic Ref = "magnetic"
	RefGrid     Ref = "grid"
)

// Kind is what a row measures.
type Kind int

// Row kinds.
const (
	KindShadow        Kind = iota + 1 // object_height, shadow_length and shadow_bearing: sun azimuth and altitude
	KindShadowBearing                 // shadow_bearing alone: sun azimuth only
	KindSighting                      // sun_azimuth and/or sun_altitude measured directly
	KindOverride                      // only lat/lon/time for the photo
)

func (k Kind) String() string {
	switch k {
	case KindShadow:
		return "shadow"
	case KindShadowBearing:
		return "shadow_bearing"
	case KindSighting:
		return "sighting"
	case KindOverride:
		return "override"
	}
	return "unknown"
}

// Time is a time override. When HasOffset is true the cell was RFC 3339 and
// Instant is that instant. Otherwise the cell was a wall-clock reading at the
// photo's place, and Instant carries the reading's fields in time.UTC as a
// container only: it is not an instant until package zone resolves it.
type Time struct {
	Text      string
	Instant   time.Time
	HasOffset bool
}

// Row is one accepted row. Optional numbers are pointers: nil means the cell
// was empty. Angles are degrees; lengths are in the sheet's own unit.
type Row struct {
	File  string // sheet name, for messages
	Line  int    // physical line where the record starts
	Kind  Kind
	Photo string // as written (apostrophe neutralisation removed)
	// PhotoColumn is the 1-based column of the photo cell, for Resolve's messages.
	PhotoColumn int
	Object      string
	Note        string

	ObjectHeight     *float64
	ShadowLength     *float64
	ShadowBearingDeg *float64
	BearingRef       Ref
	BearingSDDeg     float64 // 1-sigma
	LengthSDPct      float64 // 1-sigma, per cent
	SlopeDeg         float64 // 0 ≤ slope < 90, 0 when level
	SlopeTowardDeg   float64 // bearing the ground falls toward, same reference as shadow_bearing
	SunAzimuthDeg    *float64
	SunAltitudeDeg   *float64
	DeclinationDeg   *float64 // explicit magnetic declination, east positive
	Lat              *float64
	Lon              *float64
	Time             *Time

	cols map[string]int // 1-based column of each binding name, shared by the sheet's rows
}

// Sheet is a parsed measurement sheet.
type Sheet struct {
	File      string
	Separator rune
	Rows      []Row
	// Problems lists every bad cell, row and header column, in file order.
	Problems []*ParseError
	// Unusable is set, and also listed in Problems, when the sheet cannot
	// be read at all: too large, not text, no header, no photo column. A
	// run given such a sheet must stop rather than go on as if no
	// measurement had been made.
	Unusable *ParseError
}

// Parse reads a sheet from r; name is used in messages. It always returns a
// non-nil *Sheet holding the rows that were accepted. The error is nil when
// the sheet had no problem at all; otherwise it joins every *ParseError in
// s.Problems, so errors.Is(err, ErrNotNumber) and errors.As work on it. A
// sheet that cannot be read at all (no header, no photo column, I/O error)
// has no rows.
func Parse(r io.Reader, name string) (*Sheet, error) {
	s := &Sheet{File: name, Separator: ','}
	data, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		return s, fmt.Errorf("sheet %s: %w", name, err)
	}
	if len(data) > MaxBytes {
		s.unusable(1, ErrTooLarge)
		return s, joinProblems(s.Problems)
	}
	data = bytes.TrimPrefix(data, []byte("\uFEFF"))
	if line, ok := notText(data); ok {
		s.unusable(line, ErrNotText)
		return s, joinProblems(s.Problems)
	}
	s.Separator = detectSeparator(data)

	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = s.Separator
	cr.FieldsPerRecord = -1

	header, err := cr.Read()
	if err != nil {
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			s.add(pe.StartLine, pe.Line, 0, "", fmt.Errorf("%w: %v (byte column %d)", ErrSyntax, pe.Err, pe.Column))
			s.Unusable = s.Problems[len(s.Problems)-1]
		} else {
			s.unusable(1, ErrNoHeader)
		}
		return s, joinProblems(s.Problems)
	}
	cols := make([]string, len(header)) // binding name per cell index, "" if ignored
	seen := map[string]bool{}
	known := map[string]bool{}
	for _, c := range columns {
		known[c] = true
	}
	for i, h := range header {
		line, _ := cr.FieldPos(i)
		n := strings.ToLower(strings.TrimSpace(h))
		switch {
		case !known[n]:
			s.add(1, line, i+1, "", fmt.Errorf("%w: %s", ErrUnknownColumn, Quote(h)))
		case seen[n]:
			s.add(1, line, i+1, h, ErrDuplicateColumn)
		default:
			cols[i] = n
			seen[n] = true
		}
	}
	if !seen[ColPhoto] {
		s.unusable(1, fmt.Errorf("%w: header has no %q column", ErrMissing, ColPhoto))
		return s, joinProblems(s.Problems)
	}

	colIndex := map[string]int{}  // 1-based, for rows
	cellIndex := map[string]int{} // 0-based, for reading records
	for i, n := range cols {
		if n != "" {
			colIndex[n] = i + 1
			cellIndex[n] = i
		}
	}
	dups := map[string]int{} // row fingerprint -> first line
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			if errors.As(err, &pe) {
				s.add(pe.StartLine, pe.Line, 0, "", fmt.Errorf("%w: %v (byte column %d)", ErrSyntax, pe.Err, pe.Column))
				continue
			}
			s.add(0, 0, 0, "", err)
			break
		}
		s.parseRecord(cr, cols, colIndex, cellIndex, rec, dups)
	}
	return s, joinProblems(s.Problems)
}

func (s *Sheet) add(start, line, col int, name string, err error) {
	s.Problems = append(s.Problems, &ParseError{File: s.File, StartLine: start, Line: line, Column: col, Name: name, Err: err})
}

// unusable records a problem that makes the whole sheet unusable.
func (s *Sheet) unusable(line int, err error) {
	s.add(line, line, 0, "", err)
	s.Unusable = s.Problems[len(s.Problems)-1]
}

// notText reports whether data is not a text file, and the first line that
// shows it: a NUL byte (which no text file holds, and every photo does), or
// a first line that is not UTF-8. A single badly encoded cell further down
// is only a bad cell.
func notText(data []byte) (line int, bad bool) {
	if i := bytes.IndexByte(data, 0); i >= 0 {
		return 1 + bytes.Count(data[:i], []byte("\n")), true
	}
	first, _, _ := bytes.Cut(data, []byte("\n"))
	if !utf8.Valid(first) {
		return 1, true
	}
	return 0, false
}

// detectSeparator applies the documented rule to the first line: the more
// frequent of ',' and ';' outside double quotes; ties go to ','.
func detectSeparator(data []byte) rune {
	commas, semis := 0, 0
	inQuote := false
	for _, b := range data {
		if b == '"' {
			inQuote = !inQuote
			continue
		}
		if inQuote {
			continue
		}
		if b == '\n' {
			break
		}
		switch b {
		case ',':
			commas++
		case ';':
			semis++
		}
	}
	if semis > commas {
		return ';'
	}
	return ','
}

// cellReader gathers one record's cells by column name and records problems.
type cellReader struct {
	s     *Sheet
	cr    *csv.Reader
	start int
	idx   map[string]int // column name -> cell index
	rec   []string
	bad   bool
}

// pos locates a named cell; a column absent from the header gives column 0
// (the whole record) and the record's first line.
func (c *cellReader) pos(name string) (line, col int) {
	i, ok := c.idx[name]
	if !ok {
		line, _ = c.cr.FieldPos(0)
		return line, 0
	}
	if i < len(c.rec) {
		line, _ = c.cr.FieldPos(i)
	} else {
		line, _ = c.cr.FieldPos(0)
	}
	return line, i + 1
}

func (c *cellReader) fail(name string, err error) {
	line, col := c.pos(name)
	c.s.add(c.start, line, col, name, err)
	c.bad = true
}

func (c *cellReader) text(name string) string {
	i, ok := c.idx[name]
	if !ok || i >= len(c.rec) {
		return ""
	}
	return strings.TrimSpace(c.rec[i])
}

// decimalComma matches a plain number whose decimal mark is a comma.
var decimalComma = regexp.MustCompile(`^[+-]?[0-9]+,[0-9]+$`)

// plainNumber matches the number syntax the sheet accepts: optional sign,
// digits with an optional decimal point, optional exponent. No hex, no
// underscores, no Inf/NaN (which strconv.ParseFloat would take).
var plainNumber = regexp.MustCompile(`^[+-]?([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?$`)

// num parses an optional number cell. ok is false when empty or bad.
func (c *cellReader) num(name string) (v float64, ok bool) {
	t := c.text(name)
	if t == "" {
		return 0, false
	}
	if c.s.Separator == ';' && decimalComma.MatchString(t) {
		t = strings.Replace(t, ",", ".", 1)
	}
	if !plainNumber.MatchString(t) {
		c.fail(name, fmt.Errorf("%w: %s", ErrNotNumber, Quote(c.text(name))))
		return 0, false
	}
	v, err := strconv.ParseFloat(t, 64)
	if err != nil || math.IsInf(v, 0) {
		c.fail(name, fmt.Errorf("%w: %s", ErrNotNumber, Quote(c.text(name))))
		return 0, false
	}
	return v, true
}

// ranged parses an optional number and checks lo ≤ v ≤ hi (or v < hi when
// openHi).
func (c *cellReader) ranged(name string, lo, hi float64, openHi bool) *float64 {
	v, ok := c.num(name)
	if !ok {
		return nil
	}
	if v < lo || v > hi || (openHi && v == hi) {
		r := "]"
		if openHi {
			r = ")"
		}
		c.fail(name, fmt.Errorf("%w: %v not in [%v, %v%s", ErrOutOfRange, v, lo, hi, r))
		return nil
	}
	return &v
}

func (c *cellReader) positive(name string) *float64 {
	v, ok := c.num(name)
	if !ok {
		return nil
	}
	if v <= 0 {
		c.fail(name, fmt.Errorf("%w: %v", ErrNotPositive, v))
		return nil
	}
	return &v
}

// unneutralise removes the apostrophe WriteTemplate puts before a text cell
// that a spreadsheet would otherwise run as a formula.
func unneutralise(t string) string {
	if len(t) >= 2 && t[0] == '\'' && strings.ContainsRune(formulaStarts, rune(t[1])) {
		return t[1:]
	}
	return t
}

func (s *Sheet) parseRecord(cr *csv.Reader, cols []string, colIndex, cellIndex map[string]int, rec []string, dups map[string]int) {
	start, _ := cr.FieldPos(0)
	c := &cellReader{s: s, cr: cr, start: start, idx: cellIndex, rec: rec}
	// Skip records whose cells are all blank (";;;;" lines).
	blank := true
	for _, v := range rec {
		if strings.TrimSpace(v) != "" {
			blank = false
			break
		}
	}
	if blank {
		return
	}
	if len(rec) > len(cols) {
		line, _ := cr.FieldPos(len(cols))
		s.add(start, line, len(cols)+1, "", fmt.Errorf("%w: %d cells, header has %d", ErrExtraField, len(rec), len(cols)))
	}
	for i, v := range rec {
		if !utf8.ValidString(v) {
			line, _ := cr.FieldPos(i)
			name := ""
			if i < len(cols) {
				name = cols[i]
			}
			s.add(start, line, i+1, name, ErrEncoding)
			c.bad = true
		}
	}
	if c.bad {
		return
	}

	row := Row{File: s.File, Line: start, PhotoColumn: colIndex[ColPhoto], cols: colIndex}
	row.Photo = unneutralise(c.text(ColPhoto))
	row.Object = unneutralise(c.text(ColObject))
	row.Note = unneutralise(c.text(ColNote))
	if row.Photo == "" {
		c.fail(ColPhoto, ErrMissing)
	}

	row.ObjectHeight = c.positive(ColObjectHeight)
	row.ShadowLength = c.positive(ColShadowLength)
	row.ShadowBearingDeg = c.ranged(ColShadowBearing, 0, 360, false)
	row.SunAzimuthDeg = c.ranged(ColSunAzimuth, 0, 360, false)
	row.SunAltitudeDeg = c.ranged(ColSunAltitude, -90, 90, false)
	row.DeclinationDeg = c.ranged(ColDeclination, -180, 180, false)
	row.Lat = c.ranged(ColLat, -90, 90, false)
	row.Lon = c.ranged(ColLon, -180, 180, false)

	row.BearingRef = RefTrue
	switch ref := strings.ToLower(c.text(ColBearingRef)); ref {
	case "", "true":
	case "magnetic":
		row.BearingRef = RefMagnetic
	case "grid":
		row.BearingRef = RefGrid
	default:
		c.fail(ColBearingRef, fmt.Errorf("%w: %s", ErrUnknownRef, Quote(c.text(ColBearingRef))))
	}
	// Uncertainties must be positive: a zero would give the measurement
	// infinite weight downstream.
	row.BearingSDDeg = DefaultBearingSDDeg
	if v := c.positive(ColBearingSD); v != nil {
		if *v > 90 {
			c.fail(ColBearingSD, fmt.Errorf("%w: %v not in (0, 90]", ErrOutOfRange, *v))
		}
		row.BearingSDDeg = *v
	}
	row.LengthSDPct = DefaultLengthSDPct
	if v := c.positive(ColLengthSDPct); v != nil {
		if *v > 100 {
			c.fail(ColLengthSDPct, fmt.Errorf("%w: %v not in (0, 100]", ErrOutOfRange, *v))
		}
		row.LengthSDPct = *v
	}
	if v := c.ranged(ColSlope, 0, 90, true); v != nil {
		row.SlopeDeg = *v
	}
	if v := c.ranged(ColSlopeToward, 0, 360, false); v != nil {
		row.SlopeTowardDeg = *v
		if c.text(ColSlope) == "" {
			c.fail(ColSlope, fmt.Errorf("%w: slope_toward given without slope", ErrIncomplete))
		}
	} else if row.SlopeDeg > 0 && c.text(ColSlopeToward) == "" {
		c.fail(ColSlopeToward, fmt.Errorf("%w: a slope needs the bearing it falls toward", ErrIncomplete))
	}

	if t := c.text(ColTime); t != "" {
		tm, err := parseTime(t)
		if err != nil {
			c.fail(ColTime, fmt.Errorf("%w: %s", ErrBadTime, Quote(t)))
		} else {
			row.Time = tm
		}
	}
	if (c.text(ColLat) == "") != (c.text(ColLon) == "") {
		missing := ColLat
		if c.text(ColLon) == "" {
			missing = ColLon
		}
		c.fail(missing, fmt.Errorf("%w: lat and lon go together", ErrIncomplete))
	}
	if c.bad {
		return
	}

	hasH, hasL, hasB := c.text(ColObjectHeight) != "", c.text(ColShadowLength) != "", c.text(ColShadowBearing) != ""
	hasAz, hasAlt := c.text(ColSunAzimuth) != "", c.text(ColSunAltitude) != ""
	switch {
	case (hasH || hasL || hasB) && (hasAz || hasAlt):
		name := ColSunAzimuth
		if !hasAz {
			name = ColSunAltitude
		}
		c.fail(name, ErrConflict)
	case hasH && hasL && hasB:
		row.Kind = KindShadow
	case hasH || hasL:
		name := ColShadowBearing // the first missing of the three
		if !hasH {
			name = ColObjectHeight
		} else if !hasL {
			name = ColShadowLength
		}
		c.fail(name, fmt.Errorf("%w: a shadow needs object_height, shadow_length and shadow_bearing (or shadow_bearing alone)", ErrIncomplete))
	case hasB:
		row.Kind = KindShadowBearing
	case hasAz || hasAlt:
		row.Kind = KindSighting
	case row.Lat != nil || row.Time != nil:
		row.Kind = KindOverride
	default:
		// Settings without anything they apply to are reported, so that a
		// measurement typed into the wrong columns is not lost silently.
		for _, n := range []string{ColBearingRef, ColBearingSD, ColLengthSDPct, ColSlope, ColSlopeToward, ColDeclination} {
			if c.text(n) != "" {
				c.fail(n, fmt.Errorf("%w: %s given without a shadow, sighting or override", ErrIncomplete, n))
				return
			}
		}
		return // unfilled template row: photo, object and note only
	}
	if c.bad {
		return
	}

	fp := fingerprint(c)
	if first, ok := dups[fp]; ok {
		c.fail(ColPhoto, fmt.Errorf("%w: same as line %d", ErrDuplicate, first))
		return
	}
	dups[fp] = start
	s.Rows = append(s.Rows, row)
}

// fingerprint identifies a row by its known cells, trimmed and case-folded
// where case carries no meaning, so that re-pasted rows are caught.
func fingerprint(c *cellReader) string {
	var b strings.Builder
	for _, n := range columns {
		v := c.text(n)
		if n == ColBearingRef {
			v = strings.ToLower(v)
			if v == "" {
				v = string(RefTrue)
			}
		}
		b.WriteString(v)
		b.WriteByte(0)
	}
	return b.String()
}

// wallLayouts are the accepted wall-clock forms (no offset): ISO 8601
// extended with 'T' or a space, and the EXIF "YYYY:MM:DD hh:mm:ss" form that
// examiners copy from metadata tools. Fractional seconds are accepted.
var wallLayouts = []string{
	"2006-01-02T15:04:05.999999999",
	"2006-01-02 15:04:05.999999999",
	"2006-01-02T15:04",
	"2006-01-02 15:04",
	"2006:01:02 15:04:05.999999999",
}

func parseTime(t string) (*Time, error) {
	if tm, err := time.Parse(time.RFC3339Nano, t); err == nil {
		return &Time{Text: t, Instant: tm, HasOffset: true}, nil
	}
	for _, l := range wallLayouts {
		if tm, err := time.Parse(l, t); err == nil {
			return &Time{Text: t, Instant: tm}, nil
		}
	}
	return nil, ErrBadTime
}
