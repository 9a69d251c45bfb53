package zone

import (
	"errors"
	"fmt"
)

// Error kinds, testable with errors.Is.
var (
	// ErrUnknownZone: the name is not in the embedded tz database.
	ErrUnknownZone = errors.New("unknown time zone")
	// ErrInvalidWall: a wall-time field is out of range (e.g. 31 April, hour 24).
	ErrInvalidWall = errors.New("invalid wall time")
	// ErrInvalidCoordinates: latitude or longitude out of range or not finite.
	ErrInvalidCoordinates = errors.New("invalid coordinates")
	// ErrBadOverride: the examiner's override is neither an RFC 3339 time, a fixed
	// offset, nor a zone name.
	ErrBadOverride = errors.New("unusable time override")
	// ErrNoBasis: nothing to decide the instant from (no offset tag, no override, no place).
	ErrNoBasis = errors.New("no basis for a UTC instant")
	// ErrZoneMap: the embedded zone boundary data could not be initialised.
	ErrZoneMap = errors.New("zone boundary data unavailable")
)

// Error says which operation failed on which input; Err is one of the kinds above
// or a lower-level cause.
type Error struct {
	Op    string // e.g. "load zone", "resolve wall time", "claim"
	Input string // the offending value as given
	Err   error
}

func (e *Error) Error() string {
	if e.Input == "" {
		return fmt.Sprintf("zone: %s: %v", e.Op, e.Err)
	}
	return fmt.Sprintf("zone: %s %q: %v", e.Op, e.Input, e.Err)
}

func (e *Error) Unwrap() error { return e.Err }
