// Command hashpass is the floor of the audit benchmark: one goroutine reads
// every regular file under the given folders and computes its SHA-256 with
// crypto/sha256, as any audit must at least do. It prints the file count,
// the bytes hashed and the time taken.
//
//	go run ./internal/testkit/hashpass DIR...
package main

import (
	"crypto/sha256"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"time"
)

func main() {
	start := time.Now()
	var files, bytes int64
	buf := make([]byte, 1<<20)
	for _, dir := range os.Args[1:] {
		err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
			if err != nil || !d.Type().IsRegular() {
				return err
			}
			f, err := os.Open(p)
			if err != nil {
				return err
			}
			defer f.Close()
			h := sha256.New()
			n, err := io.CopyBuffer(h, f, buf)
			if err != nil {
				return fmt.Errorf("%s: %w", p, err)
			}
			_ = h.Sum(nil)
			files++
			bytes += n
			return nil
		})
		if err != nil {
			fmt.Fprintln(os.Stderr, "hashpass:", err)
			os.Exit(1)
		}
	}
	s := time.Since(start).Seconds()
	fmt.Printf("hashpass: %d files, %.0f MB in %.3f s (%.0f MB/s)\n", files, float64(bytes)/1e6, s, float64(bytes)/1e6/s)
}
