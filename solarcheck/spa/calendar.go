package spa

import (
	"errors"
	"fmt"
	"time"
)

// Calendar says how the year, month and day of a CalendarDate are to be read.
type Calendar int

const (
	// Reform reads dates before 1582-10-15 in the Julian calendar and later
	// dates in the Gregorian calendar, the convention of SPA Eq. 4 and
	// Meeus ch. 7. The ten days 1582-10-05..14 do not exist in it.
	Reform Calendar = iota
	// Gregorian reads every date in the proleptic Gregorian calendar, as
	// time.Time does.
	Gregorian
	// Julian reads every date in the Julian calendar (for archival material
	// from places that kept it, some into the 20th century).
	Julian
)

// String returns the name ParseCalendar accepts.
func (c Calendar) String() string {
	switch c {
	case Reform:
		return "auto"
	case Gregorian:
		return "gregorian"
	case Julian:
		return "julian"
	}
	return fmt.Sprintf("Calendar(%d)", int(c))
}

// ErrUnknownCalendar is returned (wrapped) by ParseCalendar.
var ErrUnknownCalendar = errors.New("unknown calendar")

// ErrInvalidDate is returned (wrapped) for a calendar date that does not
// exist: month 13, 30 February, 1582-10-10 in the Reform calendar.
var ErrInvalidDate = errors.New("invalid calendar date")

// ParseCalendar parses "auto" (or ""), "gregorian" or "julian".
func ParseCalendar(s string) (Calendar, error) {
	switch s {
	case "", "auto":
		return Reform, nil
	case "gregorian":
		return Gregorian, nil
	case "julian":
		return Julian, nil
	}
	return 0, fmt.Errorf("%w %q (want auto, gregorian or julian)", ErrUnknownCalendar, s)
}

// CalendarDate is a wall-clock date and time written in a given calendar.
// Year is astronomical: year 0 is 1 BC, year −1 is 2 BC.
type CalendarDate struct {
	Year, Month, Day                 int
	Hour, Minute, Second, Nanosecond int
	Calendar                         Calendar
}

// reformJDN is the Julian Day Number of 1582-10-15 (Gregorian), the first
// day of the Gregorian calendar.
const reformJDN = 2299161

// effective returns the calendar the date is read in: Reform resolves to
// Julian or Gregorian by the date itself.
func (d CalendarDate) effective() Calendar {
	if d.Calendar != Reform {
		return d.Calendar
	}
	if d.Year < 1582 || d.Year == 1582 && (d.Month < 10 || d.Month == 10 && d.Day < 15) {
		return Julian
	}
	return Gregorian
}

// Validate reports whether the date exists in its calendar.
func (d CalendarDate) Validate() error {
	cal := d.effective()
	if d.Calendar == Reform && d.Year == 1582 && d.Month == 10 && d.Day > 4 && d.Day < 15 {
		return fmt.Errorf("%w: 1582-10-%02d fell in the ten days dropped by the Gregorian reform", ErrInvalidDate, d.Day)
	}
	if d.Month < 1 || d.Month > 12 {
		return fmt.Errorf("%w: month %d", ErrInvalidDate, d.Month)
	}
	if n := daysIn(d.Year, d.Month, cal); d.Day < 1 || d.Day > n {
		return fmt.Errorf("%w: day %d of %04d-%02d (%s calendar has %d)", ErrInvalidDate, d.Day, d.Year, d.Month, cal, n)
	}
	if d.Hour < 0 || d.Hour > 23 || d.Minute < 0 || d.Minute > 59 || d.Second < 0 || d.Second > 59 ||
		d.Nanosecond < 0 || d.Nanosecond > 999999999 {
		return fmt.Errorf("%w: time of day %02d:%02d:%02d.%09d", ErrInvalidDate, d.Hour, d.Minute, d.Second, d.Nanosecond)
	}
	return nil
}

func daysIn(year, month int, cal Calendar) int {
	switch month {
	case 4, 6, 9, 11:
		return 30
	case 2:
		leap := floorMod(year, 4) == 0
		if cal == Gregorian {
			leap = leap && (floorMod(year, 100) != 0 || floorMod(year, 400) == 0)
		}
		if leap {
			return 29
		}
		return 28
	}
	return 31
}

// dayNumber returns the Julian Day Number (the JD at noon) of the date, by
// the integer form of Meeus, Astronomical Algorithms, Eq. 7.1 (= SPA Eq. 4).
func (d CalendarDate) dayNumber() int {
	a := floorDiv(14-d.Month, 12)
	y := d.Year + 4800 - a
	m := d.Month + 12*a - 3
	n := d.Day + floorDiv(153*m+2, 5) + 365*y + floorDiv(y, 4)
	if d.effective() == Gregorian {
		return n - floorDiv(y, 100) + floorDiv(y, 400) - 32045
	}
	return n - 32083
}

// JulianDay returns the Julian Day of the date, its clock reading taken as
// UT (Meeus ch. 7; SPA Eq. 4).
func (d CalendarDate) JulianDay() (float64, error) {
	if err := d.Validate(); err != nil {
		return 0, err
	}
	sec := float64(d.Hour*3600+d.Minute*60+d.Second) + float64(d.Nanosecond)*1e-9
	return float64(d.dayNumber()) - 0.5 + sec/86400, nil
}

// In returns the instant at which clocks in loc showed this date and time.
// The date is first converted to the proleptic Gregorian date of the same
// day, then handed to time.Date, so loc's offset rules (and time.Date's
// handling of gaps and repeats) apply as usual.
func (d CalendarDate) In(loc *time.Location) (time.Time, error) {
	if err := d.Validate(); err != nil {
		return time.Time{}, err
	}
	// JDN 2440588 is 1970-01-01; time.Date normalises the day overflow.
	return time.Date(1970, time.January, 1+d.dayNumber()-2440588,
		d.Hour, d.Minute, d.Second, d.Nanosecond, loc), nil
}

// CalendarDateOf returns the wall-clock reading of t (in t's location)
// written in calendar c (Reform picks Julian before 1582-10-15).
func CalendarDateOf(t time.Time, c Calendar) CalendarDate {
	y, mo, dd := t.Date()
	g := CalendarDate{Year: y, Month: int(mo), Day: dd, Calendar: Gregorian}
	jdn := g.dayNumber()
	out := CalendarDate{Hour: t.Hour(), Minute: t.Minute(), Second: t.Second(), Nanosecond: t.Nanosecond(), Calendar: c}
	if c == Gregorian || c == Reform && jdn >= reformJDN {
		out.Year, out.Month, out.Day = y, int(mo), dd
		return out
	}
	// Julian calendar from the day number (inverse of dayNumber's Julian branch).
	cc := jdn + 32082
	dq := floorDiv(4*cc+3, 1461)
	e := cc - floorDiv(1461*dq, 4)
	m := floorDiv(5*e+2, 153)
	out.Day = e - floorDiv(153*m+2, 5) + 1
	out.Month = m + 3 - 12*floorDiv(m, 10)
	out.Year = dq - 4800 + floorDiv(m, 10)
	return out
}

// String formats the date as YYYY-MM-DDTHH:MM:SS (with fraction if any)
// followed by the calendar in brackets.
func (d CalendarDate) String() string {
	s := fmt.Sprintf("%04d-%02d-%02dT%02d:%02d:%02d", d.Year, d.Month, d.Day, d.Hour, d.Minute, d.Second)
	if d.Nanosecond != 0 {
		s += fmt.Sprintf(".%09d", d.Nanosecond)
	}
	return s + " [" + d.effective().String() + "]"
}

func floorDiv(a, b int) int {
	q := a / b
	if (a%b != 0) && ((a < 0) != (b < 0)) {
		q--
	}
	return q
}

func floorMod(a, b int) int { return a - b*floorDiv(a, b) }
