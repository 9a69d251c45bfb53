package report

import (
	"encoding/csv"
	"errors"
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"io"
	"slices"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// CSVColumns returns the first row of report.csv. The columns are documented
// in the README; "checks" packs every check as
// "kind=status(figure±uncertainty unit)" joined by "; ", in the order of
// Photo.Checks; "readings" packs each reading as "utc (UTC±hh:mm abbreviation)
// verdict", the one used marked "(used)", joined by "; ".
func CSVColumns() []string { return slices.Clone(csvHeader) }

var csvHeader = []string{
	"path", "root", "sha256", "size", "container", "camera", "camera_name", "claimed_local", "claim_source",
	"zone", "claimed_utc", "lat", "lon", "sun_azimuth", "sun_altitude", "verdict",
	"offset_s", "offset_low_s", "offset_high_s", "corrected_utc_earliest", "corrected_utc_latest",
	"checks", "explanation", "error", "file_notes", "season_bands", "readings", "claim_notes",
	"camera_drift_s_per_day", "camera_drift_low_s_per_day", "camera_drift_high_s_per_day", "clock_reset",
}

// WriteCSV writes one row per photo (sorted by path, then root) under
// CSVColumns. Numeric columns (size, lat, lon, sun_azimuth, sun_altitude,
// offset_s, offset_low_s, offset_high_s, camera_drift_*) are formatted by us from numbers and
// are written as they are, so a negative offset stays a number; an unknown
// number is an empty cell. Every other cell is text and goes through
// NeutraliseCell. Bytes are otherwise kept: a file name that is not valid
// UTF-8 is written with its exact bytes (JSON carries a base64 copy).
// It is [NewCSVSink] fed every photo.
func WriteCSV(w io.Writer, a *Audit) error {
	if a == nil {
		return errors.New("report: WriteCSV: nil audit")
	}
	return feed(NewCSVSink(w), sorted(a).Photos)
}

// csvSink is report.csv written a row at a time through encoding/csv, whose
// Writer holds no more than its buffer.
type csvSink struct {
	sinkState
	cw     *csv.Writer
	header bool
	row    []string // reused for every row
}

// NewCSVSink returns a Sink that writes report.csv to w, byte for byte as
// [WriteCSV] does for the same photos: the header row at the first Photo
// or Close, then one row per photo.
func NewCSVSink(w io.Writer) Sink {
	return &csvSink{sinkState: sinkState{format: "CSV"}, cw: csv.NewWriter(w)}
}

func (s *csvSink) start() error {
	if s.header {
		return nil
	}
	s.header = true
	if err := s.cw.Write(csvHeader); err != nil {
		return s.fail(fmt.Errorf("header: %w", err))
	}
	return nil
}

func (s *csvSink) Photo(p *Photo) error {
	if err := s.admit(p); err != nil {
		return err
	}
	if err := s.start(); err != nil {
		return err
	}
	var az, alt string
	if p.Sun != nil {
		az, alt = csvFloat(&p.Sun.Azimuth), csvFloat(&p.Sun.Altitude)
	}
	s.row = append(s.row[:0],
		NeutraliseCell(p.Path), NeutraliseCell(p.Root), NeutraliseCell(p.SHA256),
		strconv.FormatInt(p.Size, 10),
		NeutraliseCell(p.Container), NeutraliseCell(p.Camera), NeutraliseCell(p.CameraName), NeutraliseCell(p.ClaimedLocal),
		NeutraliseCell(p.ClaimSource), NeutraliseCell(p.Zone), NeutraliseCell(p.ClaimedUTC),
		csvFloat(p.Lat), csvFloat(p.Lon), az, alt,
		NeutraliseCell(p.Verdict),
		csvFloat(p.OffsetS), csvFloat(p.OffsetLowS), csvFloat(p.OffsetHighS),
		NeutraliseCell(p.CorrectedUTCEarliest), NeutraliseCell(p.CorrectedUTCLatest),
		NeutraliseCell(checksCell(p.Checks)),
		NeutraliseCell(p.Explanation), NeutraliseCell(p.Error), NeutraliseCell(strings.Join(p.FileNotes, "; ")),
		NeutraliseCell(seasonBandsCell(p.SeasonBands)),
		NeutraliseCell(readingsCell(p.Readings)), NeutraliseCell(strings.Join(p.ClaimNotes, "; ")),
		csvFloat(p.CameraDriftSPerDay), csvFloat(p.CameraDriftLowSPerDay), csvFloat(p.CameraDriftHighSPerDay),
		NeutraliseCell(p.ClockReset),
	)
	if err := s.cw.Write(s.row); err != nil {
		return s.fail(fmt.Errorf("row for %q: %w", p.Path, err))
	}
	return nil
}

func (s *csvSink) Close() error {
	if ok, err := s.closing(); !ok {
		return err
	}
	if err := s.start(); err != nil {
		return err
	}
	s.cw.Flush()
	return s.fail(s.cw.Error())
}

// csvFloat formats a number in the shortest form that reads back exactly;
// nil is "". A non-finite value is written as NaN, +Inf or -Inf, the signed
// forms behind an apostrophe so that no spreadsheet evaluates them.
func csvFloat(f *float64) string {
	if f == nil {
		return ""
	}
	if n := nonFiniteName(*f); n != "" {
		return NeutraliseCell(n)
	}
	return strconv.FormatFloat(*f, 'f', -1, 64)
}

// seasonBandsCell packs season bands into one cell, nearest first:
// "first..last" (ISO 8601 dates) joined by "; ".
func seasonBandsCell(bs []SeasonBand) string {
	parts := make([]string, len(bs))
	for i, b := range bs {
		parts[i] = b.First + ".." + b.Last
	}
	return strings.Join(parts, "; ")
}

// checksCell packs checks into one cell: "kind=status(figure±uncertainty
// unit)", with ", misfit χ²/dof p=…" inside the brackets for a check that
// fits a measurement.
func checksCell(cs []Check) string {
	parts := make([]string, 0, len(cs))
	for _, c := range cs {
		var in []string
		if c.Figure != nil {
			// Rounded by the rule of the HTML card (package figure).
			fig := figure.Decimal(*c.Figure, 0, plainDecimals(*c.Figure))
			if c.Uncertainty != nil {
				fig = figure.Decimal(*c.Figure, *c.Uncertainty, 2) + "±" + figure.Uncertainty(*c.Uncertainty)
			}
			if c.Unit != "" {
				fig += " " + c.Unit
			}
			in = append(in, fig)
		}
		if c.MisfitChi2 != nil && c.MisfitDof != nil && c.MisfitP != nil {
			in = append(in, "misfit "+strconv.FormatFloat(*c.MisfitChi2, 'g', 3, 64)+"/"+strconv.Itoa(*c.MisfitDof)+
				" p="+strconv.FormatFloat(*c.MisfitP, 'g', 2, 64))
		}
		s := c.Kind + "=" + c.Status
		if len(in) > 0 {
			s += "(" + strings.Join(in, ", ") + ")"
		}
		parts = append(parts, s)
	}
	return strings.Join(parts, "; ")
}

// NeutraliseCell returns s prefixed with an apostrophe when a spreadsheet
// would read it as a formula: when its first character is = + - @ (or their
// full-width forms ＝ ＋ － ＠), a tab or a carriage return, or when such a
// character follows leading white space. This is the rule OWASP gives for
// "CSV injection"; the apostrophe shows in a text editor but makes Excel,
// LibreOffice and Google Sheets store the cell as text. Only text cells go
// through it; numbers we format are never altered.
func NeutraliseCell(s string) string {
	if s == "" {
		return s
	}
	switch s[0] {
	case '\t', '\r':
		return "'" + s
	}
	t := strings.TrimLeftFunc(s, unicode.IsSpace)
	if t == "" {
		return s
	}
	r, _ := utf8.DecodeRuneInString(t)
	switch r {
	case '=', '+', '-', '@', '\t', '\r', '＝', '＋', '－', '＠':
		return "'" + s
	}
	return s
}

// readingsCell packs the readings of a wall time for one CSV cell.
func readingsCell(rs []Reading) string {
	parts := make([]string, 0, len(rs))
	for _, r := range rs {
		s := r.UTC + " (UTC" + r.UTCOffset
		if r.Abbreviation != "" {
			s += " " + r.Abbreviation
		}
		s += ") " + r.Verdict
		if r.Used {
			s += " (used)"
		}
		parts = append(parts, s)
	}
	return strings.Join(parts, "; ")
}
