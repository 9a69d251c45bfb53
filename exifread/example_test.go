package exifread_test

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"

	"github.com/gnomon-forensics/gnomon/exifread"
)

// Read one photo (a fixture written by package exifwrite) from disk.
func ExampleReadFile() {
	rec := exifread.ReadFile(filepath.Join("testdata", "fixtures", "jpeg_full_mm.jpg"), exifread.Options{})
	t := rec.DateTimeOriginal
	utc, _ := t.UTC()
	p := rec.GPS.Position
	fmt.Println(rec.Container, rec.Err == nil)
	fmt.Println(t.Raw, t.SubSecRaw, t.OffsetRaw, "->", utc.Format("2006-01-02T15:04:05.00Z"))
	fmt.Printf("%.4f %.4f valid=%v source=%s\n", *p.LatDeg, *p.LonDeg, p.Valid, p.Source)
	fmt.Println(rec.Make, "/", rec.Model)
	// Output:
	// jpeg true
	// 2024:06:21 14:03:27 250 +02:00 -> 2024-06-21T12:03:27.25Z
	// 46.5197 6.6323 valid=true source=exif
	// Gnomon Test Optics / GT-1 Mark II
}

// Read bytes already in memory.
func ExampleRead() {
	b, err := os.ReadFile(filepath.Join("testdata", "fixtures", "heif_mdat.heic"))
	if err != nil {
		panic(err)
	}
	rec := exifread.Read(bytes.NewReader(b), int64(len(b)), exifread.Options{SkipHash: true})
	fmt.Println(rec.Container, rec.DateTimeOriginal.Raw, rec.GPS.ImgDirectionDeg.Value, rec.GPS.ImgDirectionRef)
	// Output:
	// heif 2024:06:21 14:03:27 237.15 T
}
