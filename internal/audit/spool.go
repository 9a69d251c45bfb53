package audit

import (
	"bufio"
	"encoding/gob"
	"fmt"
	"os"
	"time"

	"github.com/gnomon-forensics/gnomon/solarcheck"
	"github.com/gnomon-forensics/gnomon/solarcheck/zone"
)

// spool is the file in which the findings wait, in report order, between
// the examination and the report writers: one encoding/gob stream of
// records, written once from start to end and read from the start as often
// as needed. encoding/gob keeps every byte of every string (file names and
// metadata that are not valid UTF-8 included) and every float bit pattern
// (NaN).
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
	r := recordOf(v)
	if err := s.enc.Encode(&r); err != nil {
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

func (r *spoolReader) next(v *stored) error {
	var rec record // a fresh value: gob leaves zero fields untouched
	if err := r.dec.Decode(&rec); err != nil {
		return err
	}
	*v = rec.stored()
	return nil
}

// record is what the spool keeps of one entry. It belongs to this package,
// not to solarcheck: it holds the file facts and, field by field, what the
// camera model and the report read of the finding, so that solarcheck's
// types export nothing for the spool's sake. The diagnosis's working state
// (Finding.Basis) is not kept: nothing after Examine reads it (the camera
// model works from the ClockInput and the finding's verdict and offset).
// TestSpoolRecordFields fails when Finding gains a field this record
// does not carry.
type record struct {
	SHA256, Container, Error, Thumbnail string
	Size                                int64
	Notes                               []string
	Clock                               int

	Path, Camera   string
	CameraName     string
	Wall           zone.Wall
	WallTag        string
	Claim          zone.Claimed
	Claimed        time.Time
	HasClaimed     bool
	Readings       []solarcheck.Reading
	ReadingUsed    int
	LatDeg, LonDeg float64
	HasPlace       bool
	PlaceSource    string
	ElevationM     float64
	PlaceZones     []string
	GPSRejected    string
	Sun, BestFit   *solarcheck.SunSample
	Measured       []solarcheck.Direction
	Checks         []solarcheck.Check
	Verdict        solarcheck.Verdict
	Offset         *solarcheck.Interval
	Earliest       time.Time
	Latest         time.Time
	Explanation    string
	Rejected       []solarcheck.Alternative
	ShadowFix      *solarcheck.Fix
	SeasonBands    []solarcheck.DateBand
	FactoryDate    bool
	FromCamera     bool
}

// recordOf copies what the spool keeps of s.
func recordOf(s *stored) record {
	f := &s.Finding
	return record{
		SHA256: s.SHA256, Container: s.Container, Error: s.Error, Thumbnail: s.Thumbnail,
		Size: s.Size, Notes: s.Notes, Clock: s.Clock,
		Path: f.Path, Camera: f.Camera, CameraName: f.CameraName, Wall: f.Wall, WallTag: f.WallTag,
		Claim: f.Claim, Claimed: f.Claimed, HasClaimed: f.HasClaimed, Readings: f.Readings, ReadingUsed: f.ReadingUsed,
		LatDeg: f.LatDeg, LonDeg: f.LonDeg, HasPlace: f.HasPlace, PlaceSource: f.PlaceSource,
		ElevationM: f.ElevationM, PlaceZones: f.PlaceZones, GPSRejected: f.GPSRejected,
		Sun: f.Sun, BestFit: f.BestFit, Measured: f.Measured, Checks: f.Checks,
		Verdict: f.Verdict, Offset: f.Offset, Earliest: f.Earliest, Latest: f.Latest,
		Explanation: f.Explanation, Rejected: f.Rejected, ShadowFix: f.ShadowFix,
		SeasonBands: f.SeasonBands, FactoryDate: f.FactoryDate, FromCamera: f.FromCamera,
	}
}

// stored rebuilds the entry from its record (with no diagnosis basis).
func (r *record) stored() stored {
	return stored{
		SHA256: r.SHA256, Container: r.Container, Error: r.Error, Thumbnail: r.Thumbnail,
		Size: r.Size, Notes: r.Notes, Clock: r.Clock,
		Finding: solarcheck.Finding{
			Path: r.Path, Camera: r.Camera, CameraName: r.CameraName, Wall: r.Wall, WallTag: r.WallTag,
			Claim: r.Claim, Claimed: r.Claimed, HasClaimed: r.HasClaimed, Readings: r.Readings, ReadingUsed: r.ReadingUsed,
			LatDeg: r.LatDeg, LonDeg: r.LonDeg, HasPlace: r.HasPlace, PlaceSource: r.PlaceSource,
			ElevationM: r.ElevationM, PlaceZones: r.PlaceZones, GPSRejected: r.GPSRejected,
			Sun: r.Sun, BestFit: r.BestFit, Measured: r.Measured, Checks: r.Checks,
			Verdict: r.Verdict, Offset: r.Offset, Earliest: r.Earliest, Latest: r.Latest,
			Explanation: r.Explanation, Rejected: r.Rejected, ShadowFix: r.ShadowFix,
			SeasonBands: r.SeasonBands, FactoryDate: r.FactoryDate, FromCamera: r.FromCamera,
		},
	}
}

func (r *spoolReader) close() { r.f.Close() }
