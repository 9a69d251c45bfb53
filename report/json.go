package report

import (
	"bytes"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"
	"unicode/utf8"
)

// Suffixes of the sibling members that keep what plain JSON would lose.
const (
	rawB64Suffix    = "_raw_b64"   // exact bytes of a string that is not valid UTF-8
	nonFiniteSuffix = "_nonfinite" // "NaN", "+Inf" or "-Inf" for a number written as null
)

// ErrInvalidKey reports a map key that is not valid UTF-8. Map keys are the
// tool's own vocabulary (verdict names), so such a key is a programming error.
var ErrInvalidKey = errors.New("map key is not valid UTF-8")

// sorted returns a shallow copy of a whose photos are ordered by path (then
// root) and cameras by id, so that every writer is deterministic without
// reordering the caller's slices.
func sorted(a *Audit) *Audit {
	c := *a
	byPath := func(x, y Photo) int { return photoOrder(&x, &y) }
	// The audit hands over its photos sorted already; a large batch is not
	// copied once per report then.
	if !slices.IsSortedFunc(a.Photos, byPath) {
		c.Photos = slices.Clone(a.Photos)
		slices.SortStableFunc(c.Photos, byPath)
	}
	c.Cameras = slices.Clone(a.Cameras)
	slices.SortStableFunc(c.Cameras, func(x, y Camera) int { return strings.Compare(x.ID, y.ID) })
	return &c
}

// WriteJSON writes a as report.json: schema "gnomon.audit/1", two-space
// indent, a trailing newline, photos sorted by path and cameras by id (a is
// not modified). Strings that are not valid UTF-8 and non-finite numbers get
// the sibling members described in the package doc, so the output is valid
// JSON for any input and loses no byte. It is [NewJSONSink] fed every photo.
func WriteJSON(w io.Writer, a *Audit) error {
	if a == nil {
		return errors.New("report: WriteJSON: nil audit")
	}
	c := sorted(a)
	return feed(NewJSONSink(w, c), c.Photos)
}

// EncodeJSON writes any value (a list of exifread records, say) by the same
// rules as report.json: encoding/json's layout with a two-space indent and
// a trailing newline, the "_raw_b64" and "_nonfinite" siblings, absent lists
// as [], hidden characters escaped. `gnomon meta --json` uses it, so the
// evidence shown there keeps its bytes exactly as the audit's report does.
func EncodeJSON(w io.Writer, v any) error {
	var c jsonCodec
	b, err := c.marshal(v, "")
	if err != nil {
		return fmt.Errorf("report: encode JSON: %w", err)
	}
	if _, err := w.Write(append(b, '\n')); err != nil {
		return fmt.Errorf("report: write JSON: %w", err)
	}
	return nil
}

// feed gives every photo to s in turn and closes it: the whole-document
// writers are the sinks, so each format has one code path.
func feed(s Sink, photos []Photo) error {
	for i := range photos {
		if err := s.Photo(&photos[i]); err != nil {
			return err
		}
	}
	return s.Close()
}

// jsonSink is report.json written as photos arrive: the header members
// first, then each photo as an element of "photos", then the cameras.
type jsonSink struct {
	sinkState
	doc *jsonStream
}

// NewJSONSink returns a Sink that writes report.json to w, byte for byte as
// [WriteJSON] does for the same photos. head gives the schema (SchemaID when
// empty), tool, run and cameras (written sorted by id, from a copy);
// head.Photos is ignored and nil is an empty head. Nothing is written until
// the first Photo or Close, so the constructor cannot fail; encoded text is
// passed to w in pieces of about jsonFlushBytes, never as a whole document.
func NewJSONSink(w io.Writer, head *Audit) Sink {
	h := headOf(head)
	if h.Schema == "" {
		h.Schema = SchemaID
	}
	// The members of Audit in its field order; TestJSONMatchesEncodingJSON
	// fails if a member is added to Audit and not here.
	doc := &jsonStream{w: w,
		head:   []jsonMember{{"schema", h.Schema}, {"tool", h.Tool}, {"run", h.Run}},
		stream: "photos",
		tail:   []jsonMember{{"cameras", h.Cameras}},
	}
	return &jsonSink{sinkState: sinkState{format: "JSON"}, doc: doc}
}

func (s *jsonSink) Photo(p *Photo) error {
	if err := s.admit(p); err != nil {
		return err
	}
	return s.fail(s.doc.elem(p))
}

func (s *jsonSink) Close() error {
	if ok, err := s.closing(); !ok {
		return err
	}
	return s.fail(s.doc.end())
}

// jsonFlushBytes is how much encoded JSON is held before it is passed on:
// the document of 100,000 photos is about 290 MB of text, which must stream
// out rather than sit in memory.
const jsonFlushBytes = 64 << 10

// jsonMember is one member of a JSON object: its name and Go value.
type jsonMember struct {
	name  string
	value any
}

// jsonStream writes a JSON object whose one array member, the stream, takes
// its elements one at a time from the caller, with the layout MarshalIndent
// gives the whole object: the members before the stream are written at the
// first element (or at the end), those after it at the end. So a document
// of any length passes through in pieces of about jsonFlushBytes.
type jsonStream struct {
	w      io.Writer
	codec  jsonCodec
	buf    bytes.Buffer
	head   []jsonMember
	stream string
	tail   []jsonMember
	n      int // elements written
	begun  bool
}

// member writes `"name": value` at depth 1, preceded by the comma or brace.
func (d *jsonStream) member(first bool, m jsonMember) error {
	b, err := d.codec.marshal(m.value, "  ")
	if err != nil {
		return fmt.Errorf("%s: %w", m.name, err)
	}
	d.name(first, m.name)
	d.buf.Write(b)
	return nil
}

func (d *jsonStream) name(first bool, name string) {
	if first {
		d.buf.WriteString("{")
	} else {
		d.buf.WriteString(",")
	}
	n, _ := json.Marshal(name) // a string always marshals
	d.buf.WriteString("\n  ")
	d.buf.Write(n)
	d.buf.WriteString(": ")
}

// begin writes the members before the stream and the stream's name.
func (d *jsonStream) begin() error {
	if d.begun {
		return nil
	}
	d.begun = true
	for i, m := range d.head {
		if err := d.member(i == 0, m); err != nil {
			return err
		}
	}
	d.name(len(d.head) == 0, d.stream)
	return nil
}

// elem writes the next element of the stream.
func (d *jsonStream) elem(v any) error {
	if err := d.begin(); err != nil {
		return err
	}
	b, err := d.codec.marshal(v, "    ")
	if err != nil {
		return fmt.Errorf("%s: [%d]: %w", d.stream, d.n, err)
	}
	if d.n == 0 {
		d.buf.WriteString("[")
	} else {
		d.buf.WriteString(",")
	}
	d.n++
	d.buf.WriteString("\n    ")
	d.buf.Write(b)
	if d.buf.Len() > jsonFlushBytes {
		return d.flush()
	}
	return nil
}

// end closes the stream, writes the members after it, the closing brace and
// a newline, and passes everything left on to the writer.
func (d *jsonStream) end() error {
	if err := d.begin(); err != nil {
		return err
	}
	if d.n == 0 {
		d.buf.WriteString("[]")
	} else {
		d.buf.WriteString("\n  ]")
	}
	for _, m := range d.tail {
		if err := d.member(false, m); err != nil {
			return err
		}
	}
	d.buf.WriteString("\n}\n")
	return d.flush()
}

// flush passes the encoded text on to w.
func (d *jsonStream) flush() error {
	if _, err := d.w.Write(d.buf.Bytes()); err != nil {
		return fmt.Errorf("write: %w", err)
	}
	d.buf.Reset()
	return nil
}

// ReadJSON reads a report.json written by WriteJSON, restoring the exact
// bytes of strings from their "_raw_b64" siblings and non-finite numbers from
// their "_nonfinite" siblings, so that WriteJSON(ReadJSON(x)) == x.
func ReadJSON(r io.Reader) (*Audit, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("report: read JSON: %w", err)
	}
	var a Audit
	var c jsonCodec
	if err := c.unmarshal(data, &a); err != nil {
		return nil, fmt.Errorf("report: decode JSON: %w", err)
	}
	return &a, nil
}

// escapeHidden rewrites, in JSON text from encoding/json, each invisible or
// direction-changing character outside ASCII (see hiddenRune) as a \uXXXX
// escape, so that report.json opened in an editor shows "\u202e" rather
// than silently reordered text; the decoded string is the same. JSON's own
// syntax is ASCII, so such a character can only sit inside a string, and
// encoding/json has already escaped the ASCII controls.
func escapeHidden(b []byte) []byte {
	const hex = "0123456789abcdef"
	var out []byte // nil until a character needs escaping: the common case copies nothing
	start := 0
	for i := 0; i < len(b); {
		if b[i] < utf8.RuneSelf {
			i++
			continue
		}
		r, size := utf8.DecodeRune(b[i:])
		if hiddenRune(r) && r <= 0xffff {
			out = append(out, b[start:i]...)
			out = append(out, '\\', 'u', hex[r>>12&0xf], hex[r>>8&0xf], hex[r>>4&0xf], hex[r&0xf])
			start = i + size
		}
		i += size
	}
	if out == nil {
		return b
	}
	return append(out, b[start:]...)
}

func nonFiniteName(f float64) string {
	switch {
	case math.IsNaN(f):
		return "NaN"
	case math.IsInf(f, 1):
		return "+Inf"
	case math.IsInf(f, -1):
		return "-Inf"
	}
	return ""
}

// decodeB64 is the inverse of a "_raw_b64" value.
func decodeB64(s string) (string, error) {
	b, err := base64.StdEncoding.DecodeString(s)
	return string(b), err
}
