package marks

import (
	"errors"
	"fmt"
	"math"
)

// ErrNoFocal is returned when nothing gives the focal length: no 35 mm
// equivalent, no focal length with a focal-plane resolution, no override.
var ErrNoFocal = errors.New("no focal length: the marks need FocalLengthIn35mmFormat, FocalLength with FocalPlaneXResolution, or the focal length in pixels from the examiner")

// FocalInput is what the photo's EXIF (or the examiner) says about the
// lens, with the size of the photo as displayed.
type FocalInput struct {
	WidthPx, HeightPx        int
	FocalLength35mm          float64 // EXIF FocalLengthIn35mmFormat, mm; 0 when absent
	FocalLengthMM            float64 // EXIF FocalLength, mm; 0 when absent
	FocalPlaneXResolution    float64 // EXIF, pixels per FocalPlaneResolutionUnit
	FocalPlaneResolutionUnit int     // EXIF: 2 inch, 3 centimetre (4 millimetre, 5 micrometre as some writers use)
	OverridePx               float64 // the examiner's focal length in pixels (from a calibration); 0 when none
	OverrideSDPct            float64 // its 1-sigma in per cent; 0 = 1 %
}

// Focal is the focal length in pixels with its 1-sigma, where it came from
// (plain words) and any warning a person should read.
type Focal struct {
	Px, SDPx float64
	From     string
	Warnings []string
}

// Uncertainties of the focal length (1-sigma), common practice:
const (
	// Makers round FocalLengthIn35mmFormat to whole millimetres and do not
	// all scale it the same way; 3 % covers both for usual lenses (the
	// prototype of issue 13 used 3 %).
	focal35SDPct = 3.0
	// FocalLength and the focal-plane resolution come from the maker's
	// design data: 2 %.
	focalPlaneSDPct = 2.0
	// An examiner's calibration: 1 % unless stated.
	overrideSDPct = 1.0
	// A photo whose proportions fit no usual sensor frame may be cropped:
	// its focal length is then known only to 10 %.
	croppedSDPct = 10.0
)

// diag35mm is the diagonal of the 36 × 24 mm frame of 35 mm film.
var diag35mm = math.Hypot(36, 24)

// usualFrames are the long:short proportions of usual sensor frames.
var usualFrames = []float64{4.0 / 3, 3.0 / 2, 16.0 / 9, 1}

// FocalFromEXIF returns the focal length in pixels of the photo as
// displayed. The 35 mm equivalent is taken by the diagonal convention
// (CIPA DC-008, the EXIF standard, defines it as the focal length of a
// 35 mm film camera with the same angle of view; the diagonal is the usual
// reading): f_px = f35 × diagonal_px / 43.27 mm. Makers that scale by the
// frame's width instead differ by up to 4 % on a 4:3 frame; half that
// difference is added (in quadrature) to the 1-sigma. The 35 mm equivalent
// is preferred over FocalLength × FocalPlaneXResolution because it scales
// with the displayed size (a resized copy keeps it right), while the
// focal-plane resolution refers to the sensor's own pixels.
func FocalFromEXIF(in FocalInput) (Focal, error) {
	w, h := float64(in.WidthPx), float64(in.HeightPx)
	if !(w > 0 && h > 0) {
		return Focal{}, fmt.Errorf("image size %d×%d: %w", in.WidthPx, in.HeightPx, ErrInvalid)
	}
	long, short := math.Max(w, h), math.Min(w, h)
	var f Focal
	switch {
	case in.OverridePx > 0 && finite(in.OverridePx):
		f = Focal{Px: in.OverridePx, SDPx: in.OverridePx * sdOr(in.OverrideSDPct, overrideSDPct) / 100, From: "the examiner's focal length in pixels"}
		return f, nil
	case in.FocalLength35mm > 0 && finite(in.FocalLength35mm):
		px := in.FocalLength35mm * math.Hypot(w, h) / diag35mm
		byWidth := in.FocalLength35mm * long / 36
		conv := 100 * math.Abs(byWidth-px) / px / 2
		f = Focal{Px: px, SDPx: px * math.Hypot(focal35SDPct, conv) / 100, From: "the 35 mm equivalent focal length (EXIF)"}
	case in.FocalLengthMM > 0 && in.FocalPlaneXResolution > 0 && finite(in.FocalLengthMM, in.FocalPlaneXResolution):
		mmPerUnit := map[int]float64{2: 25.4, 3: 10, 4: 1, 5: 0.001}[in.FocalPlaneResolutionUnit]
		if mmPerUnit == 0 {
			return Focal{}, fmt.Errorf("FocalPlaneResolutionUnit %d: not a unit of length: %w", in.FocalPlaneResolutionUnit, ErrNoFocal)
		}
		px := in.FocalLengthMM * in.FocalPlaneXResolution / mmPerUnit
		f = Focal{Px: px, SDPx: px * focalPlaneSDPct / 100, From: "the focal length and focal-plane resolution (EXIF)"}
		f.Warnings = append(f.Warnings, "the focal-plane resolution refers to the sensor's own pixels: if this copy was resized, the focal length in pixels is wrong by the same factor")
	default:
		return Focal{}, ErrNoFocal
	}
	fits := false
	for _, r := range usualFrames {
		fits = fits || math.Abs(long/short/r-1) < 0.01
	}
	if !fits {
		f.SDPx = math.Max(f.SDPx, f.Px*croppedSDPct/100)
		f.Warnings = append(f.Warnings, fmt.Sprintf("the photo's proportions (%d×%d) fit no usual camera frame: it may be cropped, which moves the centre of the picture and changes the focal length in pixels; the focal length's uncertainty is widened to %g %%", in.WidthPx, in.HeightPx, croppedSDPct))
	}
	return f, nil
}
