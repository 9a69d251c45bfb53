package solarcheck

import (
	"fmt"
	"github.com/gnomon-forensics/gnomon/internal/figure"
	"math"
	"sort"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/chisq"
	"github.com/gnomon-forensics/gnomon/internal/sphere"
	"github.com/gnomon-forensics/gnomon/solarcheck/invert"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
)

// searchHalfSpan is how far either side of the claim the shadow search looks
// for the sun. Shadows repeat daily, so an offset is only known modulo a
// day; ±14 h covers every zone step (UTC−12..UTC+14) and the 12-hour slip.
const searchHalfSpan = 14 * time.Hour

// gpsLagSec and gpsLeapSec bound how far a GPS time stamp may sit from the
// moment of exposure: receivers stamp the time of their last fix, a few
// seconds before the exposure (common practice: 10 s allowed), and a receiver
// that never received the UTC correction reports GPS time, 18 s ahead of UTC
// since 2017-01-01 (IERS Bulletin C; GPS time has no leap seconds).
const (
	gpsLagSec  = 10
	gpsLeapSec = 18
)

// checkShadows compares the sun direction measured in the photo with the
// sun at the claimed moment: the offset (claimed minus best-fitting time)
// with its 95 % interval, and whether the sun was up at all.
func (x *Examiner) checkShadows(f *Finding, p Photo) {
	ds, problems := directions(p.Measurements, f.LatDeg, f.LonDeg, f.HasPlace, f.Claimed)
	for _, pr := range problems {
		f.check(Check{Kind: KindMeasurements, Status: Skipped, Sentence: "A measurement could not be used: " + pr + "."})
	}
	if len(ds) == 0 {
		return
	}
	f.Measured = ds
	if !f.HasPlace {
		f.check(Check{Kind: KindShadowTime, Status: Skipped,
			Sentence: "Shadows were measured but the photo has no place (no GPS tag and no lat/lon in the sheet), so the sun cannot be consulted."})
		return
	}
	m, spread, dof := combine(ds)
	if dof > 0 {
		lim := chisq.P95(dof)
		st, s := Agrees, fmt.Sprintf("The %d measured objects agree with each other (spread χ² %.1f for %d degrees of freedom, 95 %% limit %.1f).", len(ds), spread, dof, lim)
		if spread > lim {
			st, s = Conflicts, fmt.Sprintf("The %d measured objects disagree with each other more than their stated uncertainties allow (χ² %.1f for %d degrees of freedom, 95 %% limit %.1f): re-check the measurements.", len(ds), spread, dof, lim)
		}
		f.check(Check{Kind: KindMeasurements, Status: st, Figure: spread, HasFigure: true, Unit: "chi2", Sentence: s})
	}

	// Check 5: a shadow needs the sun above the horizon.
	if f.Sun != nil {
		if f.Sun.AltitudeDeg < spa.SunriseAltitudeDeg {
			f.check(Check{Kind: KindSunUp, Status: Conflicts, Figure: f.Sun.AltitudeDeg, HasFigure: true, Unit: "deg",
				Sentence: fmt.Sprintf("Shadows were measured, but at the claimed moment the sun was %.1f° below the horizon.", -f.Sun.AltitudeDeg)})
		} else {
			f.check(Check{Kind: KindSunUp, Status: Agrees, Figure: f.Sun.AltitudeDeg, HasFigure: true, Unit: "deg",
				Sentence: fmt.Sprintf("The sun was up at the claimed moment (altitude %.1f°), as the shadows require.", f.Sun.AltitudeDeg)})
		}
	}

	obs := spa.NewObserver(f.LatDeg, f.LonDeg, f.ElevationM)
	q := invert.Query{Observer: obs, From: f.Claimed.Add(-searchHalfSpan), To: f.Claimed.Add(searchHalfSpan), Measurement: m, DeltaT: x.deltaTFunc()}
	res, err := invert.When(q)
	if err != nil {
		f.check(Check{Kind: KindShadowTime, Status: Skipped, Sentence: "The shadow time search failed: " + err.Error() + "."})
		return
	}
	if len(res.Windows) == 0 {
		// The measurement fits the sun at no time near the claim: the
		// window of a misfit says nothing about the time, so none is
		// given; other seasons are searched instead. The stated
		// uncertainties are used as given, never inflated.
		x.seasonCheck(f, q, res.Closest)
		return
	}
	w := nearestWindow(res.Windows, f.Claimed)
	fit := windowFit(w)
	iv := Interval{
		Sec:     f.Claimed.Sub(w.Best).Seconds(),
		LowSec:  f.Claimed.Sub(w.Latest).Seconds(),
		HighSec: f.Claimed.Sub(w.Earliest).Seconds(),
	}
	f.BestFit = &SunSample{Time: w.Best, AzimuthDeg: w.AzimuthDeg, AltitudeDeg: w.AltitudeDeg}
	c := Check{Kind: KindShadowTime, Figure: iv.Sec, HasFigure: true, Unit: "s", Uncertainty: iv.HalfWidth(), HasUncertainty: true, Fit: &fit}
	if iv.Contains(0, 0) {
		c.Status = Agrees
		c.Sentence = fmt.Sprintf("The shadows fit the claimed moment: the best-fitting time is %s from it, and the claim lies inside the 95 %% window (%s to %s UTC).",
			figure.Span(iv.Sec, iv.HalfWidth()), w.Earliest.Format("15:04:05"), w.Latest.Format("15:04:05"))
	} else {
		c.Status = Conflicts
		c.Sentence = fmt.Sprintf("The shadows fit %s UTC best (95 %% window %s to %s); the claim is %s from that.",
			w.Best.Format("2006-01-02 15:04:05"), w.Earliest.Format("15:04:05"), w.Latest.Format("15:04:05"), figure.Span(iv.Sec, iv.HalfWidth()))
	}
	c.Sentence += " At the best time the measurement fits the sun " + fitPhrase(fit) + "."
	if len(res.Windows) > 1 {
		c.Sentence += fmt.Sprintf(" %d windows fit within ±14 h; the one nearest the claim is used.", len(res.Windows))
	}
	f.check(c)
	f.Basis.ShadowOffset = &iv
}

// windowFit is the goodness of fit at a window's best time.
func windowFit(w invert.Window) Fit { return Fit{Chi2: w.Misfit, Dof: w.Dof, PValue: w.PValue} }

// fitPhrase says a fit in plain words: the misfit, its degrees of freedom
// and how often chance alone gives one as large.
func fitPhrase(fit Fit) string {
	dof := "degrees"
	if fit.Dof == 1 {
		dof = "degree"
	}
	chance := fmt.Sprintf("%.0f %%", 100*fit.PValue)
	switch {
	case fit.PValue < 0.001:
		chance = "less than 0.1 %"
	case fit.PValue < 0.095:
		chance = fmt.Sprintf("%.1f %%", 100*fit.PValue)
	case fit.PValue > 0.995:
		chance = "more than 99 %"
	}
	return fmt.Sprintf("(misfit χ² %.1f with %d %s of freedom; chance alone gives a misfit at least this large in %s of honest measurements)", fit.Chi2, fit.Dof, dof, chance)
}

// seasonCheck runs when no time within ±14 h of the claim fits the shadows
// (near is the closest time there, nil when the sun was never up): it
// searches the half-year either side for the dates on which the sun could
// have cast them. Date and time of day are then two parameters of
// interest, so the dates that fit are those of the joint 95 % region,
// whose least misfit lies within χ² 5.991 (two degrees of freedom) of the
// best in the year; the claimed date is ruled out only when its own least
// misfit lies beyond that. The sun's declination repeats about each
// solstice, so the dates usually form two bands a year, each reported,
// nearest first.
func (x *Examiner) seasonCheck(f *Finding, q invert.Query, near *invert.Window) {
	nearText := "the sun never stood high enough near the claim for shadows"
	nearChi := math.Inf(1)
	var nearFit *Fit
	if near != nil {
		fit := windowFit(*near)
		nearFit, nearChi = &fit, fit.Chi2
		nearText = "the closest fit near the claim has " + strings.Trim(fitPhrase(fit), "()")
	}
	joint := chisq.P95(2)
	q.From, q.To = f.Claimed.AddDate(0, 0, -182), f.Claimed.AddDate(0, 0, 182)
	q.MaxMisfit = chisq.Point(invert.FitLevel, q.Measurement.FitDof()) + joint
	res, err := invert.When(q)
	least := math.Inf(1)
	for _, w := range res.Windows {
		if w.Fits() {
			least = min(least, w.Misfit)
		}
	}
	c := Check{Kind: KindShadowTime, Status: Conflicts, Fit: nearFit}
	switch {
	case err != nil:
		c.Sentence = "No time near the claim fits the shadows (" + nearText + "), and the year-long search failed: " + err.Error() + "."
	case math.IsInf(least, 1):
		c.Sentence = "The shadows fit the sun at no time within half a year of the claim at this place (" + nearText + "): the measurements or the place are likely wrong, and the shadows say nothing about the time."
		f.Basis.ShadowMisfit = true
	case nearChi-least < joint:
		c.Status = Open
		c.Sentence = fmt.Sprintf("The shadows fit the sun poorly at every time near the claim (%s). Other dates within half a year fit them better (least misfit χ² %.1f), but not by enough to rule out the claimed date: the shadows cannot tell the time.", nearText, least)
		f.Basis.ShadowMisfit = true
	default:
		var keep []invert.Window
		for _, w := range res.Windows {
			if w.Misfit < least+joint {
				keep = append(keep, w)
			}
		}
		bands := dateBands(keep, f.LonDeg, f.Claimed)
		f.SeasonBands = bands
		c.Figure, c.HasFigure, c.Unit = bands[0].DaysFromClaim, true, "days"
		parts := make([]string, len(bands))
		for i, b := range bands {
			parts[i] = fmt.Sprintf("%s (%s)", bandText(b), daysText(b.DaysFromClaim))
		}
		c.Sentence = fmt.Sprintf("No time on or near the claimed date fits the shadows (%s). Within half a year they fit the sun at this place only on %s, which points to a different season.",
			nearText, listText(parts))
		f.Basis.SeasonOff = true
		best := bands[0].Best
		f.BestFit = &best
	}
	f.check(c)
}

// dateBands groups fitting windows into runs of consecutive local solar
// dates (UTC shifted by the longitude, 4 min per degree, so that a day's
// windows share a date), sorted by distance from the claim, nearest first.
func dateBands(ws []invert.Window, lonDeg float64, claimed time.Time) []DateBand {
	shift := time.Duration(lonDeg / 15 * float64(time.Hour))
	solarDate := func(t time.Time) time.Time { return t.Add(shift).UTC().Truncate(24 * time.Hour) }
	var bands []DateBand
	for _, w := range ws {
		d := solarDate(w.Best)
		fit := windowFit(w)
		best := SunSample{Time: w.Best, AzimuthDeg: w.AzimuthDeg, AltitudeDeg: w.AltitudeDeg}
		if n := len(bands); n > 0 && d.Sub(bands[n-1].Last) <= 24*time.Hour {
			b := &bands[n-1]
			b.Last = d
			if fit.Chi2 < b.Fit.Chi2 {
				b.Best, b.Fit = best, fit
			}
			continue
		}
		bands = append(bands, DateBand{First: d, Last: d, Best: best, Fit: fit})
	}
	for i := range bands {
		bands[i].DaysFromClaim = bandDays(bands[i], claimed)
	}
	sort.SliceStable(bands, func(i, j int) bool { return math.Abs(bands[i].DaysFromClaim) < math.Abs(bands[j].DaysFromClaim) })
	return bands
}

// bandDays is the signed number of days from the band to the claim's
// date: positive when the band lies before the claim, 0 when it holds it.
func bandDays(b DateBand, claimed time.Time) float64 {
	c := claimed.UTC().Truncate(24 * time.Hour)
	switch {
	case c.Before(b.First):
		return -b.First.Sub(c).Hours() / 24
	case c.After(b.Last):
		return c.Sub(b.Last).Hours() / 24
	}
	return 0
}

func bandText(b DateBand) string {
	if b.First.Equal(b.Last) {
		return b.First.Format(time.DateOnly)
	}
	return b.First.Format(time.DateOnly) + " to " + b.Last.Format(time.DateOnly)
}

func daysText(d float64) string {
	n := int(math.Round(math.Abs(d)))
	unit := "days"
	if n == 1 {
		unit = "day"
	}
	switch {
	case d > 0:
		return fmt.Sprintf("ending %d %s before the claimed date", n, unit)
	case d < 0:
		return fmt.Sprintf("starting %d %s after the claimed date", n, unit)
	}
	return "holding the claimed date"
}

// listText joins phrases as "a", "a and b", "a, b and c".
func listText(parts []string) string {
	if len(parts) <= 1 {
		return strings.Join(parts, "")
	}
	return strings.Join(parts[:len(parts)-1], ", ") + " and " + parts[len(parts)-1]
}

func (x *Examiner) deltaTFunc() func(time.Time) float64 {
	if x.deltaT == nil {
		return nil
	}
	d := *x.deltaT
	return func(time.Time) float64 { return d }
}

// nearestWindow returns the window whose best time is nearest t.
func nearestWindow(ws []invert.Window, t time.Time) invert.Window {
	best := ws[0]
	for _, w := range ws[1:] {
		if absDur(w.Best.Sub(t)) < absDur(best.Best.Sub(t)) {
			best = w
		}
	}
	return best
}

// checkGPSClock compares the camera's claimed instant with the GPS
// receiver's UTC stamp. The offset is split into a whole step of 15-minute
// zone increments and a residual.
func (x *Examiner) checkGPSClock(f *Finding, rec exifread.Record) {
	g := rec.GPS.Time
	if g == nil {
		return
	}
	if !g.Valid || !g.HasDate {
		reason := g.Invalid
		if reason == "" {
			reason = "no GPS date"
		}
		f.check(Check{Kind: KindGPSClock, Status: Skipped, Sentence: "The GPS time stamp cannot be used: " + reason + "."})
		return
	}
	off := f.Claimed.Sub(g.UTC).Seconds()
	// The true moment lies in [gps − leap, gps + lag] (see gpsLagSec), so
	// claimed − true lies in [off − lag, off + leap].
	iv := Interval{Sec: off, LowSec: off - gpsLagSec, HighSec: off + gpsLeapSec}
	step := math.Round(off/900) * 900
	c := Check{Kind: KindGPSClock, Figure: off, HasFigure: true, Unit: "s", Uncertainty: iv.HalfWidth(), HasUncertainty: true}
	switch {
	case iv.Contains(0, 0):
		c.Status = Agrees
		c.Sentence = fmt.Sprintf("The camera clock agrees with the GPS clock (difference %s, within the allowance for fix lag and the GPS–UTC leap seconds).", signedDuration(off))
	case step != 0:
		c.Status = Conflicts
		c.Sentence = fmt.Sprintf("The claimed instant is %s from the GPS clock: a step of %s plus a residual of %s.", signedDuration(off), signedDuration(step), signedDuration(off-step))
	default:
		c.Status = Conflicts
		c.Sentence = fmt.Sprintf("The claimed instant is %s from the GPS clock.", signedDuration(off))
	}
	f.check(c)
	f.Basis.GPSOffset = &iv
}

// checkOffsetTag compares the camera's own offset tag with the offset of the
// zone at the place on that date.
func (x *Examiner) checkOffsetTag(f *Finding) {
	if !f.Wall.HasOffset || !f.HasPlace {
		return
	}
	pl, err := x.zones.Lookup(f.LatDeg, f.LonDeg)
	if err != nil || len(pl.Zones) == 0 {
		return
	}
	var offs []int
	for _, name := range pl.Zones {
		loc, err := x.zones.DB().Load(name)
		if err != nil {
			continue
		}
		_, o := f.Claimed.In(loc).Zone()
		offs = append(offs, o)
		if o == f.Wall.OffsetSec {
			f.check(Check{Kind: KindOffsetTag, Status: Agrees, Figure: 0, HasFigure: true, Unit: "s",
				Sentence: fmt.Sprintf("The camera's offset tag (%s) matches the zone at the place (%s) on that date.", offsetLabel(f.Wall.OffsetSec), name)})
			return
		}
	}
	if len(offs) == 0 {
		return
	}
	d := f.Wall.OffsetSec - offs[0]
	f.check(Check{Kind: KindOffsetTag, Status: Conflicts, Figure: float64(d), HasFigure: true, Unit: "s",
		Sentence: fmt.Sprintf("The camera's offset tag says %s but the place keeps %s (%s) on that date: the camera was set to another zone. The UTC instant follows the tag, which is right only if the clock showed that zone's time.",
			offsetLabel(f.Wall.OffsetSec), offsetLabel(offs[0]), pl.Zones[0])})
}

// checkShadowPlace finds where on Earth the measured sun direction puts the
// camera at the GPS receiver's time (package invert's Where), and compares
// that with the GPS position.
func (x *Examiner) checkShadowPlace(f *Finding, rec exifread.Record) {
	g := rec.GPS.Time
	if f.PlaceSource != "gps" || g == nil || !g.Valid || !g.HasDate || len(f.Measured) == 0 {
		return
	}
	m, _, _ := combine(f.Measured)
	if !m.HasAzimuth || !m.HasAltitude {
		return
	}
	fixes, err := invert.Where(invert.WhereQuery{
		Time: g.UTC, Measurement: m, ElevationM: f.ElevationM,
		PressureHPa: spa.DefaultPressureHPa, TemperatureC: spa.DefaultTemperatureC, DeltaT: x.deltaTFunc(),
	})
	if err != nil {
		f.check(Check{Kind: KindShadowPlace, Status: Skipped, Sentence: "The place search failed: " + err.Error() + "."})
		return
	}
	// Where gives two places when the circle of equal altitude encloses a
	// pole; the one nearer the GPS tag is the fair comparison.
	fix := fixes[0]
	for _, o := range fixes[1:] {
		if sphere.DistanceKm(f.LatDeg, f.LonDeg, o.LatDeg, o.LonDeg) < sphere.DistanceKm(f.LatDeg, f.LonDeg, fix.LatDeg, fix.LonDeg) {
			fix = o
		}
	}
	f.ShadowFix = &Fix{LatDeg: fix.LatDeg, LonDeg: fix.LonDeg, RadiusKm: fix.RadiusKm}
	dist := sphere.DistanceKm(f.LatDeg, f.LonDeg, fix.LatDeg, fix.LonDeg)
	c := Check{Kind: KindShadowPlace, Figure: dist, HasFigure: true, Unit: "km", Uncertainty: fix.RadiusKm, HasUncertainty: true}
	if dist <= fix.RadiusKm {
		c.Status = Agrees
		c.Sentence = fmt.Sprintf("At the GPS time the shadows place the camera %.0f km from its GPS tag, within their 95 %% radius of %.0f km.", dist, fix.RadiusKm)
	} else {
		c.Status = Conflicts
		c.Sentence = fmt.Sprintf("At the GPS time the shadows place the camera %.0f km from its GPS tag, beyond their 95 %% radius of %.0f km.", dist, fix.RadiusKm)
	}
	f.check(c)
}

// offsetLabel formats an offset from UTC as "UTC+05:30".
func offsetLabel(sec int) string {
	sign := '+'
	if sec < 0 {
		sign, sec = '-', -sec
	}
	return fmt.Sprintf("UTC%c%02d:%02d", sign, sec/3600, sec%3600/60)
}

// signedDuration formats seconds as "+2 h 47 min 05 s", to the second: for
// a figure with no interval of its own. Offsets with an interval use
// Interval.spans, so that a sentence shows the digits the report's table
// shows for the same figure (one rounding rule, package figure).
func signedDuration(sec float64) string { return figure.Span(sec, 0) }

func absDur(d time.Duration) time.Duration {
	if d < 0 {
		return -d
	}
	return d
}

// zoneOffsets returns the offsets (seconds) of the zones at the place at t.
func (x *Examiner) zoneOffsets(f *Finding, t time.Time) []zoneAt {
	if !f.HasPlace {
		return nil
	}
	pl, err := x.zones.Lookup(f.LatDeg, f.LonDeg)
	if err != nil {
		return nil
	}
	var out []zoneAt
	for _, name := range pl.Zones {
		loc, err := x.zones.DB().Load(name)
		if err != nil {
			continue
		}
		out = append(out, zoneAt{name: name, loc: loc})
	}
	return out
}

type zoneAt struct {
	name string
	loc  *time.Location
}

// keepsDST reports whether loc's offset differs between January and July of
// t's year, i.e. whether the place changes its clocks that year.
func keepsDST(loc *time.Location, t time.Time) bool {
	y := t.Year()
	_, a := time.Date(y, 1, 15, 12, 0, 0, 0, time.UTC).In(loc).Zone()
	_, b := time.Date(y, 7, 15, 12, 0, 0, 0, time.UTC).In(loc).Zone()
	return a != b
}
