package democase_test

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/gnomon-forensics/gnomon/internal/democase"
)

// Build writes the invented case into a fresh folder and returns the truth
// an audit of it should find.
func ExampleBuild() {
	tmp, err := os.MkdirTemp("", "demo")
	if err != nil {
		panic(err)
	}
	defer os.RemoveAll(tmp)
	c, err := democase.Build(filepath.Join(tmp, "case"), democase.Options{})
	if err != nil {
		panic(err)
	}
	counts := map[string]int{}
	for _, p := range c.Photos {
		counts[p.Expected]++
	}
	fmt.Println(len(c.Photos), "photos from", len(c.Cameras), "sources at", c.Place.Zone)
	for _, v := range []string{"consistent", "clock_offset", "zone_slip", "dst_slip", "ampm_slip", "light_mismatch", "unverified"} {
		fmt.Println(v, counts[v])
	}
	// Output:
	// 37 photos from 9 sources at America/New_York
	// consistent 16
	// clock_offset 10
	// zone_slip 7
	// dst_slip 1
	// ampm_slip 1
	// light_mismatch 1
	// unverified 1
}
