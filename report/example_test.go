package report_test

import (
	"bytes"
	"errors"
	"fmt"
	"image"
	"image/jpeg"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/disintegration/imaging"
	"github.com/gnomon-forensics/gnomon/report"
)

func f(x float64) *float64 { return &x }

func exampleAudit() *report.Audit {
	return &report.Audit{
		Schema: report.SchemaID,
		Tool:   report.Tool{Name: "gnomon", Version: "0.1.0"},
		Photos: []report.Photo{{
			Path: "b\xffd.jpg", Verdict: "zone_slip", Lat: f(43.21), Lon: f(5.37),
			OffsetS: f(-7200), ClaimedLocal: "=1+1",
		}},
	}
}

func ExampleWriteJSON() {
	var b bytes.Buffer
	if err := report.WriteJSON(&b, exampleAudit()); err != nil {
		panic(err)
	}
	for _, line := range strings.Split(b.String(), "\n") {
		if strings.Contains(line, `"path`) {
			fmt.Println(strings.TrimSpace(line))
		}
	}
	// Output:
	// "path": "b\ufffdd.jpg",
	// "path_raw_b64": "Yv9kLmpwZw==",
}

func ExampleReadJSON() {
	var b bytes.Buffer
	_ = report.WriteJSON(&b, exampleAudit())
	a, err := report.ReadJSON(&b)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%q\n", a.Photos[0].Path)
	// Output: "b\xffd.jpg"
}

func ExampleWriteCSV() {
	var b bytes.Buffer
	_ = report.WriteCSV(&b, exampleAudit())
	row := strings.Split(strings.Split(b.String(), "\n")[1], ",")
	fmt.Println(row[7], row[16]) // claimed_local, offset_s
	// Output: '=1+1 -7200
}

func ExampleNeutraliseCell() {
	fmt.Println(report.NeutraliseCell("@SUM(A1:A9)"), report.NeutraliseCell("IMG_0001.JPG"))
	// Output: '@SUM(A1:A9) IMG_0001.JPG
}

func ExampleWriteGeoJSON() {
	var b bytes.Buffer
	_ = report.WriteGeoJSON(&b, exampleAudit())
	i := strings.Index(b.String(), `"coordinates"`)
	fmt.Println(strings.Join(strings.Fields(b.String()[i:i+60]), " "))
	// Output: "coordinates": [ 5.37, 43.21 ]
}

func ExampleWriteHTML() {
	var b bytes.Buffer
	a := exampleAudit()
	a.Photos[0].Camera = "<script>alert(1)</script>"
	_ = report.WriteHTML(&b, a)
	fmt.Println(strings.Contains(b.String(), "<script"), strings.Contains(b.String(), "&lt;script&gt;"))
	// Output: false true
}

func ExampleWriteThumbnail() {
	dir, _ := os.MkdirTemp("", "thumbs")
	defer os.RemoveAll(dir)
	var photo bytes.Buffer
	_ = jpeg.Encode(&photo, image.NewGray(image.Rect(0, 0, 1200, 800)), nil)
	open := func() (io.ReadCloser, error) { return io.NopCloser(bytes.NewReader(photo.Bytes())), nil }
	dst := filepath.Join(dir, "0001.jpg")
	if err := report.WriteThumbnail(dst, nil, open, 6); err != nil {
		panic(err)
	}
	img, _ := imaging.Open(dst)
	fmt.Println(img.Bounds().Dx(), "x", img.Bounds().Dy())
	// Output: 213 x 320
}

func ExampleOrient() {
	img := image.NewGray(image.Rect(0, 0, 4, 3))
	fmt.Println(report.Orient(img, 8).Bounds().Size())
	// Output: (3,4)
}

func ExampleWriteFileAtomic() {
	dir, _ := os.MkdirTemp("", "report")
	defer os.RemoveAll(dir)
	p := filepath.Join(dir, "report.csv")
	err := report.WriteFileAtomic(p, func(w io.Writer) error { return report.WriteCSV(w, exampleAudit()) })
	entries, _ := os.ReadDir(dir)
	fmt.Println(err, len(entries), entries[0].Name())
	// Output: <nil> 1 report.csv
}

func ExampleVisible() {
	fmt.Println(report.Visible("holiday\u202egpj.exe\xff"))
	// Output: holiday⟦U+202E⟧gpj.exe⟦0xFF⟧
}

func ExampleCSVColumns() {
	cols := report.CSVColumns()
	fmt.Println(len(cols), cols[0], cols[len(cols)-1])
	// Output: 32 path clock_reset
}

// A caller that produces photos one at a time, in report order, streams them
// into report.json without holding the batch.
func ExampleNewJSONSink() {
	var b bytes.Buffer
	s := report.NewJSONSink(&b, &report.Audit{Tool: report.Tool{Name: "gnomon"}})
	for _, path := range []string{"a/1.jpg", "a/2.jpg"} {
		if err := s.Photo(&report.Photo{Path: path, Verdict: "unverified"}); err != nil {
			panic(err)
		}
	}
	if err := s.Close(); err != nil {
		panic(err)
	}
	for _, line := range strings.Split(b.String(), "\n") {
		if strings.Contains(line, `"path"`) || strings.Contains(line, `"schema"`) {
			fmt.Println(strings.TrimSpace(line))
		}
	}
	// Output:
	// "schema": "gnomon.audit/1",
	// "path": "a/1.jpg",
	// "path": "a/2.jpg",
}

// A photo out of report order is refused, naming both paths.
func ExampleNewCSVSink() {
	var b bytes.Buffer
	s := report.NewCSVSink(&b)
	_ = s.Photo(&report.Photo{Path: "b.jpg"})
	err := s.Photo(&report.Photo{Path: "a.jpg"})
	fmt.Println(errors.Is(err, report.ErrOrder))
	fmt.Println(err)
	// Output:
	// true
	// report: write CSV: photo "a.jpg" (root "") given after "b.jpg" (root ""): photo out of report order
}

func ExampleNewGeoJSONSink() {
	var b bytes.Buffer
	s := report.NewGeoJSONSink(&b)
	_ = s.Photo(&report.Photo{Path: "quay.jpg", Lat: f(43.21), Lon: f(5.37)})
	_ = s.Close()
	i := strings.Index(b.String(), `"coordinates"`)
	fmt.Println(strings.Join(strings.Fields(b.String()[i:i+60]), " "))
	// Output: "coordinates": [ 5.37, 43.21 ]
}

// The cards are chosen from the verdicts before the first photo arrives;
// the sink keeps only the carded photos until Close renders the page.
func ExampleNewHTMLSink() {
	verdicts := []string{"consistent", "zone_slip", "unverified"}
	var b bytes.Buffer
	s := report.NewHTMLSink(&b, &report.Audit{}, report.Carded(verdicts))
	for i, v := range verdicts {
		_ = s.Photo(&report.Photo{Path: fmt.Sprintf("DSC_%04d.jpg", i), Verdict: v})
	}
	_ = s.Close()
	fmt.Println(strings.Count(b.String(), `<article class="card`), "cards")
	// Output: 3 cards
}
