package democase

import (
	"fmt"
	"time"
)

// The place: real coordinates a few kilometres inland of the Maine coast
// (tzf gives America/New_York there, away from the simplified coastline),
// standing in for the invented harbour of Tarrow Cove.
const (
	PlaceName       = "Tarrow Cove boatyard (fictional), Maine, USA"
	PlaceLatDeg     = 44.2306
	PlaceLonDeg     = -69.1080
	PlaceElevationM = 40.0
	PlaceZone       = "America/New_York"
)

// Site is a place away from the boatyard where a camera of the case took
// photos, with its IANA zone.
type Site struct {
	Name           string
	LatDeg, LonDeg float64
	ElevationM     float64
	Zone           string
}

// Halifax, Nova Scotia: real coordinates in the city (tzf gives
// America/Halifax there), one zone ahead of Maine (tz database: UTC−3 in
// daylight time against New York's UTC−4), where the surveyor's camera
// went to a boat show in the story.
var Halifax = Site{Name: "Halifax, Nova Scotia, Canada (a trip in the story)", LatDeg: 44.6488, LonDeg: -63.5752, ElevationM: 20, Zone: "America/Halifax"}

// Verdict words the audit is expected to give (the binding vocabulary of
// the diagnosis, issue 4).
const (
	VerdictConsistent    = "consistent"
	VerdictClockOffset   = "clock_offset"
	VerdictZoneSlip      = "zone_slip"
	VerdictDSTSlip       = "dst_slip"
	VerdictAMPMSlip      = "ampm_slip"
	VerdictLightMismatch = "light_mismatch"
	VerdictUnverified    = "unverified"
)

// Fault names the error planted in a photo's claimed time.
type Fault string

// The planted faults.
const (
	FaultNone       Fault = "none"        // clock right
	FaultDrift      Fault = "clock_drift" // camera clock gains a few minutes a month
	FaultHomeZone   Fault = "home_zone"   // camera still on the zone it was bought in
	FaultDST        Fault = "dst_missed"  // clock not put back at the end of daylight saving
	FaultAMPM       Fault = "am_pm"       // clock set twelve hours off
	FaultEdited     Fault = "edited"      // DateTimeOriginal altered after the fact
	FaultNightClaim Fault = "night_claim" // a night-time claim on a daylight exposure
	FaultNoEvidence Fault = "no_evidence" // no shadows, no GPS, no exposure: nothing to test
	// FaultHomeTime: a camera carried to another zone without changing its
	// clock; at home the same clock is right.
	FaultHomeTime Fault = "home_time_abroad"
)

// Camera is one source of photos in the case.
type Camera struct {
	Key    string // short key used in Photo.Camera: "A", "B", ...
	Owner  string // who took the photos, in the story
	Make   string // as written in EXIF ("" for a stripped file)
	Model  string
	Serial string // BodySerialNumber ("" when not written)
	HasGPS bool
	Clock  string // how its clock behaves, in one line
	Folder string // sub-folder of the photos folder
}

// cameraSpec adds what the builder needs but the Case does not report.
type cameraSpec struct {
	Camera
	little      bool    // byte order of the payload
	offsetTags  bool    // writes OffsetTime* tags (the place's zone)
	thumbnail   bool    // embeds an IFD1 thumbnail
	fNumber     float64 // preferred aperture
	iso         int
	focalMM     float64
	focal35     int
	view        pose // base camera pose; photos jitter around it
	magnetic    bool // its shadows were measured with a compass
	maxObjects  int  // at most this many sheet rows per photo
	namePattern string
}

// shot is one planned photo.
type shot struct {
	cam   string
	local string // true wall time at the place, "2006-01-02 15:04:05"
	fault Fault
	// shadows: the examiner measured this photo's shadows.
	shadows bool
	// sunny: the scene has sunlight (false: the shaded close-up).
	sunny bool
	// editBy: for FaultEdited, how far DateTimeOriginal was moved.
	editBy time.Duration
	// claimed: for FaultNightClaim, the wall time written instead.
	claimed string
	// site: where the photo was taken when not at the boatyard; local is
	// then that site's wall time.
	site *Site
}

// Camera B's clock: ahead by driftStart at driftEpoch, gaining driftPerDay.
var (
	driftEpoch  = time.Date(2027, 9, 8, 16, 0, 0, 0, time.UTC) // Wed 8 Sep 2027 12:00 EDT
	driftStart  = 8 * time.Minute
	driftPerDay = 5 * time.Second // 58 ppm: 2.5 min a month
)

// Camera C's home zone: bought in Arizona, which keeps no daylight saving.
const homeZone = "America/Phoenix"

func cameraSpecs() []cameraSpec {
	return []cameraSpec{
		{Camera: Camera{Key: "A", Owner: "Dana Ferrow, the claimant (boatyard owner)", Make: "Norrvik", Model: "NX-20", Serial: "NX20-118734",
			Clock: "right (set from a phone, writes its offset tag)", Folder: "claimant"},
			little: false, offsetTags: true, thumbnail: true, fNumber: 8, iso: 100, focalMM: 18, focal35: 27,
			view: aim(-21, 4, 6.5, 0, 10, 430), maxObjects: 4, namePattern: "NX_%04d.JPG"},
		{Camera: Camera{Key: "B", Owner: "the boatyard's maintenance log (weekly)", Make: "Halden", Model: "HX-300", Serial: "HX3-00521",
			Clock: fmt.Sprintf("gains %v a day from %v ahead on %s", driftPerDay, driftStart, driftEpoch.Format("2006-01-02")), Folder: "yard-log"},
			little: true, thumbnail: true, fNumber: 5.6, iso: 100, focalMM: 6.2, focal35: 35,
			view: aim(21, 12, 7, 0, 9, 420), maxObjects: 5, namePattern: "HX300_%04d.JPG"},
		{Camera: Camera{Key: "C", Owner: "Ike Salter, the yard foreman", Make: "Sorami", Model: "Q5", Serial: "Q5-77310",
			Clock: "still on Arizona time (America/Phoenix, UTC-7, no daylight saving) since it was bought there", Folder: "foreman"},
			little: true, fNumber: 7.1, iso: 200, focalMM: 10, focal35: 28,
			view: aim(19, 25, 6, 0, 9, 420), magnetic: true, maxObjects: 4, namePattern: "Q5_%04d.JPG"},
		{Camera: Camera{Key: "P", Owner: "Rue Okafor, the insurer's adjuster (phone)", Make: "Pelora", Model: "P8",
			HasGPS: true, Clock: "right (network time, GPS, offset tag)", Folder: "adjuster"},
			little: true, offsetTags: true, thumbnail: true, fNumber: 1.8, iso: 50, focalMM: 5.4, focal35: 26,
			view: aim(14, -10, 6, 0, 9, 430), maxObjects: 3, namePattern: "IMG_%s.jpg"},
		{Camera: Camera{Key: "D", Owner: "Mo Ferrow, the claimant's spouse", Make: "Arvik", Model: "C40", Serial: "C40-3309",
			Clock: "right in summer time; never put back when daylight saving ended on 2027-11-07", Folder: "spouse"},
			little: true, fNumber: 8, iso: 100, focalMM: 7, focal35: 38,
			view: aim(-17, 24, 6, 0, 9, 420), maxObjects: 3, namePattern: "ARV_%04d.JPG"},
		{Camera: Camera{Key: "E", Owner: "a neighbour, Tove Lindqvist-Marsh", Make: "Lumeno", Model: "S7", Serial: "S7-5512",
			Clock: "set twelve hours off (PM for AM) after a battery change", Folder: "neighbour"},
			little: false, fNumber: 9, iso: 100, focalMM: 12, focal35: 32,
			view: aim(19, -3, 5.5, 0, 9, 430), maxObjects: 3, namePattern: "S7_%04d.JPG"},
		{Camera: Camera{Key: "F", Owner: "the claimant's brother-in-law, Wendell Ash", Make: "Quillon", Model: "Z1", Serial: "QZ1-88021",
			Clock: "right; the one photo's time was typed in by hand", Folder: "brother-in-law"},
			little: true, fNumber: 8, iso: 100, focalMM: 20, focal35: 30,
			view: aim(-20, 11, 6, 0, 9, 430), maxObjects: 3, namePattern: "QZ1_%04d.JPG"},
		{Camera: Camera{Key: "T", Owner: "Nils Brennick, the yard's surveyor (camera with GPS), who took it to a boat show in Halifax and back", Make: "Corvane", Model: "CX-9", Serial: "CX9-40117",
			HasGPS: true, Clock: "right on Maine time, and kept on Maine time in Halifax (one zone ahead) during the trip", Folder: "surveyor"},
			little: false, thumbnail: true, fNumber: 8, iso: 100, focalMM: 9, focal35: 24,
			view: aim(16, 6, 6.5, 0, 9, 430), maxObjects: 3, namePattern: "CX9_%04d.JPG"},
		{Camera: Camera{Key: "G", Owner: "unknown: a picture forwarded through a messaging app (metadata stripped)",
			Clock: "unknown (only DateTimeOriginal survives)", Folder: "messaging"},
			little: true,
			view:   aim(0.5, -3, 1.6, -0.5, 3, 520), namePattern: "received_%04d.jpg"},
	}
}

// script lists every photo in the case, in the true order of capture per
// camera (file numbers follow it).
func script() []shot {
	s := func(cam, local string, f Fault) shot {
		return shot{cam: cam, local: local, fault: f, shadows: true, sunny: true}
	}
	noSheet := func(sh shot) shot { sh.shadows = false; return sh }
	away := func(sh shot) shot { sh.site = &Halifax; return sh }
	edited := s("A", "2027-10-10 08:52:30", FaultEdited)
	edited.editBy = 2*time.Hour + 52*time.Minute
	// F's shadows are left unmeasured, so that the exposure is the only
	// witness against its claim: with shadows the audit would (rightly)
	// call it a plain clock offset of 8 h 48 min.
	night := noSheet(s("F", "2027-10-09 14:22:51", FaultNightClaim))
	night.claimed = "2027-10-09 23:10:00"
	stripped := shot{cam: "G", local: "2027-10-10 16:10:04", fault: FaultNoEvidence}
	return []shot{
		// A: the claimant's camera, right, except one edited photo.
		s("A", "2027-09-12 11:05:14", FaultNone),
		s("A", "2027-09-25 14:40:02", FaultNone),
		edited,
		s("A", "2027-10-10 13:15:47", FaultNone),
		s("A", "2027-10-14 15:20:09", FaultNone),
		s("A", "2027-10-21 12:02:33", FaultNone),
		s("A", "2027-11-02 10:48:51", FaultNone),
		// B: weekly log near solar noon, drifting clock.
		s("B", "2027-09-08 12:21:40", FaultDrift),
		s("B", "2027-09-15 11:58:05", FaultDrift),
		s("B", "2027-09-22 12:40:31", FaultDrift),
		s("B", "2027-09-29 12:12:18", FaultDrift),
		s("B", "2027-10-06 12:47:55", FaultDrift),
		s("B", "2027-10-13 11:52:09", FaultDrift),
		s("B", "2027-10-20 12:30:44", FaultDrift),
		s("B", "2027-10-27 12:05:26", FaultDrift),
		s("B", "2027-11-03 12:36:12", FaultDrift),
		// C: the foreman's camera on Arizona time (claimed = true - 3 h in EDT).
		s("C", "2027-09-17 13:20:05", FaultHomeZone),
		s("C", "2027-10-10 12:31:40", FaultHomeZone),
		s("C", "2027-10-12 14:05:22", FaultHomeZone),
		s("C", "2027-10-19 12:58:10", FaultHomeZone),
		// P: the adjuster's phone with GPS; two photos measured, two not.
		s("P", "2027-10-10 15:02:11", FaultNone),
		noSheet(s("P", "2027-10-11 10:15:36", FaultNone)),
		noSheet(s("P", "2027-10-18 11:40:20", FaultNone)),
		s("P", "2027-11-12 13:25:44", FaultNone),
		// D: the spouse's compact; right until the end of daylight saving.
		s("D", "2027-09-26 13:05:30", FaultNone),
		s("D", "2027-10-10 11:20:12", FaultNone),
		s("D", "2027-11-12 11:48:05", FaultDST),
		// E: the neighbour's camera, twelve hours off.
		s("E", "2027-10-11 09:41:18", FaultAMPM),
		// F: claimed to be from the storm night, taken that afternoon.
		night,
		// T: the surveyor's GPS camera: the yard, a trip to Halifax on its
		// Maine clock, the yard again. Its photos are dated by their GPS
		// clocks only (no shadows measured).
		noSheet(s("T", "2027-09-28 10:12:40", FaultNone)),
		noSheet(s("T", "2027-09-29 14:30:05", FaultNone)),
		away(noSheet(s("T", "2027-10-02 11:05:51", FaultHomeTime))),
		away(noSheet(s("T", "2027-10-03 15:41:17", FaultHomeTime))),
		away(noSheet(s("T", "2027-10-04 09:58:33", FaultHomeTime))),
		noSheet(s("T", "2027-10-07 13:20:09", FaultNone)),
		noSheet(s("T", "2027-10-08 16:02:44", FaultNone)),
		// G: stripped file, shaded close-up.
		stripped,
	}
}

// expectedVerdict is the verdict the audit should reach for a fault.
func expectedVerdict(f Fault) string {
	switch f {
	case FaultDrift, FaultEdited:
		return VerdictClockOffset
	case FaultHomeZone, FaultHomeTime:
		return VerdictZoneSlip
	case FaultDST:
		return VerdictDSTSlip
	case FaultAMPM:
		return VerdictAMPMSlip
	case FaultNightClaim:
		return VerdictLightMismatch
	case FaultNoEvidence:
		return VerdictUnverified
	}
	return VerdictConsistent
}
