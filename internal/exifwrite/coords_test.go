package exifwrite_test

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
)

// TestDMS: decimal degrees to degrees/minutes/seconds, worked by hand
// (0.5197 deg x 60 = 31.182'; 0.182' x 60 = 10.92").
func TestDMS(t *testing.T) {
	for _, tc := range []struct {
		deg    float64
		want   string
		neg    bool
		source string
	}{
		{46.5197, "[{46 1} {31 1} {109200 10000}]", false, "by hand: 46 deg 31' 10.92\""},
		{-33.8688, "[{33 1} {52 1} {76800 10000}]", true, "by hand: 33 deg 52' 7.68\" S"},
		{0.05 / 3600, "[{0 1} {0 1} {500 10000}]", false, "by hand: 0.05\""},
		{59.99999999, "[{60 1} {0 1} {0 10000}]", false, "by hand: rounds up to 60 deg, no 60\" field"},
		{0, "[{0 1} {0 1} {0 10000}]", false, "by hand"},
		// A literal -0.0 is +0 in Go (constant arithmetic has no signed
		// zero); IEEE 754 negative zero needs math.Copysign. It compares
		// equal to 0, so it must not read as the southern/western half.
		{math.Copysign(0, -1), "[{0 1} {0 1} {0 10000}]", false, "IEEE 754: -0 == 0, not below zero"},
		{180, "[{180 1} {0 1} {0 10000}]", false, "by hand"},
	} {
		dms, neg := exifwrite.DMS(tc.deg)
		if got := fmt.Sprint(dms); got != tc.want || neg != tc.neg {
			t.Errorf("DMS(%v) = %s %v, want %s %v (%s)", tc.deg, got, neg, tc.want, tc.neg, tc.source)
		}
	}
}

// TestXMPCoordinate: the XMP GPSCoordinate "DDD,MM.mmk" form (XMP
// Specification Part 2, Exif schema), worked by hand.
func TestXMPCoordinate(t *testing.T) {
	for _, tc := range []struct {
		deg      float64
		pos, neg string
		want     string
		source   string
	}{
		{46.5197, "N", "S", "46,31.1820000N", "by hand: 0.5197 x 60 = 31.182"},
		{-70.6693, "E", "W", "70,40.1580000W", "by hand: 0.6693 x 60 = 40.158"},
		{-0.0015, "E", "W", "0,00.0900000W", "by hand: 0.0015 x 60 = 0.09"},
		{math.Copysign(0, -1), "E", "W", "0,00.0000000E", "IEEE 754: -0 == 0, so the positive hemisphere"},
		{12.99999999999, "N", "S", "13,00.0000000N", "by hand: rounds to 13 deg, never 60'"},
	} {
		if got := exifwrite.XMPCoordinate(tc.deg, tc.pos, tc.neg); got != tc.want {
			t.Errorf("XMPCoordinate(%v) = %s, want %s (%s)", tc.deg, got, tc.want, tc.source)
		}
	}
}

// TestXMPWellFormed: encoding/xml parses the packet, including values that
// need escaping.
func TestXMPWellFormed(t *testing.T) {
	alt := -3.5
	packet := exifwrite.XMP(exifwrite.XMPFields{Make: `A&B "<Cams>"`, DateTimeOriginal: "2024-06-21T14:03:27Z", AltitudeM: &alt})
	d := xml.NewDecoder(bytes.NewReader(packet))
	var make string
	for {
		tok, err := d.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("encoding/xml: %v", err)
		}
		if se, ok := tok.(xml.StartElement); ok && se.Name.Local == "Description" {
			for _, a := range se.Attr {
				if a.Name.Space == "http://ns.adobe.com/tiff/1.0/" && a.Name.Local == "Make" {
					make = a.Value
				}
			}
		}
	}
	if make != `A&B "<Cams>"` {
		t.Errorf("tiff:Make read back as %q", make)
	}
}
