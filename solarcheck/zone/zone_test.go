package zone

import (
	"crypto/sha256"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sync"
	"testing"
	"time"
)

// One Finder for the package's tests, so that each polygon is indexed once.
var (
	testFinderOnce sync.Once
	testFinder     *Finder
)

func finder(t testing.TB) *Finder {
	t.Helper()
	testFinderOnce.Do(func() { testFinder = NewFinder(nil) })
	return testFinder
}

func utc(y int, m time.Month, d, h, mi int) time.Time {
	return time.Date(y, m, d, h, mi, 0, 0, time.UTC)
}

func hm(h, m int) int { // offset in seconds from signed hours and unsigned minutes
	if h < 0 {
		return h*3600 - m*60
	}
	return h*3600 + m*60
}

// TestLookupPlaces: zones and offsets at well-known places. The offset is checked
// at the given UTC instant with the embedded tz database.
func TestLookupPlaces(t *testing.T) {
	const ck = "common knowledge"
	tests := []struct {
		place    string
		lat, lon float64
		zone     string
		at       time.Time
		offset   int
		source   string
	}{
		{"New York", 40.7128, -74.0060, "America/New_York", utc(2025, 1, 15, 12, 0), hm(-5, 0), ck},
		{"Los Angeles", 34.0522, -118.2437, "America/Los_Angeles", utc(2025, 7, 15, 12, 0), hm(-7, 0), ck},
		{"Phoenix (no DST)", 33.4484, -112.0740, "America/Phoenix", utc(2025, 7, 15, 12, 0), hm(-7, 0), ck},
		{"Honolulu", 21.3069, -157.8583, "Pacific/Honolulu", utc(2025, 7, 15, 12, 0), hm(-10, 0), ck},
		{"London (summer)", 51.5074, -0.1278, "Europe/London", utc(2025, 7, 15, 12, 0), hm(1, 0), ck},
		{"Reykjavik", 64.1466, -21.9426, "Atlantic/Reykjavik", utc(2025, 1, 15, 12, 0), 0, ck},
		{"Berlin", 52.5200, 13.4050, "Europe/Berlin", utc(2025, 1, 15, 12, 0), hm(1, 0), ck},
		{"Paris (summer)", 48.8566, 2.3522, "Europe/Paris", utc(2025, 7, 15, 12, 0), hm(2, 0), ck},
		{"Moscow", 55.7558, 37.6173, "Europe/Moscow", utc(2025, 7, 15, 12, 0), hm(3, 0), ck},
		{"Cairo (winter)", 30.0444, 31.2357, "Africa/Cairo", utc(2025, 1, 15, 12, 0), hm(2, 0), ck},
		{"Johannesburg", -26.2041, 28.0473, "Africa/Johannesburg", utc(2025, 1, 15, 12, 0), hm(2, 0), ck},
		{"Tehran (no DST since 2022)", 35.6892, 51.3890, "Asia/Tehran", utc(2025, 7, 15, 12, 0), hm(3, 30), ck},
		{"Kabul", 34.5553, 69.2075, "Asia/Kabul", utc(2025, 1, 15, 12, 0), hm(4, 30), ck},
		{"Kolkata", 22.5726, 88.3639, "Asia/Kolkata", utc(2025, 1, 15, 12, 0), hm(5, 30), ck},
		{"Mumbai", 19.0760, 72.8777, "Asia/Kolkata", utc(2025, 7, 15, 12, 0), hm(5, 30), ck},
		{"Kathmandu", 27.7172, 85.3240, "Asia/Kathmandu", utc(2025, 1, 15, 12, 0), hm(5, 45), ck},
		{"Yangon", 16.8409, 96.1735, "Asia/Yangon", utc(2025, 1, 15, 12, 0), hm(6, 30), ck},
		{"Singapore", 1.3521, 103.8198, "Asia/Singapore", utc(2025, 1, 15, 12, 0), hm(8, 0), ck},
		{"Beijing", 39.9042, 116.4074, "Asia/Shanghai", utc(2025, 7, 15, 12, 0), hm(8, 0), ck},
		{"Eucla", -31.6770, 128.8890, "Australia/Eucla", utc(2025, 1, 15, 12, 0), hm(8, 45), ck},
		{"Tokyo", 35.6762, 139.6503, "Asia/Tokyo", utc(2025, 1, 15, 12, 0), hm(9, 0), ck},
		{"Adelaide (winter)", -34.9285, 138.6007, "Australia/Adelaide", utc(2025, 7, 15, 12, 0), hm(9, 30), ck},
		{"Adelaide (summer)", -34.9285, 138.6007, "Australia/Adelaide", utc(2025, 1, 15, 12, 0), hm(10, 30), ck},
		{"Sydney (summer)", -33.8688, 151.2093, "Australia/Sydney", utc(2025, 1, 15, 12, 0), hm(11, 0), ck},
		{"Auckland (summer)", -36.8485, 174.7633, "Pacific/Auckland", utc(2025, 1, 15, 12, 0), hm(13, 0), ck},
		{"Chatham (winter)", -43.9535, -176.5597, "Pacific/Chatham", utc(2025, 7, 15, 12, 0), hm(12, 45), ck},
		{"Chatham (summer)", -43.9535, -176.5597, "Pacific/Chatham", utc(2025, 1, 15, 12, 0), hm(13, 45), ck},
		{"Marquesas", -8.9100, -140.1000, "Pacific/Marquesas", utc(2025, 1, 15, 12, 0), hm(-9, 30), ck},
		{"St John's NL", 47.5615, -52.7126, "America/St_Johns", utc(2025, 1, 15, 12, 0), hm(-3, 30), ck},
		{"Caracas", 10.4806, -66.9036, "America/Caracas", utc(2025, 1, 15, 12, 0), hm(-4, 0), ck},
		{"Sao Paulo (no DST since 2019)", -23.5505, -46.6333, "America/Sao_Paulo", utc(2025, 1, 15, 12, 0), hm(-3, 0), ck},
		// Both sides of a border, one hour apart.
		{"Badajoz, Spain", 38.8794, -6.9707, "Europe/Madrid", utc(2025, 1, 15, 12, 0), hm(1, 0), ck},
		{"Elvas, Portugal", 38.8808, -7.1628, "Europe/Lisbon", utc(2025, 1, 15, 12, 0), 0, ck},
		// Open sea: nautical zones, POSIX sign in the name.
		{"North Atlantic, 30W", 40.0, -30.0, "Etc/GMT+2", utc(2025, 1, 15, 12, 0), hm(-2, 0), "common knowledge (nautical zones)"},
		{"South Pacific, 150W", -20.0, -150.0, "Etc/GMT+10", utc(2025, 1, 15, 12, 0), hm(-10, 0), "common knowledge (nautical zones)"},
		{"Indian Ocean, 80E", -30.0, 80.0, "Etc/GMT-5", utc(2025, 1, 15, 12, 0), hm(5, 0), "common knowledge (nautical zones)"},
	}
	f := finder(t)
	for _, tc := range tests {
		t.Run(tc.place, func(t *testing.T) {
			p, err := f.Lookup(tc.lat, tc.lon)
			if err != nil {
				t.Fatal(err)
			}
			if !slices.Contains(p.Zones, tc.zone) {
				t.Fatalf("Lookup(%v,%v) = %v, want %s [%s]", tc.lat, tc.lon, p.Zones, tc.zone, tc.source)
			}
			loc, err := f.DB().Load(tc.zone)
			if err != nil {
				t.Fatal(err)
			}
			if _, off := tc.at.In(loc).Zone(); off != tc.offset {
				t.Errorf("%s at %v: offset %s, want %s [%s]", tc.zone, tc.at, formatOffset(off), formatOffset(tc.offset), tc.source)
			}
			wantSea := tc.zone[:4] == "Etc/"
			if p.AtSea != wantSea {
				t.Errorf("AtSea = %v, want %v", p.AtSea, wantSea)
			}
		})
	}
}

// TestLookupArgumentOrder: tzf takes (lng, lat); Lookup takes (lat, lon). With the
// order swapped New York lands in Antarctica.
func TestLookupArgumentOrder(t *testing.T) {
	f := finder(t)
	p, err := f.Lookup(40.7128, -74.0060)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(p.Zones, []string{"America/New_York"}) {
		t.Errorf("New York: %v, want [America/New_York] (common knowledge)", p.Zones)
	}
	swapped, err := f.Lookup(-74.0060, 40.7128)
	if err != nil {
		t.Fatal(err)
	}
	if slices.Contains(swapped.Zones, "America/New_York") {
		t.Errorf("swapped coordinates also gave New York: %v", swapped.Zones)
	}
}

// TestLookupOverlap: in western China Beijing time and Xinjiang time are both in
// use, two hours apart; both names must be reported.
func TestLookupOverlap(t *testing.T) {
	f := finder(t)
	p, err := f.Lookup(43.8256, 87.6168) // Urumqi
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Asia/Shanghai", "Asia/Urumqi"} {
		if !slices.Contains(p.Zones, want) {
			t.Errorf("Urumqi: %v, missing %s (common knowledge: both in use)", p.Zones, want)
		}
	}
	if len(p.Notes) == 0 {
		t.Error("no note on overlapping zones")
	}
}

func TestLookupInvalid(t *testing.T) {
	f := finder(t)
	for _, c := range [][2]float64{{91, 0}, {-90.5, 0}, {nan(), 0}, {0, inf()}} {
		if _, err := f.Lookup(c[0], c[1]); !errors.Is(err, ErrInvalidCoordinates) {
			t.Errorf("Lookup(%v): err = %v, want ErrInvalidCoordinates", c, err)
		}
	}
	// Longitudes beyond ±180 wrap: 360-74 is New York's meridian.
	p, err := f.Lookup(40.7128, 360-74.0060)
	if err != nil || !slices.Contains(p.Zones, "America/New_York") {
		t.Errorf("wrapped longitude: %v, %v", p.Zones, err)
	}
}

func nan() float64 { z := 0.0; return z / z }
func inf() float64 { z := 0.0; return 1 / z }

// TestHistoricalOffsets: offsets that changed, from the embedded tz database.
func TestHistoricalOffsets(t *testing.T) {
	src := "IANA tz database (tzdata " + TZDataVersion + ")"
	tests := []struct {
		zone   string
		at     time.Time
		offset int
		source string
	}{
		{"Asia/Kolkata", utc(1943, 6, 1, 0, 0), hm(6, 30), src + ": wartime +0630 1942-09..1945-10"},
		{"Asia/Kolkata", utc(1942, 7, 1, 0, 0), hm(5, 30), src},
		{"Asia/Kolkata", utc(1946, 1, 1, 0, 0), hm(5, 30), src},
		{"Europe/Moscow", utc(2010, 1, 15, 0, 0), hm(3, 0), src},
		{"Europe/Moscow", utc(2010, 7, 15, 0, 0), hm(4, 0), src + ": last MSD summer"},
		{"Europe/Moscow", utc(2013, 1, 15, 0, 0), hm(4, 0), src + ": permanent +4 2011-03..2014-10"},
		{"Europe/Moscow", utc(2015, 1, 15, 0, 0), hm(3, 0), src},
		{"Pacific/Apia", utc(2011, 12, 29, 0, 0), hm(-10, 0), src + ": east of the date line until 2011-12-29"},
		{"Pacific/Apia", utc(2012, 1, 2, 0, 0), hm(14, 0), src},
		{"America/Caracas", utc(2006, 6, 1, 0, 0), hm(-4, 0), src},
		{"America/Caracas", utc(2010, 6, 1, 0, 0), hm(-4, 30), src + ": −4:30 2007-12..2016-05"},
		{"America/Caracas", utc(2017, 6, 1, 0, 0), hm(-4, 0), src},
		{"Asia/Pyongyang", utc(2014, 6, 1, 0, 0), hm(9, 0), src},
		{"Asia/Pyongyang", utc(2016, 6, 1, 0, 0), hm(8, 30), src + ": +0830 2015-08..2018-05"},
		{"Asia/Pyongyang", utc(2019, 6, 1, 0, 0), hm(9, 0), src},
		{"America/Sao_Paulo", utc(2018, 12, 15, 0, 0), hm(-2, 0), src + ": last DST summer"},
		{"America/Sao_Paulo", utc(2019, 12, 15, 0, 0), hm(-3, 0), src},
		{"Asia/Tehran", utc(2021, 7, 1, 0, 0), hm(4, 30), src},
		{"Asia/Tehran", utc(2023, 7, 1, 0, 0), hm(3, 30), src + ": DST abolished 2022"},
	}
	db := NewDB()
	for _, tc := range tests {
		loc, err := db.Load(tc.zone)
		if err != nil {
			t.Fatal(err)
		}
		if _, off := tc.at.In(loc).Zone(); off != tc.offset {
			t.Errorf("%s at %s: %s, want %s [%s]", tc.zone, tc.at.Format(time.DateOnly), formatOffset(off), formatOffset(tc.offset), tc.source)
		}
	}
}

func wall(y int, m time.Month, d, h, mi int) Wall {
	return Wall{Year: y, Month: m, Day: d, Hour: h, Minute: mi}
}

// TestResolve: wall times in gaps and folds, with every candidate instant.
func TestResolve(t *testing.T) {
	src := "IANA tz database (tzdata " + TZDataVersion + ")"
	tests := []struct {
		name       string
		zone       string
		wall       Wall
		kind       Kind
		want       []time.Time // sorted
		offsets    []int
		transition time.Time
		source     string
	}{
		{"Berlin summer noon", "Europe/Berlin", wall(2025, 6, 1, 12, 0), Normal,
			[]time.Time{utc(2025, 6, 1, 10, 0)}, []int{hm(2, 0)}, time.Time{}, "common knowledge"},
		{"Berlin DST start", "Europe/Berlin", wall(2025, 3, 30, 2, 30), Skipped,
			[]time.Time{utc(2025, 3, 30, 0, 30), utc(2025, 3, 30, 1, 30)}, []int{hm(2, 0), hm(1, 0)}, utc(2025, 3, 30, 1, 0), "common knowledge: EU change at 01:00 UTC, last Sunday of March"},
		{"New York DST end", "America/New_York", wall(2025, 11, 2, 1, 30), Repeated,
			[]time.Time{utc(2025, 11, 2, 5, 30), utc(2025, 11, 2, 6, 30)}, []int{hm(-4, 0), hm(-5, 0)}, utc(2025, 11, 2, 6, 0), "common knowledge: US change 02:00 EDT, first Sunday of November"},
		{"Sydney DST start", "Australia/Sydney", wall(2025, 10, 5, 2, 30), Skipped,
			[]time.Time{utc(2025, 10, 4, 15, 30), utc(2025, 10, 4, 16, 30)}, []int{hm(11, 0), hm(10, 0)}, utc(2025, 10, 4, 16, 0), "common knowledge: NSW change 02:00 AEST, first Sunday of October"},
		{"Sydney DST end", "Australia/Sydney", wall(2025, 4, 6, 2, 30), Repeated,
			[]time.Time{utc(2025, 4, 5, 15, 30), utc(2025, 4, 5, 16, 30)}, []int{hm(11, 0), hm(10, 0)}, utc(2025, 4, 5, 16, 0), "common knowledge: NSW change 03:00 AEDT, first Sunday of April"},
		{"Lord Howe half-hour DST start", "Australia/Lord_Howe", wall(2025, 10, 5, 2, 15), Skipped,
			[]time.Time{utc(2025, 10, 4, 15, 15), utc(2025, 10, 4, 15, 45)}, []int{hm(11, 0), hm(10, 30)}, utc(2025, 10, 4, 15, 30), src},
		{"Chatham DST start", "Pacific/Chatham", wall(2025, 9, 28, 3, 0), Skipped,
			[]time.Time{utc(2025, 9, 27, 13, 15), utc(2025, 9, 27, 14, 15)}, []int{hm(13, 45), hm(12, 45)}, utc(2025, 9, 27, 14, 0), src},
		{"Apia skipped 2011-12-30", "Pacific/Apia", wall(2011, 12, 30, 12, 0), Skipped,
			[]time.Time{utc(2011, 12, 29, 22, 0), utc(2011, 12, 30, 22, 0)}, []int{hm(14, 0), hm(-10, 0)}, utc(2011, 12, 30, 10, 0), src + "; common knowledge: Samoa skipped 30 Dec 2011"},
		{"Moscow 2014 back to +3", "Europe/Moscow", wall(2014, 10, 26, 1, 30), Repeated,
			[]time.Time{utc(2014, 10, 25, 21, 30), utc(2014, 10, 25, 22, 30)}, []int{hm(4, 0), hm(3, 0)}, utc(2014, 10, 25, 22, 0), src},
		{"Kolkata pre-1945", "Asia/Kolkata", wall(1943, 6, 1, 12, 0), Normal,
			[]time.Time{utc(1943, 6, 1, 5, 30)}, []int{hm(6, 30)}, time.Time{}, src},
	}
	db := NewDB()
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			loc, err := db.Load(tc.zone)
			if err != nil {
				t.Fatal(err)
			}
			res, err := Resolve(tc.wall, loc)
			if err != nil {
				t.Fatal(err)
			}
			if res.Kind != tc.kind {
				t.Errorf("kind %v, want %v [%s]", res.Kind, tc.kind, tc.source)
			}
			if len(res.Candidates) != len(tc.want) {
				t.Fatalf("%d candidates %v, want %v [%s]", len(res.Candidates), res.Candidates, tc.want, tc.source)
			}
			for i, c := range res.Candidates {
				if !c.UTC.Equal(tc.want[i]) || c.OffsetSec != tc.offsets[i] {
					t.Errorf("candidate %d: %v %s, want %v %s [%s]", i, c.UTC, formatOffset(c.OffsetSec), tc.want[i], formatOffset(tc.offsets[i]), tc.source)
				}
				if c.Real != (tc.kind != Skipped) {
					t.Errorf("candidate %d: Real = %v", i, c.Real)
				}
			}
			if !res.Transition.Equal(tc.transition) {
				t.Errorf("transition %v, want %v", res.Transition, tc.transition)
			}
		})
	}
}

// TestResolveAgreesWithTimeDate: for wall times that are neither skipped nor
// repeated, Resolve gives the instant time.Date gives (Go's own tz code as witness),
// hour by hour through 2025 in zones with unusual rules.
func TestResolveAgreesWithTimeDate(t *testing.T) {
	db := NewDB()
	for _, name := range []string{"Europe/Berlin", "America/New_York", "Australia/Lord_Howe", "Pacific/Chatham", "Asia/Kathmandu", "America/St_Johns", "Africa/Casablanca"} {
		loc, err := db.Load(name)
		if err != nil {
			t.Fatal(err)
		}
		counts := map[Kind]int{}
		for u := utc(2025, 1, 1, 0, 15); u.Year() == 2025; u = u.Add(time.Hour) {
			w := Wall{Year: u.Year(), Month: u.Month(), Day: u.Day(), Hour: u.Hour(), Minute: u.Minute()}
			res, err := Resolve(w, loc)
			if err != nil {
				t.Fatalf("%s %v: %v", name, w, err)
			}
			counts[res.Kind]++
			if res.Kind == Normal {
				want := time.Date(w.Year, w.Month, w.Day, w.Hour, w.Minute, 0, 0, loc)
				if !res.Candidates[0].UTC.Equal(want) {
					t.Errorf("%s %v: %v, time.Date says %v", name, w, res.Candidates[0].UTC, want.UTC())
				}
			}
			for _, c := range res.Candidates { // every real candidate shows w on the zone's clock
				lt := c.UTC.In(loc)
				if c.Real && (lt.Hour() != w.Hour || lt.Minute() != w.Minute || lt.Day() != w.Day) {
					t.Errorf("%s %v: candidate %v reads %v", name, w, c.UTC, lt)
				}
			}
		}
		if counts[Normal] < 8700 {
			t.Errorf("%s: only %d normal hours in 2025: %v", name, counts[Normal], counts)
		}
	}
}

func TestWallValidate(t *testing.T) {
	bad := []Wall{
		{Year: 2025, Month: 2, Day: 29},                                   // not a leap year
		{Year: 2025, Month: 4, Day: 31},                                   // 30 days
		{Year: 2025, Month: 13, Day: 1},                                   // month
		{Year: 2025, Month: 1, Day: 1, Hour: 24},                          // hour
		{Year: 2025, Month: 1, Day: 1, Second: 60},                        // leap second
		{Year: 2025, Month: 1, Day: 1, HasOffset: true, OffsetSec: 90000}, // offset
	}
	for _, w := range bad {
		if err := w.Validate(); !errors.Is(err, ErrInvalidWall) {
			t.Errorf("%v: err = %v, want ErrInvalidWall", w, err)
		}
	}
	if err := (Wall{Year: 2024, Month: 2, Day: 29, Hour: 23, Minute: 59, Second: 59}).Validate(); err != nil {
		t.Errorf("2024-02-29 (leap year, common knowledge): %v", err)
	}
}

func TestNauticalZone(t *testing.T) {
	const src = "common knowledge (nautical zones of 15°, centred on multiples of 15°)"
	tests := []struct {
		lon    float64
		name   string
		offset int
	}{
		{0, "Etc/GMT", 0},
		{7.4, "Etc/GMT", 0},
		{7.5, "Etc/GMT-1", 3600},
		{-45, "Etc/GMT+3", -10800},
		{-52.4, "Etc/GMT+3", -10800},
		{80, "Etc/GMT-5", 18000},
		{172.4, "Etc/GMT-11", 11 * 3600},
		{179.9, "Etc/GMT-12", 12 * 3600},
		{180, "Etc/GMT-12", 12 * 3600},
		{-180, "Etc/GMT-12", 12 * 3600},
		{-172.6, "Etc/GMT+12", -12 * 3600},
		{-172.4, "Etc/GMT+11", -11 * 3600},
		{390, "Etc/GMT-2", 7200},
	}
	db := NewDB()
	for _, tc := range tests {
		name, off, err := NauticalZone(tc.lon)
		if err != nil || name != tc.name || off != tc.offset {
			t.Errorf("NauticalZone(%v) = %s %d %v, want %s %d [%s]", tc.lon, name, off, err, tc.name, tc.offset, src)
			continue
		}
		// The tz database's Etc zones (POSIX sign) must agree with the offset.
		loc, err := db.Load(name)
		if err != nil {
			t.Fatal(err)
		}
		if _, o := time.Now().In(loc).Zone(); o != off {
			t.Errorf("tz database %s has offset %d, NauticalZone says %d", name, o, off)
		}
	}
	if _, _, err := NauticalZone(nan()); !errors.Is(err, ErrInvalidCoordinates) {
		t.Errorf("NaN: %v", err)
	}
}

// TestHostIndependence: answers come from the embedded database even when the host's
// ZONEINFO points at nothing useful.
func TestHostIndependence(t *testing.T) {
	sum := sha256.Sum256(zoneinfoZip)
	if fmt.Sprintf("%x", sum) != tzdataSHA256 {
		t.Fatalf("embedded zoneinfo.zip does not match tzversion_gen.go; run go generate")
	}
	garbage := filepath.Join(t.TempDir(), "zoneinfo.zip")
	if err := os.WriteFile(garbage, []byte("not a zip"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, zi := range []string{t.TempDir(), garbage} {
		t.Setenv("ZONEINFO", zi)
		t.Setenv("TZ", "Pacific/Kiritimati")
		db := NewDB()
		loc, err := db.Load("Asia/Kathmandu")
		if err != nil {
			t.Fatalf("ZONEINFO=%s: %v", zi, err)
		}
		if _, off := utc(2025, 1, 1, 0, 0).In(loc).Zone(); off != hm(5, 45) {
			t.Errorf("ZONEINFO=%s: Kathmandu %s, want +05:45 (common knowledge)", zi, formatOffset(off))
		}
		res, err := Resolve(wall(2025, 3, 30, 2, 30), mustLoad(t, db, "Europe/Berlin"))
		if err != nil || res.Kind != Skipped {
			t.Errorf("ZONEINFO=%s: Berlin gap %v %v", zi, res.Kind, err)
		}
	}
	if _, err := NewDB().Load("Local"); !errors.Is(err, ErrUnknownZone) {
		t.Errorf("Local must be refused, got %v", err)
	}
	if _, err := NewDB().Load("Mars/Olympus_Mons"); !errors.Is(err, ErrUnknownZone) {
		t.Errorf("unknown zone: %v", err)
	}
}

func mustLoad(t *testing.T, db *DB, name string) *time.Location {
	t.Helper()
	loc, err := db.Load(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

func TestClaim(t *testing.T) {
	withOffset := func(w Wall, off int) Wall { w.HasOffset, w.OffsetSec = true, off; return w }
	berlin := [2]float64{52.52, 13.405}
	tests := []struct {
		name   string
		in     ClaimInput
		rule   Rule
		kind   Kind
		want   []time.Time
		notes  int // minimum number of notes
		source string
	}{
		{"offset tag wins", ClaimInput{Wall: withOffset(wall(2025, 6, 1, 12, 0), hm(5, 30)), Override: ov(t, "Europe/Berlin"), HasPlace: true, LatDeg: berlin[0], LonDeg: berlin[1]},
			RuleOffsetTag, Normal, []time.Time{utc(2025, 6, 1, 6, 30)}, 2, "arithmetic: 12:00+05:30 = 06:30Z"},
		{"override RFC 3339", ClaimInput{Override: ov(t, "2025-06-01T12:00:00-03:00")},
			RuleOverrideTime, Normal, []time.Time{utc(2025, 6, 1, 15, 0)}, 0, "RFC 3339"},
		{"override offset", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), Override: ov(t, "UTC+5:45"), HasPlace: true, LatDeg: berlin[0], LonDeg: berlin[1]},
			RuleOverrideOffset, Normal, []time.Time{utc(2025, 6, 1, 6, 15)}, 1, "arithmetic"},
		{"override Z", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), Override: ov(t, "Z")},
			RuleOverrideOffset, Normal, []time.Time{utc(2025, 6, 1, 12, 0)}, 0, "arithmetic"},
		{"override zone in fold", ClaimInput{Wall: wall(2025, 11, 2, 1, 30), Override: ov(t, "America/New_York")},
			RuleOverrideZone, Repeated, []time.Time{utc(2025, 11, 2, 5, 30), utc(2025, 11, 2, 6, 30)}, 1, "common knowledge"},
		{"override Etc/GMT+3 (POSIX sign)", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), Override: ov(t, "Etc/GMT+3")},
			RuleOverrideZone, Normal, []time.Time{utc(2025, 6, 1, 15, 0)}, 0, "IANA tz database Etc zones: Etc/GMT+3 is UTC−3"},
		{"place zone", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), HasPlace: true, LatDeg: berlin[0], LonDeg: berlin[1]},
			RulePlaceZone, Normal, []time.Time{utc(2025, 6, 1, 10, 0)}, 0, "common knowledge: CEST"},
		{"place zone, DST gap", ClaimInput{Wall: wall(2025, 3, 30, 2, 30), HasPlace: true, LatDeg: berlin[0], LonDeg: berlin[1]},
			RulePlaceZone, Skipped, []time.Time{utc(2025, 3, 30, 0, 30), utc(2025, 3, 30, 1, 30)}, 1, "common knowledge"},
		{"place with two zones (Urumqi)", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), HasPlace: true, LatDeg: 43.8256, LonDeg: 87.6168},
			RulePlaceZone, Normal, []time.Time{utc(2025, 6, 1, 4, 0), utc(2025, 6, 1, 6, 0)}, 1, "common knowledge: UTC+8 and UTC+6 both in use"},
		{"at sea", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), HasPlace: true, LatDeg: 40, LonDeg: -30},
			RulePlaceZone, Normal, []time.Time{utc(2025, 6, 1, 14, 0)}, 1, "common knowledge (nautical zone UTC−2)"},
	}
	f := finder(t)
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			c, err := f.Claim(tc.in)
			if err != nil {
				t.Fatal(err)
			}
			if c.Rule != tc.rule || c.Kind != tc.kind {
				t.Errorf("rule %s kind %v, want %s %v", c.Rule, c.Kind, tc.rule, tc.kind)
			}
			var got []time.Time
			for _, cand := range c.Candidates {
				got = append(got, cand.UTC)
			}
			if !slices.EqualFunc(got, tc.want, time.Time.Equal) {
				t.Errorf("candidates %v, want %v [%s]", got, tc.want, tc.source)
			}
			if len(c.Notes) < tc.notes {
				t.Errorf("notes %q, want at least %d", c.Notes, tc.notes)
			}
			if u, ok := c.Unique(); ok != (len(tc.want) == 1 && tc.kind == Normal) || (ok && !u.Equal(tc.want[0])) {
				t.Errorf("Unique() = %v %v", u, ok)
			}
			if c.TZData != TZDataVersion {
				t.Errorf("TZData %q", c.TZData)
			}
		})
	}
}

// ov parses an override the test writes as text.
func ov(t *testing.T, s string) Override {
	t.Helper()
	o, err := ParseOverride(s)
	if err != nil {
		t.Fatal(err)
	}
	return o
}

// TestParseOverride: each text form gives its value; the round trip through
// String gives the same value; "GMT+3" is refused (ISO and POSIX signs differ).
func TestParseOverride(t *testing.T) {
	tests := []struct {
		in   string
		want Override
		err  error
	}{
		{"", Override{}, nil},
		{"+05:30", Override{OffsetSec: 19800, HasOffset: true}, nil},
		{"UTC-3", Override{OffsetSec: -10800, HasOffset: true}, nil},
		{"Z", Override{HasOffset: true}, nil},
		{"Europe/Berlin", Override{Zone: "Europe/Berlin"}, nil},
		{"2025-06-01T12:00:00-03:00", Override{Instant: time.Date(2025, 6, 1, 15, 0, 0, 0, time.UTC), HasInstant: true}, nil},
		{"GMT+3", Override{}, ErrBadOverride},
		{"UTC+25", Override{}, ErrBadOverride},
	}
	for _, tc := range tests {
		got, err := ParseOverride(tc.in)
		if !errors.Is(err, tc.err) {
			t.Errorf("ParseOverride(%q) err = %v, want %v", tc.in, err, tc.err)
			continue
		}
		if got.HasInstant != tc.want.HasInstant || !got.Instant.Equal(tc.want.Instant) ||
			got.HasOffset != tc.want.HasOffset || got.OffsetSec != tc.want.OffsetSec || got.Zone != tc.want.Zone {
			t.Errorf("ParseOverride(%q) = %+v, want %+v", tc.in, got, tc.want)
		}
		if err == nil && !tc.want.IsZero() {
			back, err := ParseOverride(got.String())
			if err != nil || back.String() != got.String() {
				t.Errorf("round trip of %q: %q, %v", tc.in, back.String(), err)
			}
		}
	}
}

func TestClaimErrors(t *testing.T) {
	f := finder(t)
	tests := []struct {
		name string
		in   ClaimInput
		want error
	}{
		{"nothing", ClaimInput{}, ErrNoBasis},
		{"wall only", ClaimInput{Wall: wall(2025, 6, 1, 12, 0)}, ErrNoBasis},
		{"unknown zone", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), Override: ov(t, "Europe/Atlantis")}, ErrBadOverride},
		{"offset without wall", ClaimInput{Override: ov(t, "+02:00")}, ErrBadOverride},
		{"bad wall", ClaimInput{Wall: wall(2025, 2, 30, 12, 0), Override: ov(t, "+02:00")}, ErrInvalidWall},
		{"bad place", ClaimInput{Wall: wall(2025, 6, 1, 12, 0), HasPlace: true, LatDeg: 100}, ErrInvalidCoordinates},
	}
	for _, tc := range tests {
		if _, err := f.Claim(tc.in); !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.name, err, tc.want)
		}
	}
}

// TestConcurrentLookups: the first lookups on a fresh Finder come from several
// goroutines at once; the data is loaded once and every answer is right (run with
// -race to check for data races).
func TestConcurrentLookups(t *testing.T) {
	if testing.Short() {
		t.Skip("loads a second copy of the boundary data")
	}
	f := NewFinder(nil)
	var wg sync.WaitGroup
	for g := 0; g < 8; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := 0; i < 50; i++ {
				p, err := f.Lookup(35.6762, 139.6503)
				if err != nil || len(p.Zones) != 1 || p.Zones[0] != "Asia/Tokyo" {
					t.Errorf("Tokyo: %v %v (common knowledge: Asia/Tokyo)", p.Zones, err)
					return
				}
				if _, err := f.DB().Load("Asia/Tokyo"); err != nil {
					t.Error(err)
					return
				}
			}
		}()
	}
	wg.Wait()
}

func TestZoneMapVersion(t *testing.T) {
	v, err := finder(t).ZoneMapVersion()
	if err != nil || v == "" {
		t.Fatalf("%q %v", v, err)
	}
	t.Log(v)
}
