package audit

import (
	"bufio"
	"encoding/gob"
	"fmt"
	"os"
)

// spool is the file in which the findings wait, in report order, between
// the examination and the report writers: one encoding/gob stream, written
// once from start to end and read from the start as often as needed.
// encoding/gob keeps every byte of every string (file names and metadata
// that are not valid UTF-8 included) and every float bit pattern (NaN).
type spool struct {
	f   *os.File
	w   *bufio.Writer
	enc *gob.Encoder
	n   int
}

// createSpool creates the spool file in dir, with a name no report has.
func createSpool(dir string) (*spool, error) {
	if dir == "" {
		dir = "."
	}
	f, err := os.CreateTemp(dir, ".gnomon-spool-*.tmp")
	if err != nil {
		return nil, fmt.Errorf("spool: %w", err)
	}
	w := bufio.NewWriterSize(f, 256<<10)
	return &spool{f: f, w: w, enc: gob.NewEncoder(w)}, nil
}

func (s *spool) add(v *stored) error {
	if err := s.enc.Encode(v); err != nil {
		return fmt.Errorf("spool %s: %w", s.f.Name(), err)
	}
	s.n++
	return nil
}

// finish flushes what add wrote, so that readers see all of it.
func (s *spool) finish() error {
	if err := s.w.Flush(); err != nil {
		return fmt.Errorf("spool %s: %w", s.f.Name(), err)
	}
	return nil
}

// remove closes and deletes the spool file.
func (s *spool) remove() error {
	if s == nil || s.f == nil {
		return nil
	}
	s.f.Close()
	err := removeQuietly(s.f.Name())
	s.f = nil
	return err
}

// spoolReader reads a spool from its start.
type spoolReader struct {
	f   *os.File
	dec *gob.Decoder
}

func (s *spool) reader() (*spoolReader, error) {
	f, err := os.Open(s.f.Name())
	if err != nil {
		return nil, fmt.Errorf("spool: %w", err)
	}
	return &spoolReader{f: f, dec: gob.NewDecoder(bufio.NewReaderSize(f, 256<<10))}, nil
}

func (r *spoolReader) next(v *stored) error { return r.dec.Decode(v) }

func (r *spoolReader) close() { r.f.Close() }
