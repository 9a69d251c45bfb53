package zone

import (
	"fmt"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"time"
)

// Rule names the source that decided a claimed instant, in the order of preference
// Claim applies.
type Rule string

const (
	RuleOffsetTag      Rule = "offset_tag"      // the photo's own offset tag
	RuleOverrideTime   Rule = "override_time"   // examiner gave a full RFC 3339 time
	RuleOverrideOffset Rule = "override_offset" // examiner gave a fixed offset
	RuleOverrideZone   Rule = "override_zone"   // examiner gave an IANA zone name
	RulePlaceZone      Rule = "place_zone"      // the zone(s) at the photo's position
)

// ClaimInput is what is known about one photo's time and place. Plain values, so
// any reader of metadata or of the measurement sheet can fill it.
type ClaimInput struct {
	// Wall is the camera's wall time; zero if the photo has none. Wall.HasOffset
	// marks an offset tag (EXIF OffsetTimeOriginal or similar).
	Wall Wall
	// Override is the examiner's statement of the time, zone or offset; the zero
	// Override is none. ParseOverride reads it from text.
	Override Override
	// HasPlace marks LatDeg/LonDeg as known (geodetic degrees, east positive).
	HasPlace       bool
	LatDeg, LonDeg float64
}

// Override is the examiner's statement about a photo's time, as values, so that
// any reader (a sheet column, a command-line flag) hands it over without a
// round trip through text. At most one form is set.
type Override struct {
	// Instant replaces the camera's time entirely: a full time whose location
	// carries the offset the examiner wrote. HasInstant marks it.
	Instant    time.Time
	HasInstant bool
	// OffsetSec (local minus UTC, seconds) reads the camera's wall time at a
	// fixed offset. HasOffset marks it.
	OffsetSec int
	HasOffset bool
	// Zone reads the camera's wall time in an IANA zone ("Europe/Berlin",
	// "Etc/GMT+3"); Claim refuses a name the tz database does not hold.
	Zone string
}

// IsZero reports whether o states nothing.
func (o Override) IsZero() bool { return !o.HasInstant && !o.HasOffset && o.Zone == "" }

// String renders o as the examiner would write it: an RFC 3339 time, an offset
// "±hh:mm", or the zone name; "" for none.
func (o Override) String() string {
	switch {
	case o.HasInstant:
		return o.Instant.Format(time.RFC3339Nano)
	case o.HasOffset:
		return formatOffset(o.OffsetSec)
	}
	return o.Zone
}

// ParseOverride reads an override written as text: an RFC 3339 time
// ("2025-06-01T12:00:00+02:00"), a fixed offset ("+05:30", "-0300", "UTC+5:30",
// "Z") or a zone name ("Europe/Berlin", "Etc/GMT+3"). Empty text is no override.
// "GMT+3" is refused as ambiguous (ISO and POSIX readings differ in sign). Zone
// names are checked by Claim, against the tz database it uses.
func ParseOverride(s string) (Override, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return Override{}, nil
	}
	if t, err := time.Parse(time.RFC3339Nano, s); err == nil {
		return Override{Instant: t, HasInstant: true}, nil
	}
	off, ok, err := parseFixedOffset(s)
	if err != nil {
		return Override{}, &Error{Op: "override", Input: s, Err: fmt.Errorf("%w: %w", ErrBadOverride, err)}
	}
	if ok {
		return Override{OffsetSec: off, HasOffset: true}, nil
	}
	return Override{Zone: s}, nil
}

// Claimed is the UTC instant (or instants) a photo claims, and how it was decided.
type Claimed struct {
	Rule  Rule
	Zones []string // zone names or offset labels used ("+05:30"); several for overlapping zones
	// Kind is the worst over Candidates: Skipped if any is, then Repeated, else Normal.
	Kind       Kind
	Candidates []Candidate // sorted by UTC; one per zone for a Normal wall time
	Notes      []string
	TZData     string // IANA tz database release used
}

// Unique returns the single claimed instant when there is exactly one.
func (c Claimed) Unique() (time.Time, bool) {
	if len(c.Candidates) == 1 && c.Kind == Normal {
		return c.Candidates[0].UTC, true
	}
	return time.Time{}, false
}

// Claim decides the claimed UTC instant of a photo in the recorded order of
// preference: (1) the offset tag with the wall time; (2) the examiner's override;
// (3) the zone(s) at the place. Lower-ranked sources that were present but not used
// are named in Notes. Every candidate is returned: a wall time skipped or repeated
// at a daylight-saving change gives two, overlapping zones give one per zone.
func (f *Finder) Claim(in ClaimInput) (Claimed, error) {
	out := Claimed{TZData: f.db.Version()}
	hasWall := !in.Wall.IsZero()
	if hasWall {
		if err := in.Wall.Validate(); err != nil {
			return Claimed{}, fmt.Errorf("zone: claim: %w", err)
		}
	}
	override := in.Override

	// (1) Offset tag.
	if hasWall && in.Wall.HasOffset {
		label := formatOffset(in.Wall.OffsetSec)
		out.Rule = RuleOffsetTag
		out.Zones = []string{label}
		out.Kind = Normal
		out.Candidates = []Candidate{{
			UTC: in.Wall.asUTC().Add(-sec(in.Wall.OffsetSec)), OffsetSec: in.Wall.OffsetSec,
			Zone: label, Kind: Normal, Real: true,
		}}
		if !override.IsZero() {
			out.Notes = append(out.Notes, fmt.Sprintf("examiner override %q not used: the offset tag takes precedence", override))
		}
		if in.HasPlace {
			out.Notes = append(out.Notes, "zone at the place not used: the offset tag takes precedence")
		}
		return out, nil
	}

	// (2) Examiner's override.
	if !override.IsZero() {
		if err := f.claimOverride(in, override, &out); err != nil {
			return Claimed{}, err
		}
		if in.HasPlace {
			out.Notes = append(out.Notes, "zone at the place not used: the examiner's override takes precedence")
		}
		return out, nil
	}

	if !hasWall {
		return Claimed{}, &Error{Op: "claim", Err: fmt.Errorf("%w: no wall time and no RFC 3339 override", ErrNoBasis)}
	}

	// (3) Zone(s) at the place.
	if !in.HasPlace {
		return Claimed{}, &Error{Op: "claim", Input: in.Wall.String(), Err: fmt.Errorf("%w: no offset tag, no override, no place", ErrNoBasis)}
	}
	place, err := f.Lookup(in.LatDeg, in.LonDeg)
	if err != nil {
		return Claimed{}, fmt.Errorf("zone: claim: %w", err)
	}
	out.Rule = RulePlaceZone
	out.Notes = append(out.Notes, place.Notes...)
	for _, name := range place.Zones {
		loc, err := f.db.Load(name)
		if err != nil {
			return Claimed{}, fmt.Errorf("zone: claim: zone at place: %w", err)
		}
		res, err := Resolve(in.Wall, loc)
		if err != nil {
			return Claimed{}, fmt.Errorf("zone: claim: %w", err)
		}
		out.add(res)
	}
	return out, nil
}

func (f *Finder) claimOverride(in ClaimInput, o Override, out *Claimed) error {
	hasWall := !in.Wall.IsZero()
	// A full time needs no wall time.
	if o.HasInstant {
		_, off := o.Instant.Zone()
		out.Rule = RuleOverrideTime
		out.Zones = []string{formatOffset(off)}
		out.Kind = Normal
		out.Candidates = []Candidate{{UTC: o.Instant.UTC(), OffsetSec: off, Zone: formatOffset(off), Kind: Normal, Real: true}}
		if hasWall {
			out.Notes = append(out.Notes, "camera wall time "+in.Wall.String()+" replaced by the examiner's RFC 3339 time")
		}
		return nil
	}
	if !hasWall {
		return &Error{Op: "claim", Input: o.String(), Err: fmt.Errorf("%w: an offset or zone override needs a wall time; give a full RFC 3339 time", ErrBadOverride)}
	}
	if o.HasOffset {
		if o.OffsetSec < -maxOffsetSec || o.OffsetSec > maxOffsetSec {
			return &Error{Op: "claim", Input: o.String(), Err: fmt.Errorf("%w: offset out of range", ErrBadOverride)}
		}
		label := formatOffset(o.OffsetSec)
		out.Rule = RuleOverrideOffset
		out.Zones = []string{label}
		out.Kind = Normal
		out.Candidates = []Candidate{{UTC: in.Wall.asUTC().Add(-sec(o.OffsetSec)), OffsetSec: o.OffsetSec, Zone: label, Kind: Normal, Real: true}}
		return nil
	}
	loc, err := f.db.Load(o.Zone)
	if err != nil {
		return &Error{Op: "claim", Input: o.Zone, Err: fmt.Errorf("%w: not an RFC 3339 time, fixed offset or known zone name: %w", ErrBadOverride, err)}
	}
	res, err := Resolve(in.Wall, loc)
	if err != nil {
		return fmt.Errorf("zone: claim: %w", err)
	}
	out.Rule = RuleOverrideZone
	out.add(res)
	return nil
}

// add merges one zone's resolution into the claim.
func (c *Claimed) add(res Resolution) {
	c.Zones = append(c.Zones, res.Zone)
	for _, n := range res.Candidates {
		// Zones that overlap at a place but keep the same offset give the
		// same instant: one reading, not two to choose between.
		if !slices.ContainsFunc(c.Candidates, func(o Candidate) bool { return o.UTC.Equal(n.UTC) && o.OffsetSec == n.OffsetSec }) {
			c.Candidates = append(c.Candidates, n)
		}
	}
	for i := 1; i < len(c.Candidates); i++ { // insertion sort keeps it stable and sorted by UTC
		for j := i; j > 0 && c.Candidates[j].UTC.Before(c.Candidates[j-1].UTC); j-- {
			c.Candidates[j], c.Candidates[j-1] = c.Candidates[j-1], c.Candidates[j]
		}
	}
	switch {
	case res.Kind == Skipped || c.Kind == Skipped:
		c.Kind = Skipped
	case res.Kind == Repeated || c.Kind == Repeated:
		c.Kind = Repeated
	default:
		c.Kind = Normal
	}
	switch res.Kind {
	case Skipped:
		c.Notes = append(c.Notes, fmt.Sprintf("In %s this wall time never came: the clocks went forward at %s, so a clock on the legal time there never showed it; both readings are kept",
			res.Zone, res.Transition.UTC().Format("2006-01-02 15:04 UTC")))
	case Repeated:
		c.Notes = append(c.Notes, fmt.Sprintf("In %s this wall time came twice: the clocks went back at %s; both readings are kept",
			res.Zone, res.Transition.UTC().Format("2006-01-02 15:04 UTC")))
	}
}

var offsetRE = regexp.MustCompile(`^(?i:(UTC|GMT))?\s*([+\-−])\s*(\d{1,2})(?::?(\d{2}))?$`)

// parseFixedOffset reads "Z", "UTC", "+05:30", "-0300", "+5", "UTC+5:30". ok is
// false when s is not offset-shaped (it may be a zone name). "GMT±N" is refused:
// in ISO usage it means UTC±N, in POSIX and the Etc/ zone names the opposite.
func parseFixedOffset(s string) (offsetSec int, ok bool, err error) {
	switch strings.ToUpper(s) {
	case "Z", "UTC", "GMT", "UT":
		return 0, true, nil
	}
	m := offsetRE.FindStringSubmatch(s)
	if m == nil {
		return 0, false, nil
	}
	if strings.EqualFold(m[1], "GMT") {
		return 0, false, fmt.Errorf("%q is ambiguous (ISO: UTC%s, POSIX: the opposite sign); write UTC%s%s or Etc/GMT%s%s", s, m[2]+m[3], m[2], m[3], m[2], m[3])
	}
	h, _ := strconv.Atoi(m[3])
	mi := 0
	if m[4] != "" {
		mi, _ = strconv.Atoi(m[4])
	}
	if h > 23 || mi > 59 {
		return 0, false, fmt.Errorf("offset %q out of range", s)
	}
	offsetSec = h*3600 + mi*60
	if m[2] != "+" {
		offsetSec = -offsetSec
	}
	return offsetSec, true, nil
}
