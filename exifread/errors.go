package exifread

import "fmt"

// FormatError reports bytes that are damaged: they do not follow the
// container or TIFF structure they claim. Offset is the byte position where
// the problem was found, -1 when not known: counted from the start of the
// file, except for Where values beginning with "tiff", whose offsets count
// from the TIFF header of the EXIF payload (the file start for a TIFF file),
// as TIFF offsets themselves do.
type FormatError struct {
	Where  string // "jpeg", "tiff IFD0", "heif iloc" …
	Offset int64
	Err    error
}

func (e *FormatError) Error() string {
	if e.Offset >= 0 {
		return fmt.Sprintf("damaged %s at byte %d: %v", e.Where, e.Offset, e.Err)
	}
	return fmt.Sprintf("damaged %s: %v", e.Where, e.Err)
}

func (e *FormatError) Unwrap() error { return e.Err }

// UnsupportedError reports a file that may be valid but that this package
// does not read (an unknown container, an HEIF Exif item built from other items).
type UnsupportedError struct {
	Where string
	Err   error
}

func (e *UnsupportedError) Error() string {
	return fmt.Sprintf("unsupported %s: %v", e.Where, e.Err)
}

func (e *UnsupportedError) Unwrap() error { return e.Err }

// LimitError reports input that exceeds one of the safety limits of Options;
// reading stopped there (or the offending part was skipped) to bound memory and time.
type LimitError struct {
	Where string
	Limit string // name of the Options field
	Value int64  // the value found
	Max   int64  // the limit
}

func (e *LimitError) Error() string {
	return fmt.Sprintf("%s: %s %d exceeds limit %d", e.Where, e.Limit, e.Value, e.Max)
}

func formatErr(where string, off int64, format string, a ...any) error {
	return &FormatError{Where: where, Offset: off, Err: fmt.Errorf(format, a...)}
}
