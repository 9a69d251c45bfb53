package exifwrite

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"math"
	"strconv"
)

// XMPFields are the XMP properties gnomon reads. Dates are XMP dates (ISO
// 8601 subset of XMP Part 1 "Date" value type, e.g. "2024-06-01T10:15:30.25+02:00";
// the offset is optional). Empty strings and nil pointers are left out.
type XMPFields struct {
	DateTimeOriginal string // exif:DateTimeOriginal
	CreateDate       string // xmp:CreateDate
	ModifyDate       string // xmp:ModifyDate
	DateCreated      string // photoshop:DateCreated
	Make, Model      string // tiff:Make, tiff:Model
	// LatDeg/LonDeg (signed degrees) become exif:GPSLatitude/GPSLongitude
	// in the XMP GPSCoordinate form "DDD,MM.mmmmmmmK" (XMP Part 2, Exif
	// schema, GPSCoordinate value type; the rounding error is below 1e-7 minute).
	LatDeg, LonDeg *float64
	AltitudeM      *float64 // exif:GPSAltitude (rational, metres) + exif:GPSAltitudeRef
}

// XMPCoordinate formats signed degrees as an XMP GPSCoordinate
// "DDD,MM.mmmmmmmK"; pos and neg are the hemisphere letters ("N","S").
func XMPCoordinate(deg float64, pos, neg string) string {
	h := pos
	if deg < 0 {
		h = neg
	}
	// Work in units of 1e-7 minute so rounding never yields "60.0000000".
	units := int64(math.Round(math.Abs(deg) * 60 * 1e7))
	d := units / (60 * 1e7)
	rem := units - d*60*1e7
	return fmt.Sprintf("%d,%02d.%07d%s", d, rem/1e7, rem%1e7, h)
}

// XMP returns a complete XMP packet (with xpacket wrapper, UTF-8), suitable
// for a JPEG APP1 segment or, as is, for a ".xmp" sidecar file.
func XMP(f XMPFields) []byte {
	var attrs bytes.Buffer
	add := func(name, val string) {
		if val == "" {
			return
		}
		attrs.WriteString("\n   ")
		attrs.WriteString(name)
		attrs.WriteString(`="`)
		_ = xml.EscapeText(&attrs, []byte(val)) // writes to a bytes.Buffer: cannot fail
		attrs.WriteString(`"`)
	}
	add("exif:DateTimeOriginal", f.DateTimeOriginal)
	add("xmp:CreateDate", f.CreateDate)
	add("xmp:ModifyDate", f.ModifyDate)
	add("photoshop:DateCreated", f.DateCreated)
	add("tiff:Make", f.Make)
	add("tiff:Model", f.Model)
	if f.LatDeg != nil {
		add("exif:GPSLatitude", XMPCoordinate(*f.LatDeg, "N", "S"))
	}
	if f.LonDeg != nil {
		add("exif:GPSLongitude", XMPCoordinate(*f.LonDeg, "E", "W"))
	}
	if f.AltitudeM != nil {
		ref := "0"
		if *f.AltitudeM < 0 {
			ref = "1"
		}
		add("exif:GPSAltitudeRef", ref)
		add("exif:GPSAltitude", strconv.FormatInt(int64(math.Round(math.Abs(*f.AltitudeM)*1000)), 10)+"/1000")
	}
	var b bytes.Buffer
	b.WriteString("<?xpacket begin=\"\uFEFF\" id=\"W5M0MpCehiHzreSzNTczkc9d\"?>\n")
	b.WriteString(`<x:xmpmeta xmlns:x="adobe:ns:meta/">` + "\n")
	b.WriteString(` <rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#">` + "\n")
	b.WriteString(`  <rdf:Description rdf:about=""` +
		"\n   " + `xmlns:exif="http://ns.adobe.com/exif/1.0/"` +
		"\n   " + `xmlns:xmp="http://ns.adobe.com/xap/1.0/"` +
		"\n   " + `xmlns:photoshop="http://ns.adobe.com/photoshop/1.0/"` +
		"\n   " + `xmlns:tiff="http://ns.adobe.com/tiff/1.0/"`)
	b.Write(attrs.Bytes())
	b.WriteString("/>\n </rdf:RDF>\n</x:xmpmeta>\n<?xpacket end=\"w\"?>")
	return b.Bytes()
}
