package spa

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/angle"
)

// The interpolated ephemeris must reproduce full SPA far inside SPA's own
// ±0.0003°.
func TestEphemerisMatchesAt(t *testing.T) {
	t0 := time.Date(2023, 12, 30, 0, 0, 0, 0, time.UTC)
	span := 400 * 24 * time.Hour
	e := NewEphemeris(t0, span.Seconds(), DeltaT)
	r := rand.New(rand.NewPCG(3, 4))
	for i := 0; i < 3000; i++ {
		s := r.Float64() * span.Seconds()
		ts := t0.Add(time.Duration(s * 1e9))
		o := NewObserver(r.Float64()*180-90, r.Float64()*360-180, 0)
		got := e.At(s).Topocentric(o)
		want := At(ts, o, DeltaT(ts))
		dAz := math.Abs(angle.Wrap180(got.AzimuthDeg-want.AzimuthDeg)) * math.Cos(angle.Rad(want.AltitudeDeg))
		if dAz > 1e-5 || math.Abs(got.AltitudeDeg-want.AltitudeDeg) > 1e-5 {
			t.Fatalf("%s: %s at %.2f,%.2f: interpolated az %.7f alt %.7f, spa.At %.7f %.7f",
				"self-consistency with At (itself checked against the SPA report and astropy)", ts, o.LatDeg, o.LonDeg, got.AzimuthDeg, got.AltitudeDeg, want.AzimuthDeg, want.AltitudeDeg)
		}
	}
}
