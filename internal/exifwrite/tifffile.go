package exifwrite

import (
	"fmt"
	"image"
)

// TIFF returns a baseline TIFF 6.0 file whose IFD0 describes img as one
// uncompressed strip of 8-bit RGB (section 6 "RGB Full Color Images"), plus
// the caller's IFD0 entries and the Exif/GPS/IFD1 directories of p. The
// image tags (ImageWidth, ImageLength, BitsPerSample, Compression,
// PhotometricInterpretation, SamplesPerPixel, RowsPerStrip, PlanarConfiguration and,
// unless given, the resolution tags) are added; StripOffsets and
// StripByteCounts are set by the writer.
func TIFF(p Payload, img image.Image) ([]byte, error) {
	if img == nil {
		return nil, fmt.Errorf("tiff: nil image: %w", ErrInvalid)
	}
	bd := img.Bounds()
	w, h := bd.Dx(), bd.Dy()
	if w < 1 || h < 1 || uint64(w)*uint64(h)*3 > 1<<30 {
		return nil, fmt.Errorf("tiff: image size %dx%d unsupported: %w", w, h, ErrInvalid)
	}
	strip := make([]byte, 0, w*h*3)
	for y := bd.Min.Y; y < bd.Max.Y; y++ {
		for x := bd.Min.X; x < bd.Max.X; x++ {
			r, g, b, _ := img.At(x, y).RGBA()
			strip = append(strip, byte(r>>8), byte(g>>8), byte(b>>8))
		}
	}
	q := p
	q.IFD0 = append([]Entry(nil), p.IFD0...)
	add := func(e Entry) {
		if !has(q.IFD0, e.Tag) {
			q.IFD0 = append(q.IFD0, e)
		}
	}
	add(Long(0x0100, uint32(w)))  // ImageWidth
	add(Long(0x0101, uint32(h)))  // ImageLength
	add(Short(0x0102, 8, 8, 8))   // BitsPerSample
	add(Short(TagCompression, 1)) // no compression
	add(Short(0x0106, 2))         // PhotometricInterpretation: RGB
	add(Short(0x0115, 3))         // SamplesPerPixel
	add(Long(0x0116, uint32(h)))  // RowsPerStrip: one strip
	add(Short(0x011C, 1))         // PlanarConfiguration: chunky
	add(Rat(TagXResolution, Rational{72, 1}))
	add(Rat(TagYResolution, Rational{72, 1}))
	add(Short(TagResolutionUnit, 2))
	b, _, err := q.build(strip)
	if err != nil {
		return nil, fmt.Errorf("tiff: %w", err)
	}
	return b, nil
}
