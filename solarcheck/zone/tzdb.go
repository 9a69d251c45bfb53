package zone

//go:generate go run ./internal/gen

import (
	"archive/zip"
	"bytes"
	_ "embed"
	"fmt"
	"io"
	"sort"
	"sync"
	"time"
)

// zoneinfoZip is a copy of the Go toolchain's tz database (see tzversion_gen.go for
// its release and checksum). Read-only; it is never modified.
//
//go:embed zoneinfo.zip
var zoneinfoZip []byte

// DB loads time zones from the tz database embedded in this package, never from the
// host. time.LoadLocation prefers $ZONEINFO and the system's /usr/share/zoneinfo over
// the copy in time/tzdata, so two machines with different tz releases could resolve
// the same wall time differently; DB makes every result depend on TZDataVersion only.
//
// A DB is safe for concurrent use. The zip index is read once, on first use, and
// parsed locations are cached.
type DB struct {
	once  sync.Once
	files map[string]*zip.File
	err   error

	mu    sync.Mutex
	cache map[string]*time.Location
}

// NewDB returns a DB over the embedded tz database.
func NewDB() *DB { return &DB{} }

// Version returns the IANA tz database release of the embedded data, e.g. "2025c".
func (db *DB) Version() string { return TZDataVersion }

func (db *DB) index() error {
	db.once.Do(func() {
		zr, err := zip.NewReader(bytes.NewReader(zoneinfoZip), int64(len(zoneinfoZip)))
		if err != nil {
			db.err = fmt.Errorf("zone: embedded tz database: %w", err)
			return
		}
		db.files = make(map[string]*zip.File, len(zr.File))
		for _, f := range zr.File {
			db.files[f.Name] = f
		}
		db.cache = make(map[string]*time.Location)
	})
	return db.err
}

// Load returns the location with the given IANA name ("Europe/Berlin",
// "Etc/GMT+3", "UTC") from the embedded tz database. "Local" and "" are refused:
// they would depend on the host. Unknown names give an error wrapping ErrUnknownZone.
func (db *DB) Load(name string) (*time.Location, error) {
	if err := db.index(); err != nil {
		return nil, err
	}
	if name == "" || name == "Local" {
		return nil, &Error{Op: "load zone", Input: name, Err: ErrUnknownZone}
	}
	db.mu.Lock()
	defer db.mu.Unlock()
	if loc, ok := db.cache[name]; ok {
		return loc, nil
	}
	f, ok := db.files[name]
	if !ok {
		return nil, &Error{Op: "load zone", Input: name, Err: ErrUnknownZone}
	}
	rc, err := f.Open()
	if err != nil {
		return nil, &Error{Op: "load zone", Input: name, Err: err}
	}
	data, err := io.ReadAll(rc)
	rc.Close()
	if err != nil {
		return nil, &Error{Op: "load zone", Input: name, Err: err}
	}
	loc, err := time.LoadLocationFromTZData(name, data)
	if err != nil {
		return nil, &Error{Op: "load zone", Input: name, Err: err}
	}
	db.cache[name] = loc
	return loc, nil
}

// Names lists every zone name in the embedded database, sorted.
func (db *DB) Names() ([]string, error) {
	if err := db.index(); err != nil {
		return nil, err
	}
	names := make([]string, 0, len(db.files))
	for n := range db.files {
		names = append(names, n)
	}
	sort.Strings(names)
	return names, nil
}
