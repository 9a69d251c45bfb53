package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

const sunSynopsis = "gnomon sun --time T --lat D --lon D [--elevation M] [--pressure HPA] [--temperature C] [--delta-t S] [--calendar auto|gregorian|julian] [--zone IANA] [--json]"

const sunAbout = `Print where the sun was at a time and place (NREL SPA, Reda & Andreas 2008,
±0.0003° for years -2000..6000), with that day's solar noon, sunrise, sunset
and civil, nautical and astronomical twilight.

--time is RFC 3339 with an offset (2003-10-17T12:30:30-07:00, ...Z), or a
wall time YYYY-MM-DDTHH:MM:SS read in --zone, or, without --zone, in the
time zone that holds at --lat/--lon (looked up offline; the answer names
it). The resulting UTC instant is
treated as UT1 (|UT1-UTC| < 0.9 s, at most 0.004° of sun motion);
TT = UT1 + delta-t. Dates before 1582-10-15 are read in the Julian calendar
(--calendar auto); --calendar julian or gregorian forces one calendar.
Day events belong to the calendar day of --time in its offset or zone, and
are computed by SPA Appendix A.2 (good to about 10 s; sunrise/sunset at
-0.8333°, twilights at -6°, -12°, -18°); "none" or null means the sun did
not cross that altitude that day (midnight sun, polar night).
Azimuth is clockwise from true north; altitudes and angles are degrees.`

// sunFlags holds the parsed command line of `gnomon sun`.
type sunFlags struct {
	time, zone, calendar, deltaT string
	lat, lon, elev, press, temp  float64
	json                         bool
}

// wallTimeRE matches YYYY-MM-DDTHH:MM:SS[.fff][Z|±HH:MM]; the year may be
// negative or longer than 4 digits (astronomical numbering: 0 = 1 BC).
var wallTimeRE = regexp.MustCompile(`^([+-]?\d{4,6})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2}):(\d{2})(\.\d{1,9})?([Zz]|[+-]\d{2}:\d{2})?$`)

// errSunInput marks a --time or --zone value that cannot be used; runSun
// answers it with the usage (exit 2).
var errSunInput = errors.New("bad input")

// reading says how a wall time without offset was read in --zone where it
// was skipped or repeated: a sentence naming the reading used, and the
// other instants (RFC 3339 UTC). Zero for an ordinary wall time.
type reading struct {
	note   string
	others []string
}

// parseSunTime reads s as a wall time in calendar cal and returns the
// instant, the zone used for the day's events, and, for a wall time that
// zoneName skipped or repeated, a sentence saying which reading was used
// and what the others are. With an offset the offset wins over --zone for
// the instant. Zones come from db, the embedded tz database, never from the
// host.
func parseSunTime(s, zoneName string, cal spa.Calendar, db *zone.DB) (time.Time, *time.Location, reading, error) {
	m := wallTimeRE.FindStringSubmatch(strings.TrimSpace(s))
	if m == nil {
		return time.Time{}, nil, reading{}, fmt.Errorf("%w: --time %q is not YYYY-MM-DDTHH:MM:SS with an optional offset (RFC 3339)", errSunInput, s)
	}
	atoi := func(x string) int { n, _ := strconv.Atoi(strings.TrimPrefix(x, "+")); return n }
	d := spa.CalendarDate{Year: atoi(m[1]), Month: atoi(m[2]), Day: atoi(m[3]),
		Hour: atoi(m[4]), Minute: atoi(m[5]), Second: atoi(m[6]), Calendar: cal}
	if m[7] != "" {
		frac := (m[7][1:] + "000000000")[:9]
		d.Nanosecond = atoi(frac)
	}
	var loc *time.Location
	if zoneName != "" {
		l, err := db.Load(zoneName)
		if err != nil {
			return time.Time{}, nil, reading{}, fmt.Errorf("%w: unknown --zone %q", errSunInput, zoneName)
		}
		loc = l
	}
	inst := loc
	switch off := m[8]; {
	case off == "Z" || off == "z":
		inst = time.UTC
	case off != "":
		sign := 1
		if off[0] == '-' {
			sign = -1
		}
		h, mm := atoi(off[1:3]), atoi(off[4:6])
		if h > 23 || mm > 59 {
			return time.Time{}, nil, reading{}, fmt.Errorf("%w: --time %q has a bad offset", errSunInput, s)
		}
		inst = time.FixedZone(off, sign*(h*3600+mm*60))
	case loc == nil:
		return time.Time{}, nil, reading{}, fmt.Errorf("%w: --time %q has no UTC offset: add one (Z, +02:00) or give --zone", errSunInput, s)
	}
	t, err := d.In(inst)
	if err != nil {
		return time.Time{}, nil, reading{}, fmt.Errorf("%w: --time %q: %v", errSunInput, s, err)
	}
	var r reading
	if inst == loc {
		t, r.note, r.others = resolveInZone(t, d, loc)
	}
	if loc == nil {
		loc = inst
	}
	return t, loc, r, nil
}

// resolveInZone reads the wall time d in loc with the tz database's own
// transitions (time.Date, which made t, picks one instant silently where
// the wall time was skipped or repeated). Of several readings the earlier
// instant is used (for a skipped wall time, the same one time.Date gives),
// and the note names it and the others. Years outside 1..9999 are left as
// they are: the tz database has no changes there.
func resolveInZone(t time.Time, d spa.CalendarDate, loc *time.Location) (time.Time, string, []string) {
	g, err := d.In(time.UTC) // the wall fields in the proleptic Gregorian calendar
	if err != nil || g.Year() < 1 || g.Year() > 9999 {
		return t, "", nil
	}
	w := zone.Wall{Year: g.Year(), Month: g.Month(), Day: g.Day(), Hour: g.Hour(), Minute: g.Minute(), Second: g.Second(), Nanosecond: g.Nanosecond()}
	res, err := zone.Resolve(w, loc)
	if err != nil || res.Kind == zone.Normal {
		return t, "", nil
	}
	var others []string
	for _, c := range res.Candidates[1:] {
		others = append(others, c.UTC.Format(time.RFC3339Nano))
	}
	return res.Candidates[0].UTC, res.Describe(w, 0), others
}

// sunJSON is the --json output. Times are RFC 3339 UTC; a nil time means
// the event did not happen that day.
type sunJSON struct {
	Time              string   `json:"time"`
	TimeReading       string   `json:"time_reading,omitempty"`
	OtherTimes        []string `json:"other_times,omitempty"`
	TimeLocal         string   `json:"time_local"`
	UTCOffsetSec      int      `json:"utc_offset_s"`
	ZoneUsed          string   `json:"zone_used,omitempty"`
	ZoneNote          string   `json:"zone_note,omitempty"`
	CalendarDate      string   `json:"calendar_date"`
	Lat               float64  `json:"lat"`
	Lon               float64  `json:"lon"`
	ElevationM        float64  `json:"elevation"`
	PressureHPa       float64  `json:"pressure"`
	TemperatureC      float64  `json:"temperature"`
	DeltaT            float64  `json:"delta_t"`
	DeltaTSource      string   `json:"delta_t_source"`
	Azimuth           float64  `json:"azimuth"`
	Altitude          float64  `json:"altitude"`
	AltitudeAirless   float64  `json:"altitude_airless"`
	Refraction        float64  `json:"refraction"`
	Zenith            float64  `json:"zenith"`
	Declination       float64  `json:"declination"`
	RightAscension    float64  `json:"right_ascension"`
	HourAngle         float64  `json:"hour_angle"`
	EarthSunAU        float64  `json:"earth_sun_distance_au"`
	EquationOfTimeMin float64  `json:"equation_of_time_min"`
	ApparentSolarTime string   `json:"apparent_solar_time"`
	SubsolarLat       float64  `json:"subsolar_lat"`
	SubsolarLon       float64  `json:"subsolar_lon"`
	Day               string   `json:"day"`
	SolarNoon         string   `json:"solar_noon"`
	SolarNoonAltitude float64  `json:"solar_noon_altitude"`
	Sunrise           *string  `json:"sunrise"`
	Sunset            *string  `json:"sunset"`
	CivilDawn         *string  `json:"civil_dawn"`
	CivilDusk         *string  `json:"civil_dusk"`
	NauticalDawn      *string  `json:"nautical_dawn"`
	NauticalDusk      *string  `json:"nautical_dusk"`
	AstronomicalDawn  *string  `json:"astronomical_dawn"`
	AstronomicalDusk  *string  `json:"astronomical_dusk"`
}

func runSun(e env, args []string) int {
	fs := newFlagSet(e, "sun", sunSynopsis, sunAbout)
	var f sunFlags
	fs.StringVar(&f.time, "time", "", "`TIME` of the sun: RFC 3339 with offset, or YYYY-MM-DDTHH:MM:SS with --zone (UTC read as UT1)")
	fs.Float64Var(&f.lat, "lat", 0, "latitude in `DEGREES` north (-90..90)")
	fs.Float64Var(&f.lon, "lon", 0, "longitude in `DEGREES` east (-180..180)")
	fs.Float64Var(&f.elev, "elevation", 0, "height above sea level in `METRES`")
	fs.Float64Var(&f.press, "pressure", spa.DefaultPressureHPa, "mean air pressure for refraction in `HPA` (0 = no refraction)")
	fs.Float64Var(&f.temp, "temperature", spa.DefaultTemperatureC, "mean air temperature for refraction in `CELSIUS`")
	fs.StringVar(&f.deltaT, "delta-t", "", "TT - UT1 in `SECONDS` (default: Espenak & Meeus 2006 polynomials)")
	fs.StringVar(&f.calendar, "calendar", "auto", "`CALENDAR` of --time: auto (Julian before 1582-10-15), gregorian or julian")
	fs.StringVar(&f.zone, "zone", "", "IANA time `ZONE` for a --time without offset and for local times")
	fs.BoolVar(&f.json, "json", false, "print one JSON object")
	set, code, done := parseNoArgs(fs, args, "time", "lat", "lon")
	if done {
		return code
	}
	switch {
	case !(f.lat >= -90 && f.lat <= 90):
		return usageErr(fs, "--lat %g is outside -90..90", f.lat)
	case !(f.lon >= -180 && f.lon <= 180):
		return usageErr(fs, "--lon %g is outside -180..180", f.lon)
	case math.IsNaN(f.elev) || math.IsInf(f.elev, 0) || f.elev < -500 || f.elev > 100000:
		return usageErr(fs, "--elevation %g is outside -500..100000 m", f.elev)
	case !(f.press >= 0 && f.press <= 2000):
		return usageErr(fs, "--pressure %g is outside 0..2000 hPa", f.press)
	case !(f.temp > -100 && f.temp < 100):
		return usageErr(fs, "--temperature %g is outside -100..100 °C", f.temp)
	}
	cal, err := spa.ParseCalendar(f.calendar)
	if err != nil {
		return usageErr(fs, "--calendar: %v", err)
	}
	db := zone.NewDB()
	zoneArg, zoneNote := f.zone, ""
	if zoneArg == "" && needsZone(f.time) {
		zoneArg, zoneNote, err = zoneAtPlace(zone.NewFinder(db), f.lat, f.lon)
		if err != nil {
			return fail(e.stderr, "sun", err)
		}
	}
	t, loc, rd, err := parseSunTime(f.time, zoneArg, cal, db)
	if err != nil {
		return usageErr(fs, "%v", strings.TrimPrefix(err.Error(), errSunInput.Error()+": "))
	}
	if y := t.UTC().Year(); y < -2000 || y > 6000 {
		return usageErr(fs, "--time %q is outside the years -2000..6000 that SPA covers", f.time)
	}
	dt, dtSource := spa.DeltaT(t), "Espenak & Meeus 2006"
	if set["delta-t"] {
		v, err := strconv.ParseFloat(f.deltaT, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return usageErr(fs, "--delta-t %q is not a number of seconds", f.deltaT)
		}
		dt, dtSource = v, "given"
	}

	o := spa.Observer{LatDeg: f.lat, LonDeg: f.lon, ElevationM: f.elev, PressureHPa: f.press, TemperatureC: f.temp}
	p := spa.At(t, o, dt)
	lt := t.In(loc)
	dayStart := time.Date(lt.Year(), lt.Month(), lt.Day(), 0, 0, 0, 0, loc)
	d := spa.DayAt(dayStart, o, dt)

	out := sunJSON{
		Time: t.UTC().Format(time.RFC3339Nano), TimeReading: rd.note, OtherTimes: rd.others, TimeLocal: localStamp(lt), UTCOffsetSec: utcOffset(lt),
		ZoneUsed: zoneArg, ZoneNote: zoneNote,
		CalendarDate: spa.CalendarDateOf(lt, cal).String(),
		Lat:          f.lat, Lon: f.lon, ElevationM: f.elev, PressureHPa: f.press, TemperatureC: f.temp,
		DeltaT: round(dt, 3), DeltaTSource: dtSource,
		Azimuth: round(p.AzimuthDeg, 6), Altitude: round(p.AltitudeDeg, 6), AltitudeAirless: round(p.AltitudeAirlessDeg, 6),
		Refraction: round(p.RefractionDeg, 6), Zenith: round(p.ZenithDeg, 6),
		Declination: round(p.DeclinationDeg, 6), RightAscension: round(p.RightAscensionDeg, 6),
		HourAngle: round(p.HourAngleDeg, 6), EarthSunAU: round(p.Geocentric.EarthRadiusAU, 8),
		EquationOfTimeMin: round(p.EquationOfTimeMin, 4), ApparentSolarTime: clock(p.ApparentSolarTime),
		SubsolarLat: round(p.SubsolarLatDeg, 6), SubsolarLon: round(p.SubsolarLonDeg, 6),
		Day: dayStart.Format("2006-01-02") + " " + zoneName(loc, dayStart), SolarNoon: utcString(d.Transit),
		SolarNoonAltitude: round(d.TransitAltitudeDeg, 4),
		Sunrise:           optUTC(d.Sunrise), Sunset: optUTC(d.Sunset),
		CivilDawn: optUTC(d.CivilDawn), CivilDusk: optUTC(d.CivilDusk),
		NauticalDawn: optUTC(d.NauticalDawn), NauticalDusk: optUTC(d.NauticalDusk),
		AstronomicalDawn: optUTC(d.AstroDawn), AstronomicalDusk: optUTC(d.AstroDusk),
	}
	if f.json {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if err := enc.Encode(out); err != nil {
			return fail(e.stderr, "sun", fmt.Errorf("write JSON: %w", err))
		}
		return exitOK
	}
	if err := writeSunTable(e.stdout, out, p, d, loc); err != nil {
		return fail(e.stderr, "sun", fmt.Errorf("write output: %w", err))
	}
	return exitOK
}

// writeSunTable prints the readable form: one aligned line per quantity,
// with its unit.
func writeSunTable(w io.Writer, j sunJSON, p spa.Position, d spa.Day, loc *time.Location) error {
	var b strings.Builder
	row := func(name, format string, a ...any) {
		fmt.Fprintf(&b, "%-28s %s\n", name, fmt.Sprintf(format, a...))
	}
	event := func(name string, t *time.Time, polar spa.Polar) {
		if t == nil {
			row(name, "none (sun %s that altitude all day)", polar)
			return
		}
		row(name, "%s  (%s local)", utcString(*t), offsetLayout(t.In(loc).Round(time.Second), "15:04:05 -07:00"))
	}
	row("time (UTC, read as UT1)", "%s", j.Time)
	row("time (local)", "%s  (as read: %s)", j.TimeLocal, j.CalendarDate)
	if j.ZoneNote != "" {
		row("time zone", "%s", j.ZoneNote)
	}
	if j.TimeReading != "" {
		row("note", "%s", j.TimeReading)
	}
	row("place", "%.6f° lat, %.6f° lon, %.1f m", j.Lat, j.Lon, j.ElevationM)
	row("atmosphere (refraction)", "%.2f hPa, %.1f °C", j.PressureHPa, j.TemperatureC)
	row("ΔT (TT − UT1)", "%.3f s (%s)", j.DeltaT, j.DeltaTSource)
	row("azimuth", "%10.5f °  (clockwise from true north)", p.AzimuthDeg)
	row("altitude (refracted)", "%10.5f °", p.AltitudeDeg)
	row("altitude (airless)", "%10.5f °", p.AltitudeAirlessDeg)
	row("zenith angle", "%10.5f °", p.ZenithDeg)
	row("declination (geocentric)", "%10.5f °", p.DeclinationDeg)
	row("hour angle (topocentric)", "%10.5f °  (west positive)", p.HourAngleDeg)
	row("equation of time", "%10.4f min", p.EquationOfTimeMin)
	row("apparent solar time", "%s", j.ApparentSolarTime)
	row("subsolar point", "%.4f° lat, %.4f° lon", p.SubsolarLatDeg, p.SubsolarLonDeg)
	row("day (events)", "%s", j.Day)
	event("solar noon", &d.Transit, spa.RisesAndSets)
	row("solar noon altitude", "%10.4f °  (airless)", d.TransitAltitudeDeg)
	event("astronomical dawn (−18°)", d.AstroDawn, d.AstroPolar)
	event("nautical dawn (−12°)", d.NauticalDawn, d.NauticalPolar)
	event("civil dawn (−6°)", d.CivilDawn, d.CivilPolar)
	event("sunrise", d.Sunrise, d.SunPolar)
	event("sunset", d.Sunset, d.SunPolar)
	event("civil dusk (−6°)", d.CivilDusk, d.CivilPolar)
	event("nautical dusk (−12°)", d.NauticalDusk, d.NauticalPolar)
	event("astronomical dusk (−18°)", d.AstroDusk, d.AstroPolar)
	_, err := io.WriteString(w, b.String())
	return err
}

// utcString formats an event time as RFC 3339 UTC to the second (the
// events are good to a few seconds).
func utcString(t time.Time) string { return t.UTC().Round(time.Second).Format(time.RFC3339) }

func optUTC(t *time.Time) *string {
	if t == nil {
		return nil
	}
	s := utcString(*t)
	return &s
}

// clock formats a time of day as HH:MM:SS, rounded to the second.
func clock(d time.Duration) string {
	s := int64(d.Round(time.Second)/time.Second) % 86400
	return fmt.Sprintf("%02d:%02d:%02d", s/3600, s/60%60, s%60)
}

func zoneName(loc *time.Location, t time.Time) string {
	if loc.String() != "" && !strings.HasPrefix(loc.String(), "+") && !strings.HasPrefix(loc.String(), "-") {
		return loc.String()
	}
	return "UTC" + offsetLayout(t, "-07:00")
}

// utcOffset is t's offset from UTC in seconds.
func utcOffset(t time.Time) int {
	_, off := t.Zone()
	return off
}

// offsetLayout formats t with layout, whose offset part ("-07:00") gains
// seconds when t's offset has them: local mean time before standard zones
// (Rome kept +00:49:56 until 1866 in the tz database) would otherwise be
// shown a minute short, and the local clock time and the UTC instant would
// not agree by the offset shown. RFC 3339 has no offset seconds; such a
// time is ISO 8601's extended form with seconds, which is what it is.
func offsetLayout(t time.Time, layout string) string {
	if utcOffset(t)%60 != 0 {
		layout = strings.Replace(layout, "-07:00", "-07:00:00", 1)
	}
	return t.Format(layout)
}

// localStamp is t as an RFC 3339 local time, with offset seconds where the
// offset has them (see offsetLayout).
func localStamp(t time.Time) string {
	return offsetLayout(t, "2006-01-02T15:04:05.999999999-07:00")
}

// needsZone reports whether --time is a wall time without an offset (a
// value that is not a wall time at all is left for parseSunTime to refuse).
func needsZone(s string) bool {
	m := wallTimeRE.FindStringSubmatch(strings.TrimSpace(s))
	return m != nil && m[8] == ""
}

// zoneAtPlace is the zone a wall time at lat/lon is read in when --zone is
// not given: the one the offline zone map holds there, and a sentence that
// says so. Where zones overlap (disputed borders) the first is used and the
// sentence names the others, so nothing is chosen silently.
func zoneAtPlace(f *zone.Finder, lat, lon float64) (string, string, error) {
	pl, err := f.Lookup(lat, lon)
	if err != nil || len(pl.Zones) == 0 {
		return "", "", fmt.Errorf("no time zone found at %g, %g: give --zone or an offset in --time (%v)", lat, lon, err)
	}
	note := pl.Zones[0] + ", looked up from the place (--zone overrides)"
	if len(pl.Zones) > 1 {
		note += "; zones that also hold here: " + strings.Join(pl.Zones[1:], ", ") + ": the answer may differ in those"
	}
	return pl.Zones[0], note, nil
}

func round(x float64, places int) float64 {
	p := math.Pow(10, float64(places))
	return math.Round(x*p) / p
}
