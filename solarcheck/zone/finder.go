package zone

import (
	"fmt"
	"math"
	"runtime/debug"
	"strings"
	"sync"

	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
)

// Finder looks up the zones at a place. The boundary data is read on the first
// lookup only, exactly once (a few hundredths of a second; about 2 MB kept besides
// the embedded data; see zonemap.go), and a polygon is decoded and indexed the
// first time a looked-up point falls inside its bounding box; a Finder that never
// looks up a place costs nothing. Safe for concurrent use.
type Finder struct {
	db *DB

	once    sync.Once
	zm      *zoneMap
	initErr error
}

// NewFinder returns a Finder whose zones are loaded from db (NewDB() if nil).
func NewFinder(db *DB) *Finder {
	if db == nil {
		db = NewDB()
	}
	return &Finder{db: db}
}

// DB returns the tz database the Finder loads locations from.
func (f *Finder) DB() *DB { return f.db }

func (f *Finder) init() error {
	f.once.Do(func() {
		defer func() {
			if r := recover(); r != nil {
				f.initErr = &Error{Op: "load zone boundaries", Err: fmt.Errorf("%w: %v", ErrZoneMap, r)}
			}
		}()
		zm, err := decodeZoneMap(tzfrellite.LiteCompressData)
		if err != nil {
			f.initErr = &Error{Op: "load zone boundaries", Err: fmt.Errorf("%w: %w", ErrZoneMap, err)}
			return
		}
		f.zm = zm
	})
	return f.initErr
}

// Place is the answer to "which zones hold here".
type Place struct {
	Zones  []string // IANA names, sorted; several where boundaries overlap
	AtSea  bool     // every zone is a nautical Etc/GMT±N zone
	Source string   // "tzf boundary data 2025b" or "nautical zone from longitude"
	Notes  []string
}

// ZoneMapVersion returns the version of the boundary data (e.g. "2025b") and of the
// Go module that carries it. It reads the version field only; the boundaries are
// not decoded. (tzf's own code is not in the binary: only its data, read with its
// rules; see zonemap.go.)
func (f *Finder) ZoneMapVersion() (string, error) {
	dv, err := zoneMapDataVersion(tzfrellite.LiteCompressData)
	if err != nil {
		return "", &Error{Op: "load zone boundaries", Err: fmt.Errorf("%w: %w", ErrZoneMap, err)}
	}
	v := "tzf boundary data " + dv
	if mods := moduleVersions(); mods != "" {
		v += " (" + mods + ")"
	}
	return v, nil
}

// moduleVersions reads the version of the module carrying the boundary data from
// the build information, when the binary carries it.
func moduleVersions() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return zoneMapModules
	}
	var parts []string
	for _, d := range bi.Deps {
		if d.Path == "github.com/ringsaturn/tzf-rel-lite" {
			parts = append(parts, d.Path+" "+d.Version)
		}
	}
	if len(parts) == 0 { // test binaries carry no dependency list
		return zoneMapModules
	}
	return strings.Join(parts, ", ")
}

// Lookup returns the zones at a geodetic latitude and longitude (degrees, east
// positive; longitudes outside ±180 are wrapped). The boundary data is in
// (longitude, latitude) order; this method takes latitude first like every other
// function in gnomon. Where no polygon holds the point (a gap in the simplified
// data) the nautical zone of the longitude is returned with a note.
func (f *Finder) Lookup(latDeg, lonDeg float64) (Place, error) {
	lonDeg, err := checkCoords(latDeg, lonDeg)
	if err != nil {
		return Place{}, err
	}
	if err := f.init(); err != nil {
		return Place{}, err
	}
	names := f.zm.zonesAt(lonDeg, latDeg)
	if len(names) == 0 {
		name, off, _ := NauticalZone(lonDeg)
		return Place{
			Zones: []string{name}, AtSea: true, Source: "nautical zone from longitude",
			Notes: []string{fmt.Sprintf("no zone polygon holds %.5f,%.5f; nautical zone %s (UTC%s) assumed", latDeg, lonDeg, name, formatOffset(off))},
		}, nil
	}
	p := Place{Zones: names, AtSea: true, Source: "tzf boundary data " + f.zm.version}
	for _, n := range names {
		if !strings.HasPrefix(n, "Etc/") {
			p.AtSea = false
		}
	}
	if p.AtSea {
		p.Notes = append(p.Notes, "open sea: nautical zone "+strings.Join(names, ", ")+
			" (POSIX sign: Etc/GMT+N is UTC−N); a ship may keep another time")
	}
	if len(names) > 1 {
		p.Notes = append(p.Notes, fmt.Sprintf("%d zones overlap here: %s", len(names), strings.Join(names, ", ")))
	}
	return p, nil
}

func checkCoords(latDeg, lonDeg float64) (float64, error) {
	if math.IsNaN(latDeg) || math.IsNaN(lonDeg) || math.IsInf(latDeg, 0) || math.IsInf(lonDeg, 0) || latDeg < -90 || latDeg > 90 {
		return 0, &Error{Op: "lookup", Input: fmt.Sprintf("%v,%v", latDeg, lonDeg), Err: ErrInvalidCoordinates}
	}
	return wrapLon(lonDeg), nil
}

// wrapLon maps a longitude to [-180, 180).
func wrapLon(lonDeg float64) float64 {
	l := math.Mod(lonDeg+180, 360)
	if l < 0 {
		l += 360
	}
	return l - 180
}

// NauticalZone returns the nautical (Etc/GMT±N) zone for a longitude: the whole hour
// nearest lon/15, with zone boundaries at odd multiples of 7.5° (a longitude exactly
// on a boundary goes to the zone farther from Greenwich). offsetSec is local minus
// UTC; the name carries the POSIX sign, so 45°W gives "Etc/GMT+3" and -10800 s.
// ±180° gives UTC+12 ("Etc/GMT-12"), the convention east of the date line; the
// western half of zone 12 (172.5°W..180°) keeps UTC−12.
func NauticalZone(lonDeg float64) (name string, offsetSec int, err error) {
	if math.IsNaN(lonDeg) || math.IsInf(lonDeg, 0) {
		return "", 0, &Error{Op: "nautical zone", Input: fmt.Sprint(lonDeg), Err: ErrInvalidCoordinates}
	}
	l := wrapLon(lonDeg)
	h := int(math.Round(l / 15)) // Round: half away from zero
	if l == -180 {
		h = 12
	}
	offsetSec = h * 3600
	switch {
	case h == 0:
		name = "Etc/GMT"
	case h > 0:
		name = fmt.Sprintf("Etc/GMT-%d", h) // POSIX sign: east of Greenwich is "minus"
	default:
		name = fmt.Sprintf("Etc/GMT+%d", -h)
	}
	return name, offsetSec, nil
}
