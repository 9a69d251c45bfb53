package report_test

import (
	"bytes"
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
	fmt.Println(row[6], row[15]) // claimed_local, offset_s
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
	// Output: 23 path error
}
