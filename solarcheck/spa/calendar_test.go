package spa

import (
	"errors"
	"math"
	"testing"
	"time"
)

func TestCalendarJulianDay(t *testing.T) {
	// d is a date with a fractional day, as Meeus writes them.
	type date struct {
		y, m int
		d    float64
	}
	tests := []struct {
		source string
		cal    Calendar
		in     date
		want   float64
	}{
		{"SPA report Eq. 4 / Meeus ch. 7: last Julian day", Reform, date{1582, 10, 4}, 2299159.5},
		{"SPA report Eq. 4 / Meeus ch. 7: first Gregorian day", Reform, date{1582, 10, 15}, 2299160.5},
		{"Meeus ch. 7 (example 7.a, from memory)", Reform, date{1957, 10, 4.81}, 2436116.31},
		{"Meeus ch. 7 (example 7.b)", Reform, date{333, 1, 27.5}, 1842713.0},
		{"Meeus ch. 7 (table of examples)", Reform, date{2000, 1, 1.5}, 2451545.0},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{1987, 6, 19.5}, 2446966.0},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{1900, 1, 1}, 2415020.5},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{1600, 12, 31}, 2305812.5},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{837, 4, 10.3}, 2026871.8},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{-123, 12, 31}, 1676496.5},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{-1000, 7, 12.5}, 1356001.0},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{-1000, 2, 29}, 1355866.5},
		{"Meeus ch. 7 (table of examples, from memory)", Reform, date{-4712, 1, 1.5}, 0},
		// Forced calendars: the same day written both ways.
		{"common knowledge: 1917-10-25 Julian = 1917-11-07 Gregorian", Julian, date{1917, 10, 25}, 2421539.5},
		{"common knowledge: 1917-10-25 Julian = 1917-11-07 Gregorian", Gregorian, date{1917, 11, 7}, 2421539.5},
		{"Meeus ch. 7: proleptic Gregorian 1582-10-04 is 10 days later", Gregorian, date{1582, 10, 4}, 2299149.5},
	}
	for _, tc := range tests {
		day := math.Floor(tc.in.d)
		sec := (tc.in.d - day) * 86400
		cd := CalendarDate{Year: tc.in.y, Month: tc.in.m, Day: int(day), Calendar: tc.cal,
			Hour: int(sec / 3600), Minute: int(math.Mod(sec, 3600) / 60), Second: int(math.Round(math.Mod(sec, 60)))}
		got, err := cd.JulianDay()
		if err != nil {
			t.Errorf("%s: %v: %v", tc.source, cd, err)
			continue
		}
		if math.Abs(got-tc.want) > 1e-6 {
			t.Errorf("%s: %v: JD %.6f, want %.6f", tc.source, cd, got, tc.want)
		}
		// The instant agrees with JulianDay of time.Time (proleptic Gregorian).
		tm, err := cd.In(time.UTC)
		if err != nil {
			t.Fatal(err)
		}
		if j := JulianDay(tm); math.Abs(j-tc.want) > 1e-6 {
			t.Errorf("%s: %v.In(UTC) = %v, JD %.6f, want %.6f", tc.source, cd, tm, j, tc.want)
		}
		// And converts back to the same fields in the same calendar.
		if back := CalendarDateOf(tm, tc.cal); back.Year != cd.Year || back.Month != cd.Month || back.Day != cd.Day || back.Hour != cd.Hour {
			t.Errorf("%s: round trip %v -> %v -> %v", tc.source, cd, tm, back)
		}
	}
}

func TestCalendarInvalid(t *testing.T) {
	tests := []struct {
		source string
		d      CalendarDate
	}{
		{"Gregorian reform (Meeus ch. 7): 1582-10-05..14 never happened", CalendarDate{Year: 1582, Month: 10, Day: 10}},
		{"common knowledge: 1900 is not a Gregorian leap year", CalendarDate{Year: 1900, Month: 2, Day: 29, Calendar: Gregorian}},
		{"common knowledge: month 13", CalendarDate{Year: 2000, Month: 13, Day: 1}},
		{"common knowledge: hour 24", CalendarDate{Year: 2000, Month: 1, Day: 1, Hour: 24}},
	}
	for _, tc := range tests {
		if _, err := tc.d.JulianDay(); !errors.Is(err, ErrInvalidDate) {
			t.Errorf("%s: %v: err %v, want ErrInvalidDate", tc.source, tc.d, err)
		}
	}
	// 1900-02-29 exists in the Julian calendar (every 4th year is leap).
	if err := (CalendarDate{Year: 1900, Month: 2, Day: 29, Calendar: Julian}).Validate(); err != nil {
		t.Errorf("common knowledge: 1900-02-29 Julian exists: %v", err)
	}
	if _, err := ParseCalendar("mayan"); !errors.Is(err, ErrUnknownCalendar) {
		t.Errorf("ParseCalendar(mayan): %v", err)
	}
}

func TestJulianDayOfTime(t *testing.T) {
	tests := []struct {
		source string
		t      time.Time
		want   float64
	}{
		{"SPA report Table A5.1", time.Date(2003, 10, 17, 19, 30, 30, 0, time.UTC), 2452930.312847},
		{"common knowledge: Unix epoch", time.Unix(0, 0), 2440587.5},
		{"common knowledge: J2000.0", time.Date(2000, 1, 1, 12, 0, 0, 0, time.UTC), 2451545.0},
	}
	for _, tc := range tests {
		if got := JulianDay(tc.t); math.Abs(got-tc.want) > 5e-7 {
			t.Errorf("%s: JulianDay(%v) = %.7f, want %.7f", tc.source, tc.t, got, tc.want)
		}
		if back := TimeFromJulianDay(JulianDay(tc.t)); back.Sub(tc.t).Abs() > time.Millisecond {
			t.Errorf("TimeFromJulianDay round trip: %v -> %v", tc.t, back)
		}
	}
}
