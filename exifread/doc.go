// Package exifread reads the evidence a photo carries about when and where
// it was taken — EXIF capture times with sub-seconds and offsets, GPS
// position, time and direction, camera and exposure — into a plain Record,
// without trusting or changing the file.
//
// # Formats
//
// EXIF is read as defined by CIPA DC-008 (Exif 2.2 to 3.0, including the
// OffsetTime* tags of 2.31 and the UTF-8 type 129 of 3.0) on the TIFF 6.0
// structure, from these containers, recognised by their bytes:
//
//   - JPEG: the Exif APP1 segment wherever it sits among the segments before
//     the scan (ISO/IEC 10918-1), and the XMP APP1 (XMP Part 3 §1.1.3).
//     Files that end after their metadata segments are read, with a warning.
//   - TIFF and TIFF-structured raw files (DNG, NEF, CR2, ARW, PEF, ORF "IIRO",
//     RW2 "IIU"): the file itself, walked through a bounded window, never
//     read whole; XMP from tag 700.
//   - HEIF/HEIC and AVIF (ISO/IEC 23008-12 on ISO/IEC 14496-12): the item of
//     type 'Exif' found through iinf/infe and located through iloc (file
//     offsets or idat), after its 4-byte TIFF-header offset; XMP from a
//     'mime' item of type application/rdf+xml.
//   - PNG: the eXIf chunk (PNG 3rd edition), before or after IDAT; failing
//     that, the "Raw profile type exif" text chunk that ImageMagick and GIMP
//     write; XMP from iTXt "XML:com.adobe.xmp".
//   - WebP: the RIFF "EXIF" and "XMP " chunks.
//   - XMP (embedded, or a `<file>.xmp` / `<basename>.xmp` sidecar) supplies
//     capture times (with offset when the XMP date has one) and GPS where
//     the EXIF lacks them; every value records its source.
//
// # Departures and choices
//
// All fields are read by this package's own bounded TIFF walker (tiff.go):
// goexif (github.com/rwcarlsen/goexif) drops tags it does not map
// (OffsetTime*, BodySerialNumber, LensModel, GPSHPositioningError,
// FocalLengthIn35mmFilm), rejects a whole directory for one tag of an
// unknown type (Exif 3.0 UTF-8), and, measured on this project's machine,
// can be made to allocate tens of GiB, to loop forever or to panic by a
// hostile payload. goexif is used only as a second opinion: the validated
// in-memory payload (never a whole file, at most 256 KiB, never one in which
// the walker found any fault, an unknown or UTF-8 type, or values whose
// declared sizes add up to more than the payload) is decoded by goexif
// inside recover(), and disagreements on Make, Model and DateTimeOriginal
// become warnings prefixed "cross-check:". TIFF files are not
// cross-checked, to avoid reading them whole. Options.SkipCrossCheck turns
// the second opinion off.
//
// Times are kept as wall-clock readings (WallTime) and never interpreted in
// the machine's local zone; an instant exists only when an offset tag or an
// XMP date supplies the offset. Implausible values are kept raw and marked
// invalid with a reason: dates with blanks or zeros, GPS time fields out of
// range, GPS dates before 1990 or later than the file's other dates plus
// 14 h (the largest offset ahead of UTC), position exactly (0, 0), latitude
// beyond ±90°, direction outside 0–360°, rationals with zero denominators,
// and GPS coordinates stored as text instead of RATIONALs (which general
// readers interpret in incompatible ways).
//
// Tags a camera puts in the wrong directory (Make in the Exif IFD,
// FocalLengthIn35mmFilm in IFD0) are read where they are. MakerNotes are
// not read. Only the first Exif block and the first XMP packet of a file
// are used; a second one is reported as a warning.
//
// # Safety
//
// Every count, offset and allocation is bounded by Options (sizes in 64-bit
// arithmetic against the payload length, a visited set for directory
// offsets, caps on entries, directories and declared value bytes). Damage
// is reported in Record.Err as a *FormatError, *UnsupportedError or
// *LimitError (test with errors.As) together with whatever could be read
// safely. Files are opened read-only; the only full pass over a file is the
// streamed SHA-256.
package exifread
