package report

import (
	"bytes"
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"reflect"
	"slices"
	"strconv"
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
	head Audit
	doc  *jsonDoc
}

// NewJSONSink returns a Sink that writes report.json to w, byte for byte as
// [WriteJSON] does for the same photos. head gives the schema (SchemaID when
// empty), tool, run and cameras (written sorted by id, from a copy);
// head.Photos is ignored and nil is an empty head. Nothing is written until
// the first Photo or Close, so the constructor cannot fail; encoded text is
// passed to w in pieces of about jsonFlushBytes, never as a whole document.
func NewJSONSink(w io.Writer, head *Audit) Sink {
	s := &jsonSink{sinkState: sinkState{format: "JSON"}, head: headOf(head)}
	if s.head.Schema == "" {
		s.head.Schema = SchemaID
	}
	s.doc = newJSONDoc(w, reflect.ValueOf(&s.head).Elem(), "photos")
	return s
}

func (s *jsonSink) Photo(p *Photo) error {
	if err := s.admit(p); err != nil {
		return err
	}
	return s.fail(s.doc.elem(reflect.ValueOf(p).Elem()))
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

// jsonEncoder writes a Go value as indented JSON, following the struct tags
// (name, "-", omitempty) the way encoding/json does, plus the sibling rules.
type jsonEncoder struct {
	w       io.Writer // when set, buf is written out at array elements once over jsonFlushBytes
	buf     bytes.Buffer
	scratch []byte
	fields  map[reflect.Type][]jsonField // cache: a batch has many photos of one type
}

func (e *jsonEncoder) fieldsOf(t reflect.Type) []jsonField {
	if fs, ok := e.fields[t]; ok {
		return fs
	}
	if e.fields == nil {
		e.fields = map[reflect.Type][]jsonField{}
	}
	fs := jsonFields(t)
	e.fields[t] = fs
	return fs
}

func (e *jsonEncoder) newline(depth int) {
	e.buf.WriteByte('\n')
	for range depth {
		e.buf.WriteString("  ")
	}
}

// str writes s as a JSON string as encoding/json does (checked by
// TestJSONMatchesEncodingJSON and FuzzJSON): invalid UTF-8 becomes U+FFFD,
// and <, >, &, U+2028 and U+2029 are escaped (harmless, and safer if the text
// is pasted into HTML). It departs in one way: invisible and
// direction-changing characters (C1 controls, U+200B-U+200F, U+202A-U+202E,
// U+2060-U+2069, U+FEFF, ...) are written as \uXXXX escapes too. Writing it here rather than calling json.Marshal per
// string makes report.json several times faster on large batches.
func (e *jsonEncoder) str(s string) {
	e.scratch = appendJSONString(e.scratch[:0], s)
	e.buf.Write(e.scratch)
}

const hexDigits = "0123456789abcdef"

func appendJSONString(b []byte, s string) []byte {
	b = append(b, '"')
	start := 0
	for i := 0; i < len(s); {
		if c := s[i]; c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' && c != '<' && c != '>' && c != '&' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '"', '\\':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xf])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
			i += size
			start = i
			continue
		}
		if r == '\u2028' || r == '\u2029' || hiddenRune(r) {
			// encoding/json escapes U+2028 and U+2029; we also escape the
			// invisible and direction-changing characters (see Visible), so
			// that report.json opened in an editor shows "\u202e" rather
			// than silently reordered text. The decoded string is the same.
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', hexDigits[r>>12&0xf], hexDigits[r>>8&0xf], hexDigits[r>>4&0xf], hexDigits[r&0xf])
			i += size
			start = i
			continue
		}
		i += size
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}

// num writes a finite float exactly as encoding/json does (shortest
// round-trip form; exponent form below 1e-6 and from 1e21), or null.
func (e *jsonEncoder) num(f float64) {
	if math.IsNaN(f) || math.IsInf(f, 0) {
		e.buf.WriteString("null")
		return
	}
	abs, format := math.Abs(f), byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b := strconv.AppendFloat(e.scratch[:0], f, format, -1, 64)
	if format == 'e' {
		// Clean up e-09 to e-9, as encoding/json does.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	e.scratch = b
	e.buf.Write(b)
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

func (e *jsonEncoder) value(v reflect.Value, depth int) error {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if v.IsNil() {
			e.buf.WriteString("null")
			return nil
		}
		return e.value(v.Elem(), depth)
	case reflect.String:
		e.str(v.String())
	case reflect.Bool:
		e.buf.WriteString(strconv.FormatBool(v.Bool()))
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		e.buf.WriteString(strconv.FormatInt(v.Int(), 10))
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		e.buf.WriteString(strconv.FormatUint(v.Uint(), 10))
	case reflect.Float32, reflect.Float64:
		e.num(v.Float())
	case reflect.Slice, reflect.Array:
		arr := newArrayWriter(e, depth)
		for i := range v.Len() {
			if err := arr.elem(v.Index(i)); err != nil {
				return err
			}
		}
		arr.end()
	case reflect.Map:
		if v.Type().Key().Kind() != reflect.String {
			return fmt.Errorf("unsupported map key type %s", v.Type().Key())
		}
		if v.Len() == 0 {
			e.buf.WriteString("{}")
			return nil
		}
		keys := v.MapKeys()
		slices.SortFunc(keys, func(x, y reflect.Value) int { return strings.Compare(x.String(), y.String()) })
		e.buf.WriteByte('{')
		for i, k := range keys {
			if !utf8.ValidString(k.String()) {
				return fmt.Errorf("%q: %w", k.String(), ErrInvalidKey)
			}
			if i > 0 {
				e.buf.WriteByte(',')
			}
			e.newline(depth + 1)
			e.str(k.String())
			e.buf.WriteString(": ")
			if err := e.value(v.MapIndex(k), depth+1); err != nil {
				return fmt.Errorf("%s: %w", k.String(), err)
			}
		}
		e.newline(depth)
		e.buf.WriteByte('}')
	case reflect.Struct:
		return e.object(v, depth)
	default:
		return fmt.Errorf("unsupported kind %s", v.Kind())
	}
	return nil
}

// jsonField is one struct field as encoding/json would name it.
type jsonField struct {
	index     int
	name      string
	omitEmpty bool
}

func jsonFields(t reflect.Type) []jsonField {
	var out []jsonField
	for i := range t.NumField() {
		f := t.Field(i)
		if !f.IsExported() {
			continue
		}
		tag := f.Tag.Get("json")
		if tag == "-" {
			continue
		}
		name, opts, _ := strings.Cut(tag, ",")
		if name == "" {
			name = f.Name
		}
		out = append(out, jsonField{index: i, name: name, omitEmpty: slices.Contains(strings.Split(opts, ","), "omitempty")})
	}
	return out
}

func isEmpty(v reflect.Value) bool {
	switch v.Kind() {
	case reflect.Slice, reflect.Map, reflect.String, reflect.Array:
		return v.Len() == 0
	case reflect.Pointer, reflect.Interface:
		return v.IsNil()
	case reflect.Bool:
		return !v.Bool()
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64:
		return v.Int() == 0
	case reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64:
		return v.Uint() == 0
	case reflect.Float32, reflect.Float64:
		return v.Float() == 0
	}
	return false
}

// object writes a struct, adding "<name>_raw_b64" after a string or string
// list holding invalid UTF-8 and "<name>_nonfinite" after a NaN/Inf number.
func (e *jsonEncoder) object(v reflect.Value, depth int) error {
	obj := newObjectWriter(e, depth)
	for _, f := range e.fieldsOf(v.Type()) {
		if err := obj.field(v.Field(f.index), f); err != nil {
			return err
		}
	}
	obj.end()
	return nil
}

// nest is a JSON object or array being written an item at a time, so that
// a document can stop between items (see jsonDoc).
type nest struct {
	e     *jsonEncoder
	depth int    // of the object or array itself
	pair  string // "{}" or "[]"
	n     int    // items written
}

// next starts the next item: the opening bracket or a comma, then the indent.
func (c *nest) next() {
	if c.n == 0 {
		c.e.buf.WriteByte(c.pair[0])
	} else {
		c.e.buf.WriteByte(',')
	}
	c.n++
	c.e.newline(c.depth + 1)
}

// end closes it: the empty pair when it has no item (as encoding/json
// writes an empty struct or slice), else the closing bracket on a line of
// its own.
func (c *nest) end() {
	if c.n == 0 {
		c.e.buf.WriteString(c.pair)
		return
	}
	c.e.newline(c.depth)
	c.e.buf.WriteByte(c.pair[1])
}

// objectWriter writes one JSON object a member at a time.
type objectWriter struct{ nest }

func newObjectWriter(e *jsonEncoder, depth int) objectWriter {
	return objectWriter{nest{e: e, depth: depth, pair: "{}"}}
}

// name opens the next member: the brace or comma, the indent and the name.
func (o *objectWriter) name(name string) {
	o.next()
	o.e.str(name)
	o.e.buf.WriteString(": ")
}

// field writes struct field fv as member f, then its siblings; nothing when
// f is omitempty and fv is empty.
func (o *objectWriter) field(fv reflect.Value, f jsonField) error {
	e, depth := o.e, o.depth
	if f.omitEmpty && isEmpty(fv) {
		return nil
	}
	o.name(f.name)
	if err := e.value(fv, depth+1); err != nil {
		return fmt.Errorf("%s: %w", f.name, err)
	}
	// Siblings.
	for fv.Kind() == reflect.Pointer && !fv.IsNil() {
		fv = fv.Elem()
	}
	switch {
	case fv.Kind() == reflect.String && !utf8.ValidString(fv.String()):
		o.name(f.name + rawB64Suffix)
		e.str(base64.StdEncoding.EncodeToString([]byte(fv.String())))
	case fv.Kind() == reflect.Slice && fv.Type().Elem().Kind() == reflect.String:
		var bad bool
		for i := range fv.Len() {
			bad = bad || !utf8.ValidString(fv.Index(i).String())
		}
		if !bad {
			break
		}
		o.name(f.name + rawB64Suffix)
		e.buf.WriteByte('[')
		for i := range fv.Len() {
			if i > 0 {
				e.buf.WriteByte(',')
			}
			e.newline(depth + 2)
			if s := fv.Index(i).String(); utf8.ValidString(s) {
				e.buf.WriteString("null")
			} else {
				e.str(base64.StdEncoding.EncodeToString([]byte(s)))
			}
		}
		e.newline(depth + 1)
		e.buf.WriteByte(']')
	case fv.Kind() == reflect.Float64 || fv.Kind() == reflect.Float32:
		if n := nonFiniteName(fv.Float()); n != "" {
			o.name(f.name + nonFiniteSuffix)
			e.str(n)
		}
	}
	return nil
}

// arrayWriter writes one JSON array an element at a time, passing the text
// on to the encoder's writer between elements once over jsonFlushBytes.
type arrayWriter struct{ nest }

func newArrayWriter(e *jsonEncoder, depth int) arrayWriter {
	return arrayWriter{nest{e: e, depth: depth, pair: "[]"}}
}

func (a *arrayWriter) elem(v reflect.Value) error {
	a.next()
	if err := a.e.value(v, a.depth+1); err != nil {
		return fmt.Errorf("[%d]: %w", a.n-1, err)
	}
	if a.e.w != nil && a.e.buf.Len() > jsonFlushBytes {
		return a.e.flush()
	}
	return nil
}

// flush passes the encoded text on to w.
func (e *jsonEncoder) flush() error {
	if _, err := e.w.Write(e.buf.Bytes()); err != nil {
		return fmt.Errorf("write: %w", err)
	}
	e.buf.Reset()
	return nil
}

// jsonDoc writes a struct as a document exactly as jsonEncoder.value would,
// except that one slice member, the stream, takes its elements one at a
// time from the caller: the members before it are written at the first
// element (or at the end), those after it at the end. So a document of any
// length passes through in jsonFlushBytes pieces. The stream member's own
// value in the struct is never read, and it is written even when empty.
type jsonDoc struct {
	e      jsonEncoder
	doc    reflect.Value // the struct
	fields []jsonField
	at     int // index in fields of the stream member
	obj    objectWriter
	arr    arrayWriter
	begun  bool
}

// newJSONDoc prepares doc (an addressable struct) with the member named
// stream; a stream name that is not a member is a programming error.
func newJSONDoc(w io.Writer, doc reflect.Value, stream string) *jsonDoc {
	d := &jsonDoc{e: jsonEncoder{w: w}, doc: doc, fields: jsonFields(doc.Type()), at: -1}
	for i, f := range d.fields {
		if f.name == stream {
			d.at = i
		}
	}
	if d.at < 0 {
		panic("report: newJSONDoc: " + doc.Type().String() + " has no member " + stream)
	}
	d.obj = newObjectWriter(&d.e, 0)
	d.arr = newArrayWriter(&d.e, 1)
	return d
}

// begin writes the members before the stream and the stream's name.
func (d *jsonDoc) begin() error {
	if d.begun {
		return nil
	}
	d.begun = true
	for _, f := range d.fields[:d.at] {
		if err := d.obj.field(d.doc.Field(f.index), f); err != nil {
			return err
		}
	}
	d.obj.name(d.fields[d.at].name)
	return nil
}

// elem writes the next element of the stream.
func (d *jsonDoc) elem(v reflect.Value) error {
	if err := d.begin(); err != nil {
		return err
	}
	if err := d.arr.elem(v); err != nil {
		return fmt.Errorf("%s: %w", d.fields[d.at].name, err)
	}
	return nil
}

// end closes the stream, writes the members after it, the closing brace and
// a newline, and passes everything left on to the writer.
func (d *jsonDoc) end() error {
	if err := d.begin(); err != nil {
		return err
	}
	d.arr.end()
	for _, f := range d.fields[d.at+1:] {
		if err := d.obj.field(d.doc.Field(f.index), f); err != nil {
			return err
		}
	}
	d.obj.end()
	d.e.buf.WriteByte('\n')
	return d.e.flush()
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
	if err := json.Unmarshal(data, &a); err != nil {
		return nil, fmt.Errorf("report: decode JSON: %w", err)
	}
	var generic any
	if err := json.Unmarshal(data, &generic); err != nil {
		return nil, fmt.Errorf("report: decode JSON: %w", err)
	}
	if err := restore(reflect.ValueOf(&a).Elem(), generic); err != nil {
		return nil, fmt.Errorf("report: decode JSON: %w", err)
	}
	return &a, nil
}

// restore walks v (already decoded by encoding/json) beside its generic
// JSON tree g and applies the sibling members.
func restore(v reflect.Value, g any) error {
	switch v.Kind() {
	case reflect.Pointer:
		if v.IsNil() {
			return nil
		}
		return restore(v.Elem(), g)
	case reflect.Slice:
		arr, _ := g.([]any)
		for i := 0; i < v.Len() && i < len(arr); i++ {
			if err := restore(v.Index(i), arr[i]); err != nil {
				return fmt.Errorf("[%d]: %w", i, err)
			}
		}
	case reflect.Struct:
		obj, _ := g.(map[string]any)
		if obj == nil {
			return nil
		}
		for _, f := range jsonFields(v.Type()) {
			fv := v.Field(f.index)
			if err := restore(fv, obj[f.name]); err != nil {
				return fmt.Errorf("%s: %w", f.name, err)
			}
			if raw, ok := obj[f.name+rawB64Suffix]; ok {
				if err := restoreRaw(fv, raw); err != nil {
					return fmt.Errorf("%s%s: %w", f.name, rawB64Suffix, err)
				}
			}
			if nf, ok := obj[f.name+nonFiniteSuffix].(string); ok {
				var x float64
				switch nf {
				case "NaN":
					x = math.NaN()
				case "+Inf":
					x = math.Inf(1)
				case "-Inf":
					x = math.Inf(-1)
				default:
					return fmt.Errorf("%s%s: unknown value %q", f.name, nonFiniteSuffix, nf)
				}
				if fv.Kind() == reflect.Pointer {
					fv.Set(reflect.New(fv.Type().Elem()))
					fv = fv.Elem()
				}
				if fv.Kind() == reflect.Float64 || fv.Kind() == reflect.Float32 {
					fv.SetFloat(x)
				}
			}
		}
	}
	return nil
}

func restoreRaw(fv reflect.Value, raw any) error {
	decode := func(s string) (string, error) {
		b, err := base64.StdEncoding.DecodeString(s)
		return string(b), err
	}
	switch fv.Kind() {
	case reflect.String:
		s, ok := raw.(string)
		if !ok {
			return errors.New("not a string")
		}
		b, err := decode(s)
		if err != nil {
			return err
		}
		fv.SetString(b)
	case reflect.Slice:
		arr, ok := raw.([]any)
		if !ok || len(arr) != fv.Len() {
			return errors.New("not an array of the field's length")
		}
		for i, x := range arr {
			s, ok := x.(string)
			if !ok {
				continue // null: the element was valid UTF-8
			}
			b, err := decode(s)
			if err != nil {
				return fmt.Errorf("[%d]: %w", i, err)
			}
			fv.Index(i).SetString(b)
		}
	}
	return nil
}
