package exifread

import (
	"encoding/json"
	"errors"
	"fmt"
	"time"
)

// Sources of a value: where in or beside the file it was read.
const (
	SourceEXIF    = "exif"    // the EXIF/TIFF directories inside the file
	SourceXMP     = "xmp"     // an XMP packet embedded in the file
	SourceSidecar = "sidecar" // a .xmp file beside the photo
)

// Container names, decided from the file's first bytes, never from its name.
const (
	ContainerJPEG    = "jpeg"
	ContainerTIFF    = "tiff" // TIFF and TIFF-structured raw files (DNG, NEF, CR2, ARW, ORF, RW2, PEF …)
	ContainerHEIF    = "heif"
	ContainerAVIF    = "avif"
	ContainerPNG     = "png"
	ContainerWebP    = "webp"
	ContainerUnknown = "unknown"
)

// Record is the evidence read from one photo. It is a plain value: every
// field can be built by hand in a test of a later stage. Absent values are
// nil pointers, empty strings or zero; present but implausible values are
// kept raw and marked with Valid=false and a reason, never dropped, because
// an examiner may need to see exactly what the camera wrote.
type Record struct {
	// File facts.
	Path    string    `json:"path"`
	Size    int64     `json:"size"`
	SHA256  string    `json:"sha256"` // hex of the whole file, streamed; "" when hashing was skipped or failed
	ModTime time.Time `json:"mod_time"`

	// Container is one of the Container* constants, from the bytes.
	Container string `json:"container"`
	// ExtensionMismatch notes a file name extension that does not fit the
	// container found in the bytes ("" when they agree or the extension is unknown).
	ExtensionMismatch string `json:"extension_mismatch,omitempty"`

	// Err is the most serious problem met (a *FormatError, *UnsupportedError,
	// *LimitError or an I/O error), nil when the metadata was read cleanly.
	// The fields below still hold whatever could be read safely.
	Err error `json:"-"`
	// Error is Err's message; JSON null when fine.
	Error Message `json:"error"`
	// Warnings are problems that did not stop reading and did not damage
	// the metadata (a file truncated after its Exif segment, a repeated
	// segment, a disagreement between readers).
	Warnings []string `json:"warnings"`

	// Capture times, as the camera wrote them (wall clock, zone only when
	// an offset tag or an XMP date supplies one).
	DateTimeOriginal  *WallTime `json:"date_time_original"`
	DateTimeDigitized *WallTime `json:"date_time_digitized"`
	DateTime          *WallTime `json:"date_time"`

	GPS GPS `json:"gps"`

	// Camera.
	Make             string `json:"make"`
	Model            string `json:"model"`
	BodySerialNumber string `json:"body_serial_number"`
	LensModel        string `json:"lens_model"`
	ImageUniqueID    string `json:"image_unique_id"`
	Software         string `json:"software"`
	// Orientation is the EXIF Orientation value 1..8 (0 when absent).
	Orientation int `json:"orientation"`
	// PixelWidth and PixelHeight come from PixelXDimension/PixelYDimension,
	// else from ImageWidth/ImageLength of IFD0 (0 when absent).
	PixelWidth  int `json:"pixel_width"`
	PixelHeight int `json:"pixel_height"`

	// Exposure.
	ExposureTimeSec *float64 `json:"exposure_time_sec"`
	FNumber         *float64 `json:"f_number"`
	ISO             int      `json:"iso"` // PhotographicSensitivity (first value), 0 when absent
	Flash           *Flash   `json:"flash"`
	FocalLengthMM   *float64 `json:"focal_length_mm"`
	FocalLength35mm int      `json:"focal_length_35mm"` // FocalLengthIn35mmFilm in mm, 0 when absent

	// XMPSources names the fields above, other than times and GPS (which
	// carry their own Source), that were taken from XMP: JSON field name ->
	// "xmp" or "sidecar". Fields not listed came from EXIF.
	XMPSources map[string]string `json:"xmp_sources,omitempty"`

	// Thumbnail is the embedded JPEG thumbnail of IFD1, not decoded.
	Thumbnail     []byte `json:"-"`
	ThumbnailSize int    `json:"thumbnail_size"`
}

// Message is an error text that encodes as JSON null when empty, so that a
// record's "error" is null for a clean file.
type Message string

// MarshalJSON encodes "" as null.
func (m Message) MarshalJSON() ([]byte, error) {
	if m == "" {
		return []byte("null"), nil
	}
	return json.Marshal(string(m))
}

// WallTime is a date and time as written in the file: a wall clock reading
// with no zone unless an offset is known. It is never interpreted in the
// machine's local zone.
type WallTime struct {
	Raw    string `json:"raw"`
	Year   int    `json:"year"`
	Month  int    `json:"month"`
	Day    int    `json:"day"`
	Hour   int    `json:"hour"`
	Minute int    `json:"minute"`
	Second int    `json:"second"`
	// Nanosecond is from the SubSecTime* tag (or the XMP date's fraction).
	Nanosecond int    `json:"nanosecond"`
	SubSecRaw  string `json:"subsec_raw"`
	// OffsetSec is the offset from UTC in seconds (east positive) from the
	// OffsetTime* tag or an XMP date; nil when unknown.
	OffsetSec *int   `json:"offset_sec"`
	OffsetRaw string `json:"offset_raw"`
	// OffsetSource says where the offset came from when it differs from
	// Source (an XMP offset attached to an EXIF time with the same wall clock).
	OffsetSource string `json:"offset_source,omitempty"`
	// Valid is false when Raw is blank, zero or out of range; Invalid says why.
	Valid   bool   `json:"valid"`
	Invalid string `json:"invalid,omitempty"`
	Source  string `json:"source"`
}

// CaptureTime is the one rule for which tag holds the time a photo claims
// to have been taken: the first valid of DateTimeOriginal,
// DateTimeDigitized and DateTime (the last is often the time of an edit,
// which a finding that rests on it should say), returned with the tag's
// name. When none is valid, err says why: the first tag present but not
// usable, or that there is none. The audit's claim and the sheet
// template's note both use it, so they always name the same time.
func (r *Record) CaptureTime() (w *WallTime, tag string, err error) {
	for _, c := range []struct {
		tag string
		w   *WallTime
	}{
		{"DateTimeOriginal", r.DateTimeOriginal},
		{"DateTimeDigitized", r.DateTimeDigitized},
		{"DateTime", r.DateTime},
	} {
		switch {
		case c.w == nil:
		case c.w.Valid:
			return c.w, c.tag, nil
		case err == nil:
			err = fmt.Errorf("%s %s is not usable: %s", c.tag, quoted(c.w.Raw), c.w.Invalid)
		}
	}
	if err == nil {
		err = errors.New("no capture time tag")
	}
	return nil, "", err
}

// Civil returns the wall clock as a time.Time in a zone named "wall" at
// offset 0. It exists for arithmetic between wall times of one camera; the
// result is NOT an instant in UTC.
func (w WallTime) Civil() time.Time {
	return time.Date(w.Year, time.Month(w.Month), w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.FixedZone("wall", 0))
}

// In interprets the wall clock in loc (a zone the caller has inferred, for
// instance from the GPS position). The offset tag, if any, is ignored.
func (w WallTime) In(loc *time.Location) (time.Time, error) {
	if !w.Valid {
		return time.Time{}, fmt.Errorf("wall time %s: %s", quoted(w.Raw), w.Invalid)
	}
	if loc == nil {
		return time.Time{}, fmt.Errorf("wall time %s: nil location", quoted(w.Raw))
	}
	return time.Date(w.Year, time.Month(w.Month), w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, loc), nil
}

// UTC returns the instant when the offset is known; ok is false otherwise
// (there is no instant without a zone).
func (w WallTime) UTC() (t time.Time, ok bool) {
	if !w.Valid || w.OffsetSec == nil {
		return time.Time{}, false
	}
	zone := time.FixedZone(w.OffsetRaw, *w.OffsetSec)
	return time.Date(w.Year, time.Month(w.Month), w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, zone).UTC(), true
}

// GPS holds the GPS IFD's evidence. Each part records its validity and source.
type GPS struct {
	Position         *Position `json:"position"`
	AltitudeM        *Number   `json:"altitude_m"` // signed: below sea level is negative
	Time             *GPSTime  `json:"time"`
	ImgDirectionDeg  *Number   `json:"img_direction_deg"`
	ImgDirectionRef  string    `json:"img_direction_ref"` // "T" true north, "M" magnetic north, "" absent
	HPositioningErrM *Number   `json:"h_positioning_error_m"`
	DOP              *Number   `json:"dop"`
	MapDatum         string    `json:"map_datum"`
	VersionID        string    `json:"version_id"`
}

// Position is a signed latitude/longitude in degrees (north and east positive).
type Position struct {
	LatDeg  *float64 `json:"lat_deg"`
	LonDeg  *float64 `json:"lon_deg"`
	Raw     string   `json:"raw"`
	Valid   bool     `json:"valid"`
	Invalid string   `json:"invalid,omitempty"`
	Source  string   `json:"source"`
}

// Number is one measured quantity with its raw text, validity and source.
type Number struct {
	Value   float64 `json:"value"`
	Raw     string  `json:"raw"`
	Valid   bool    `json:"valid"`
	Invalid string  `json:"invalid,omitempty"`
	Source  string  `json:"source"`
}

// GPSTime is GPSDateStamp + GPSTimeStamp, an instant in UTC by definition
// of the EXIF standard.
type GPSTime struct {
	UTC     time.Time `json:"utc"`
	DateRaw string    `json:"date_raw"`
	TimeRaw string    `json:"time_raw"`
	// HasDate is false when only GPSTimeStamp is present (UTC then holds
	// the time of day on 0001-01-01 and Valid is false).
	HasDate bool   `json:"has_date"`
	Valid   bool   `json:"valid"`
	Invalid string `json:"invalid,omitempty"`
	Source  string `json:"source"`
}

// Flash is the EXIF Flash tag: bit 0 says whether the flash fired.
type Flash struct {
	Fired bool `json:"fired"`
	Raw   int  `json:"raw"`
}
