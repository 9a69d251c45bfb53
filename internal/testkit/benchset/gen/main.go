// Command gen writes the benchmark photo folder: go run ./internal/testkit/benchset/gen -n 1000 -out DIR [-thumb]
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/gnomon-forensics/gnomon/internal/testkit/benchset"
)

func main() {
	n := flag.Int("n", 1000, "number of photos")
	w := flag.Int("w", 3000, "width in pixels")
	h := flag.Int("h", 2000, "height in pixels")
	out := flag.String("out", "", "output folder (created)")
	thumb := flag.Bool("thumb", false, "embed a 160x107 preview in IFD1, as cameras do")
	flag.Parse()
	if *out == "" {
		fmt.Fprintln(os.Stderr, "gen: -out is required")
		os.Exit(2)
	}
	if err := os.MkdirAll(*out, 0o755); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	base, err := benchset.Base(*w, *h)
	if err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	var preview []byte
	if *thumb {
		if preview, err = benchset.Base(160, 107); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
	}
	if err := benchset.Write(*out, *n, base, preview); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	fmt.Printf("wrote %d photos of %d bytes to %s\n", *n, len(base), *out)
}
