// Command gen writes the scale benchmark's folder of small photos:
//
//	go run ./internal/testkit/smallset/gen -n 100000 -out DIR [-big K]
package main

import (
	"flag"
	"fmt"
	"os"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/testkit/smallset"
)

func main() {
	n := flag.Int("n", 1000, "number of small photos")
	big := flag.Int("big", 0, "number of extra multi-megabyte photos")
	out := flag.String("out", "", "output folder (created)")
	flag.Parse()
	if *out == "" {
		fmt.Fprintln(os.Stderr, "gen: -out is required")
		os.Exit(2)
	}
	start := time.Now()
	c, err := smallset.Write(*out, *n, smallset.Options{Big: *big})
	if err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	fmt.Printf("wrote %d photos to %s in %.1f s\n", c, *out, time.Since(start).Seconds())
}
