package main

import (
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/internal/chisq"
	"github.com/gnomon-forensics/gnomon/solarcheck/invert"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

const whenSynopsis = "gnomon when --lat D --lon D (--date YYYY-MM-DD | --from YYYY-MM-DD --to YYYY-MM-DD) (--azimuth A [--altitude H] | --altitude H | --shadow-bearing B --height H --shadow-length L [--slope S --slope-toward B]) [--azimuth-sd S] [--altitude-sd S] [--bearing-sd S] [--length-sd-pct P] [--zone IANA] [--json]"

const whenAbout = `Find every time in a date range at which the sun, seen from a place, stood
where a measurement puts it: a sun azimuth and/or altitude, or the shadow of a
vertical object (height, shadow length along the ground and shadow bearing
from base to tip, optionally on ground sloping down toward --slope-toward).

Each match is a 95 % window about a time of least misfit ("best"): the
times whose misfit chi-square exceeds the best one's by less than 3.841 (the
profile interval for the one unknown, the time; NREL SPA sun, refracted
altitude, standard atmosphere, sea level). Beside it stand the misfit at the
best time, its degrees of freedom (angles measured less one, at least one)
and its p-value: a match is listed only when the p-value is at least 0.05.
When no time fits, the closest time is shown with its misfit: the
measurement and the sun disagree at every time in the range. Altitude alone
usually fits twice a day; near noon the two windows can merge. Only times
with the sun above the horizon match. Searching is done on a 1-minute grid
and refined to about 1 s.

Dates are UTC calendar days unless --zone names an IANA zone; at most three
years. Uncertainties are 1-sigma: defaults 1° for azimuth and altitude, 2° for
a shadow bearing and 5 % for a shadow length. The object's height is taken
as exact: only the ratio height/length matters, so put the height's relative
error into --length-sd-pct. Azimuths and bearings are degrees clockwise from
true north (correct a compass for magnetic declination first).`

// maxWhenDays is the longest range the command accepts (invert.MaxRange).
const maxWhenDays = 3 * 366

type whenMatchJSON struct {
	Best     string  `json:"best"`
	Earliest string  `json:"earliest"`
	Latest   string  `json:"latest"`
	Azimuth  float64 `json:"azimuth"`
	Altitude float64 `json:"altitude"`
	// Misfit is χ² at best, MisfitDof its degrees of freedom and PValue
	// the chance of a misfit at least as large from an honest measurement.
	Misfit    float64 `json:"misfit"`
	MisfitDof int     `json:"misfit_dof"`
	PValue    float64 `json:"p_value"`
	Fits      bool    `json:"fits"`
}

// whenQueryJSON echoes the question as understood: the place, the days,
// the zone, the inputs as given and the sun direction they make.
type whenQueryJSON struct {
	Lat  float64 `json:"lat"`
	Lon  float64 `json:"lon"`
	From string  `json:"from"`
	To   string  `json:"to"`
	Zone string  `json:"zone"`
	// Inputs are the measurement flags given, by name without dashes.
	Inputs map[string]float64 `json:"inputs"`
	// The measured sun direction (1-sigma), null where not measured.
	Azimuth     *float64 `json:"azimuth"`
	AzimuthSD   *float64 `json:"azimuth_sd"`
	Altitude    *float64 `json:"altitude"`
	AltitudeSD  *float64 `json:"altitude_sd"`
	Correlation float64  `json:"correlation"`
}

type whenJSON struct {
	Query   whenQueryJSON   `json:"query"`
	Matches []whenMatchJSON `json:"matches"`
	// Closest is the time of least misfit when no time fits (null when
	// something fits, or when the sun never rose in the range).
	Closest *whenMatchJSON `json:"closest"`
	// Warnings say where a figure is undefined (an azimuth at a pole).
	Warnings []string `json:"warnings,omitempty"`
	// Notes say where a midnight bounding the days was skipped or repeated
	// in --zone, and which instant was taken.
	Notes []string `json:"notes,omitempty"`
}

// dayBounds returns the first and last instants (to the second) at which
// the clocks of loc showed the days day0..day1. Where a bounding midnight
// was skipped or repeated (zones that change at midnight), the day runs
// from the first instant that showed its date, and a note says so.
func dayBounds(day0, day1 time.Time, loc *time.Location) (start, end time.Time, notes []string, err error) {
	note := func(what string, y int, m time.Month, d int, res zone.Resolution, at time.Time) {
		switch res.Kind {
		case zone.Skipped:
			notes = append(notes, fmt.Sprintf("%s: midnight of %04d-%02d-%02d never came in %s (the clocks went forward at it); the day is taken from the change, %s.",
				what, y, int(m), d, res.Zone, at.UTC().Format(time.RFC3339)))
		case zone.Repeated:
			notes = append(notes, fmt.Sprintf("%s: midnight of %04d-%02d-%02d came twice in %s (the clocks went back); the day is taken from the first, %s.",
				what, y, int(m), d, res.Zone, at.UTC().Format(time.RFC3339)))
		}
	}
	y, m, d := day0.Date()
	start, res, err := zone.DayStart(y, m, d, loc)
	if err != nil {
		return time.Time{}, time.Time{}, nil, fmt.Errorf("start of %s: %w", day0.Format(time.DateOnly), err)
	}
	note("start", y, m, d, res, start)
	y, m, d = day1.AddDate(0, 0, 1).Date()
	next, res, err := zone.DayStart(y, m, d, loc)
	if err != nil {
		return time.Time{}, time.Time{}, nil, fmt.Errorf("end of %s: %w", day1.Format(time.DateOnly), err)
	}
	note("end", y, m, d, res, next)
	return start, next.Add(-time.Second), notes, nil
}

func runWhen(e env, args []string) int {
	fs := newFlagSet(e, "when", whenSynopsis, whenAbout)
	lat := fs.Float64("lat", 0, "latitude in `DEGREES` north (-90..90)")
	lon := fs.Float64("lon", 0, "longitude in `DEGREES` east (-180..180)")
	date := fs.String("date", "", "one calendar `DAY`, YYYY-MM-DD")
	from := fs.String("from", "", "first calendar `DAY` of a range, YYYY-MM-DD")
	to := fs.String("to", "", "last calendar `DAY` of a range (inclusive), YYYY-MM-DD")
	az := fs.Float64("azimuth", 0, "measured sun azimuth in `DEGREES` clockwise from true north")
	alt := fs.Float64("altitude", 0, "measured apparent (refracted) sun altitude in `DEGREES`")
	bearing := fs.Float64("shadow-bearing", 0, "shadow bearing from base to tip in `DEGREES` true")
	height := fs.Float64("height", 0, "`HEIGHT` of the vertical object (any unit, the same as --shadow-length)")
	length := fs.Float64("shadow-length", 0, "shadow `LENGTH` from base to tip, measured along the ground")
	slope := fs.Float64("slope", 0, "ground slope in `DEGREES` (0 = level)")
	slopeToward := fs.Float64("slope-toward", 0, "bearing the ground slopes down toward, in `DEGREES` true")
	azSD := fs.Float64("azimuth-sd", 1, "1-sigma error of --azimuth in `DEGREES`")
	altSD := fs.Float64("altitude-sd", 1, "1-sigma error of --altitude in `DEGREES`")
	bearingSD := fs.Float64("bearing-sd", 2, "1-sigma error of --shadow-bearing in `DEGREES`")
	lenSD := fs.Float64("length-sd-pct", 5, "1-sigma error of --shadow-length in `PERCENT` of the length")
	zoneName := fs.String("zone", "", "IANA time `ZONE` of the dates (default: UTC dates)")
	asJSON := fs.Bool("json", false, "print one JSON object")
	set, code, done := parseNoArgs(fs, args, "lat", "lon")
	if done {
		return code
	}
	if !(*lat >= -90 && *lat <= 90) {
		return usageErr(fs, "--lat %g is outside -90..90", *lat)
	}
	if !(*lon >= -180 && *lon <= 180) {
		return usageErr(fs, "--lon %g is outside -180..180", *lon)
	}
	for _, sd := range []struct {
		name string
		v    float64
	}{{"azimuth-sd", *azSD}, {"altitude-sd", *altSD}, {"bearing-sd", *bearingSD}, {"length-sd-pct", *lenSD}} {
		if !(sd.v > 0) || math.IsInf(sd.v, 0) {
			return usageErr(fs, "--%s %g must be a positive number", sd.name, sd.v)
		}
	}

	// The dates.
	loc := time.UTC
	if *zoneName != "" {
		l, err := zone.NewDB().Load(*zoneName) // the embedded tz database, never the host's
		if err != nil {
			return usageErr(fs, "unknown --zone %q", *zoneName)
		}
		loc = l
	}
	var d0, d1 string
	switch {
	case set["date"] && (set["from"] || set["to"]):
		return usageErr(fs, "give either --date or --from and --to, not both")
	case set["date"]:
		d0, d1 = *date, *date
	case set["from"] && set["to"]:
		d0, d1 = *from, *to
	case set["from"] || set["to"]:
		return usageErr(fs, "--from and --to go together")
	default:
		return usageErr(fs, "a date is required: --date, or --from and --to")
	}
	day0, err := time.Parse(time.DateOnly, d0) // calendar fields only: midnight in loc may not exist
	if err != nil {
		return usageErr(fs, "date %q is not a calendar date YYYY-MM-DD", d0)
	}
	day1, err := time.Parse(time.DateOnly, d1)
	if err != nil {
		return usageErr(fs, "date %q is not a calendar date YYYY-MM-DD", d1)
	}
	if day1.Before(day0) {
		return usageErr(fs, "--from %s is after --to %s", d0, d1)
	}
	if y := day0.Year(); y < -2000 || day1.Year() > 6000 {
		return usageErr(fs, "dates outside the years -2000..6000 that SPA covers")
	}
	start, end, dayNotes, err := dayBounds(day0, day1, loc)
	if err != nil {
		return fail(e.stderr, "when", err)
	}
	if end.Sub(start) > maxWhenDays*24*time.Hour {
		return usageErr(fs, "range %s to %s is longer than %d days (about three years)", d0, d1, maxWhenDays)
	}

	// The measurement.
	shadowFlags := set["shadow-bearing"] || set["height"] || set["shadow-length"] || set["slope"] || set["slope-toward"]
	var m invert.Measurement
	var from0 string
	switch {
	case shadowFlags && (set["azimuth"] || set["altitude"]):
		return usageErr(fs, "give either a shadow or --azimuth/--altitude, not both")
	case shadowFlags:
		for _, name := range []string{"shadow-bearing", "height", "shadow-length"} {
			if !set[name] {
				return usageErr(fs, "a shadow needs --shadow-bearing, --height and --shadow-length (--%s missing)", name)
			}
		}
		if set["slope"] != set["slope-toward"] {
			return usageErr(fs, "--slope and --slope-toward go together")
		}
		if !(*height > 0) || math.IsInf(*height, 0) {
			return usageErr(fs, "--height %g must be positive", *height)
		}
		if !(*length > 0) || math.IsInf(*length, 0) {
			return usageErr(fs, "--shadow-length %g must be positive", *length)
		}
		if !(*slope >= 0 && *slope < 90) {
			return usageErr(fs, "--slope %g is outside 0..90 (exclusive)", *slope)
		}
		if !(*bearing >= 0 && *bearing <= 360) || !(*slopeToward >= 0 && *slopeToward <= 360) {
			return usageErr(fs, "bearings must be degrees in 0..360 (clockwise from true north)")
		}
		sh := shadow.Shadow{Height: *height, Length: *length, BearingDeg: *bearing,
			Ground: shadow.Ground{SlopeDeg: *slope, TowardDeg: *slopeToward}}
		est, err := shadow.Propagate(sh, shadow.Uncertainty{LengthSDPct: *lenSD, BearingSDDeg: *bearingSD})
		if err != nil {
			return usageErr(fs, "%v", err)
		}
		m = invert.FromShadow(est)
		from0 = "shadow"
	case set["azimuth"] || set["altitude"]:
		if set["azimuth"] {
			if !(*az >= 0 && *az <= 360) {
				return usageErr(fs, "--azimuth %g is outside 0..360 (degrees clockwise from true north)", *az)
			}
			m.HasAzimuth, m.AzimuthDeg, m.AzimuthSDDeg = true, angle.Norm360(*az), *azSD
		}
		if set["altitude"] {
			if !(*alt >= -90 && *alt <= 90) {
				return usageErr(fs, "--altitude %g is outside -90..90", *alt)
			}
			m.HasAltitude, m.AltitudeDeg, m.AltitudeSDDeg = true, *alt, *altSD
		}
		from0 = "measured"
	default:
		return usageErr(fs, "a measurement is required: --azimuth and/or --altitude, or a shadow")
	}

	var warnings []string
	if w := poleWarning(*lat); w != "" && m.HasAzimuth {
		warnings = append(warnings, w+"; the azimuth measured cannot place the sun in time")
		fmt.Fprintln(e.stderr, "gnomon when: warning: "+warnings[0])
	}
	res, err := invert.When(invert.Query{
		Observer:    spa.NewObserver(*lat, *lon, 0),
		From:        start,
		To:          end,
		Measurement: m,
	})
	if errors.Is(err, invert.ErrInvalid) {
		return usageErr(fs, "%v", err)
	}
	if err != nil {
		return fail(e.stderr, "when", err)
	}
	out := whenJSON{Query: whenQuery(fs, *lat, *lon, d0, d1, loc, m), Matches: []whenMatchJSON{}, Notes: dayNotes, Warnings: warnings}
	for _, w := range res.Windows {
		out.Matches = append(out.Matches, whenMatch(w))
	}
	if len(res.Windows) == 0 && res.Closest != nil {
		c := whenMatch(*res.Closest)
		out.Closest = &c
	}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		if err := enc.Encode(out); err != nil {
			return fail(e.stderr, "when", fmt.Errorf("write JSON: %w", err))
		}
		return exitOK
	}
	if err := writeWhenTable(e.stdout, m, from0, *lat, *lon, d0, d1, loc, dayNotes, res); err != nil {
		return fail(e.stderr, "when", fmt.Errorf("write output: %w", err))
	}
	return exitOK
}

// whenMatch is the JSON form of a window.
func whenMatch(w invert.Window) whenMatchJSON {
	return whenMatchJSON{
		Best: w.Best.UTC().Format(time.RFC3339), Earliest: w.Earliest.UTC().Format(time.RFC3339),
		Latest: w.Latest.UTC().Format(time.RFC3339),
		// SPA is good to 0.0003°; four decimals keep that and no more.
		Azimuth: roundTo(w.AzimuthDeg, 4), Altitude: roundTo(w.AltitudeDeg, 4),
		Misfit: roundTo(w.Misfit, 3), MisfitDof: w.Dof, PValue: roundTo(w.PValue, 4), Fits: w.Fits(),
	}
}

// whenQuery echoes the query: the flags given and the measurement made of them.
func whenQuery(fs *flag.FlagSet, lat, lon float64, d0, d1 string, loc *time.Location, m invert.Measurement) whenQueryJSON {
	q := whenQueryJSON{Lat: lat, Lon: lon, From: d0, To: d1, Zone: loc.String(), Inputs: map[string]float64{}, Correlation: roundTo(m.Correlation, 4)}
	fs.Visit(func(f *flag.Flag) {
		if g, ok := f.Value.(flag.Getter); ok {
			if v, ok := g.Get().(float64); ok && f.Name != "lat" && f.Name != "lon" {
				q.Inputs[f.Name] = v
			}
		}
	})
	if m.HasAzimuth {
		q.Azimuth, q.AzimuthSD = ptrTo(roundTo(m.AzimuthDeg, 4)), ptrTo(roundTo(m.AzimuthSDDeg, 4))
	}
	if m.HasAltitude {
		q.Altitude, q.AltitudeSD = ptrTo(roundTo(m.AltitudeDeg, 4)), ptrTo(roundTo(m.AltitudeSDDeg, 4))
	}
	return q
}

func ptrTo(x float64) *float64 { return &x }

// writeWhenTable prints the readable form: what was measured, then one
// aligned row per window.
func writeWhenTable(w io.Writer, m invert.Measurement, source string, lat, lon float64, d0, d1 string, loc *time.Location, notes []string, res invert.Result) error {
	ws := res.Windows
	var b strings.Builder
	var parts []string
	if m.HasAzimuth {
		parts = append(parts, fmt.Sprintf("azimuth %.2f° ± %.2f°", m.AzimuthDeg, m.AzimuthSDDeg))
	}
	if m.HasAltitude {
		parts = append(parts, fmt.Sprintf("altitude %.2f° ± %.2f°", m.AltitudeDeg, m.AltitudeSDDeg))
	}
	if m.Correlation != 0 {
		parts = append(parts, fmt.Sprintf("correlation %.2f", m.Correlation))
	}
	fmt.Fprintf(&b, "%-10s %s (%s, 1-sigma)\n", "sun", strings.Join(parts, ", "), source)
	fmt.Fprintf(&b, "%-10s %.5f° lat, %.5f° lon\n", "place", lat, lon)
	fmt.Fprintf(&b, "%-10s %s to %s (%s)\n", "days", d0, d1, loc)
	for _, n := range notes {
		fmt.Fprintf(&b, "%-10s %s\n", "note", n)
	}
	fmt.Fprintf(&b, "%-10s misfit at the best time with p ≥ 0.05 (χ² below %.3f, %d dof); window: χ² within %.3f of the best; sun above the horizon\n",
		"match", chisq.Point(invert.FitLevel, m.FitDof()), m.FitDof(), chisq.P95(invert.ProfileDof))
	if len(ws) == 0 {
		b.WriteString("\nno time in the range fits the measurement")
		if c := res.Closest; c != nil {
			p := "p = " + pText(c.PValue)
			if c.PValue < 0.001 {
				p = "p < 0.001"
			}
			fmt.Fprintf(&b, ": the measurement and the sun disagree at every time. The closest is %s (sun azimuth %.2f°, altitude %.2f°) with misfit χ² %.1f on %d dof (%s).",
				c.Best.UTC().Format(time.RFC3339), c.AzimuthDeg, c.AltitudeDeg, c.Misfit, c.Dof, p)
		} else {
			b.WriteString(": the sun was below the horizon throughout.")
		}
		b.WriteString("\n")
		_, err := io.WriteString(w, b.String())
		return err
	}
	local := loc != time.UTC
	b.WriteString("\n")
	header := fmt.Sprintf("%3s  %-20s  %-20s  %-20s  %10s  %10s  %6s  %7s", "#", "earliest (UTC)", "best (UTC)", "latest (UTC)", "azimuth °", "altitude °", "χ²", "p")
	if local {
		header += "  best (local)"
	}
	b.WriteString(header + "\n")
	for i, x := range ws {
		note := ""
		if x.StartsBefore {
			note += "  (starts before the range)"
		}
		if x.EndsAfter {
			note += "  (ends after the range)"
		}
		row := fmt.Sprintf("%3d  %-20s  %-20s  %-20s  %10.4f  %10.4f  %6.3f  %7s", i+1,
			x.Earliest.UTC().Format(time.RFC3339), x.Best.UTC().Format(time.RFC3339), x.Latest.UTC().Format(time.RFC3339),
			x.AzimuthDeg, x.AltitudeDeg, x.Misfit, pText(x.PValue))
		if local {
			row += "  " + x.Best.In(loc).Format("2006-01-02 15:04:05 MST")
		}
		b.WriteString(row + note + "\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// pText prints a p-value to two significant places, and tiny ones as a bound.
func pText(p float64) string {
	if p < 0.001 {
		return "< 0.001"
	}
	return strconv.FormatFloat(p, 'g', 2, 64)
}

// roundTo rounds x to the given number of decimal places.
func roundTo(x float64, places int) float64 {
	p := math.Pow(10, float64(places))
	return math.Round(x*p) / p
}
