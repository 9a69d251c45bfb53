package exifread

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

// checkCivil returns "" when the fields form a real civil date and time.
func checkCivil(y, mo, d, h, mi, s int) string {
	switch {
	case y == 0 && mo == 0 && d == 0:
		return "zero date"
	case mo < 1 || mo > 12:
		return fmt.Sprintf("month %d out of range", mo)
	case d < 1 || d > daysIn(y, mo):
		return fmt.Sprintf("day %d out of range", d)
	case h < 0 || h > 23:
		return fmt.Sprintf("hour %d out of range", h)
	case mi < 0 || mi > 59:
		return fmt.Sprintf("minute %d out of range", mi)
	case s < 0 || s > 59:
		return fmt.Sprintf("second %d out of range", s)
	}
	return ""
}

func daysIn(y, m int) int {
	return time.Date(y, time.Month(m)+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

// parseExifDate parses "YYYY:MM:DD HH:MM:SS" (EXIF 3.0 §4.6.5, DateTime).
// Blanks, zeros and out-of-range parts leave Valid false with a reason.
func parseExifDate(raw, source string) *WallTime {
	w := &WallTime{Raw: raw, Source: source}
	s := strings.TrimRight(raw, "\x00")
	if strings.TrimSpace(s) == "" {
		w.Invalid = "blank"
		return w
	}
	if len(s) < 19 {
		w.Invalid = "shorter than YYYY:MM:DD HH:MM:SS"
		return w
	}
	if len(s) > 19 && strings.TrimSpace(s[19:]) != "" {
		w.Invalid = "text after YYYY:MM:DD HH:MM:SS"
		return w
	}
	s = s[:19]
	if (s[4] != ':' && s[4] != '-') || (s[7] != ':' && s[7] != '-') || (s[10] != ' ' && s[10] != 'T') || s[13] != ':' || s[16] != ':' {
		w.Invalid = "not in the layout YYYY:MM:DD HH:MM:SS"
		return w
	}
	num := func(a, b int) (int, bool) {
		v := 0
		for i := a; i < b; i++ {
			c := s[i]
			if c < '0' || c > '9' {
				return 0, false
			}
			v = v*10 + int(c-'0')
		}
		return v, true
	}
	var ok [6]bool
	w.Year, ok[0] = num(0, 4)
	w.Month, ok[1] = num(5, 7)
	w.Day, ok[2] = num(8, 10)
	w.Hour, ok[3] = num(11, 13)
	w.Minute, ok[4] = num(14, 16)
	w.Second, ok[5] = num(17, 19)
	for _, o := range ok {
		if !o {
			w.Invalid = "blanks or non-digits in place of digits"
			return w
		}
	}
	if w.Year == 0 && w.Month == 0 && w.Day == 0 && w.Hour == 0 && w.Minute == 0 && w.Second == 0 {
		w.Invalid = "all zeros"
		return w
	}
	if reason := checkCivil(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second); reason != "" {
		w.Invalid = reason
		return w
	}
	w.Valid = true
	return w
}

// subSecNanos turns the digits of a SubSecTime tag ("123" = 0.123 s) into nanoseconds.
func subSecNanos(raw string) (int, bool) {
	s := strings.TrimSpace(strings.TrimRight(raw, "\x00"))
	if s == "" {
		return 0, false
	}
	ns := 0
	for i := 0; i < 9; i++ {
		d := 0
		if i < len(s) {
			c := s[i]
			if c < '0' || c > '9' {
				return 0, false
			}
			d = int(c - '0')
		}
		ns = ns*10 + d
	}
	for i := 9; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return 0, false
		}
	}
	return ns, true
}

// parseOffset parses "+HH:MM", "-HH:MM" (EXIF 2.31 OffsetTime*) or "Z", and
// accepts only offsets in use on Earth (−12:00 … +14:00).
func parseOffset(raw string) (int, bool) {
	s := strings.TrimSpace(strings.TrimRight(raw, "\x00"))
	if s == "Z" {
		return 0, true
	}
	if len(s) != 6 || (s[0] != '+' && s[0] != '-') || s[3] != ':' {
		return 0, false
	}
	h, e1 := strconv.Atoi(s[1:3])
	m, e2 := strconv.Atoi(s[4:6])
	if e1 != nil || e2 != nil || m > 59 {
		return 0, false
	}
	off := h*3600 + m*60
	if s[0] == '-' {
		off = -off
	}
	if off < -12*3600 || off > 14*3600 {
		return 0, false
	}
	return off, true
}

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

// gpsTimeFill sets t.UTC and returns the reason the GPS time is unusable.
func gpsTimeFill(t *GPSTime, date string, hasDate bool, tm []rat, hasTime bool) string {
	if !hasTime || len(tm) < 3 {
		if hasDate {
			return "GPSDateStamp without GPSTimeStamp"
		}
		return "GPSTimeStamp incomplete"
	}
	var hms [3]float64
	for i, r := range tm[:3] {
		v, ok := r.float()
		if !ok {
			return "GPSTimeStamp has a zero denominator"
		}
		hms[i] = v
	}
	if hms[0] < 0 || hms[0] >= 24 || hms[1] < 0 || hms[1] >= 60 || hms[2] < 0 || hms[2] >= 61 {
		return fmt.Sprintf("GPSTimeStamp %v outside 0–23 h, 0–59 min, 0–60 s", hms)
	}
	secs := hms[0]*3600 + hms[1]*60 + hms[2]
	dur := time.Duration(math.Round(secs * 1e9))
	if !hasDate {
		t.UTC = time.Date(1, 1, 1, 0, 0, 0, 0, time.UTC).Add(dur)
		return "GPSTimeStamp without GPSDateStamp"
	}
	t.HasDate = true
	s := strings.TrimSpace(strings.TrimRight(date, "\x00"))
	if len(s) != 10 {
		return "GPSDateStamp not YYYY:MM:DD"
	}
	y, e1 := strconv.Atoi(s[0:4])
	m, e2 := strconv.Atoi(s[5:7])
	dd, e3 := strconv.Atoi(s[8:10])
	if e1 != nil || e2 != nil || e3 != nil || (s[4] != ':' && s[4] != '-') {
		return "GPSDateStamp not YYYY:MM:DD"
	}
	if reason := checkCivil(y, m, dd, 0, 0, 0); reason != "" {
		return "GPSDateStamp " + reason
	}
	t.UTC = time.Date(y, time.Month(m), dd, 0, 0, 0, 0, time.UTC).Add(dur)
	if y < gpsEarliestDateYear {
		return fmt.Sprintf("GPS date before %d (receiver clock not set)", gpsEarliestDateYear)
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
