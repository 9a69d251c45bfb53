package exifread

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/rwcarlsen/goexif/exif"
)

// ReadFile reads the evidence of the file at path. The file is opened
// read-only and nothing is written anywhere. Only the metadata blocks are
// read for the fields, but the whole file is streamed once for its SHA-256
// (unless opt.SkipHash). A `<file>.xmp` or `<basename>.xmp` sidecar beside
// it supplies what the file lacks. ReadFile never panics: problems end up in
// Record.Err and Record.Warnings.
func ReadFile(path string, opt Options) (rec Record) {
	rec = Record{Path: path, Container: ContainerUnknown}
	defer rec.finish()
	f, err := os.Open(path)
	if err != nil {
		rec.setErr(fmt.Errorf("open: %w", err))
		return rec
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		rec.setErr(fmt.Errorf("stat: %w", err))
		return rec
	}
	if !st.Mode().IsRegular() {
		rec.setErr(&UnsupportedError{Where: "file", Err: fmt.Errorf("%s is not a regular file", st.Mode().Type())})
		return rec
	}
	rec.Size = st.Size()
	rec.ModTime = st.ModTime().UTC()
	opt = opt.withDefaults()
	read(&rec, f, st.Size(), opt)
	if !opt.SkipHash {
		rec.hash(f, st.Size())
	}
	rec.ExtensionMismatch = extensionMismatch(path, rec.Container)
	if !opt.SkipSidecar {
		readSidecar(&rec, path, opt)
	}
	crossCheckGPSDate(&rec)
	return rec
}

// Read reads the evidence from size bytes of r (for bytes already in
// memory, or a section of a larger file). Path, ModTime and the sidecar are
// left to ReadFile; SHA256 is computed over the size bytes unless opt.SkipHash.
func Read(r io.ReaderAt, size int64, opt Options) Record {
	rec := Record{Container: ContainerUnknown, Size: size}
	opt = opt.withDefaults()
	read(&rec, r, size, opt)
	if !opt.SkipHash {
		rec.hash(r, size)
	}
	crossCheckGPSDate(&rec)
	rec.finish()
	return rec
}

// hashReadMax is the largest read the SHA-256 pass makes. io.Copy reads 32 KB at
// a time; on photos of several MB those reads were 16 % of an audit's profile
// (issue 12), and 1 MB reads cut the system calls 32-fold. A smaller file gets a
// buffer of its own size, so that a folder of small files allocates little.
const hashReadMax = 1 << 20

// hash sets SHA256 to the hash of the size bytes of r, or records the failure.
func (rec *Record) hash(r io.ReaderAt, size int64) {
	h := sha256.New()
	buf := make([]byte, max(1, min(size, hashReadMax)))
	if _, err := io.CopyBuffer(h, io.NewSectionReader(r, 0, size), buf); err != nil {
		rec.addProblem(fmt.Errorf("sha256: %w", err))
		return
	}
	rec.SHA256 = hex.EncodeToString(h.Sum(nil))
}

// setErr records err as the record's error when none is set yet.
func (rec *Record) setErr(err error) {
	if rec.Err == nil {
		rec.Err = err
	}
	rec.Error = Message(rec.Err.Error())
}

// addProblem keeps the first problem as Err and the others as warnings.
func (rec *Record) addProblem(err error) {
	if rec.Err == nil {
		rec.setErr(err)
		return
	}
	rec.Warnings = append(rec.Warnings, err.Error())
}

func (rec *Record) finish() {
	if rec.Warnings == nil {
		rec.Warnings = []string{}
	}
	if rec.Err != nil {
		rec.Error = Message(rec.Err.Error())
	}
}

// read does the work shared by Read and ReadFile, inside a recover so that
// no input can take the process down (the walkers are bounded; the recover
// is for the goexif cross-check and for defects of our own).
func read(rec *Record, r io.ReaderAt, size int64, opt Options) {
	defer func() {
		if p := recover(); p != nil {
			rec.addProblem(&FormatError{Where: "reader", Offset: -1, Err: fmt.Errorf("internal panic: %v", p)})
		}
	}()
	head := make([]byte, 64)
	n, _ := r.ReadAt(head, 0)
	head = head[:n]
	rec.Container = sniff(head)
	var f *found
	switch rec.Container {
	case ContainerJPEG:
		f = walkJPEG(r, size, opt)
	case ContainerPNG:
		f = walkPNG(r, size, opt)
	case ContainerWebP:
		f = walkWebP(r, size, opt)
	case ContainerHEIF, ContainerAVIF:
		f = walkHEIF(r, size, rec.Container, opt)
	case ContainerTIFF:
		f = &found{container: ContainerTIFF, exifSrc: r, exifSize: size}
	default:
		if n == 0 {
			rec.addProblem(&FormatError{Where: "file", Offset: 0, Err: errors.New("empty file")})
		} else {
			rec.addProblem(&UnsupportedError{Where: "container", Err: fmt.Errorf("first bytes % x match no supported format", head[:min(8, n)])})
		}
		return
	}
	for _, err := range f.problems {
		rec.addProblem(err)
	}
	rec.Warnings = append(rec.Warnings, f.warnings...)
	if f.exifSrc != nil {
		base := int64(0)
		if f.exifMem == nil {
			base = f.exifBase
		}
		d, err := walkTIFF(f.exifSrc, base, f.exifSize, opt)
		if d != nil {
			fromEXIF(rec, d)
			for _, p := range d.problems {
				rec.addProblem(p)
			}
			if d.dropped > 0 {
				rec.Warnings = append(rec.Warnings, fmt.Sprintf("%d further TIFF problems not listed", d.dropped))
			}
			// goexif materialises every value (a RATIONAL costs it ~40 bytes),
			// so it only sees small payloads whose declared values do not
			// overlap (their sum within the payload's own length).
			if f.exifMem != nil && len(d.problems) == 0 && !d.unknownTypes && !opt.SkipCrossCheck &&
				len(f.exifMem) <= crossCheckMaxBytes && d.nBytes <= int64(len(f.exifMem)) {
				crossCheck(rec, f.exifMem)
			}
			if f.xmp == nil && f.container == ContainerTIFF {
				if e, ok := d.get(ifd0, tagXMP); ok && e.size <= opt.MaxXMPBytes {
					if b, err := d.bytesOf(e, e.size); err == nil {
						f.xmp = b
					}
				}
			}
		} else if err != nil {
			rec.addProblem(err)
		}
	}
	if f.xmp != nil {
		applyXMP(rec, f.xmp, SourceXMP)
	}
}

// crossCheckMaxBytes bounds the payloads handed to goexif (a JPEG APP1 holds
// at most 64 KiB; larger HEIF/PNG payloads are read by this package alone).
const crossCheckMaxBytes = 256 << 10

// crossCheck decodes the validated, bounded payload with goexif and notes
// disagreements. goexif sees the payload only after walkTIFF found no
// problem, so none of its known failures (huge counts, IFD loops, repeated
// large values, unknown types) can be reached; recover() guards the rest.
func crossCheck(rec *Record, payload []byte) {
	defer func() {
		if p := recover(); p != nil {
			rec.Warnings = append(rec.Warnings, fmt.Sprintf("cross-check: goexif panicked: %v", p))
		}
	}()
	x, err := exif.Decode(bytes.NewReader(payload))
	if err != nil && x == nil {
		rec.Warnings = append(rec.Warnings, "cross-check: goexif could not decode the payload: "+err.Error())
		return
	}
	cmp := func(name exif.FieldName, ours string) {
		t, err := x.Get(name)
		if err != nil {
			return
		}
		s, err := t.StringVal()
		if err != nil {
			return
		}
		s = strings.TrimSpace(strings.TrimRight(s, "\x00"))
		if s != strings.TrimSpace(ours) {
			rec.Warnings = append(rec.Warnings, fmt.Sprintf("cross-check: goexif reads %s as %s, this reader as %s", name, quoted(s), quoted(ours)))
		}
	}
	cmp(exif.Make, rec.Make)
	cmp(exif.Model, rec.Model)
	if rec.DateTimeOriginal != nil {
		cmp(exif.DateTimeOriginal, strings.TrimRight(rec.DateTimeOriginal.Raw, "\x00"))
	}
}

// extensionMismatch notes a file name extension that does not fit the container.
func extensionMismatch(path, container string) string {
	ext := strings.ToLower(filepath.Ext(path))
	var want string
	switch ext {
	case ".jpg", ".jpeg", ".jpe", ".jfif":
		want = ContainerJPEG
	case ".tif", ".tiff", ".dng", ".nef", ".nrw", ".cr2", ".arw", ".srf", ".sr2", ".orf", ".rw2", ".pef", ".srw", ".3fr", ".erf", ".kdc", ".mos", ".iiq":
		want = ContainerTIFF
	case ".heic", ".heif", ".hif":
		want = ContainerHEIF
	case ".avif":
		want = ContainerAVIF
	case ".png":
		want = ContainerPNG
	case ".webp":
		want = ContainerWebP
	default:
		return ""
	}
	if want == container || (want == ContainerHEIF && container == ContainerAVIF) || (want == ContainerAVIF && container == ContainerHEIF) {
		return ""
	}
	return fmt.Sprintf("extension %s suggests %s but the bytes are %s", ext, want, container)
}

// sidecarNames lists the sidecar paths looked for, in order of preference.
func sidecarNames(path string) []string {
	base := strings.TrimSuffix(path, filepath.Ext(path))
	return []string{path + ".xmp", path + ".XMP", base + ".xmp", base + ".XMP"}
}

func readSidecar(rec *Record, path string, opt Options) {
	for _, p := range sidecarNames(path) {
		if p == path {
			continue
		}
		st, err := os.Stat(p)
		if err != nil || !st.Mode().IsRegular() {
			continue
		}
		if st.Size() > opt.MaxXMPBytes {
			rec.Warnings = append(rec.Warnings, (&LimitError{Where: "sidecar " + filepath.Base(p), Limit: "MaxXMPBytes", Value: st.Size(), Max: opt.MaxXMPBytes}).Error())
			return
		}
		b, err := os.ReadFile(p)
		if err != nil {
			rec.Warnings = append(rec.Warnings, fmt.Sprintf("sidecar %s: %v", filepath.Base(p), err))
			return
		}
		applyXMP(rec, b, SourceSidecar)
		return
	}
}

// applyXMP fills the fields the EXIF lacks from an XMP packet. An XMP date
// whose wall clock equals the EXIF one lends the EXIF time its offset.
func applyXMP(rec *Record, b []byte, source string) {
	props, err := parseXMP(b)
	if err != nil {
		rec.Warnings = append(rec.Warnings, fmt.Sprintf("%s: %v", source, err))
	}
	date := func(cur **WallTime, keys ...[2]string) {
		for _, k := range keys {
			raw, ok := props.get(k[0], k[1])
			if !ok {
				continue
			}
			w := parseXMPDate(raw, source)
			if *cur == nil {
				*cur = w
				return
			}
			c := *cur
			if c.OffsetSec == nil && w.OffsetSec != nil && w.Valid && c.Valid &&
				c.Year == w.Year && c.Month == w.Month && c.Day == w.Day && c.Hour == w.Hour && c.Minute == w.Minute && c.Second == w.Second {
				c.OffsetSec, c.OffsetRaw, c.OffsetSource = w.OffsetSec, w.OffsetRaw, source
			}
			return
		}
	}
	date(&rec.DateTimeOriginal, [2]string{nsEXIF, "DateTimeOriginal"}, [2]string{nsPhotoshop, "DateCreated"})
	date(&rec.DateTimeDigitized, [2]string{nsEXIF, "DateTimeDigitized"}, [2]string{nsXMP, "CreateDate"})
	date(&rec.DateTime, [2]string{nsTIFF, "DateTime"}, [2]string{nsXMP, "ModifyDate"})

	g := &rec.GPS
	if g.Position == nil {
		la, okLa := props.get(nsEXIF, "GPSLatitude")
		lo, okLo := props.get(nsEXIF, "GPSLongitude")
		if okLa || okLo {
			p := &Position{Raw: la + "; " + lo, Source: source}
			var latBad, lonBad string
			if v, ok := parseXMPCoord(la); ok {
				p.LatDeg = fptr(v)
			} else if okLa {
				latBad = "not an XMP GPSCoordinate"
			}
			if v, ok := parseXMPCoord(lo); ok {
				p.LonDeg = fptr(v)
			} else if okLo {
				lonBad = "not an XMP GPSCoordinate"
			}
			p.Invalid = positionInvalid(p.LatDeg, p.LonDeg, latBad, lonBad)
			p.Valid = p.Invalid == ""
			g.Position = p
		}
	}
	num := func(cur **Number, local string, check func(float64) string) {
		if *cur != nil {
			return
		}
		raw, ok := props.get(nsEXIF, local)
		if !ok {
			return
		}
		n := &Number{Raw: raw, Source: source}
		if v, ok := parseXMPRational(raw); ok {
			n.Value = v
			n.Invalid = check(v)
		} else {
			n.Invalid = "not a number"
		}
		n.Valid = n.Invalid == ""
		*cur = n
	}
	if g.AltitudeM == nil {
		num(&g.AltitudeM, "GPSAltitude", func(float64) string { return "" })
		if g.AltitudeM != nil {
			if r, _ := props.get(nsEXIF, "GPSAltitudeRef"); r == "1" {
				g.AltitudeM.Value = -g.AltitudeM.Value
			}
		}
	}
	num(&g.ImgDirectionDeg, "GPSImgDirection", directionInvalid)
	if g.ImgDirectionRef == "" {
		g.ImgDirectionRef, _ = props.get(nsEXIF, "GPSImgDirectionRef")
	}
	num(&g.DOP, "GPSDOP", func(v float64) string {
		if v <= 0 {
			return "not positive"
		}
		return ""
	})
	if g.MapDatum == "" {
		g.MapDatum, _ = props.get(nsEXIF, "GPSMapDatum")
	}
	if g.Time == nil {
		// XMP's exif:GPSTimeStamp is a full date-time in UTC (CIPA DC-010 §2.5).
		if raw, ok := props.get(nsEXIF, "GPSTimeStamp"); ok {
			w := parseXMPDate(raw, source)
			t := &GPSTime{DateRaw: raw, TimeRaw: raw, Source: source, HasDate: w.Year != 0}
			switch {
			case !w.Valid:
				t.Invalid = w.Invalid
			case w.Year < gpsEarliestDateYear:
				t.Invalid = fmt.Sprintf("GPS date before %d (receiver clock not set)", gpsEarliestDateYear)
			}
			if w.Valid {
				off := 0
				if w.OffsetSec != nil {
					off = *w.OffsetSec // an XMP date may carry any offset; the instant is what counts
				}
				t.UTC = time.Date(w.Year, time.Month(w.Month), w.Day, w.Hour, w.Minute, w.Second, w.Nanosecond, time.FixedZone("", off)).UTC()
			}
			t.Valid = t.Invalid == ""
			g.Time = t
		}
	}
	str := func(cur *string, name, ns, local string) {
		if *cur != "" {
			return
		}
		if v, ok := props.get(ns, local); ok && v != "" {
			*cur = v
			if rec.XMPSources == nil {
				rec.XMPSources = map[string]string{}
			}
			rec.XMPSources[name] = source
		}
	}
	str(&rec.Make, "make", nsTIFF, "Make")
	str(&rec.Model, "model", nsTIFF, "Model")
	str(&rec.LensModel, "lens_model", nsEXIFEX, "LensModel")
	str(&rec.BodySerialNumber, "body_serial_number", nsEXIFEX, "BodySerialNumber")
}

// maxQuotedBytes bounds a tag value quoted in a warning. Warnings travel
// into every report row; a crafted 200 KB value quoted whole would make
// the row unreadable and, over a batch, cost memory for nothing. The value
// itself stays in its field.
const maxQuotedBytes = 64

// quoted returns s as a Go-quoted string, cut to maxQuotedBytes (at a
// character boundary) with the full length stated when it is longer.
func quoted(s string) string {
	if len(s) <= maxQuotedBytes {
		return strconv.Quote(s)
	}
	cut := maxQuotedBytes
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return fmt.Sprintf("%s… (%d bytes in all)", strconv.Quote(s[:cut]), len(s))
}
