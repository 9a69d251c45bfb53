package exifwrite

import (
	"encoding/binary"
	"math"
)

// Tag numbers used by Photo (Exif 2.32 / CIPA DC-008, the IFD0, Exif IFD and GPS IFD tag tables).
const (
	TagMake                 uint16 = 0x010F
	TagModel                uint16 = 0x0110
	TagOrientation          uint16 = 0x0112
	TagXResolution          uint16 = 0x011A
	TagYResolution          uint16 = 0x011B
	TagResolutionUnit       uint16 = 0x0128
	TagSoftware             uint16 = 0x0131
	TagDateTime             uint16 = 0x0132
	TagCompression          uint16 = 0x0103
	TagExposureTime         uint16 = 0x829A
	TagFNumber              uint16 = 0x829D
	TagISO                  uint16 = 0x8827
	TagExifVersion          uint16 = 0x9000
	TagDateTimeOriginal     uint16 = 0x9003
	TagDateTimeDigitized    uint16 = 0x9004
	TagOffsetTime           uint16 = 0x9010
	TagOffsetTimeOriginal   uint16 = 0x9011
	TagOffsetTimeDigitized  uint16 = 0x9012
	TagFlash                uint16 = 0x9209
	TagFocalLength          uint16 = 0x920A
	TagSubSecTime           uint16 = 0x9290
	TagSubSecTimeOriginal   uint16 = 0x9291
	TagSubSecTimeDigitized  uint16 = 0x9292
	TagYCbCrPositioning     uint16 = 0x0213
	TagComponentsConfig     uint16 = 0x9101
	TagFlashpixVersion      uint16 = 0xA000
	TagColorSpace           uint16 = 0xA001
	TagPixelXDimension      uint16 = 0xA002
	TagPixelYDimension      uint16 = 0xA003
	TagFocalLengthIn35mm    uint16 = 0xA405
	TagImageUniqueID        uint16 = 0xA420
	TagBodySerialNumber     uint16 = 0xA431
	TagLensModel            uint16 = 0xA434
	TagGPSVersionID         uint16 = 0x0000
	TagGPSLatitudeRef       uint16 = 0x0001
	TagGPSLatitude          uint16 = 0x0002
	TagGPSLongitudeRef      uint16 = 0x0003
	TagGPSLongitude         uint16 = 0x0004
	TagGPSAltitudeRef       uint16 = 0x0005
	TagGPSAltitude          uint16 = 0x0006
	TagGPSTimeStamp         uint16 = 0x0007
	TagGPSDOP               uint16 = 0x000B
	TagGPSImgDirectionRef   uint16 = 0x0010
	TagGPSImgDirection      uint16 = 0x0011
	TagGPSMapDatum          uint16 = 0x0012
	TagGPSDateStamp         uint16 = 0x001D
	TagGPSHPositioningError uint16 = 0x001F
)

// Photo holds the metadata a typical camera writes. Empty strings, zero
// rationals and zero integers are left out, except where a pointer makes
// "absent" explicit (Flash, where 0 means "did not fire").
type Photo struct {
	Make, Model, BodySerial, LensModel, Software, ImageUniqueID string
	// Orientation 1..8 (TIFF 6.0); 0 writes no tag.
	Orientation int
	// Dates as cameras write them: "YYYY:MM:DD HH:MM:SS", a wall time.
	DateTimeOriginal, DateTimeDigitized, DateTime string
	// Sub-second digits ("123") and offsets ("+02:00"), Exif 2.31.
	SubSecOriginal, SubSecDigitized, SubSec             string
	OffsetTimeOriginal, OffsetTimeDigitized, OffsetTime string
	ExposureTime, FNumber, FocalLength                  Rational
	// ISO is written as PhotographicSensitivity (SHORT); values above 65535
	// are written as 65535, which is what Exif 2.3 asks for PhotographicSensitivity
	// (from memory; it then wants the true value in another tag, not written here).
	ISO           int
	Flash         *int
	FocalLength35 int
	// PixelWidth/PixelHeight: PixelXDimension/PixelYDimension (LONG).
	PixelWidth, PixelHeight int
	GPS                     *GPS
	// Thumbnail: a complete JPEG for IFD1.
	Thumbnail []byte
}

// GPS holds the GPS IFD values. LatDeg/LonDeg are always written when a GPS
// block is present (a test of position (0, 0) needs that); the rest is
// optional.
type GPS struct {
	LatDeg, LonDeg  float64 // signed degrees, north and east positive
	AltitudeM       *float64
	DateStamp       string      // "YYYY:MM:DD", UTC
	TimeStamp       [3]Rational // h, m, s (UTC); all zero writes no tag
	ImgDirection    Rational    // degrees 0..359.99
	ImgDirectionRef string      // "T" true north or "M" magnetic
	HPosError       Rational    // metres
	DOP             Rational
	MapDatum        string // e.g. "WGS-84"
}

// Ptr returns a pointer to v, for the optional fields.
func Ptr[T any](v T) *T { return &v }

// DMS converts signed decimal degrees to the three RATIONALs of
// GPSLatitude/GPSLongitude (degrees/1, minutes/1, seconds/10000) and the
// sign. Integer arithmetic on units of 1e-4 arc-second keeps seconds below 60
// (no 59.99995 -> 60 carry); the rounding error is at most 0.00005" (about
// 1.5 mm on the ground).
func DMS(deg float64) (dms [3]Rational, negative bool) {
	negative = deg < 0
	units := uint64(math.Round(math.Abs(deg) * 3600 * 10000))
	d := units / (3600 * 10000)
	units -= d * 3600 * 10000
	m := units / (60 * 10000)
	s := units - m*60*10000
	return [3]Rational{{uint32(d), 1}, {uint32(m), 1}, {uint32(s), 10000}}, negative
}

// Payload builds the EXIF payload of p in the given byte order.
func (p Photo) Payload(order binary.ByteOrder) Payload {
	var pl Payload
	pl.Order = order
	str := func(dst *[]Entry, tag uint16, s string) {
		if s != "" {
			*dst = append(*dst, ASCII(tag, s))
		}
	}
	rat := func(dst *[]Entry, tag uint16, r Rational) {
		if !r.IsZero() {
			*dst = append(*dst, Rat(tag, r))
		}
	}
	str(&pl.IFD0, TagMake, p.Make)
	str(&pl.IFD0, TagModel, p.Model)
	if p.Orientation != 0 {
		pl.IFD0 = append(pl.IFD0, Short(TagOrientation, uint16(p.Orientation)))
	}
	pl.IFD0 = append(pl.IFD0,
		Rat(TagXResolution, Rational{72, 1}),
		Rat(TagYResolution, Rational{72, 1}),
		Short(TagResolutionUnit, 2))
	str(&pl.IFD0, TagSoftware, p.Software)
	str(&pl.IFD0, TagDateTime, p.DateTime)
	// YCbCrPositioning, ComponentsConfiguration, FlashpixVersion and
	// ColorSpace are mandatory in a JPEG's Exif (Exif 2.32 tag support levels, as
	// exiftool -validate also checks);
	// written always, with the values of an ordinary sRGB camera JPEG.
	pl.IFD0 = append(pl.IFD0, Short(TagYCbCrPositioning, 1))

	ex := &pl.Exif
	rat(ex, TagExposureTime, p.ExposureTime)
	rat(ex, TagFNumber, p.FNumber)
	if p.ISO > 0 {
		*ex = append(*ex, Short(TagISO, uint16(min(p.ISO, 65535))))
	}
	*ex = append(*ex, Undefined(TagExifVersion, []byte("0232")),
		Undefined(TagComponentsConfig, []byte{1, 2, 3, 0}),
		Undefined(TagFlashpixVersion, []byte("0100")),
		Short(TagColorSpace, 1))
	str(ex, TagDateTimeOriginal, p.DateTimeOriginal)
	str(ex, TagDateTimeDigitized, p.DateTimeDigitized)
	str(ex, TagOffsetTime, p.OffsetTime)
	str(ex, TagOffsetTimeOriginal, p.OffsetTimeOriginal)
	str(ex, TagOffsetTimeDigitized, p.OffsetTimeDigitized)
	if p.Flash != nil {
		*ex = append(*ex, Short(TagFlash, uint16(*p.Flash)))
	}
	rat(ex, TagFocalLength, p.FocalLength)
	str(ex, TagSubSecTime, p.SubSec)
	str(ex, TagSubSecTimeOriginal, p.SubSecOriginal)
	str(ex, TagSubSecTimeDigitized, p.SubSecDigitized)
	if p.PixelWidth > 0 {
		*ex = append(*ex, Long(TagPixelXDimension, uint32(p.PixelWidth)))
	}
	if p.PixelHeight > 0 {
		*ex = append(*ex, Long(TagPixelYDimension, uint32(p.PixelHeight)))
	}
	if p.FocalLength35 > 0 {
		*ex = append(*ex, Short(TagFocalLengthIn35mm, uint16(p.FocalLength35)))
	}
	str(ex, TagImageUniqueID, p.ImageUniqueID)
	str(ex, TagBodySerialNumber, p.BodySerial)
	str(ex, TagLensModel, p.LensModel)

	if g := p.GPS; g != nil {
		gp := &pl.GPS
		*gp = append(*gp, Bytes(TagGPSVersionID, 2, 3, 0, 0))
		lat, south := DMS(g.LatDeg)
		lon, west := DMS(g.LonDeg)
		*gp = append(*gp,
			ASCII(TagGPSLatitudeRef, map[bool]string{false: "N", true: "S"}[south]),
			Rat(TagGPSLatitude, lat[:]...),
			ASCII(TagGPSLongitudeRef, map[bool]string{false: "E", true: "W"}[west]),
			Rat(TagGPSLongitude, lon[:]...))
		if g.AltitudeM != nil {
			ref := byte(0)
			if *g.AltitudeM < 0 {
				ref = 1
			}
			*gp = append(*gp, Bytes(TagGPSAltitudeRef, ref),
				Rat(TagGPSAltitude, Rational{uint32(math.Round(math.Abs(*g.AltitudeM) * 1000)), 1000}))
		}
		if g.TimeStamp != [3]Rational{} {
			*gp = append(*gp, Rat(TagGPSTimeStamp, g.TimeStamp[:]...))
		}
		rat(gp, TagGPSDOP, g.DOP)
		str(gp, TagGPSImgDirectionRef, g.ImgDirectionRef)
		rat(gp, TagGPSImgDirection, g.ImgDirection)
		str(gp, TagGPSMapDatum, g.MapDatum)
		str(gp, TagGPSDateStamp, g.DateStamp)
		rat(gp, TagGPSHPositioningError, g.HPosError)
	}
	if len(p.Thumbnail) > 0 {
		pl.IFD1 = append(pl.IFD1,
			Short(TagCompression, 6),
			Rat(TagXResolution, Rational{72, 1}),
			Rat(TagYResolution, Rational{72, 1}),
			Short(TagResolutionUnit, 2))
		pl.Thumbnail = p.Thumbnail
	}
	return pl
}
