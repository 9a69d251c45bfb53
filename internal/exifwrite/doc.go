// Package exifwrite writes small, well-formed EXIF payloads and wraps them in
// the containers gnomon reads (JPEG, PNG, WebP, HEIF, TIFF, XMP), so that
// tests and the `gnomon demo` command can produce photos whose metadata is
// known exactly.
//
// It is for test fixtures and invented demo photos only. It must never be
// used to alter or "repair" evidence: it writes new files from values the
// caller supplies, it does not edit a photo under examination.
//
// Standards followed:
//   - the TIFF structure of CIPA DC-008-2023 (Exif 3.0) / TIFF 6.0: a byte
//     order mark (II or MM), the magic 42, IFD0 with the Exif IFD pointer
//     (0x8769) and GPS IFD pointer (0x8825), IFD1 with the thumbnail through
//     JPEGInterchangeFormat (0x0201/0x0202); entries sorted by tag, values
//     longer than four bytes stored out of line at word (even) offsets. The
//     Photo convenience type writes ExifVersion "0232" (Exif 2.32; every
//     tag it writes exists since Exif 2.31 at the latest, OffsetTime* and
//     GPSHPositioningError being the newest);
//     the UTF-8 type (129) of Exif 3.0 is available for hand-built entries.
//   - JPEG: ISO/IEC 10918-1 segments; Exif in APP1 with the "Exif\0\0"
//     identifier, XMP in APP1 with "http://ns.adobe.com/xap/1.0/\0" (XMP
//     Specification Part 3).
//   - PNG: eXIf chunk of the PNG Specification (Third Edition) / PNG
//     Extensions 1.5.0, placed before the first IDAT, CRC-32 per ISO 3309.
//   - WebP: RIFF container with a VP8X header and an EXIF chunk after the
//     image data (Google's WebP Container Specification, RFC 9649 section 2.7);
//     the image is a solid-colour VP8L lossless bitstream (RFC 9649 section 3)
//     written by this package.
//   - HEIF: ISO/IEC 23008-12 with the Exif item of Annex A.2.1: the item body
//     is a 4-byte big-endian offset to the TIFF header followed by the payload.
//     Boxes per ISO/IEC 14496-12.
//
// Departures, stated so nobody relies on them: the HEIF container built by
// HEIF carries no coded image (its primary item has no decodable data), so it
// exercises metadata parsers only; where a decodable HEIC is needed, encode a
// JPEG made by JPEG with libheif's heif-enc, which copies the Exif segment
// into an Exif item (exifread/testdata/gen_fixtures.sh does this). TIFF
// writes uncompressed 8-bit RGB only. Payload writes no Interoperability IFD
// and no MakerNote. WebP images are a single solid colour.
//
// Checked against the outside world: the fixtures built by package
// exifwrite/fixtures are committed byte for byte under exifread/testdata/fixtures
// together with exiftool's reading of them and libheif's box dump; the tests
// also decode every container with readers this project did not write
// (goexif's TIFF parser, image/jpeg, image/png, golang.org/x/image/webp and
// golang.org/x/image/tiff).
//
// Section names and numbers in the comments are cited from memory of the
// documents, not from copies at hand; what the code writes is checked by the
// outside readers above rather than by those citations.
//
// Deliberately damaged payloads (for reader tests) are possible through
// Payload.Raw, which turns off the consistency checks, and through
// Payload.Build, which reports where each directory landed so a test can
// patch the bytes.
package exifwrite
