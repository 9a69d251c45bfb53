package exifread

// Date, time and offset parsing: the text and rational forms the tags use,
// turned into WallTime and GPSTime values with a reason whenever they
// cannot name a moment. Mapping tags into the Record is fields.go's job.

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
)

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

// parseXMPDate parses an XMP date (XMP Part 1 §8.2.1.1, a subset of ISO
// 8601): YYYY-MM-DDThh:mm[:ss[.s+]][TZD]. EXIF-style "YYYY:MM:DD hh:mm:ss"
// is accepted too. A date without a time is marked invalid: it names no moment.
func parseXMPDate(raw, source string) *WallTime {
	w := &WallTime{Raw: raw, Source: source}
	s := strings.TrimSpace(raw)
	if len(s) >= 10 && s[4] == ':' && s[7] == ':' {
		s = s[:4] + "-" + s[5:7] + "-" + s[8:]
	}
	if len(s) >= 11 && s[10] == ' ' {
		s = s[:10] + "T" + s[11:]
	}
	// zone designator
	zone := ""
	if i := strings.LastIndexAny(s, "Z+-"); i >= 10 {
		zone, s = s[i:], s[:i]
	}
	frac := ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		frac, s = s[i+1:], s[:i]
	}
	var err error
	atoi := func(x string) int {
		v, e := strconv.Atoi(x)
		if e != nil && err == nil {
			err = fmt.Errorf("%s is not a number", quoted(x))
		}
		return v
	}
	switch {
	case len(s) == 10 && s[4] == '-' && s[7] == '-':
		w.Year, w.Month, w.Day = atoi(s[:4]), atoi(s[5:7]), atoi(s[8:10])
		w.Invalid = "date without a time of day"
		return w
	case len(s) >= 16 && s[4] == '-' && s[7] == '-' && s[10] == 'T' && s[13] == ':':
		w.Year, w.Month, w.Day = atoi(s[:4]), atoi(s[5:7]), atoi(s[8:10])
		w.Hour, w.Minute = atoi(s[11:13]), atoi(s[14:16])
		if len(s) == 19 && s[16] == ':' {
			w.Second = atoi(s[17:19])
		} else if len(s) != 16 {
			err = errors.New("unexpected layout")
		}
	default:
		w.Invalid = "not an XMP date"
		return w
	}
	if err != nil {
		w.Invalid = err.Error()
		return w
	}
	if frac != "" {
		w.SubSecRaw = frac
		if ns, ok := subSecNanos(frac); ok {
			w.Nanosecond = ns
		}
	}
	if zone != "" {
		w.OffsetRaw = zone
		if off, ok := parseOffset(zone); ok {
			w.OffsetSec = &off
		}
	}
	if reason := checkCivil(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second); reason != "" {
		w.Invalid = reason
		return w
	}
	w.Valid = true
	return w
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
