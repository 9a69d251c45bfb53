package report

import (
	"bytes"
	"encoding/binary"
	"errors"
	"hash/crc32"
	"image"
	"image/color"
	"image/jpeg"
	"io"
	"os"
	"path/filepath"
	"testing"

	"github.com/disintegration/imaging"
)

type corner int

const (
	topLeft corner = iota
	topRight
	bottomRight
	bottomLeft
)

func cornerXY(b image.Rectangle, c corner) (int, int) {
	switch c {
	case topRight:
		return b.Max.X - 1, b.Min.Y
	case bottomRight:
		return b.Max.X - 1, b.Max.Y - 1
	case bottomLeft:
		return b.Min.X, b.Max.Y - 1
	}
	return b.Min.X, b.Min.Y
}

// TestOrient checks each EXIF Orientation against the CIPA DC-008 (EXIF
// 2.32) table, which says on which visual side the stored 0th row and 0th
// column lie: the stored first pixel (row 0, column 0) and the last pixel of
// row 0 must land on the corners that table implies.
func TestOrient(t *testing.T) {
	red, green := color.NRGBA{255, 0, 0, 255}, color.NRGBA{0, 255, 0, 255}
	src := image.NewNRGBA(image.Rect(0, 0, 3, 2)) // 3 wide, 2 high
	src.Set(0, 0, red)
	src.Set(2, 0, green)
	tests := []struct {
		o           int
		row0, col0  string // the table's words
		first, last corner
		swapped     bool
		source      string
	}{
		{1, "top", "left side", topLeft, topRight, false, "CIPA DC-008 Orientation = 1"},
		{2, "top", "right side", topRight, topLeft, false, "CIPA DC-008 Orientation = 2"},
		{3, "bottom", "right side", bottomRight, bottomLeft, false, "CIPA DC-008 Orientation = 3"},
		{4, "bottom", "left side", bottomLeft, bottomRight, false, "CIPA DC-008 Orientation = 4"},
		{5, "left side", "top", topLeft, bottomLeft, true, "CIPA DC-008 Orientation = 5"},
		{6, "right side", "top", topRight, bottomRight, true, "CIPA DC-008 Orientation = 6"},
		{7, "right side", "bottom", bottomRight, topRight, true, "CIPA DC-008 Orientation = 7"},
		{8, "left side", "bottom", bottomLeft, topLeft, true, "CIPA DC-008 Orientation = 8"},
		{0, "unknown", "unknown", topLeft, topRight, false, "out of range: left as stored"},
		{9, "unknown", "unknown", topLeft, topRight, false, "out of range: left as stored"},
	}
	for _, tc := range tests {
		got := Orient(src, tc.o)
		b := got.Bounds()
		if (b.Dx() == 2) != tc.swapped {
			t.Errorf("o=%d: size %dx%d, swapped=%v (%s)", tc.o, b.Dx(), b.Dy(), tc.swapped, tc.source)
			continue
		}
		for _, want := range []struct {
			c   corner
			col color.NRGBA
			who string
		}{{tc.first, red, "row 0 column 0"}, {tc.last, green, "row 0 last column"}} {
			x, y := cornerXY(b, want.c)
			if c := color.NRGBAModel.Convert(got.At(x, y)).(color.NRGBA); c != want.col {
				t.Errorf("o=%d (0th row %s, 0th column %s): %s not at corner %d (%s)", tc.o, tc.row0, tc.col0, want.who, want.c, tc.source)
			}
		}
	}
}

func jpegOf(t *testing.T, w, h int, c color.NRGBA) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := jpeg.Encode(&b, imaging.New(w, h, c), nil); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

// bombPNG is a PNG header declaring w×h pixels with no pixel data
// (PNG spec, ISO/IEC 15948 §11.2.2 IHDR, CRC per §5.5).
func bombPNG(w, h uint32) []byte {
	var b bytes.Buffer
	b.WriteString("\x89PNG\r\n\x1a\n")
	ihdr := make([]byte, 17)
	copy(ihdr, "IHDR")
	binary.BigEndian.PutUint32(ihdr[4:], w)
	binary.BigEndian.PutUint32(ihdr[8:], h)
	ihdr[12], ihdr[13] = 8, 2 // 8-bit truecolour
	binary.Write(&b, binary.BigEndian, uint32(13))
	b.Write(ihdr)
	binary.Write(&b, binary.BigEndian, crc32.ChecksumIEEE(ihdr))
	return b.Bytes()
}

func TestWriteThumbnail(t *testing.T) {
	blue := color.NRGBA{0, 0, 255, 255}
	orange := color.NRGBA{255, 128, 0, 255}
	full := jpegOf(t, 1200, 800, orange)
	mustNotOpen := func() (io.ReadCloser, error) {
		return nil, errors.New("opened the full image although the preview is usable")
	}
	tests := []struct {
		name        string
		embedded    []byte
		open        func() (io.ReadCloser, error)
		orientation int
		wantW       int
		wantH       int
		wantColour  color.NRGBA // from the preview or from the full image
		wantErr     error
		source      string
	}{
		{"large preview used", jpegOf(t, 640, 480, blue), mustNotOpen, 1, 320, 240, blue, nil, "issue 5: use the embedded preview where large enough"},
		{"preview exactly 160 px", jpegOf(t, 160, 120, blue), mustNotOpen, 1, 160, 120, blue, nil, "brief: >= 160 px"},
		{"small preview: full image decoded", jpegOf(t, 120, 90, blue), opener(full), 1, 320, 213, orange, nil, "brief: otherwise decode and resize to ~320 px"},
		{"no preview, rotated 90°", nil, opener(full), 6, 213, 320, orange, nil, "CIPA DC-008 Orientation = 6 swaps sides"},
		{"broken preview: full image", []byte("\xff\xd8garbage"), opener(full), 8, 213, 320, orange, nil, "fallback"},
		{"decompression bomb refused", nil, opener(bombPNG(100000, 100000)), 1, 0, 0, color.NRGBA{}, ErrTooLarge, "issue 6: check dimensions before decoding"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dst := filepath.Join(t.TempDir(), "thumb.jpg")
			err := WriteThumbnail(dst, tc.embedded, tc.open, tc.orientation)
			if tc.wantErr != nil {
				if !errors.Is(err, tc.wantErr) {
					t.Fatalf("err = %v, want %v (%s)", err, tc.wantErr, tc.source)
				}
				if _, serr := os.Stat(dst); !os.IsNotExist(serr) {
					t.Error("a file was written despite the error")
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			img, err := imaging.Open(dst)
			if err != nil {
				t.Fatal(err)
			}
			if b := img.Bounds(); b.Dx() != tc.wantW || b.Dy() != tc.wantH {
				t.Errorf("size %dx%d, want %dx%d (%s)", b.Dx(), b.Dy(), tc.wantW, tc.wantH, tc.source)
			}
			c := color.NRGBAModel.Convert(img.At(img.Bounds().Dx()/2, img.Bounds().Dy()/2)).(color.NRGBA)
			if diff(c.R, tc.wantColour.R) > 24 || diff(c.G, tc.wantColour.G) > 24 || diff(c.B, tc.wantColour.B) > 24 {
				t.Errorf("centre colour %v, want about %v: wrong source image", c, tc.wantColour)
			}
		})
	}
}

func diff(a, b uint8) int {
	if a > b {
		return int(a - b)
	}
	return int(b - a)
}
