package solarcheck

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"sync"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/solarcheck/shadow"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// The tests in this file build synthetic photos whose true capture times
// are known. Their shadows are computed by the sun engine (package spa,
// itself checked against the SPA report and astropy) and perturbed with
// noise at the stated uncertainty, so what is tested here is the reasoning:
// do the verdicts, offsets and intervals come out right.

var sharedExaminer = sync.OnceValue(func() *Examiner { return NewExaminer(Options{}) })

// scene is a synthetic photo.
type scene struct {
	trueUTC   time.Time
	wall      time.Time // the camera's wall reading (its location is ignored)
	offsetTag *int      // OffsetTimeOriginal, seconds
	lat, lon  float64
	gps       bool        // write the position as a GPS tag (else in the sheet)
	gpsTime   *time.Time  // GPS UTC stamp
	shadows   int         // objects measured
	bearingSD float64     // degrees, 1σ (default 2)
	noise     *rand.Rand  // nil: noise-free measurements
	exposure  *[3]float64 // f-number, exposure s, ISO
	camera    string      // model name
	gpsAt     *[2]float64 // GPS position differing from the real place
}

func (s scene) photo(t *testing.T, path string) Photo {
	t.Helper()
	w := s.wall
	wt := &exifread.WallTime{Raw: w.Format("2006:01:02 15:04:05"), Year: w.Year(), Month: int(w.Month()), Day: w.Day(),
		Hour: w.Hour(), Minute: w.Minute(), Second: w.Second(), Valid: true, Source: exifread.SourceEXIF}
	if s.offsetTag != nil {
		wt.OffsetSec = s.offsetTag
	}
	rec := exifread.Record{Path: path, Make: "Synth", Model: s.camera, DateTimeOriginal: wt}
	if s.camera == "" {
		rec.Model = "S1"
	}
	var ms []Measurement
	var ov Override
	if s.gps {
		lat, lon := s.lat, s.lon
		if s.gpsAt != nil {
			lat, lon = s.gpsAt[0], s.gpsAt[1]
		}
		rec.GPS.Position = &exifread.Position{LatDeg: &lat, LonDeg: &lon, Valid: true, Source: exifread.SourceEXIF}
	} else {
		lat, lon := s.lat, s.lon
		ov = Override{HasPlace: true, LatDeg: lat, LonDeg: lon}
	}
	if s.gpsTime != nil {
		rec.GPS.Time = &exifread.GPSTime{UTC: *s.gpsTime, HasDate: true, Valid: true, Source: exifread.SourceEXIF}
	}
	if s.exposure != nil {
		fn, et := s.exposure[0], s.exposure[1]
		rec.FNumber, rec.ExposureTimeSec, rec.ISO = &fn, &et, int(s.exposure[2])
	}
	sd := s.bearingSD
	if sd == 0 {
		sd = 2
	}
	sun := spa.At(s.trueUTC, spa.NewObserver(s.lat, s.lon, 0), spa.DeltaT(s.trueUTC))
	for i := 0; i < s.shadows; i++ {
		h := 1.0 + float64(i)
		length, bearing, err := shadow.ShadowFromSun(shadow.Sun{AzimuthDeg: sun.AzimuthDeg, AltitudeDeg: sun.AltitudeDeg}, h, shadow.Ground{})
		if err != nil {
			t.Fatalf("synthetic shadow at %v: %v", s.trueUTC, err)
		}
		if s.noise != nil {
			bearing += s.noise.NormFloat64() * sd
			length *= 1 + s.noise.NormFloat64()*0.05
		}
		hh, ll, bb := h, length, angle.Norm360(bearing)
		ms = append(ms, Measurement{Source: fmt.Sprintf("sheet.csv line %d", 2+i), Kind: MeasureShadow, Object: "post",
			ObjectHeight: hh, ShadowLength: ll, ShadowBearingDeg: bb, North: TrueNorth, BearingSDDeg: sd, LengthSDPct: 5})
	}
	return Photo{Path: path, Record: rec, Measurements: ms, Override: ov}
}

func mustLoc(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := zone.NewDB().Load(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

func ptr[T any](v T) *T { return &v }

// TestVerdicts plants each kind of fault in a synthetic photo and checks the
// diagnosis names it. Place: 46.2° N 6.15° E (Europe/Zurich, keeps DST;
// zone facts from the IANA tz database).
func TestVerdicts(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	tokyo := mustLoc(t, "Asia/Tokyo")
	truth := time.Date(2026, 6, 20, 13, 10, 0, 0, time.UTC) // 15:10 CEST, sun high in the south-west
	lat, lon := 46.2, 6.15
	rng := rand.New(rand.NewPCG(1, 2))                      // one stream for all cases; each case runs many trials
	night := time.Date(2026, 6, 20, 21, 40, 0, 0, time.UTC) // 23:40 CEST, sun well below the horizon

	cases := []struct {
		name string
		s    scene
		want Verdict
		not  []Verdict
	}{
		{"clock right, three shadows", scene{trueUTC: truth, wall: truth.In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, Consistent, nil},
		{"clock 3 min fast: never a zone or DST step", scene{trueUTC: truth, wall: truth.Add(3 * time.Minute).In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, "", []Verdict{ZoneSlip, DSTSlip, AMPMSlip}},
		{"edited by +2 h 47 min", scene{trueUTC: truth, wall: truth.Add(2*time.Hour + 47*time.Minute).In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, ClockOffset, nil},
		{"missed DST change (1 h slow)", scene{trueUTC: truth, wall: truth.Add(-time.Hour).In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, DSTSlip, nil},
		{"AM/PM slip", scene{trueUTC: truth, wall: truth.Add(-12 * time.Hour).In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, AMPMSlip, nil},
		{"camera on Tokyo time", scene{trueUTC: truth, wall: truth.In(tokyo), lat: lat, lon: lon, shadows: 3, noise: rng}, ZoneSlip, nil},
		{"wrong season: claimed in December", scene{trueUTC: truth, wall: truth.AddDate(0, -6, 0).In(zurich), lat: lat, lon: lon, shadows: 3, noise: rng}, SeasonMismatch, nil},
		{"GPS clock agrees", scene{trueUTC: truth, wall: truth.In(zurich), lat: lat, lon: lon, gps: true, gpsTime: ptr(truth.Add(-2 * time.Second))}, Consistent, nil},
		{"GPS clock: 40 s slow camera", scene{trueUTC: truth, wall: truth.Add(-40 * time.Second).In(zurich), lat: lat, lon: lon, gps: true, gpsTime: ptr(truth)}, ClockOffset, nil},
		{"GPS clock: camera on UTC+05:30", scene{trueUTC: truth, wall: truth.In(time.FixedZone("", 19800)), lat: lat, lon: lon, gps: true, gpsTime: ptr(truth)}, ZoneSlip, nil},
		{"GPS tag 800 km from where the shadows were cast", scene{trueUTC: truth, wall: truth.In(zurich), lat: lat, lon: lon, gps: true, gpsTime: ptr(truth), gpsAt: &[2]float64{lat - 7, lon}, shadows: 3}, PlaceMismatch, nil},
		{"night time on a daylight exposure", scene{trueUTC: truth, wall: night.In(zurich), lat: lat, lon: lon, exposure: &[3]float64{8, 1.0 / 500, 100}}, LightMismatch, nil},
		{"no witness", scene{trueUTC: truth, wall: truth.In(zurich), lat: lat, lon: lon}, Unverified, nil},
	}
	// Each case is examined in 20 trials with fresh measurement noise. A
	// 95 % interval misses the truth in 1 trial in 20 by design, so a case
	// passes when at least 16 of 20 trials give the planted verdict, and a
	// verdict listed under "not" may never appear.
	const trials, need = 20, 16
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			hits := 0
			var last Finding
			for i := 0; i < trials; i++ {
				f := x.Examine(c.s.photo(t, "a.jpg"))
				for _, n := range c.not {
					if f.Verdict == n {
						t.Fatalf("trial %d: verdict %s for a clock within 5 min of correct: %s", i, f.Verdict, f.Explanation)
					}
				}
				if f.Explanation == "" {
					t.Fatalf("trial %d: no explanation", i)
				}
				if c.want == "" || f.Verdict == c.want {
					hits++
				} else {
					last = f
				}
			}
			t.Logf("%d of %d trials gave %s", hits, trials, c.want)
			if hits < need {
				t.Fatalf("only %d of %d trials gave %s; a miss: verdict %s\nexplanation: %s\nchecks: %+v", hits, trials, c.want, last.Verdict, last.Explanation, last.Checks)
			}
		})
	}
}

func TestUnreadable(t *testing.T) {
	rec := exifread.Record{Path: "bad.jpg", Err: errors.New("not a photo")}
	f := sharedExaminer().Examine(Photo{Path: "bad.jpg", Record: rec})
	if f.Verdict != Unreadable {
		t.Fatalf("verdict %s, want unreadable", f.Verdict)
	}
}

// TestOffsetRecovered checks that the offset estimate of a planted error is
// recovered within its interval.
func TestOffsetRecovered(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	truth := time.Date(2027, 3, 14, 9, 30, 0, 0, time.UTC)
	for _, off := range []time.Duration{0, 7 * time.Minute, -25 * time.Minute, 2 * time.Hour} {
		s := scene{trueUTC: truth, wall: truth.Add(off).In(zurich), lat: 46.2, lon: 6.15, shadows: 2}
		f := x.Examine(s.photo(t, "a.jpg"))
		if f.Offset == nil {
			t.Fatalf("offset %v: no offset found: %s", off, f.Explanation)
		}
		if !f.Offset.Contains(off.Seconds(), 0) {
			t.Errorf("offset %v: interval [%.0f, %.0f] s misses the truth", off, f.Offset.LowSec, f.Offset.HighSec)
		}
		if f.Earliest.After(truth) || f.Latest.Before(truth) {
			t.Errorf("offset %v: corrected window %v–%v misses the true time %v", off, f.Earliest, f.Latest, truth)
		}
	}
}

// TestNarrowerWithBetterBearings: halving the bearing uncertainty must
// narrow the time interval (noise-free measurements, same geometry).
func TestNarrowerWithBetterBearings(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	truth := time.Date(2026, 9, 2, 8, 0, 0, 0, time.UTC)
	width := func(sd float64) float64 {
		s := scene{trueUTC: truth, wall: truth.In(zurich), lat: 46.2, lon: 6.15, shadows: 1, bearingSD: sd}
		f := x.Examine(s.photo(t, "a.jpg"))
		if f.Offset == nil {
			t.Fatalf("sd %v: no offset: %s", sd, f.Explanation)
		}
		return f.Offset.HighSec - f.Offset.LowSec
	}
	w2, w1 := width(2), width(1)
	t.Logf("95 %% interval width: %.0f s at 2° bearing sd, %.0f s at 1°", w2, w1)
	if !(w1 < w2*0.8) {
		t.Errorf("halving the bearing sd did not narrow the interval enough: %.0f s → %.0f s", w2, w1)
	}
}

// TestCoverage simulates 1,000 photos at random places and times with
// shadows perturbed at their stated uncertainty, and counts how often the
// 95 % interval holds the true offset (0). A correct 95 % profile interval
// covers the truth with probability 0.95 (χ² at the true time minus χ² at
// the best time is chi-square distributed with one degree of freedom, the
// time); photos whose shadows fit no time near the claim (about 5 %, the
// goodness-of-fit test's level) have no interval and are not counted. The
// binomial 99.9 % band for n = 1000 is about ±0.023.
func TestCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation skipped in -short mode")
	}
	x := sharedExaminer()
	rng := rand.New(rand.NewPCG(7, 11))
	n, covered, used := 1000, 0, 0
	for i := 0; i < n; i++ {
		lat := -60 + 120*rng.Float64()
		lon := -180 + 360*rng.Float64()
		day := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC).Add(time.Duration(rng.IntN(365*24)) * time.Hour)
		// Pick a time with the sun between 10° and 70° up, so that shadows exist and are measurable.
		var truth time.Time
		for tries := 0; tries < 48; tries++ {
			c := day.Add(time.Duration(rng.IntN(24*60)) * time.Minute)
			alt := spa.At(c, spa.NewObserver(lat, lon, 0), spa.DeltaT(c)).AltitudeDeg
			if alt > 10 && alt < 70 {
				truth = c
				break
			}
		}
		if truth.IsZero() {
			continue
		}
		s := scene{trueUTC: truth, wall: truth, offsetTag: ptr(0), lat: lat, lon: lon, shadows: 1, noise: rng}
		f := x.Examine(s.photo(t, "p.jpg"))
		if f.Offset == nil {
			continue
		}
		used++
		if f.Offset.Contains(0, 0) {
			covered++
		}
	}
	cov := float64(covered) / float64(used)
	t.Logf("coverage of the 95 %% interval: %d of %d simulated photos (%.3f)", covered, used, cov)
	if used < 900 || math.Abs(cov-0.95) > 0.025 {
		t.Errorf("coverage %.3f over %d photos, want 0.95 ± 0.025", cov, used)
	}
}

// TestDriftRecovered: a camera gaining 6 s/day, 30 photos over 60 days, each
// with a GPS clock witness. The fitted drift must be within 10 % of 6 s/day.
func TestDriftRecovered(t *testing.T) {
	x := sharedExaminer()
	zurich := mustLoc(t, "Europe/Zurich")
	rng := rand.New(rand.NewPCG(3, 5))
	start := time.Date(2026, 4, 1, 10, 0, 0, 0, time.UTC)
	const drift = 6.0 // s/day
	var fs []Finding
	for i := 0; i < 30; i++ {
		truth := start.Add(time.Duration(float64(60*24*time.Hour) * float64(i) / 29)).Add(time.Duration(rng.IntN(6)) * time.Hour)
		off := 40 + drift*truth.Sub(start).Hours()/24
		s := scene{trueUTC: truth, wall: truth.Add(secDur(off)).In(zurich), lat: 46.2, lon: 6.15, gps: true, gpsTime: ptr(truth.Add(-time.Duration(rng.IntN(5)) * time.Second)), camera: "Drifter"}
		fs = append(fs, x.Examine(s.photo(t, "d/IMG_"+string(rune('A'+i))+".jpg")))
	}
	var ins []ClockInput
	for i := range fs {
		if in, ok := x.ClockInput(&fs[i]); ok {
			ins = append(ins, in)
		}
	}
	cs, _ := x.FitCameras(ins)
	cams := cs.List
	if len(cams) != 1 || !cams[0].Fitted {
		t.Fatalf("cameras: %+v", cams)
	}
	got := cams[0].Model.Segments[0].DriftSecPerDay
	t.Logf("drift recovered: %.2f s/day (true %.1f)", got, drift)
	if math.Abs(got-drift) > 0.1*drift {
		t.Errorf("drift %.2f s/day, want %.1f ± 10 %%", got, drift)
	}
}

// TestSunPathMatchesSPA: the chart's sun path, computed through the
// interpolating ephemeris, must agree with full spa.At at every sample
// (spa.At is itself checked against the SPA report and astropy).
func TestSunPathMatchesSPA(t *testing.T) {
	x := sharedExaminer()
	f := Finding{HasPlace: true, HasClaimed: true, LatDeg: -33.9, LonDeg: 18.4, ElevationM: 20,
		Claimed: time.Date(2026, 12, 21, 9, 7, 13, 0, time.UTC)}
	path := x.SunPath(&f)
	if len(path) != 145 {
		t.Fatalf("%d samples, want 145 (24 h every 10 min)", len(path))
	}
	o := spa.NewObserver(f.LatDeg, f.LonDeg, f.ElevationM)
	for _, s := range path {
		want := spa.At(s.Time, o, spa.DeltaT(s.Time))
		if d := math.Abs(angle.Wrap180(s.AzimuthDeg-want.AzimuthDeg)) * math.Cos(angle.Rad(want.AltitudeDeg)); d > 1e-4 {
			t.Errorf("%v: azimuth %.6f, spa.At %.6f", s.Time, s.AzimuthDeg, want.AzimuthDeg)
		}
		if d := math.Abs(s.AltitudeDeg - want.AltitudeDeg); d > 1e-4 {
			t.Errorf("%v: altitude %.6f, spa.At %.6f", s.Time, s.AltitudeDeg, want.AltitudeDeg)
		}
	}
}
