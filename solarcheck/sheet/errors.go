package sheet

import (
	"errors"
	"fmt"
	"strconv"
)

// Causes of a bad cell, row or header. Test them with errors.Is on a
// *ParseError (or on the joined error that Parse and Resolve return).
var (
	ErrSyntax              = errors.New("CSV syntax error")
	ErrEncoding            = errors.New("not valid UTF-8")
	ErrTooLarge            = errors.New("sheet larger than the size limit")
	ErrNoHeader            = errors.New("no header line")
	ErrNotText             = errors.New("not a text file (a CSV sheet holds UTF-8 text, no NUL bytes)")
	ErrUnknownColumn       = errors.New("unknown column (ignored)")
	ErrDuplicateColumn     = errors.New("column named twice (second ignored)")
	ErrExtraField          = errors.New("more cells than header columns")
	ErrMissing             = errors.New("required value missing")
	ErrNotNumber           = errors.New("not a number")
	ErrOutOfRange          = errors.New("out of range")
	ErrNotPositive         = errors.New("must be greater than zero")
	ErrUnknownRef          = errors.New("unknown bearing reference (want true, magnetic or grid)")
	ErrBadTime             = errors.New("not a time (want RFC 3339 or a wall time YYYY-MM-DD hh:mm:ss)")
	ErrConflict            = errors.New("shadow and sun sighting in one row")
	ErrIncomplete          = errors.New("incomplete measurement")
	ErrDuplicate           = errors.New("duplicate row (dropped)")
	ErrUnknownPhoto        = errors.New("no photo of that name in the audited folders")
	ErrAmbiguousPhoto      = errors.New("names several photos; write the photo as the sheet template names it")
	ErrConflictingOverride = errors.New("override differs from an earlier row for the same photo (row dropped)")
)

// ParseError is one problem in a sheet, located like encoding/csv's
// ParseError: File is the sheet's name as given to Parse, StartLine the
// physical line where the record starts, Line the physical line of the cell,
// Column the 1-based index of the cell in its record (0 when the problem
// concerns the whole record), and Name the column's header name ("" when
// unknown). Err is the cause, wrapping one of the Err… values.
type ParseError struct {
	File      string
	StartLine int
	Line      int
	Column    int
	Name      string
	Err       error
}

func (e *ParseError) Error() string {
	switch {
	case e.Column > 0 && e.Name != "":
		return fmt.Sprintf("%s:%d:%d (%s): %v", e.File, e.Line, e.Column, e.Name, e.Err)
	case e.Column > 0:
		return fmt.Sprintf("%s:%d:%d: %v", e.File, e.Line, e.Column, e.Err)
	default:
		return fmt.Sprintf("%s:%d: %v", e.File, e.Line, e.Err)
	}
}

// Unwrap returns the cause, so errors.Is(err, ErrNotNumber) works.
func (e *ParseError) Unwrap() error { return e.Err }

// joinProblems turns a list of problems into one error (nil when empty) that
// errors.Is and errors.As see through.
func joinProblems(ps []*ParseError) error {
	if len(ps) == 0 {
		return nil
	}
	errs := make([]error, len(ps))
	for i, p := range ps {
		errs[i] = p
	}
	return errors.Join(errs...)
}

// quoteRunes is how many characters of a cell a message quotes.
const quoteRunes = 40

// Quote writes a cell's text for a message: in double quotes with Go
// escapes (strconv.Quote), so control characters and invalid UTF-8 show as
// escapes rather than reaching a terminal or a report raw, and cut after
// quoteRunes characters with "…" after the closing quote, so that a wrong
// file (a photo given as the sheet) cannot fill a message with its bytes.
func Quote(cell string) string {
	n, cut := 0, len(cell)
	for i := range cell {
		if n == quoteRunes {
			cut = i
			break
		}
		n++
	}
	if cut == len(cell) {
		return strconv.Quote(cell)
	}
	return strconv.Quote(cell[:cut]) + "…"
}
