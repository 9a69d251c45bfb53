package hostile_test

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/gnomon-forensics/gnomon/internal/testkit/hostile"
)

// Write builds the corpus and returns its manifest.
func ExampleWrite() {
	dir, err := os.MkdirTemp("", "hostile")
	if err != nil {
		fmt.Println(err)
		return
	}
	defer os.RemoveAll(dir)
	items, err := hostile.Write(filepath.Join(dir, "evidence"))
	if err != nil {
		fmt.Println(err)
		return
	}
	kinds := map[string]int{}
	for _, it := range items {
		kinds[it.Kind]++
	}
	fmt.Println(kinds["empty"], kinds["fifo"], kinds["bomb"])
	// Output: 5 1 3
}
