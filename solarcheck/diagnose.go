package solarcheck

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/sphere"
	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
)

// stepSlackSec is how close the evidence interval must come to a whole step
// (1 h, 12 h, a zone difference) for the step to explain the offset: a
// camera left on home time may also be a minute or two off (common practice).
const stepSlackSec = 120

// hypothesis is one explanation of a time offset: claimed − true = Sec.
type hypothesis struct {
	verdict Verdict
	sec     float64
	label   string
}

// diagnose chooses the verdict for f from its checks. The order of
// precedence: a different place, a different season, then the time offset
// the witnesses give (tested against the competing explanations), then the
// light, then nothing.
func diagnose(f *Finding, x *Examiner) {
	defer func() { f.Explanation += f.Basis.PlaceNote }()
	iv, source := timeEvidence(f)

	if c, ok := f.Check(KindShadowPlace); ok && c.Status == Conflicts {
		f.Verdict = PlaceMismatch
		f.Explanation = c.Sentence + " The photo may not have been taken where its GPS tag says, or the tag belongs to another moment."
		if iv != nil {
			f.setOffset(*iv)
		}
		return
	}
	reset := factoryDateSentence(f)
	if f.Basis.SeasonOff {
		c, _ := f.Check(KindShadowTime)
		f.Verdict = SeasonMismatch
		f.Explanation = reset + c.Sentence
		return
	}
	if iv == nil && f.Basis.ShadowMisfit {
		c, _ := f.Check(KindShadowTime)
		f.Verdict = Unverified
		f.Explanation = c.Sentence + " No other witness fixes the time; it is neither confirmed nor contradicted."
		return
	}
	if iv == nil {
		if f.Basis.LightOff {
			c, _ := f.Check(KindLight)
			f.Verdict = LightMismatch
			f.Explanation = c.Sentence + " No other witness fixes the time; this is a hint, not proof."
			return
		}
		if c, ok := f.Check(KindSunUp); ok && c.Status == Conflicts {
			f.Verdict = LightMismatch
			f.Explanation = c.Sentence
			return
		}
		f.Verdict = Unverified
		f.Explanation = "No independent witness (shadows, sightings or a GPS clock) was available for this photo; its time is neither confirmed nor contradicted."
		return
	}
	f.setOffset(*iv)
	x.judgeOffset(f, *iv, source)
	if f.Verdict != Consistent && reset != "" {
		f.Explanation = reset + f.Explanation
	}
	if f.Basis.ShadowMisfit {
		f.Explanation += " The shadows were not used: they fit the sun well at no time near the claim (see the shadow check)."
	}
}

// factoryDateSentence names a camera clock reset as the explanation when
// the capture date is a factory default (clock.FactoryEpoch), and marks
// the finding; "" otherwise. It is said only beside evidence that the time
// is wrong: the date alone is a hint.
func factoryDateSentence(f *Finding) string {
	if f.Wall.IsZero() {
		return ""
	}
	w := f.Wall
	epoch, ok := clock.FactoryEpoch(time.Date(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second, 0, time.UTC))
	if !ok {
		return ""
	}
	f.FactoryDate = true
	return fmt.Sprintf("The camera's date (%04d-%02d-%02d %02d:%02d) is at or just after %s, a date camera clocks fall back to when reset: the clock was most likely reset and not set again, so its date says nothing about when the photo was taken. ",
		w.Year, int(w.Month), w.Day, w.Hour, w.Minute, epoch.Format(time.DateOnly))
}

// timeEvidence returns the interval the time witnesses give, and names them.
// When both shadows and the GPS clock speak and their intervals overlap, the
// narrower (the GPS clock, as a rule) is used; when they contradict each
// other, the narrower is used and the contradiction is said.
func timeEvidence(f *Finding) (*Interval, string) {
	s, g := f.Basis.ShadowOffset, f.Basis.GPSOffset
	switch {
	case s == nil && g == nil:
		return nil, ""
	case s == nil:
		return g, "the GPS clock"
	case g == nil:
		return s, "the shadows"
	}
	overlap := s.LowSec <= g.HighSec && g.LowSec <= s.HighSec
	best, name := g, "the GPS clock"
	if s.HalfWidth() < g.HalfWidth() {
		best, name = s, "the shadows"
	}
	if !overlap {
		f.Rejected = append(f.Rejected, Alternative{Verdict: Consistent,
			Reason: fmt.Sprintf("the shadows (%s) and the GPS clock (%s) disagree with each other; %s, the narrower, is used", signedDuration(s.Sec), signedDuration(g.Sec), name)})
		return best, name
	}
	return best, "the shadows and the GPS clock"
}

// setOffset records iv and the corrected UTC window it implies.
func (f *Finding) setOffset(iv Interval) {
	f.Offset = &iv
	f.Earliest = f.Claimed.Add(-secDur(iv.HighSec))
	f.Latest = f.Claimed.Add(-secDur(iv.LowSec))
}

// judgeOffset tests the explanations of a time offset against iv.
func (x *Examiner) judgeOffset(f *Finding, iv Interval, source string) {
	hyps := x.hypotheses(f, iv)
	_, lowText, highText := iv.spans()
	var accepted []hypothesis
	for _, h := range hyps {
		slack := float64(stepSlackSec)
		if h.verdict == Consistent {
			slack = 0
		}
		if iv.Contains(h.sec, slack) {
			accepted = append(accepted, h)
		} else if h.verdict != ZoneSlip || math.Abs(h.sec) == 3600 {
			f.Rejected = append(f.Rejected, Alternative{Verdict: h.verdict,
				Reason: fmt.Sprintf("%s: the 95 %% interval of the offset (%s to %s) does not reach %s", h.label, lowText, highText, signedDuration(h.sec))})
		}
	}
	sec, low, high := iv.spans()
	ivText := fmt.Sprintf("%s (95 %% interval %s to %s, from %s)", sec, low, high, source)
	if len(accepted) == 0 {
		f.Basis.StepSec = 0
		f.Verdict = ClockOffset
		f.Explanation = fmt.Sprintf("The claimed time is off by %s, which is not a time-zone, daylight-saving or 12-hour step: %s.", ivText, clockOffsetCause(iv.Sec))
		return
	}
	// Consistent wins whenever the interval reaches zero; otherwise the
	// step nearest the estimate, the specific steps before general zone steps.
	sort.SliceStable(accepted, func(i, j int) bool {
		if (accepted[i].verdict == Consistent) != (accepted[j].verdict == Consistent) {
			return accepted[i].verdict == Consistent
		}
		di, dj := math.Abs(accepted[i].sec-iv.Sec), math.Abs(accepted[j].sec-iv.Sec)
		if di != dj {
			return di < dj
		}
		return rank(accepted[i].verdict) < rank(accepted[j].verdict)
	})
	h := accepted[0]
	f.Basis.StepSec = h.sec
	for _, o := range accepted[1:] {
		if o.verdict != h.verdict {
			f.Rejected = append(f.Rejected, Alternative{Verdict: o.verdict,
				Reason: fmt.Sprintf("%s also fits the interval but lies farther from the estimate than %s", o.label, h.label)})
		}
	}
	f.Verdict = h.verdict
	switch h.verdict {
	case Consistent:
		f.Explanation = fmt.Sprintf("The claimed time is consistent with the evidence at the stated uncertainty: offset %s.", ivText)
	case DSTSlip:
		f.Explanation = fmt.Sprintf("The claimed time is off by %s, one hour at a place that keeps daylight saving: the camera most likely missed a daylight-saving change.", ivText)
	case AMPMSlip:
		f.Explanation = fmt.Sprintf("The claimed time is off by %s, twelve hours: an AM/PM slip in setting the clock is the likely cause.", ivText)
	case ZoneSlip:
		f.Explanation = fmt.Sprintf("The claimed time is off by %s, a whole time-zone step: the camera was most likely on %s.", ivText, h.label)
	}
}

func rank(v Verdict) int {
	switch v {
	case Consistent:
		return 0
	case AMPMSlip:
		return 1
	case DSTSlip:
		return 2
	}
	return 3
}

// hypotheses lists the explanations to test for f's offset: no error, a
// missed daylight-saving change (only where the place keeps DST), a 12-hour
// slip, and whole zone steps. Whole-hour steps are always tried; quarter-
// and half-hour steps only when the interval is narrow enough (half-width
// under 7.5 min) to tell them apart.
func (x *Examiner) hypotheses(f *Finding, iv Interval) []hypothesis {
	hs := []hypothesis{{Consistent, 0, "no clock error"}}
	zs := x.zoneOffsets(f, f.Claimed)
	dst := false
	for _, z := range zs {
		if keepsDST(z.loc, f.Claimed) {
			dst = true
		}
	}
	if dst {
		hs = append(hs, hypothesis{DSTSlip, 3600, "a missed daylight-saving change (+1 h)"}, hypothesis{DSTSlip, -3600, "a missed daylight-saving change (−1 h)"})
	}
	hs = append(hs, hypothesis{AMPMSlip, 43200, "an AM/PM slip (+12 h)"}, hypothesis{AMPMSlip, -43200, "an AM/PM slip (−12 h)"})
	step := 3600.0
	if iv.HalfWidth() < 450 {
		step = 900
	}
	placeOff := 0
	switch {
	case f.Wall.HasOffset:
		placeOff = f.Wall.OffsetSec
	case len(zs) > 0:
		_, placeOff = f.Claimed.In(zs[0].loc).Zone()
	}
	inUse := x.offsetsInUse(f.Claimed)
	for s := -14 * 3600.0; s <= 14*3600; s += step {
		if s == 0 || math.Abs(s) == 43200 || (dst && math.Abs(s) == 3600) {
			continue
		}
		home := placeOff + int(s)
		zones := inUse[home]
		if len(zones) == 0 {
			continue // no zone kept that offset on that day
		}
		label := fmt.Sprintf("the time of a zone at %s", offsetLabel(home))
		zones = x.rankZones(zones, zs, f.LatDeg, f.LonDeg)
		if len(zones) > 3 {
			zones = zones[:3]
		}
		if !strings.HasPrefix(zones[0], "Etc/") {
			label += " (e.g. " + strings.Join(zones, ", ") + ")"
		}
		hs = append(hs, hypothesis{ZoneSlip, s, label})
	}
	return hs
}

// rankZones orders the example zones of a zone step by relevance to the
// place: zones of the place's own country first (zone.tab), then those of
// its region (the part of the IANA name before the first "/", e.g.
// Europe), then the other regional zones, then the Etc/ ones; within each
// group the nearest principal city (zone.tab) first, and zones zone.tab
// does not list after those, in the database's order. Zones where the same
// camera's other photos were taken would rank higher still, but a photo is
// examined alone, before its camera's model exists, so they are not known
// here (the camera model names that zone itself).
func (x *Examiner) rankZones(zones []string, place []zoneAt, latDeg, lonDeg float64) []string {
	region := func(name string) string {
		if i := strings.IndexByte(name, '/'); i > 0 {
			return name[:i]
		}
		return name
	}
	homeRegion, homeCountry := map[string]bool{}, map[string]bool{}
	for _, z := range place {
		homeRegion[region(z.name)] = true
		if e, ok := x.zoneTab.Lookup(z.name); ok {
			homeCountry[e.Country] = true
		}
	}
	type ranked struct {
		name string
		tier int
		km   float64
	}
	rs := make([]ranked, len(zones))
	for i, name := range zones {
		r := ranked{name: name, tier: 2, km: math.Inf(1)}
		e, listed := x.zoneTab.Lookup(name)
		switch {
		case strings.HasPrefix(name, "Etc/"):
			r.tier = 3
		case listed && homeCountry[e.Country]:
			r.tier = 0
		case homeRegion[region(name)]:
			r.tier = 1
		}
		if listed && len(place) > 0 {
			r.km = sphere.DistanceKm(latDeg, lonDeg, e.LatDeg, e.LonDeg)
		}
		rs[i] = r
	}
	sort.SliceStable(rs, func(i, j int) bool {
		if rs[i].tier != rs[j].tier {
			return rs[i].tier < rs[j].tier
		}
		return rs[i].km < rs[j].km
	})
	out := make([]string, len(rs))
	for i, r := range rs {
		out[i] = r.name
	}
	return out
}

func secDur(s float64) time.Duration { return time.Duration(math.Round(s * 1e9)) }
