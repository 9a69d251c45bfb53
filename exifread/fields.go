package exifread

// Mapping the tags of a walked TIFF payload into the Record, with the
// checks that decide whether each value can be used. The date, time and
// offset forms themselves are parsed in dates.go.

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
)

// Tag numbers (EXIF 3.0 / CIPA DC-008-2023 tables 4, 7, 8 and 15; TIFF 6.0).
const (
	tagImageWidth          = 0x0100
	tagImageLength         = 0x0101
	tagMake                = 0x010F
	tagModel               = 0x0110
	tagOrientation         = 0x0112
	tagSoftware            = 0x0131
	tagDateTime            = 0x0132
	tagJPEGIF              = 0x0201
	tagJPEGIFLength        = 0x0202
	tagXMP                 = 0x02BC
	tagExposureTime        = 0x829A
	tagFNumber             = 0x829D
	tagISO                 = 0x8827
	tagDateTimeOriginal    = 0x9003
	tagDateTimeDigitized   = 0x9004
	tagOffsetTime          = 0x9010
	tagOffsetTimeOriginal  = 0x9011
	tagOffsetTimeDigitized = 0x9012
	tagFlash               = 0x9209
	tagFocalLength         = 0x920A
	tagSubSecTime          = 0x9290
	tagSubSecTimeOriginal  = 0x9291
	tagSubSecTimeDigitized = 0x9292
	tagPixelXDimension     = 0xA002
	tagPixelYDimension     = 0xA003
	tagFocalLength35mm     = 0xA405
	tagImageUniqueID       = 0xA420
	tagBodySerialNumber    = 0xA431
	tagLensModel           = 0xA434

	gpsVersionID        = 0x00
	gpsLatitudeRef      = 0x01
	gpsLatitude         = 0x02
	gpsLongitudeRef     = 0x03
	gpsLongitude        = 0x04
	gpsAltitudeRef      = 0x05
	gpsAltitude         = 0x06
	gpsTimeStamp        = 0x07
	gpsDOP              = 0x0B
	gpsImgDirectionRef  = 0x10
	gpsImgDirection     = 0x11
	gpsMapDatum         = 0x12
	gpsDateStamp        = 0x1D
	gpsHPositioningErr  = 0x1F
	gpsEarliestDateYear = 1990 // GPS receivers in consumer cameras postdate this; earlier dates are clock resets
)

func ratsRaw(rs []rat) string {
	parts := make([]string, len(rs))
	for i, r := range rs {
		parts[i] = r.String()
	}
	return strings.Join(parts, " ")
}

func fptr(v float64) *float64 { return &v }

// fromEXIF fills rec from a walked TIFF payload.
func fromEXIF(rec *Record, d *tiffData) {
	text := func(dir string, tag uint16) string {
		s, _ := d.str(d.alt(dir, tag), tag)
		if s = strings.TrimSpace(s); s == "" && d.alt(dir, tag) == dir {
			// an empty value in its proper place: try the other directory
			other := map[string]string{ifd0: ifdExif, ifdExif: ifd0}[dir]
			if _, ok := d.get(other, tag); ok {
				s, _ = d.str(other, tag)
				s = strings.TrimSpace(s)
			}
		}
		return s
	}
	rec.Make = text(ifd0, tagMake)
	rec.Model = text(ifd0, tagModel)
	rec.Software = text(ifd0, tagSoftware)
	rec.BodySerialNumber = text(ifdExif, tagBodySerialNumber)
	rec.LensModel = text(ifdExif, tagLensModel)
	rec.ImageUniqueID = text(ifdExif, tagImageUniqueID)
	if v, ok := d.ints(d.alt(ifd0, tagOrientation), tagOrientation, 1); ok {
		rec.Orientation = int(v[0])
	}
	if v, ok := d.ints(d.alt(ifdExif, tagPixelXDimension), tagPixelXDimension, 1); ok {
		rec.PixelWidth = int(v[0])
	} else if v, ok := d.ints(ifd0, tagImageWidth, 1); ok {
		rec.PixelWidth = int(v[0])
	}
	if v, ok := d.ints(d.alt(ifdExif, tagPixelYDimension), tagPixelYDimension, 1); ok {
		rec.PixelHeight = int(v[0])
	} else if v, ok := d.ints(ifd0, tagImageLength, 1); ok {
		rec.PixelHeight = int(v[0])
	}

	// Times.
	wall := func(dir string, tag, subTag, offTag uint16) *WallTime {
		raw, ok := d.str(dir, tag)
		if !ok {
			return nil
		}
		w := parseExifDate(raw, SourceEXIF)
		if sub, ok := d.str(ifdExif, subTag); ok {
			w.SubSecRaw = sub
			if ns, ok := subSecNanos(sub); ok && w.Valid {
				w.Nanosecond = ns
			}
		}
		if off, ok := d.str(ifdExif, offTag); ok {
			w.OffsetRaw = off
			if v, ok := parseOffset(off); ok {
				w.OffsetSec = &v
			} else if strings.TrimSpace(strings.Trim(off, "\x00:")) != "" {
				rec.Warnings = append(rec.Warnings, fmt.Sprintf("offset tag %#04x %s is not a usable offset (±HH:MM within −12:00…+14:00); ignored", offTag, quoted(off)))
			}
		}
		return w
	}
	rec.DateTimeOriginal = wall(ifdExif, tagDateTimeOriginal, tagSubSecTimeOriginal, tagOffsetTimeOriginal)
	rec.DateTimeDigitized = wall(ifdExif, tagDateTimeDigitized, tagSubSecTimeDigitized, tagOffsetTimeDigitized)
	rec.DateTime = wall(ifd0, tagDateTime, tagSubSecTime, tagOffsetTime)

	// Exposure.
	one := func(dir string, tag uint16) (*float64, string) {
		rs, ok := d.rats(d.alt(dir, tag), tag, 1)
		if !ok {
			return nil, ""
		}
		if v, ok := rs[0].float(); ok {
			return fptr(v), ""
		}
		return nil, fmt.Sprintf("tag %#04x %s has a zero denominator; ignored", tag, rs[0])
	}
	collect := func(p *float64, w string) *float64 {
		if w != "" {
			rec.Warnings = append(rec.Warnings, w)
		}
		return p
	}
	rec.ExposureTimeSec = collect(one(ifdExif, tagExposureTime))
	rec.FNumber = collect(one(ifdExif, tagFNumber))
	rec.FocalLengthMM = collect(one(ifdExif, tagFocalLength))
	if v, ok := d.ints(d.alt(ifdExif, tagISO), tagISO, 1); ok {
		rec.ISO = int(v[0])
	}
	if v, ok := d.ints(d.alt(ifdExif, tagFocalLength35mm), tagFocalLength35mm, 1); ok {
		rec.FocalLength35mm = int(v[0])
	}
	if v, ok := d.ints(d.alt(ifdExif, tagFlash), tagFlash, 1); ok {
		rec.Flash = &Flash{Fired: v[0]&1 == 1, Raw: int(v[0])}
	}

	fromEXIFGPS(rec, d)

	// Thumbnail (IFD1 JPEGInterchangeFormat), bounds checked in 64 bits.
	if o, ok := d.ints(ifd1, tagJPEGIF, 1); ok {
		if l, ok := d.ints(ifd1, tagJPEGIFLength, 1); ok {
			off, n := o[0], l[0]
			switch {
			case n > d.opt.MaxThumbnailBytes:
				d.problem(&LimitError{Where: "tiff IFD1 thumbnail", Limit: "MaxThumbnailBytes", Value: n, Max: d.opt.MaxThumbnailBytes})
			case off < 0 || off > d.size || n > d.size-off:
				d.problem(formatErr("tiff IFD1 thumbnail", d.base+off, "%d bytes at offset %d overrun payload of %d bytes", n, off, d.size))
			default:
				if b, err := d.read(off, n); err == nil {
					rec.Thumbnail = b
					rec.ThumbnailSize = len(b)
				}
			}
		}
	}
}

func fromEXIFGPS(rec *Record, d *tiffData) {
	g := &rec.GPS
	if v, ok := d.ints(ifdGPS, gpsVersionID, 4); ok {
		parts := make([]string, len(v))
		for i, x := range v {
			parts[i] = strconv.FormatInt(x, 10)
		}
		g.VersionID = strings.Join(parts, ".")
	}
	ref := func(tag uint16) string {
		s, _ := d.str(ifdGPS, tag)
		return strings.ToUpper(strings.TrimSpace(s))
	}
	// Position: degrees, minutes, seconds as three RATIONALs (EXIF 3.0 table 15).
	coord := func(tag, refTag uint16, pos, neg string) (*float64, string, string) {
		e, ok := d.get(ifdGPS, tag)
		if !ok {
			return nil, "", ""
		}
		r := ref(refTag)
		if e.typ == tASCII {
			// Some phones store "52,00000,50,00000,34,01180" as text. EXIF
			// requires three RATIONALs; the text can be read as 52°0'50" or as
			// 52.0° 50.0' 34.0118" and nothing in the file says which, so the
			// value is kept raw and marked invalid rather than guessed.
			s, _ := d.str(ifdGPS, tag)
			return nil, s + " " + r, "stored as text, not RATIONAL (non-standard, ambiguous)"
		}
		rs, ok := d.rats(ifdGPS, tag, 3)
		if !ok {
			return nil, "", ""
		}
		raw := ratsRaw(rs) + " " + r
		v := 0.0
		div := []float64{1, 60, 3600}
		for i, x := range rs {
			f, ok := x.float()
			if !ok {
				return nil, raw, "zero denominator"
			}
			v += f / div[i]
		}
		switch r {
		case neg:
			v = -v
		case pos:
		default:
			return fptr(v), raw, fmt.Sprintf("reference %s is neither %s nor %s", quoted(r), pos, neg)
		}
		return fptr(v), raw, ""
	}
	lat, latRaw, latBad := coord(gpsLatitude, gpsLatitudeRef, "N", "S")
	lon, lonRaw, lonBad := coord(gpsLongitude, gpsLongitudeRef, "E", "W")
	if latRaw != "" || lonRaw != "" {
		p := &Position{LatDeg: lat, LonDeg: lon, Raw: strings.TrimSpace(latRaw + "; " + lonRaw), Source: SourceEXIF}
		p.Invalid = positionInvalid(lat, lon, latBad, lonBad)
		p.Valid = p.Invalid == ""
		g.Position = p
	}

	num := func(tag uint16, check func(float64) string) *Number {
		rs, ok := d.rats(ifdGPS, tag, 1)
		if !ok {
			return nil
		}
		n := &Number{Raw: rs[0].String(), Source: SourceEXIF}
		v, ok := rs[0].float()
		switch {
		case !ok:
			n.Invalid = "zero denominator"
		default:
			n.Value = v
			n.Invalid = check(v)
		}
		n.Valid = n.Invalid == ""
		return n
	}
	g.AltitudeM = num(gpsAltitude, func(float64) string { return "" })
	if g.AltitudeM != nil {
		if v, ok := d.ints(ifdGPS, gpsAltitudeRef, 1); ok {
			g.AltitudeM.Raw += fmt.Sprintf(" ref %d", v[0])
			if v[0] == 1 {
				g.AltitudeM.Value = -g.AltitudeM.Value
			}
		}
	}
	g.ImgDirectionDeg = num(gpsImgDirection, directionInvalid)
	g.ImgDirectionRef = ref(gpsImgDirectionRef)
	g.HPositioningErrM = num(gpsHPositioningErr, func(v float64) string {
		if v < 0 {
			return "negative"
		}
		return ""
	})
	g.DOP = num(gpsDOP, func(v float64) string {
		if v <= 0 {
			return "not positive"
		}
		return ""
	})
	if s, ok := d.str(ifdGPS, gpsMapDatum); ok {
		g.MapDatum = strings.TrimSpace(s)
	}

	// Time: GPSDateStamp "YYYY:MM:DD" + GPSTimeStamp h, m, s RATIONALs, UTC.
	date, hasDate := d.str(ifdGPS, gpsDateStamp)
	if e, ok := d.get(ifdGPS, gpsTimeStamp); ok && e.typ == tASCII {
		s, _ := d.str(ifdGPS, gpsTimeStamp)
		g.Time = &GPSTime{DateRaw: date, TimeRaw: s, HasDate: hasDate, Source: SourceEXIF,
			Invalid: "GPSTimeStamp stored as text, not RATIONAL (non-standard, ambiguous)"}
		return
	}
	tm, hasTime := d.rats(ifdGPS, gpsTimeStamp, 3)
	if hasDate || hasTime {
		t := &GPSTime{DateRaw: date, TimeRaw: ratsRaw(tm), Source: SourceEXIF}
		t.Invalid = gpsTimeFill(t, date, hasDate, tm, hasTime)
		t.Valid = t.Invalid == ""
		g.Time = t
	}
}

func directionInvalid(v float64) string {
	if math.IsNaN(v) || v < 0 || v > 360 {
		return "direction outside 0–360°"
	}
	return ""
}

// positionInvalid gives the reason a position cannot be used, "" when it can.
func positionInvalid(lat, lon *float64, latBad, lonBad string) string {
	switch {
	case latBad != "":
		return "latitude: " + latBad
	case lonBad != "":
		return "longitude: " + lonBad
	case lat == nil:
		return "latitude missing"
	case lon == nil:
		return "longitude missing"
	case math.IsNaN(*lat) || math.IsNaN(*lon) || math.IsInf(*lat, 0) || math.IsInf(*lon, 0):
		return "not a number"
	case math.Abs(*lat) > 90:
		return "latitude beyond ±90°"
	case math.Abs(*lon) > 180:
		return "longitude beyond ±180°"
	case *lat == 0 && *lon == 0:
		return "exactly (0, 0): a receiver without a fix"
	}
	return ""
}

// crossCheckGPSDate marks the GPS time invalid when it lies in the future of
// every other date of the file. A wall time is at most 14 h ahead of UTC,
// so a GPS instant later than the latest wall reading + 14 h cannot be right.
func crossCheckGPSDate(rec *Record) {
	t := rec.GPS.Time
	if t == nil || !t.Valid {
		return
	}
	var latest time.Time
	for _, w := range []*WallTime{rec.DateTimeOriginal, rec.DateTimeDigitized, rec.DateTime} {
		if w == nil || !w.Valid {
			continue
		}
		c := time.Date(w.Year, time.Month(w.Month), w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.UTC)
		if u, ok := w.UTC(); ok {
			c = u // the instant is known; the 14 h slack below stays, to be conservative
		}
		if c.After(latest) {
			latest = c
		}
	}
	if latest.IsZero() {
		return
	}
	if t.UTC.After(latest.Add(14 * time.Hour)) {
		t.Valid = false
		t.Invalid = fmt.Sprintf("GPS time %s is after every other date in the file", t.UTC.Format(time.RFC3339))
	}
}
