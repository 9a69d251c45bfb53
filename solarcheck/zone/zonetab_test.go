package zone

import (
	"math"
	"testing"
)

// TestZoneTab reads lines of the embedded zone.tab (IANA tz database) and
// checks them against the line as printed in the file and common
// knowledge of where the cities are.
func TestZoneTab(t *testing.T) {
	tab := NewZoneTab()
	tests := []struct {
		source   string
		zone     string
		country  string
		lat, lon float64 // degrees, from the line's ISO 6709 text
	}{
		{"zone.tab: ES +4024-00341 Europe/Madrid", "Europe/Madrid", "ES", 40 + 24.0/60, -(3 + 41.0/60)},
		{"zone.tab: US +404251-0740023 America/New_York", "America/New_York", "US", 40 + 42.0/60 + 51.0/3600, -(74 + 0.0/60 + 23.0/3600)},
		{"zone.tab: AU -3352+15113 Australia/Sydney", "Australia/Sydney", "AU", -(33 + 52.0/60), 151 + 13.0/60},
		{"zone.tab: RU +554521+0373704 Europe/Moscow", "Europe/Moscow", "RU", 55 + 45.0/60 + 21.0/3600, 37 + 37.0/60 + 4.0/3600},
	}
	for _, tc := range tests {
		e, ok := tab.Lookup(tc.zone)
		if !ok || e.Country != tc.country || math.Abs(e.LatDeg-tc.lat) > 1e-9 || math.Abs(e.LonDeg-tc.lon) > 1e-9 {
			t.Errorf("%s: got %+v, %v", tc.source, e, ok)
		}
	}
	for _, name := range []string{"Etc/GMT+3", "US/Pacific", "Atlantis/Capital"} {
		if _, ok := tab.Lookup(name); ok {
			t.Errorf("%s is not a line of zone.tab", name)
		}
	}
	// Every zone zone.tab names is one the embedded database can load
	// (zone.tab and zoneinfo.zip come from neighbouring releases).
	db := NewDB()
	for name := range tab.m {
		if _, err := db.Load(name); err != nil {
			t.Errorf("zone.tab names %s, which the embedded database cannot load: %v", name, err)
		}
	}
	if len(tab.m) < 300 {
		t.Errorf("only %d zones parsed", len(tab.m))
	}
}
