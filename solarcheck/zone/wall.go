package zone

import (
	"fmt"
	"sort"
	"strings"
	"time"
)

// Wall is a clock reading as a camera records it: calendar fields with no zone,
// plus an optional UTC offset (the EXIF OffsetTime* tags). The zero Wall (Month 0)
// means "no wall time".
type Wall struct {
	Year       int
	Month      time.Month
	Day        int
	Hour       int
	Minute     int
	Second     int
	Nanosecond int

	// HasOffset says OffsetSec was recorded; OffsetSec is local minus UTC, in seconds
	// (+19800 for +05:30).
	HasOffset bool
	OffsetSec int
}

// IsZero reports whether w carries no wall time.
func (w Wall) IsZero() bool { return w.Month == 0 }

// String formats w as ISO 8601 local time, with its offset when recorded.
func (w Wall) String() string {
	s := fmt.Sprintf("%04d-%02d-%02dT%02d:%02d:%02d", w.Year, int(w.Month), w.Day, w.Hour, w.Minute, w.Second)
	if w.Nanosecond != 0 {
		s += fmt.Sprintf(".%09d", w.Nanosecond)
	}
	if w.HasOffset {
		s += formatOffset(w.OffsetSec)
	}
	return s
}

// maxOffsetSec bounds plausible UTC offsets: real zones stay within ±15:56 (Manila's
// local mean time before 1845); EXIF allows ±23:59.
const maxOffsetSec = 24*3600 - 1

// Validate checks every field's range, so that time.Date's silent normalisation
// (31 April -> 1 May) never changes an examiner's or a camera's reading. A leap
// second (Second 60) is refused: the tz database and Go's time cannot represent it.
func (w Wall) Validate() error {
	bad := func(what string) error {
		return &Error{Op: "wall time", Input: w.String(), Err: fmt.Errorf("%w: %s", ErrInvalidWall, what)}
	}
	switch {
	case w.Year < 1 || w.Year > 9999:
		return bad("year outside 1..9999")
	case w.Month < time.January || w.Month > time.December:
		return bad("month out of range")
	case w.Day < 1 || w.Day > daysIn(w.Year, w.Month):
		return bad("day out of range for the month")
	case w.Hour < 0 || w.Hour > 23:
		return bad("hour out of range")
	case w.Minute < 0 || w.Minute > 59:
		return bad("minute out of range")
	case w.Second < 0 || w.Second > 59:
		return bad("second out of range (leap seconds are not representable)")
	case w.Nanosecond < 0 || w.Nanosecond > 999999999:
		return bad("nanosecond out of range")
	case w.HasOffset && (w.OffsetSec < -maxOffsetSec || w.OffsetSec > maxOffsetSec):
		return bad("offset out of range")
	}
	return nil
}

func daysIn(year int, m time.Month) int {
	return time.Date(year, m+1, 0, 0, 0, 0, 0, time.UTC).Day()
}

// asUTC reads the wall fields as if they were UTC: the instant the wall time
// denotes at offset 0. Subtracting an offset gives the instant at that offset.
func (w Wall) asUTC() time.Time {
	return time.Date(w.Year, w.Month, w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.UTC)
}

// Kind classifies how a wall time maps to instants in a zone.
type Kind int

const (
	// KindUnknown is the zero value: not resolved.
	KindUnknown Kind = iota
	// Normal: exactly one instant shows this wall time.
	Normal
	// Skipped: no instant shows this wall time (a gap, e.g. a daylight-saving start);
	// the candidates are computed with the offsets before and after the change.
	Skipped
	// Repeated: two (or more) instants show this wall time (a fold, e.g. a
	// daylight-saving end).
	Repeated
)

func (k Kind) String() string {
	switch k {
	case Normal:
		return "normal"
	case Skipped:
		return "skipped"
	case Repeated:
		return "repeated"
	}
	return "unknown"
}

// Candidate is one UTC instant a wall time may denote.
type Candidate struct {
	UTC       time.Time // always in time.UTC
	OffsetSec int       // the offset (local minus UTC) assumed for this candidate
	Abbrev    string    // the zone abbreviation in force with that offset ("CEST"), if any
	Zone      string    // the zone name or offset label the candidate was computed in
	Kind      Kind      // how the wall time resolved in Zone
	// Real is false for the candidates of a skipped wall time: the clock never showed
	// that reading, so neither instant is exactly right.
	Real bool
}

// Resolution lists every instant a wall time maps to in one zone.
type Resolution struct {
	Zone       string
	Kind       Kind
	Candidates []Candidate // sorted by UTC
	// Transition is the UTC instant of the offset change that made the wall time
	// skipped or repeated; zero for Normal.
	Transition time.Time
}

type transition struct {
	at            time.Time // UTC instant of the change
	before, after int       // offsets in seconds
	abBefore      string
	abAfter       string
}

// window bounds the search for offsets around a wall time. Real offsets stay
// within ±16 h, so every instant a wall time can denote lies within ±16 h of the
// wall time read as UTC; 30 h leaves a margin.
const window = 30 * time.Hour

// Resolve returns every instant at which the clocks of loc showed w, using loc's
// own transitions (historical rules included), not time.Date, which silently picks
// one instant for skipped and repeated wall times. w's own offset, if any, is
// ignored: callers that trust it do not need a zone.
func Resolve(w Wall, loc *time.Location) (Resolution, error) {
	if err := w.Validate(); err != nil {
		return Resolution{}, err
	}
	if loc == nil {
		return Resolution{}, &Error{Op: "resolve wall time", Input: w.String(), Err: ErrUnknownZone}
	}
	u := w.asUTC()
	res := Resolution{Zone: loc.String()}

	// Walk the zone periods overlapping [u-window, u+window] and note each offset
	// and each change between them.
	offsets := map[int]string{}
	var changes []transition
	t := u.Add(-window)
	end := u.Add(window)
	for i := 0; i < 64; i++ { // bounded: a zone never changes 64 times in 60 h
		lt := t.In(loc)
		ab, off := lt.Zone()
		offsets[off] = ab
		_, next := lt.ZoneBounds()
		if next.IsZero() || next.After(end) {
			break
		}
		ab2, off2 := next.In(loc).Zone()
		if off2 != off {
			changes = append(changes, transition{at: next.UTC(), before: off, after: off2, abBefore: ab, abAfter: ab2})
		}
		t = next
	}

	// An offset o is a real reading of w when the zone's offset at u-o is o.
	for off, ab := range offsets {
		inst := u.Add(-time.Duration(off) * time.Second)
		ab2, got := inst.In(loc).Zone()
		if got == off {
			if ab2 != "" {
				ab = ab2
			}
			res.Candidates = append(res.Candidates, Candidate{UTC: inst, OffsetSec: off, Abbrev: ab, Zone: res.Zone, Real: true})
		}
	}
	sort.Slice(res.Candidates, func(i, j int) bool { return res.Candidates[i].UTC.Before(res.Candidates[j].UTC) })

	switch n := len(res.Candidates); {
	case n == 1:
		res.Kind = Normal
	case n > 1:
		res.Kind = Repeated
		for _, c := range changes {
			// Fold: the clock went back; wall times in [at+after, at+before) repeat.
			if c.after < c.before && !u.Before(c.at.Add(sec(c.after))) && u.Before(c.at.Add(sec(c.before))) {
				res.Transition = c.at
			}
		}
	default:
		for _, c := range changes {
			// Gap: the clock jumped forward; wall times in [at+before, at+after) never occur.
			if c.after > c.before && !u.Before(c.at.Add(sec(c.before))) && u.Before(c.at.Add(sec(c.after))) {
				res.Kind = Skipped
				res.Transition = c.at
				res.Candidates = []Candidate{
					{UTC: u.Add(-sec(c.after)), OffsetSec: c.after, Abbrev: c.abAfter, Zone: res.Zone},
					{UTC: u.Add(-sec(c.before)), OffsetSec: c.before, Abbrev: c.abBefore, Zone: res.Zone},
				}
				break
			}
		}
		if res.Kind != Skipped {
			return Resolution{}, &Error{Op: "resolve wall time", Input: w.String() + " in " + res.Zone,
				Err: fmt.Errorf("no instant and no gap found (tz data inconsistent?)")}
		}
	}
	for i := range res.Candidates {
		res.Candidates[i].Kind = res.Kind
	}
	return res, nil
}

func sec(s int) time.Duration { return time.Duration(s) * time.Second }

// formatOffset renders an offset in seconds as ±hh:mm (or ±hh:mm:ss).
func formatOffset(offsetSec int) string {
	sign := "+"
	if offsetSec < 0 {
		sign = "-"
		offsetSec = -offsetSec
	}
	h, m, s := offsetSec/3600, offsetSec/60%60, offsetSec%60
	if s != 0 {
		return fmt.Sprintf("%s%02d:%02d:%02d", sign, h, m, s)
	}
	return fmt.Sprintf("%s%02d:%02d", sign, h, m)
}

// DayStart returns the first instant at which the clocks of loc showed the
// calendar date y-m-d (normalised, so day 32 is the next month's first), and
// how its midnight resolved: Normal; Repeated where midnight came twice (the
// first is returned); Skipped where a change at midnight jumped over it (as
// the tz database's America/Havana and Asia/Beirut rules do), when the day
// began at the change itself. time.Date would pick one silently. Years
// before 1 have no offset changes in the tz database and are read directly.
func DayStart(y int, m time.Month, d int, loc *time.Location) (time.Time, Resolution, error) {
	n := time.Date(y, m, d, 12, 0, 0, 0, time.UTC)
	if n.Year() < 1 || n.Year() > 9999 {
		t := time.Date(n.Year(), n.Month(), n.Day(), 0, 0, 0, 0, loc)
		return t, Resolution{Zone: loc.String(), Kind: Normal}, nil
	}
	res, err := Resolve(Wall{Year: n.Year(), Month: n.Month(), Day: n.Day()}, loc)
	if err != nil {
		return time.Time{}, Resolution{}, err
	}
	if res.Kind == Skipped {
		return res.Transition, res, nil
	}
	return res.Candidates[0].UTC, res, nil
}

// Describe says in plain words how w resolved in r and which of r's
// candidates the caller used (index into r.Candidates), naming the other
// readings, so that no command shifts a skipped or repeated wall time
// silently. It is "" for a Normal resolution.
func (r Resolution) Describe(w Wall, used int) string {
	if r.Kind == Normal || used < 0 || used >= len(r.Candidates) {
		return ""
	}
	w.HasOffset = false
	wall := strings.Replace(w.String(), "T", " ", 1)
	change := r.Transition.UTC().Format("2006-01-02 15:04 UTC")
	var b strings.Builder
	switch r.Kind {
	case Repeated:
		fmt.Fprintf(&b, "%s came twice in %s (the clocks went back at %s): read as %s", wall, r.Zone, change, r.Candidates[used].String())
	case Skipped:
		fmt.Fprintf(&b, "%s never came in %s (the clocks went forward at %s), so a clock on the legal time there never showed it: read as %s",
			wall, r.Zone, change, r.Candidates[used].String())
	}
	for i, c := range r.Candidates {
		if i != used {
			fmt.Fprintf(&b, "; the other reading is %s", c.String())
		}
	}
	return b.String() + "."
}

// String names a candidate in plain words: "UTC−05:00 (EST), 2025-11-02
// 06:30:00 UTC".
func (c Candidate) String() string {
	s := "UTC" + strings.Replace(formatOffset(c.OffsetSec), "-", "−", 1)
	if c.Abbrev != "" && c.Abbrev[0] != '+' && c.Abbrev[0] != '-' {
		s += " (" + c.Abbrev + ")"
	}
	return s + ", " + c.UTC.UTC().Format("2006-01-02 15:04:05 UTC")
}
