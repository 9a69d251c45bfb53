package marks_test

import (
	"fmt"

	"github.com/gnomon-forensics/gnomon/solarcheck/marks"
)

// The sun from three posts and their shadows, the sea horizon seen from
// 10.7 m and a quay edge whose bearing a map gives, in a 4032 × 3024 photo
// from a phone whose EXIF says 24 mm (35 mm equivalent). The marks are
// scene 2 of testdata/scenes_opencv.csv, projected by OpenCV; the scene's
// sun stood at altitude 53.95°, azimuth 281.55°.
func ExampleSolve() {
	focal, err := marks.FocalFromEXIF(marks.FocalInput{WidthPx: 4032, HeightPx: 3024, FocalLength35mm: 24})
	if err != nil {
		panic(err)
	}
	in := marks.Input{
		Camera: marks.Camera{WidthPx: 4032, HeightPx: 3024, FocalPx: focal.Px, FocalSDPx: focal.SDPx},
		Objects: []marks.Object{
			{Label: "post A", Base: marks.Point{X: 1838.00, Y: 2423.45}, Top: marks.Point{X: 1872.11, Y: 2141.13}, Tip: marks.Point{X: 1671.08, Y: 2554.45}},
			{Label: "post B", Base: marks.Point{X: 1686.87, Y: 2618.19}, Top: marks.Point{X: 1718.84, Y: 2293.58}, Tip: marks.Point{X: 1474.22, Y: 2791.77}},
			{Label: "post C", Base: marks.Point{X: 945.67, Y: 1831.96}, Top: marks.Point{X: 934.95, Y: 1440.34}, Tip: marks.Point{X: 650.64, Y: 1943.06}},
		},
		Horizon:     &marks.Horizon{A: marks.Point{X: 764.68, Y: 208.92}, B: marks.Point{X: 3338.94, Y: 545.42}, CameraHeightM: 10.688},
		GroundLines: []marks.GroundLine{{Label: "quay edge", From: marks.Point{X: 3447.48, Y: 1930.03}, To: marks.Point{X: 2927.84, Y: 1750.90}, BearingDeg: 188.67}},
	}
	res, err := marks.Solve(in)
	if err != nil {
		panic(err)
	}
	fmt.Printf("sun altitude %.1f° ± %.1f°, %s\n", res.Altitude.Deg, res.Altitude.SDDeg, res.Altitude.How)
	fmt.Printf("sun azimuth %.0f° ± %.0f°, %s\n", res.Azimuth.Deg, res.Azimuth.SDDeg, res.Azimuth.How)
	fmt.Println(res.Light.Sentence)
	// Output:
	// sun altitude 54.0° ± 0.3°, from the shadows of 3 objects
	// sun azimuth 282° ± 1°, from a ground line of known bearing
	// the shadows in this photo agree with one light source
}

// The sea horizon seen from a quay 5 m above the water lies 3.9′ below
// the true horizontal.
func ExampleDipDeg() {
	fmt.Printf("%.1f′\n", marks.DipDeg(5)*60)
	// Output: 3.9′
}

// A phone photo's focal length in pixels from its 35 mm equivalent.
func ExampleFocalFromEXIF() {
	f, err := marks.FocalFromEXIF(marks.FocalInput{WidthPx: 4032, HeightPx: 3024, FocalLength35mm: 26})
	if err != nil {
		panic(err)
	}
	fmt.Printf("%.0f ± %.0f px, from %s\n", f.Px, f.SDPx, f.From)
	// Output: 3029 ± 108 px, from the 35 mm equivalent focal length (EXIF)
}
