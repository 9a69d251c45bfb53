package zone_test

import (
	"fmt"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

func ExampleFinder_Lookup() {
	f := zone.NewFinder(nil)             // boundary data loads on the first lookup
	p, err := f.Lookup(27.7172, 85.3240) // latitude first
	if err != nil {
		panic(err)
	}
	fmt.Println(p.Zones, p.AtSea)
	sea, _ := f.Lookup(40, -30)
	fmt.Println(sea.Zones, sea.AtSea)
	// Output:
	// [Asia/Kathmandu] false
	// [Etc/GMT+2] true
}

func ExampleResolve() {
	db := zone.NewDB()
	berlin, _ := db.Load("Europe/Berlin")
	res, _ := zone.Resolve(zone.Wall{Year: 2025, Month: time.March, Day: 30, Hour: 2, Minute: 30}, berlin)
	fmt.Println(res.Kind)
	for _, c := range res.Candidates {
		fmt.Println(c.UTC.Format(time.RFC3339), c.OffsetSec/3600)
	}
	// Output:
	// skipped
	// 2025-03-30T00:30:00Z 2
	// 2025-03-30T01:30:00Z 1
}

func ExampleFinder_Claim() {
	f := zone.NewFinder(nil)
	c, err := f.Claim(zone.ClaimInput{
		Wall:     zone.Wall{Year: 2025, Month: time.November, Day: 2, Hour: 1, Minute: 30},
		Override: zone.Override{Zone: "America/New_York"},
	})
	if err != nil {
		panic(err)
	}
	fmt.Println(c.Rule, c.Kind)
	for _, cand := range c.Candidates {
		fmt.Println(cand.UTC.Format(time.RFC3339), cand.Abbrev)
	}
	// Output:
	// override_zone repeated
	// 2025-11-02T05:30:00Z EDT
	// 2025-11-02T06:30:00Z EST
}

func ExampleNauticalZone() {
	name, offsetSec, _ := zone.NauticalZone(-45)
	fmt.Println(name, offsetSec/3600)
	// Output: Etc/GMT+3 -3
}

func ExampleDB_Load() {
	db := zone.NewDB()
	loc, _ := db.Load("America/Caracas")
	_, off := time.Date(2010, 6, 1, 0, 0, 0, 0, time.UTC).In(loc).Zone()
	fmt.Println(db.Version() != "", off) // −4:30 from 2007 to 2016
	// Output: true -16200
}

// Cuba puts its clocks forward at midnight (tz database, northamerica, Rule
// Cuba 2012 max Mar Sun>=8 0:00s): 2025-03-09 had no midnight in Havana and
// began at the change, 05:00 UTC. In Denver the same date began at an
// ordinary midnight, 07:00 UTC, and was 23 hours long.
func ExampleDayStart() {
	db := zone.NewDB()
	for _, name := range []string{"America/Havana", "America/Denver"} {
		loc, _ := db.Load(name)
		start, res, _ := zone.DayStart(2025, time.March, 9, loc)
		next, _, _ := zone.DayStart(2025, time.March, 10, loc)
		fmt.Println(name, res.Kind, start.Format(time.RFC3339), next.Sub(start))
	}
	// Output:
	// America/Havana skipped 2025-03-09T05:00:00Z 23h0m0s
	// America/Denver normal 2025-03-09T07:00:00Z 23h0m0s
}
