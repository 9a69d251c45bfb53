package report

import (
	"cmp"
	"errors"
	"fmt"
	"slices"
	"strings"
)

// A Sink writes one report file a photo at a time, so that a batch of any
// size streams through without being held in memory.
type Sink interface {
	// Photo adds the next photo. Photos must arrive in report order: by
	// Path, then Root (byte-wise string order, as sorted() orders them);
	// a photo out of order is an error (name both paths in it) and nothing more is written.
	Photo(p *Photo) error
	// Close writes the rest of the file. It does not close the underlying writer.
	Close() error
}

// ErrOrder reports a photo given to a Sink out of report order. Every
// report file lists photos in one order, so that the files can be compared
// line by line and a rerun gives the same bytes; a sink cannot reorder what
// it has already written, so it refuses instead.
var ErrOrder = errors.New("photo out of report order")

// photoOrder is report order: by Path, then Root, byte-wise.
func photoOrder(x, y *Photo) int {
	return cmp.Or(strings.Compare(x.Path, y.Path), strings.Compare(x.Root, y.Root))
}

// headOf returns a's run header for a sink: its photos dropped (a sink takes
// them one at a time, and must not keep the caller's whole batch alive) and
// its cameras sorted by id in a copy, so the caller's slice keeps its order.
// A nil head is an empty one, so that a constructor cannot fail.
func headOf(a *Audit) Audit {
	var h Audit
	if a != nil {
		h = *a
	}
	h.Photos = nil
	h.Cameras = slices.Clone(h.Cameras)
	slices.SortStableFunc(h.Cameras, func(x, y Camera) int { return strings.Compare(x.ID, y.ID) })
	return h
}

// sinkState is what every sink shares: the order check, the first error
// (after which nothing more is written: a report file that went wrong
// midway must not look complete) and whether Close has run.
type sinkState struct {
	format string // "JSON", "CSV", ... for error messages
	n      int    // photos admitted
	last   Photo  // only Path and Root are kept
	err    error
	closed bool
}

// admit checks that p may be written next and records it.
func (s *sinkState) admit(p *Photo) error {
	switch {
	case s.err != nil:
		return s.err
	case s.closed:
		return fmt.Errorf("report: %s sink: photo %q given after Close", s.format, p.Path)
	case p == nil:
		return s.fail(errors.New("nil photo"))
	case s.n > 0 && photoOrder(&s.last, p) > 0:
		return s.fail(fmt.Errorf("photo %q (root %q) given after %q (root %q): %w", p.Path, p.Root, s.last.Path, s.last.Root, ErrOrder))
	}
	s.n++
	s.last.Path, s.last.Root = p.Path, p.Root
	return nil
}

// fail records err (wrapped with the format) as the sink's final error.
func (s *sinkState) fail(err error) error {
	if err != nil && s.err == nil {
		s.err = fmt.Errorf("report: write %s: %w", s.format, err)
	}
	return s.err
}

// closing reports whether Close has work to do: not after an error (which
// it returns) and not a second time.
func (s *sinkState) closing() (bool, error) {
	if s.err != nil || s.closed {
		return false, s.err
	}
	s.closed = true
	return true, nil
}
