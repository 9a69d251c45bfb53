package solarcheck

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/gnomon-forensics/gnomon/exifread"
	"github.com/gnomon-forensics/gnomon/solarcheck/clock"
	"github.com/gnomon-forensics/gnomon/solarcheck/spa"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// Examiner runs the per-photo checks. It holds what is costly to build once
// (the zone finder and its tz database); create one per audit with
// NewExaminer and share it between goroutines: Examine is safe for
// concurrent use.
type Examiner struct {
	zones *zone.Finder
	// zoneTab ranks example zones by country and distance (zone.tab).
	zoneTab *zone.ZoneTab
	// deltaT overrides ΔT (seconds) when non-nil; otherwise spa.DeltaT.
	deltaT *float64

	// offsetsMu guards offsetsByDay: for a UTC day, the offsets in use
	// somewhere in the world (from every zone of the tz database) with the
	// zones that kept each, which the diagnosis needs to name zone steps
	// that really exist.
	offsetsMu    sync.Mutex
	offsetsByDay map[string]map[int][]string
}

// Options configure an Examiner.
type Options struct {
	// Zones looks up the zone at a place; nil builds one over the embedded
	// tz database.
	Zones *zone.Finder
	// DeltaTSec overrides the ΔT model (seconds) when non-nil.
	DeltaTSec *float64
}

// NewExaminer returns an Examiner.
func NewExaminer(o Options) *Examiner {
	z := o.Zones
	if z == nil {
		z = zone.NewFinder(nil)
	}
	return &Examiner{zones: z, zoneTab: zone.NewZoneTab(), deltaT: o.DeltaTSec, offsetsByDay: map[string]map[int][]string{}}
}

// offsetsInUse returns the UTC offsets (seconds) that some zone of the tz
// database kept at t, each with the names of those zones (sorted, regional
// zones before the Etc/ ones). Built once per UTC day and cached.
func (x *Examiner) offsetsInUse(t time.Time) map[int][]string {
	day := t.UTC().Format(time.DateOnly)
	x.offsetsMu.Lock()
	defer x.offsetsMu.Unlock()
	if m, ok := x.offsetsByDay[day]; ok {
		return m
	}
	m := map[int][]string{}
	names, err := x.zones.DB().Names()
	if err == nil {
		for _, n := range names {
			if loc, err := x.zones.DB().Load(n); err == nil {
				_, off := t.In(loc).Zone()
				m[off] = append(m[off], n)
			}
		}
	}
	for off, ns := range m {
		sort.SliceStable(ns, func(i, j int) bool {
			return !strings.HasPrefix(ns[i], "Etc/") && strings.HasPrefix(ns[j], "Etc/")
		})
		m[off] = ns
	}
	x.offsetsByDay[day] = m
	return m
}

// Zones returns the zone finder the examiner uses.
func (x *Examiner) Zones() *zone.Finder { return x.zones }

// deltaTAt returns ΔT for t.
func (x *Examiner) deltaTAt(t time.Time) float64 {
	if x.deltaT != nil {
		return *x.deltaT
	}
	return spa.DeltaT(t)
}

// sunAt is the SPA position at t from the finding's place.
func (x *Examiner) sunAt(f *Finding, t time.Time) spa.Position {
	return spa.At(t, spa.NewObserver(f.LatDeg, f.LonDeg, f.ElevationM), x.deltaTAt(t))
}

// sheetTimeTag is Finding.WallTag for a wall time taken from the
// examiner's sheet because the file has none.
const sheetTimeTag = "sheet time"

// Examine runs every check on one photo and diagnoses it. It never fails:
// what cannot be judged is said in the finding.
func (x *Examiner) Examine(p Photo) Finding {
	rec := p.Record
	f := Finding{Path: p.Path, Camera: clock.CameraID(rec.Make, rec.Model, rec.BodySerialNumber),
		CameraName: cameraName(rec.Make, rec.Model, rec.BodySerialNumber)}

	wall, tag, wallErr := captureWall(rec)
	f.Wall, f.WallTag = wall, tag
	x.place(&f, p)
	if f.HasPlace {
		if pl, err := x.zones.Lookup(f.LatDeg, f.LonDeg); err == nil {
			f.PlaceZones = pl.Zones
		}
	}

	if wallErr != nil && rec.Err != nil {
		f.Verdict = Unreadable
		f.Explanation = fmt.Sprintf("The file could not be read well enough to judge: %v.", rec.Err)
		return f
	}

	override := p.Override
	if wall.IsZero() && !override.Wall.IsZero() {
		f.Wall, f.WallTag = override.Wall, sheetTimeTag
	}
	if f.Wall.IsZero() && !override.Time.HasInstant {
		f.Verdict = Unverified
		f.Explanation = "The file holds no usable capture time"
		if wallErr != nil {
			f.Explanation += " (" + wallErr.Error() + ")"
		}
		f.Explanation += "; there is no claim to check."
		if len(rec.Warnings) > 0 {
			f.Explanation += " The reader noted: " + strings.Join(rec.Warnings, "; ") + "."
		}
		f.Explanation += f.Basis.PlaceNote
		return f
	}

	claim, err := x.zones.Claim(zone.ClaimInput{
		Wall:     f.Wall,
		Override: override.Time,
		HasPlace: f.HasPlace,
		LatDeg:   f.LatDeg,
		LonDeg:   f.LonDeg,
	})
	f.Claim = claim
	if !wall.IsZero() && !override.Wall.IsZero() && !override.Time.HasInstant {
		ow := override.Wall
		f.Claim.Notes = append(f.Claim.Notes, "The sheet's time "+strings.Replace(ow.String(), "T", " ", 1)+
			" was not used: it has no offset, and the file has its own capture time; write the sheet's time with its offset to replace the file's")
	}
	if err != nil || len(claim.Candidates) == 0 {
		f.Verdict = Unverified
		f.Explanation = "The claimed time could not be placed in UTC"
		if err != nil {
			f.Explanation += ": " + claimProblem(err)
		}
		f.Explanation += ". Without a place or an offset the sun cannot be consulted."
		return f
	}
	if len(claim.Candidates) > 1 {
		x.examineReadings(&f, p)
		return f
	}
	f.Claimed, f.HasClaimed = claim.Candidates[0].UTC, true
	x.runChecks(&f, p)
	diagnose(&f, x)
	return f
}

// runChecks consults every witness against f.Claimed.
func (x *Examiner) runChecks(f *Finding, p Photo) {
	if f.HasPlace {
		pos := x.sunAt(f, f.Claimed)
		f.Sun = &SunSample{Time: f.Claimed, AzimuthDeg: pos.AzimuthDeg, AltitudeDeg: pos.AltitudeDeg}
	}
	x.checkShadows(f, p)
	x.checkGPSClock(f, p.Record)
	x.checkOffsetTag(f)
	x.checkLight(f, p.Record)
	x.checkShadowPlace(f, p.Record)
}

// SunPath samples the sun every 10 minutes over the 24 hours centred on the
// claimed moment, for the report's sky chart; nil when the finding has no
// place or claim. It is computed on demand, not kept in every finding, so
// that a large batch does not hold a day of sun positions per photo, and
// through the interpolating spa.Ephemeris (seven full evaluations instead
// of 145, the same positions to 1e-5°).
func (x *Examiner) SunPath(f *Finding) []SunSample {
	if !f.HasPlace || !f.HasClaimed {
		return nil
	}
	const step, span = 10 * time.Minute, 24 * time.Hour
	start := f.Claimed.Add(-span / 2).Truncate(step)
	dt := x.deltaTFunc()
	if dt == nil {
		dt = spa.DeltaT
	}
	eph := spa.NewEphemeris(start, span.Seconds(), dt)
	o := spa.NewObserver(f.LatDeg, f.LonDeg, f.ElevationM)
	g := make([]SunSample, 0, int(span/step)+1)
	for d := time.Duration(0); d <= span; d += step {
		pos := eph.At(d.Seconds()).Topocentric(o)
		g = append(g, SunSample{Time: start.Add(d), AzimuthDeg: pos.AzimuthDeg, AltitudeDeg: pos.AltitudeDeg})
	}
	return g
}

// captureWall is the capture time as written, chosen by
// exifread.Record.CaptureTime, as a zone.Wall.
func captureWall(rec exifread.Record) (zone.Wall, string, error) {
	c, tag, err := rec.CaptureTime()
	if err != nil {
		return zone.Wall{}, "", err
	}
	w := zone.Wall{
		Year: c.Year, Month: time.Month(c.Month), Day: c.Day,
		Hour: c.Hour, Minute: c.Minute, Second: c.Second, Nanosecond: c.Nanosecond,
	}
	if c.OffsetSec != nil {
		w.HasOffset, w.OffsetSec = true, *c.OffsetSec
	}
	if err := w.Validate(); err != nil {
		return zone.Wall{}, "", fmt.Errorf("%s %q: %w", tag, c.Raw, err)
	}
	return w, tag, nil
}

// place decides where the photo was taken: the GPS tag when valid, else the
// examiner's lat/lon from the sheet.
func (x *Examiner) place(f *Finding, p Photo) {
	g := p.Record.GPS
	if g.Position != nil && !g.Position.Valid {
		f.GPSRejected = fmt.Sprintf("%q: %s", g.Position.Raw, g.Position.Invalid)
		f.Basis.PlaceNote = " The GPS position " + f.GPSRejected + " was not used."
	}
	if g.Position != nil && g.Position.Valid && g.Position.LatDeg != nil && g.Position.LonDeg != nil {
		f.LatDeg, f.LonDeg, f.HasPlace, f.PlaceSource = *g.Position.LatDeg, *g.Position.LonDeg, true, "gps"
		if g.AltitudeM != nil && g.AltitudeM.Valid && !math.IsNaN(g.AltitudeM.Value) {
			f.ElevationM = g.AltitudeM.Value
		}
		return
	}
	if o := p.Override; o.HasPlace {
		f.LatDeg, f.LonDeg, f.HasPlace, f.PlaceSource = o.LatDeg, o.LonDeg, true, "sheet"
	}
}
