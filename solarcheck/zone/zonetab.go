package zone

import (
	_ "embed"
	"strconv"
	"strings"
	"sync"
)

// zoneTabText is the tz database's zone.tab (release and origin in its
// first lines): for each zone, the ISO 3166 country it serves and the
// position of its principal city.
//
//go:embed zone.tab
var zoneTabText string

// TabEntry is one zone's line of zone.tab.
type TabEntry struct {
	Country        string // ISO 3166-1 alpha-2, e.g. "ES"
	LatDeg, LonDeg float64
}

// ZoneTab answers which country a zone serves and where its principal
// city lies, for ranking zones by relevance to a place. It is parsed on
// first use and safe for concurrent use.
type ZoneTab struct {
	once sync.Once
	m    map[string]TabEntry
}

// NewZoneTab returns a ZoneTab over the embedded zone.tab.
func NewZoneTab() *ZoneTab { return &ZoneTab{} }

// Lookup returns the zone's entry; false for zones zone.tab does not list
// (links such as US/Pacific, Etc/ zones).
func (t *ZoneTab) Lookup(name string) (TabEntry, bool) {
	t.once.Do(func() { t.m = parseZoneTab(zoneTabText) })
	e, ok := t.m[name]
	return e, ok
}

// parseZoneTab reads zone.tab's tab-separated lines: country code,
// ISO 6709 position (±DDMM±DDDMM or ±DDMMSS±DDDMMSS), zone name. Lines
// that do not parse are left out.
func parseZoneTab(text string) map[string]TabEntry {
	m := map[string]TabEntry{}
	for _, line := range strings.Split(text, "\n") {
		if line == "" || line[0] == '#' {
			continue
		}
		f := strings.Split(line, "\t")
		if len(f) < 3 {
			continue
		}
		lat, lon, ok := parseISO6709(f[1])
		if !ok {
			continue
		}
		m[f[2]] = TabEntry{Country: f[0], LatDeg: lat, LonDeg: lon}
	}
	return m
}

// parseISO6709 reads zone.tab's position: latitude ±DDMM[SS] then
// longitude ±DDDMM[SS].
func parseISO6709(s string) (lat, lon float64, ok bool) {
	i := strings.IndexAny(s[1:], "+-") + 1
	if i <= 0 {
		return 0, 0, false
	}
	lat, ok1 := sexagesimal(s[:i], 2)
	lon, ok2 := sexagesimal(s[i:], 3)
	return lat, lon, ok1 && ok2
}

// sexagesimal reads ±D…DMM or ±D…DMMSS with deg degree digits.
func sexagesimal(s string, deg int) (float64, bool) {
	if len(s) != 1+deg+2 && len(s) != 1+deg+4 {
		return 0, false
	}
	sign := 1.0
	if s[0] == '-' {
		sign = -1
	} else if s[0] != '+' {
		return 0, false
	}
	v, div := 0.0, 1.0
	for k := 1; k < len(s); {
		n := deg
		if k > 1 {
			n = 2
		}
		x, err := strconv.Atoi(s[k : k+n])
		if err != nil {
			return 0, false
		}
		v += float64(x) / div
		div *= 60
		k += n
	}
	return sign * v, true
}
