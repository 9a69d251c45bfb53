package report

import (
	"encoding/base64"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"unicode/utf8"
)

// jsonCodec lets encoding/json write and read report.json without losing a
// byte. encoding/json turns invalid UTF-8 into U+FFFD, refuses NaN and ±Inf,
// and writes an absent list as null; so before encoding, a value is copied
// into its "sibling form": a struct type built (reflect.StructOf) with the
// same members and tags, plus, after each string, string list or number, a
// member "<name>_raw_b64" or "<name>_nonfinite" that is omitted when empty;
// numbers become [jsonNum] (null when not finite); nil lists and maps become
// empty ones. Decoding goes the other way. Types with their own MarshalJSON
// (time.Time, exifread.Message) are left to it, siblings aside. The built
// types are kept per codec, since a batch has many photos of one type.
type jsonCodec struct {
	forms map[reflect.Type]*jsonForm
}

// jsonForm is the sibling form of one Go type.
type jsonForm struct {
	t      reflect.Type // the type encoding/json sees
	fields []formField  // for structs: the members, in order
	elem   *jsonForm    // for pointers, slices, arrays and maps
	same   bool         // t is the Go type itself: the value is used as it is
	// nullFloat: a float or *float member written as *float64, nil when
	// absent or not finite; cheaper than jsonNum's MarshalJSON, which
	// encoding/json calls and re-validates for every number.
	nullFloat bool
	kind      reflect.Kind // of the Go type
	goType    reflect.Type // the Go type
}

// formField is one struct member and its sibling.
type formField struct {
	index   int // in the Go struct
	out     int // in the form struct; the sibling, if any, is out+1
	name    string
	omit    bool // omitempty
	sibling siblingKind
	form    *jsonForm
}

type siblingKind int

const (
	noSibling    siblingKind = iota
	rawSibling               // string: "<name>_raw_b64", standard base64
	rawListSib               // []string: an array of base64 or null per element
	nonFiniteSib             // number: "<name>_nonfinite"
)

// jsonNum is a number as report.json writes it: as encoding/json does when
// finite, null otherwise (the sibling then says which).
type jsonNum float64

func (n jsonNum) MarshalJSON() ([]byte, error) {
	if math.IsNaN(float64(n)) || math.IsInf(float64(n), 0) {
		return []byte("null"), nil
	}
	return json.Marshal(float64(n))
}

func (n *jsonNum) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		return nil
	}
	return json.Unmarshal(b, (*float64)(n))
}

var (
	marshalerType  = reflect.TypeFor[json.Marshaler]()
	jsonNumType    = reflect.TypeFor[jsonNum]()
	stringPtrType  = reflect.TypeFor[*string]()
	floatPtrType   = reflect.TypeFor[*float64]()
	stringPtrsType = reflect.TypeFor[[]*string]()
)

// marshal encodes v in its sibling form, indented by two spaces with prefix
// before every line but the first, hidden characters escaped.
func (c *jsonCodec) marshal(v any, prefix string) ([]byte, error) {
	rv := reflect.ValueOf(v)
	if !rv.IsValid() {
		return []byte("null"), nil
	}
	f, err := c.form(rv.Type())
	if err != nil {
		return nil, err
	}
	sv, err := f.to(rv)
	if err != nil {
		return nil, err
	}
	b, err := json.MarshalIndent(sv.Interface(), prefix, "  ")
	if err != nil {
		return nil, err
	}
	return escapeHidden(b), nil
}

// unmarshal decodes data into v (a pointer), applying the siblings.
func (c *jsonCodec) unmarshal(data []byte, v any) error {
	rv := reflect.ValueOf(v)
	if rv.Kind() != reflect.Pointer || rv.IsNil() {
		return errors.New("unmarshal needs a non-nil pointer")
	}
	f, err := c.form(rv.Elem().Type())
	if err != nil {
		return err
	}
	sv := reflect.New(f.t)
	if err := json.Unmarshal(data, sv.Interface()); err != nil {
		return err
	}
	return f.from(sv.Elem(), rv.Elem())
}

// form returns (building once) the sibling form of t.
func (c *jsonCodec) form(t reflect.Type) (*jsonForm, error) {
	if f, ok := c.forms[t]; ok {
		return f, nil
	}
	if c.forms == nil {
		c.forms = map[reflect.Type]*jsonForm{}
	}
	f := &jsonForm{goType: t, kind: t.Kind()}
	c.forms[t] = f // before recursing, so that a failed build is not retried half-made
	var err error
	switch {
	case t.Implements(marshalerType) || reflect.PointerTo(t).Implements(marshalerType) ||
		t.Kind() == reflect.Slice && t.Elem().Kind() == reflect.Uint8:
		f.t, f.same = t, true
	case t.Kind() == reflect.Float32 || t.Kind() == reflect.Float64:
		f.t = jsonNumType
	case t.Kind() == reflect.Pointer:
		if f.elem, err = c.form(t.Elem()); err == nil {
			f.t = reflect.PointerTo(f.elem.t)
		}
	case t.Kind() == reflect.Slice:
		if f.elem, err = c.form(t.Elem()); err == nil {
			f.t = reflect.SliceOf(f.elem.t)
		}
	case t.Kind() == reflect.Array:
		if f.elem, err = c.form(t.Elem()); err == nil {
			f.t = reflect.ArrayOf(t.Len(), f.elem.t)
		}
	case t.Kind() == reflect.Map:
		if t.Key().Kind() != reflect.String {
			err = fmt.Errorf("unsupported map key type %s", t.Key())
		} else if f.elem, err = c.form(t.Elem()); err == nil {
			f.t = reflect.MapOf(t.Key(), f.elem.t)
		}
	case t.Kind() == reflect.Struct:
		err = c.structForm(f, t)
	case t.Kind() == reflect.Interface, t.Kind() == reflect.Func, t.Kind() == reflect.Chan,
		t.Kind() == reflect.Complex64, t.Kind() == reflect.Complex128, t.Kind() == reflect.UnsafePointer:
		err = fmt.Errorf("unsupported type %s", t)
	default: // bool, integers, strings
		f.t, f.same = t, true
	}
	if err != nil {
		delete(c.forms, t)
		return nil, err
	}
	return f, nil
}

func (c *jsonCodec) structForm(f *jsonForm, t reflect.Type) error {
	var out []reflect.StructField
	for i := range t.NumField() {
		sf := t.Field(i)
		tag := sf.Tag.Get("json")
		if !sf.IsExported() || tag == "-" {
			continue
		}
		if sf.Anonymous {
			return fmt.Errorf("%s.%s: embedded fields are not supported", t, sf.Name)
		}
		name, opts, _ := strings.Cut(tag, ",")
		if name == "" {
			name = sf.Name
		}
		omit := strings.Contains(","+opts+",", ",omitempty,")
		ff, err := c.form(sf.Type)
		if err != nil {
			return fmt.Errorf("%s: %w", name, err)
		}
		if isFloat(sf.Type) && !omit || sf.Type.Kind() == reflect.Pointer && isFloat(sf.Type.Elem()) {
			// (omitempty on a plain float omits 0, which jsonNum keeps.)
			ff = &jsonForm{goType: sf.Type, kind: sf.Type.Kind(), t: floatPtrType, nullFloat: true}
		}
		fld := formField{index: i, out: len(out), name: name, form: ff, omit: omit}
		out = append(out, reflect.StructField{Name: fmt.Sprintf("F%d", len(out)), Type: ff.t, Tag: sf.Tag})
		base := sf.Type
		for base.Kind() == reflect.Pointer {
			base = base.Elem()
		}
		var st reflect.Type
		switch {
		case base.Kind() == reflect.String:
			fld.sibling, st = rawSibling, stringPtrType
		case base.Kind() == reflect.Slice && base.Elem().Kind() == reflect.String:
			fld.sibling, st = rawListSib, stringPtrsType
		case base.Kind() == reflect.Float32 || base.Kind() == reflect.Float64:
			fld.sibling, st = nonFiniteSib, stringPtrType
		}
		if st != nil {
			suffix := rawB64Suffix
			if fld.sibling == nonFiniteSib {
				suffix = nonFiniteSuffix
			}
			tag := reflect.StructTag(fmt.Sprintf(`json:"%s%s,omitempty"`, name, suffix))
			out = append(out, reflect.StructField{Name: fmt.Sprintf("F%d", len(out)), Type: st, Tag: tag})
		}
		f.fields = append(f.fields, fld)
	}
	f.t = reflect.StructOf(out)
	return nil
}

func isFloat(t reflect.Type) bool { return t.Kind() == reflect.Float32 || t.Kind() == reflect.Float64 }

// to returns v (of f's Go type) in its sibling form.
func (f *jsonForm) to(v reflect.Value) (reflect.Value, error) {
	switch {
	case f.nullFloat:
		if v.Kind() == reflect.Pointer {
			if v.IsNil() {
				return reflect.Zero(floatPtrType), nil
			}
			v = v.Elem()
		}
		x := v.Float()
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return reflect.Zero(floatPtrType), nil
		}
		return reflect.ValueOf(&x), nil
	case f.same:
		return v, nil
	case f.t == jsonNumType:
		return reflect.ValueOf(jsonNum(v.Float())), nil
	}
	switch f.kind {
	case reflect.Pointer:
		if v.IsNil() {
			return reflect.Zero(f.t), nil
		}
		e, err := f.elem.to(v.Elem())
		if err != nil {
			return e, err
		}
		p := reflect.New(f.elem.t)
		p.Elem().Set(e)
		return p, nil
	case reflect.Slice, reflect.Array:
		out := reflect.New(f.t).Elem()
		if f.kind == reflect.Slice {
			out = reflect.MakeSlice(f.t, v.Len(), v.Len()) // nil becomes [], not null
		}
		for i := range v.Len() {
			e, err := f.elem.to(v.Index(i))
			if err != nil {
				return e, fmt.Errorf("[%d]: %w", i, err)
			}
			out.Index(i).Set(e)
		}
		return out, nil
	case reflect.Map:
		out := reflect.MakeMapWithSize(f.t, v.Len()) // nil becomes {}, not null
		for it := v.MapRange(); it.Next(); {
			k := it.Key()
			if !utf8.ValidString(k.String()) {
				return out, fmt.Errorf("%q: %w", k.String(), ErrInvalidKey)
			}
			e, err := f.elem.to(it.Value())
			if err != nil {
				return e, fmt.Errorf("%s: %w", k.String(), err)
			}
			out.SetMapIndex(k, e)
		}
		return out, nil
	}
	// A struct.
	out := reflect.New(f.t).Elem()
	for _, fld := range f.fields {
		fv := v.Field(fld.index)
		e, err := fld.form.to(fv)
		if err != nil {
			return e, fmt.Errorf("%s: %w", fld.name, err)
		}
		out.Field(fld.out).Set(e)
		for fv.Kind() == reflect.Pointer && !fv.IsNil() {
			fv = fv.Elem()
		}
		if fld.sibling == noSibling || fv.Kind() == reflect.Pointer || fld.omit && fv.IsZero() {
			continue // none, nil, or an omitted member: no sibling
		}
		sib := out.Field(fld.out + 1)
		switch fld.sibling {
		case rawSibling:
			if s := fv.String(); !utf8.ValidString(s) {
				b := base64.StdEncoding.EncodeToString([]byte(s))
				sib.Set(reflect.ValueOf(&b))
			}
		case rawListSib:
			var raws []*string
			for i := range fv.Len() {
				if s := fv.Index(i).String(); !utf8.ValidString(s) {
					if raws == nil {
						raws = make([]*string, fv.Len())
					}
					b := base64.StdEncoding.EncodeToString([]byte(s))
					raws[i] = &b
				}
			}
			sib.Set(reflect.ValueOf(raws))
		case nonFiniteSib:
			if n := nonFiniteName(fv.Float()); n != "" {
				sib.Set(reflect.ValueOf(&n))
			}
		}
	}
	return out, nil
}

// from sets dst (of f's Go type) from sv, its decoded sibling form.
func (f *jsonForm) from(sv, dst reflect.Value) error {
	switch {
	case f.nullFloat:
		switch {
		case sv.IsNil():
			dst.SetZero()
		case dst.Kind() == reflect.Pointer:
			dst.Set(reflect.New(dst.Type().Elem()))
			dst.Elem().SetFloat(sv.Elem().Float())
		default:
			dst.SetFloat(sv.Elem().Float())
		}
		return nil
	case f.same:
		dst.Set(sv)
		return nil
	case f.t == jsonNumType:
		dst.SetFloat(sv.Float())
		return nil
	}
	switch f.kind {
	case reflect.Pointer:
		if sv.IsNil() {
			dst.SetZero()
			return nil
		}
		dst.Set(reflect.New(f.goType.Elem()))
		return f.elem.from(sv.Elem(), dst.Elem())
	case reflect.Slice, reflect.Array:
		if f.kind == reflect.Slice {
			dst.Set(reflect.MakeSlice(f.goType, sv.Len(), sv.Len()))
		}
		for i := range sv.Len() {
			if err := f.elem.from(sv.Index(i), dst.Index(i)); err != nil {
				return fmt.Errorf("[%d]: %w", i, err)
			}
		}
		return nil
	case reflect.Map:
		dst.Set(reflect.MakeMapWithSize(f.goType, sv.Len()))
		for it := sv.MapRange(); it.Next(); {
			e := reflect.New(f.goType.Elem()).Elem()
			if err := f.elem.from(it.Value(), e); err != nil {
				return fmt.Errorf("%s: %w", it.Key().String(), err)
			}
			dst.SetMapIndex(it.Key().Convert(f.goType.Key()), e)
		}
		return nil
	}
	for _, fld := range f.fields {
		fv := dst.Field(fld.index)
		if err := fld.form.from(sv.Field(fld.out), fv); err != nil {
			return fmt.Errorf("%s: %w", fld.name, err)
		}
		if fld.sibling == noSibling {
			continue
		}
		if err := fld.restore(sv.Field(fld.out+1), fv); err != nil {
			return fmt.Errorf("%s: %w", fld.name, err)
		}
	}
	return nil
}

// restore applies a decoded sibling to the member fv it belongs to.
func (fld *formField) restore(sib, fv reflect.Value) error {
	if sib.IsNil() {
		return nil
	}
	switch fld.sibling {
	case rawSibling:
		s, err := decodeB64(sib.Elem().String())
		if err != nil {
			return fmt.Errorf("%s%s: %w", fld.name, rawB64Suffix, err)
		}
		for fv.Kind() == reflect.Pointer {
			if fv.IsNil() {
				fv.Set(reflect.New(fv.Type().Elem()))
			}
			fv = fv.Elem()
		}
		fv.SetString(s)
	case rawListSib:
		for fv.Kind() == reflect.Pointer && !fv.IsNil() {
			fv = fv.Elem()
		}
		if fv.Kind() != reflect.Slice || sib.Len() != fv.Len() {
			return fmt.Errorf("%s%s: not an array of the member's length", fld.name, rawB64Suffix)
		}
		for i := range sib.Len() {
			if sib.Index(i).IsNil() {
				continue // the element was valid UTF-8
			}
			s, err := decodeB64(sib.Index(i).Elem().String())
			if err != nil {
				return fmt.Errorf("%s%s: [%d]: %w", fld.name, rawB64Suffix, i, err)
			}
			fv.Index(i).SetString(s)
		}
	case nonFiniteSib:
		var x float64
		switch n := sib.Elem().String(); n {
		case "NaN":
			x = math.NaN()
		case "+Inf":
			x = math.Inf(1)
		case "-Inf":
			x = math.Inf(-1)
		default:
			return fmt.Errorf("%s%s: unknown value %q", fld.name, nonFiniteSuffix, n)
		}
		for fv.Kind() == reflect.Pointer {
			if fv.IsNil() {
				fv.Set(reflect.New(fv.Type().Elem()))
			}
			fv = fv.Elem()
		}
		fv.SetFloat(x)
	}
	return nil
}
