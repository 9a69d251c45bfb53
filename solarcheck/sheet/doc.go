// Package sheet reads and writes the examiner's measurement sheet: one row
// per measured object (a shadow, or a direct sighting of the sun) or per
// override of a photo's place or time, several rows per photo allowed.
//
// The file format is CSV as described in RFC 4180 and read with
// encoding/csv, with these departures and decisions:
//
//   - Encoding is UTF-8, with or without a byte-order mark (U+FEFF), which is
//     dropped. Invalid UTF-8 in a cell is reported as a bad cell.
//   - The separator is ',' or ';'. It is decided once, from the header line
//     (the first line after the BOM): whichever of the two occurs more often
//     outside double quotes wins; a tie (for instance a one-column header)
//     means ','. Column names contain neither character, so a well-formed
//     header always decides clearly.
//   - Decimal comma: when, and only when, the separator is ';', a number may
//     use a comma as its decimal mark ("12,5"), as spreadsheets in many
//     locales write it. Digit grouping is never accepted ("1.234,5",
//     "1,234.5" are not numbers), and in a ','-separated sheet a quoted
//     "12,5" is rejected rather than guessed at.
//   - Records may have fewer cells than the header (missing cells are empty);
//     a record with more cells than the header is reported, and its extra
//     cells are ignored.
//   - Column names are matched after trimming spaces and folding case. The
//     names are binding because later checks depend on them: photo, object,
//     object_height, shadow_length, shadow_bearing, bearing_ref, bearing_sd,
//     length_sd_pct, slope, slope_toward, sun_azimuth, sun_altitude,
//     declination, lat, lon, time, note. Unknown and repeated columns are
//     reported (ErrUnknownColumn, ErrDuplicateColumn) and ignored; a sheet
//     without a photo column is unusable.
//   - Lines are counted physically (a quoted cell may span lines), as
//     csv.Reader.FieldPos reports them, so a message points at the line an
//     editor shows.
//
// Each row is classified (see Kind): a full shadow (object_height,
// shadow_length and shadow_bearing), a shadow bearing alone (gives the sun's
// azimuth only), a sighting (sun_azimuth and/or sun_altitude), or an
// override only (lat/lon/time without a measurement). Rows that give nothing
// but photo, object and note (an unfilled template row) are skipped quietly;
// a row with settings (bearing_ref, bearing_sd, length_sd_pct, slope,
// slope_toward, declination) but nothing they apply to is reported.
//
// Every bad cell becomes a *ParseError naming the file, the physical line and
// the column (1-based index and name); its cause is one of the Err… values
// and can be tested with errors.Is. A row with a bad cell is dropped; all
// other rows are still returned. Exact duplicate rows are reported and the
// repeat is dropped; two different measurements of the same object are kept
// (repeated measurements are legitimate).
//
// The sheet records bearing_ref and declination as written: turning magnetic
// or grid bearings into true ones is the job of package geomag, and zone
// resolution of wall-clock times is the job of package zone.
//
// WriteTemplate writes an empty sheet, one row per photo, for the examiner to
// fill in; cells that a spreadsheet would run as a formula are neutralised
// with a leading apostrophe (OWASP "CSV injection" advice), and Parse removes
// that apostrophe again from the text columns.
package sheet
