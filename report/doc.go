// Package report writes an [Audit] to the four files an examiner receives.
//
//   - report.json ([WriteJSON]): the whole document as JSON (RFC 8259), two-space
//     indent, fields in the order of the Go structs, photos sorted by path and
//     cameras by id, map keys sorted. It is written by encoding/json (see
//     jsonCodec) and departs from its plain output in the following
//     documented ways so that no fact is lost: a string (or string list) that is
//     not valid UTF-8 is written with invalid bytes replaced by U+FFFD and a
//     sibling member "<name>_raw_b64" carrying the exact bytes in standard
//     base64 (RFC 4648 §4; for lists, an array of the same length with null for
//     elements that were valid); a non-finite number (NaN, ±Inf, which JSON
//     cannot hold) is written as null with a sibling "<name>_nonfinite" holding
//     "NaN", "+Inf" or "-Inf"; and absent lists are written as [] rather than
//     null. [ReadJSON] applies both siblings, so raw bytes survive a round trip.
//     Invisible and direction-changing characters are written as \uXXXX
//     escapes so that the file cannot display reordered text. [EncodeJSON]
//     writes any other value by the same rules (`gnomon meta --json`).
//   - report.csv ([WriteCSV]): one row per photo, RFC 4180 as implemented by
//     encoding/csv (comma separator, quotes doubled), departing only in ending
//     lines with "\n" rather than CRLF, because encoding/csv would otherwise turn a
//     newline inside a file name into CRLF and change its bytes. Text cells
//     that a spreadsheet would run as a formula are neutralised with a leading
//     apostrophe; cells formatted from numbers are never altered (see
//     [NeutraliseCell]).
//   - report.geojson ([WriteGeoJSON]): an RFC 7946 FeatureCollection with one
//     Point per photo GPS position and one per shadow-derived position. A
//     position that cannot be drawn (NaN, latitude beyond ±90°, longitude beyond
//     ±180°, one half missing) becomes a Feature with null geometry (RFC 7946
//     §3.2 allows it) and a "skipped_reason" property, so it is still counted.
//   - report.html ([WriteHTML]) and its thumbnails ([WriteThumbnail]): one
//     self-contained page (HTML5) with inline CSS and SVG, no script at all and
//     a Content-Security-Policy that forbids scripts, so nothing in the evidence
//     can run when the page is opened.
//
// Each file can also be written a photo at a time through a [Sink]
// ([NewJSONSink], [NewCSVSink], [NewGeoJSONSink], [NewHTMLSink]), so that a
// batch of any size streams through in flat memory; the Write functions are
// those sinks fed a whole [Audit], and both give the same bytes. Photos must
// reach a sink in report order (path, then root); one out of order is
// refused with [ErrOrder].
//
// Every writer renders the same facts; none computes a finding. The files are
// deterministic: the same Audit gives the same bytes. [WriteFileAtomic] puts a
// file in place only once it is complete.
package report
