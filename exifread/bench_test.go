package exifread

import (
	"os"
	"path/filepath"
	"sync"
	"testing"

	"github.com/gnomon-forensics/gnomon/internal/testkit/benchset"
)

var (
	benchOnce sync.Once
	benchBase []byte
	benchErr  error
)

// benchFolder writes n multi-megabyte JPEGs (3000x2000, about 2.7 MB) into a
// temporary folder.
func benchFolder(b *testing.B, n int) []string {
	b.Helper()
	benchOnce.Do(func() { benchBase, benchErr = benchset.Base(3000, 2000) })
	if benchErr != nil {
		b.Fatal(benchErr)
	}
	dir := b.TempDir()
	if err := benchset.Write(dir, n, benchBase, nil); err != nil {
		b.Fatal(err)
	}
	files, _ := filepath.Glob(filepath.Join(dir, "*.jpg"))
	return files
}

// BenchmarkMetadataPerFile: metadata only (no SHA-256), one file per op.
func BenchmarkMetadataPerFile(b *testing.B) {
	files := benchFolder(b, 50)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rec := ReadFile(files[i%len(files)], Options{SkipHash: true})
		if rec.Err != nil || rec.DateTimeOriginal == nil {
			b.Fatal(rec.Err)
		}
	}
}

// BenchmarkMetadataAndSHA256: full reading with the streamed SHA-256; the
// throughput (MB/s) is over the whole files.
func BenchmarkMetadataAndSHA256(b *testing.B) {
	files := benchFolder(b, 20)
	st, err := os.Stat(files[0])
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(st.Size())
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		rec := ReadFile(files[i%len(files)], Options{})
		if rec.Err != nil || len(rec.SHA256) != 64 {
			b.Fatal(rec.Err)
		}
	}
}
