// Command zonebench measures one zone finder in a fresh process, so that the
// finders can be compared side by side (testdata/bench_zone.sh runs it once per
// finder under GNU time for the peak resident memory):
//
//	gnomon  zone.Finder (the lazy exact finder gnomon uses)
//	exact   tzf.NewFinderFromCompressed (tzf's exact polygon finder)
//	fuzzy   tzf.NewFuzzyFinderFromPB over the preindex tiles (tzf's fast finder)
//	default tzf.NewDefaultFinder (fuzzy first, exact for its names)
//
// It prints the time to the first answer (loading included), the bytes
// allocated and kept by then, the time per lookup over a cold and a warm pass
// of the same points (uniform over the sphere, fixed seed), and the share of
// points with no answer and with several zones.
package main

import (
	"flag"
	"fmt"
	"log"
	"math"
	"math/rand/v2"
	"os"
	"runtime"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
	"github.com/ringsaturn/tzf"
	tzfrellite "github.com/ringsaturn/tzf-rel-lite"
	pb "github.com/ringsaturn/tzf/gen/go/tzf/v1"
	"google.golang.org/protobuf/proto"
)

// lookup answers the zones at (lat, lon); nil for no answer.
type lookup func(lat, lon float64) []string

func main() {
	which := flag.String("finder", "gnomon", "gnomon, exact, fuzzy or default")
	n := flag.Int("n", 100000, "points per pass")
	flag.Parse()

	runtime.GC()
	var m0 runtime.MemStats
	runtime.ReadMemStats(&m0)
	start := time.Now()
	find, err := build(*which)
	if err != nil {
		log.Fatal(err)
	}
	find(27.7172, 85.3240) // the self-test's place: the first answer
	first := time.Since(start)
	var m1 runtime.MemStats
	runtime.ReadMemStats(&m1)
	runtime.GC()
	var m2 runtime.MemStats
	runtime.ReadMemStats(&m2)

	rng := rand.New(rand.NewPCG(1, 2))
	pts := make([][2]float64, *n)
	for i := range pts { // uniform over the sphere
		pts[i] = [2]float64{angle.Deg(math.Asin(2*rng.Float64() - 1)), 360*rng.Float64() - 180}
	}
	pass := func() (time.Duration, int, int) {
		none, several := 0, 0
		t := time.Now()
		for _, p := range pts {
			switch z := find(p[0], p[1]); {
			case len(z) == 0:
				none++
			case len(z) > 1:
				several++
			}
		}
		return time.Since(t), none, several
	}
	cold, _, _ := pass()
	warm, none, several := pass()
	fmt.Fprintf(os.Stdout, "%-8s first answer %6.3f s  allocated %6.1f MB  kept %6.1f MB  lookup cold %6.2f µs  warm %6.2f µs  no answer %5.2f %%  several zones %5.2f %%\n",
		*which, first.Seconds(), float64(m1.TotalAlloc-m0.TotalAlloc)/1e6, float64(m2.HeapAlloc)/1e6,
		float64(cold.Microseconds())/float64(*n), float64(warm.Microseconds())/float64(*n),
		100*float64(none)/float64(*n), 100*float64(several)/float64(*n))
}

func build(which string) (lookup, error) {
	if which == "gnomon" {
		f := zone.NewFinder(nil)
		return func(lat, lon float64) []string {
			p, err := f.Lookup(lat, lon)
			if err != nil || p.Source == "nautical zone from longitude" {
				return nil
			}
			return p.Zones
		}, nil
	}
	var tf tzf.F
	var err error
	switch which {
	case "exact":
		in := &pb.CompressedTimezones{}
		if err := proto.Unmarshal(tzfrellite.LiteCompressData, in); err != nil {
			return nil, err
		}
		tf, err = tzf.NewFinderFromCompressed(in, tzf.SetDropPBTZ)
	case "fuzzy":
		in := &pb.PreindexTimezones{}
		if err := proto.Unmarshal(tzfrellite.PreindexData, in); err != nil {
			return nil, err
		}
		tf, err = tzf.NewFuzzyFinderFromPB(in)
	case "default":
		tf, err = tzf.NewDefaultFinder()
	default:
		return nil, fmt.Errorf("unknown finder %q", which)
	}
	if err != nil {
		return nil, err
	}
	if which == "default" { // its own answer is one name, fuzzy first
		return func(lat, lon float64) []string {
			if s := tf.GetTimezoneName(lon, lat); s != "" {
				return []string{s}
			}
			return nil
		}, nil
	}
	return func(lat, lon float64) []string {
		z, err := tf.GetTimezoneNames(lon, lat)
		if err != nil {
			return nil
		}
		return z
	}, nil
}
