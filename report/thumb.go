package report

import (
	"bytes"
	"errors"
	"fmt"
	"image"
	_ "image/gif"  // decoders for image.DecodeConfig
	_ "image/jpeg" //
	_ "image/png"  //
	"io"

	"github.com/disintegration/imaging"
	_ "golang.org/x/image/tiff" // TIFF-based raw previews
	_ "golang.org/x/image/webp" //
)

// Thumbnail sizes, in pixels on the longer side.
const (
	// MinPreviewPx is the smallest embedded preview used as it is: below it a
	// card would show a blurred image, so the full image is decoded instead.
	MinPreviewPx = 160
	// ThumbPx is the longer side of the written thumbnail.
	ThumbPx = 320
	// MaxDecodePixels bounds the images WriteThumbnail decodes (width ×
	// height), checked from the header before any pixel is decoded, so a
	// crafted header cannot make the tool allocate gigabytes (a
	// "decompression bomb"). 120 megapixels covers current camera sensors.
	MaxDecodePixels = 120_000_000
)

// ErrTooLarge reports an image whose declared size exceeds MaxDecodePixels.
var ErrTooLarge = errors.New("image larger than the decoding limit")

// WriteThumbnail writes a JPEG thumbnail of at most ThumbPx on its longer
// side to dst, displayed the right way up. embedded is the photo's embedded
// EXIF preview (may be nil); when it decodes and is at least MinPreviewPx on
// its longer side it is used (about 0.2 ms), otherwise open is called to
// read the photo itself, whose size is checked before decoding (see
// MaxDecodePixels). orientation is the EXIF Orientation tag (1-8; anything
// else is treated as 1); it is applied to the small image after resizing,
// which is far cheaper than rotating the full one. The embedded preview is
// taken to be stored like the main image, unrotated, as cameras write it.
// The file is written under a temporary name and renamed when complete (not
// fsynced; see writeFileRenamed). dst must lie inside the report folder: the
// caller chooses it, and this function never derives a path from the evidence.
func WriteThumbnail(dst string, embedded []byte, open func() (io.ReadCloser, error), orientation int) error {
	img, err := thumbSource(embedded, open)
	if err != nil {
		return fmt.Errorf("report: thumbnail %s: %w", dst, err)
	}
	b := img.Bounds()
	if b.Dx() > ThumbPx || b.Dy() > ThumbPx {
		img = imaging.Fit(img, ThumbPx, ThumbPx, imaging.Box)
	}
	img = Orient(img, orientation)
	return writeFileRenamed(dst, func(w io.Writer) error {
		return imaging.Encode(w, img, imaging.JPEG, imaging.JPEGQuality(82))
	}, false)
}

// thumbSource returns the embedded preview if it is usable, else the decoded photo.
func thumbSource(embedded []byte, open func() (io.ReadCloser, error)) (image.Image, error) {
	if len(embedded) > 0 {
		if cfg, _, err := image.DecodeConfig(bytes.NewReader(embedded)); err == nil &&
			max(cfg.Width, cfg.Height) >= MinPreviewPx && int64(cfg.Width)*int64(cfg.Height) <= MaxDecodePixels {
			if img, err := imaging.Decode(bytes.NewReader(embedded)); err == nil {
				return img, nil
			}
		}
	}
	if open == nil {
		return nil, errors.New("no usable preview and no way to open the image")
	}
	rc, err := open()
	if err != nil {
		return nil, err
	}
	cfg, _, err := image.DecodeConfig(rc)
	rc.Close()
	if err != nil {
		return nil, fmt.Errorf("read image header: %w", err)
	}
	if cfg.Width <= 0 || cfg.Height <= 0 || int64(cfg.Width)*int64(cfg.Height) > MaxDecodePixels {
		return nil, fmt.Errorf("%d×%d pixels: %w", cfg.Width, cfg.Height, ErrTooLarge)
	}
	rc, err = open()
	if err != nil {
		return nil, err
	}
	defer rc.Close()
	img, err := imaging.Decode(rc)
	if err != nil {
		return nil, fmt.Errorf("decode image: %w", err)
	}
	return img, nil
}

// Orient turns an image stored with EXIF Orientation o (CIPA DC-008, tag
// 0x0112) into the way it is meant to be seen. The EXIF table says where the
// stored 0th row and 0th column lie in the view:
//
//	1 top, left      5 left, top
//	2 top, right     6 right, top
//	3 bottom, right  7 right, bottom
//	4 bottom, left   8 left, bottom
//
// Values outside 1-8 mean "unknown" and leave the image as it is.
func Orient(img image.Image, o int) image.Image {
	switch o {
	case 2:
		return imaging.FlipH(img)
	case 3:
		return imaging.Rotate180(img)
	case 4:
		return imaging.FlipV(img)
	case 5:
		return imaging.Transpose(img)
	case 6:
		return imaging.Rotate270(img) // 90° clockwise
	case 7:
		return imaging.Transverse(img)
	case 8:
		return imaging.Rotate90(img) // 90° counter-clockwise
	}
	return img
}
