package exifread

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"os"
	"strconv"
	"strings"
)

// XMP namespaces (XMP Specification Part 2, and the EXIF/TIFF schemas of
// the CIPA DC-010 "Exif metadata for XMP").
const (
	nsXMP       = "http://ns.adobe.com/xap/1.0/"
	nsEXIF      = "http://ns.adobe.com/exif/1.0/"
	nsTIFF      = "http://ns.adobe.com/tiff/1.0/"
	nsPhotoshop = "http://ns.adobe.com/photoshop/1.0/"
	nsEXIFEX    = "http://cipa.jp/exif/1.0/"
)

// xmpProps maps "namespace local" to the first simple value found.
type xmpProps map[string]string

func (p xmpProps) get(ns, local string) (string, bool) {
	v, ok := p[ns+" "+local]
	return strings.TrimSpace(v), ok
}

// parseXMP collects simple property values (as attributes of
// rdf:Description or as element text). It stops at the first XML error and
// returns what it had together with a FormatError.
func parseXMP(b []byte) (xmpProps, error) {
	props := xmpProps{}
	dec := xml.NewDecoder(bytes.NewReader(b))
	dec.Strict = false
	dec.CharsetReader = func(label string, r io.Reader) (io.Reader, error) { return r, nil }
	var stack []string // key of each open element
	var text strings.Builder
	for n := 0; ; n++ {
		if n > 1_000_000 {
			return props, &LimitError{Where: "xmp", Limit: "tokens", Value: int64(n), Max: 1_000_000}
		}
		tok, err := dec.Token()
		if errors.Is(err, io.EOF) {
			return props, nil
		}
		if err != nil {
			return props, &FormatError{Where: "xmp", Offset: dec.InputOffset(), Err: err}
		}
		switch t := tok.(type) {
		case xml.StartElement:
			if len(stack) > 256 {
				return props, &LimitError{Where: "xmp", Limit: "depth", Value: int64(len(stack)), Max: 256}
			}
			for _, a := range t.Attr {
				k := a.Name.Space + " " + a.Name.Local
				if _, dup := props[k]; !dup {
					props[k] = a.Value
				}
			}
			stack = append(stack, t.Name.Space+" "+t.Name.Local)
			text.Reset()
		case xml.CharData:
			if text.Len() < 4096 {
				text.Write(t)
			}
		case xml.EndElement:
			if len(stack) == 0 {
				continue
			}
			k := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			if s := strings.TrimSpace(text.String()); s != "" {
				if _, dup := props[k]; !dup {
					props[k] = s
				}
			}
			text.Reset()
		}
	}
}

// parseXMPCoord parses an XMP GPSCoordinate "DDD,MM,SSk" or "DDD,MM.mmk"
// (CIPA DC-010 §2.5) into signed degrees.
func parseXMPCoord(raw string) (float64, bool) {
	s := strings.TrimSpace(raw)
	if s == "" {
		return 0, false
	}
	sign := 1.0
	switch s[len(s)-1] {
	case 'N', 'E', 'n', 'e':
	case 'S', 'W', 's', 'w':
		sign = -1
	default:
		// a plain decimal number is accepted too
		v, err := strconv.ParseFloat(s, 64)
		return v, err == nil
	}
	parts := strings.Split(s[:len(s)-1], ",")
	if len(parts) < 2 || len(parts) > 3 {
		return 0, false
	}
	var v [3]float64
	for i, p := range parts {
		f, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
		if err != nil {
			return 0, false
		}
		v[i] = f
	}
	return sign * (v[0] + v[1]/60 + v[2]/3600), true
}

// parseXMPRational parses "n/d" or a decimal.
func parseXMPRational(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	if i := strings.IndexByte(s, '/'); i >= 0 {
		n, e1 := strconv.ParseFloat(s[:i], 64)
		d, e2 := strconv.ParseFloat(s[i+1:], 64)
		if e1 != nil || e2 != nil || d == 0 {
			return 0, false
		}
		return n / d, true
	}
	v, err := strconv.ParseFloat(s, 64)
	return v, err == nil
}

// CheckSidecar says whether the .xmp file at path gives its photo anything:
// nil when it is an XMP packet with at least one property, otherwise why not
// (too large, not well-formed XML, empty). The file is opened read-only.
// The photo's own record reads the sidecar's values (ReadFile); this only
// lets the sidecar's row in a report say whether it was usable.
func CheckSidecar(path string, opt Options) error {
	opt = opt.withDefaults()
	st, err := os.Stat(path)
	if err != nil {
		return err
	}
	if st.Size() > opt.MaxXMPBytes {
		return &LimitError{Where: "sidecar", Limit: "MaxXMPBytes", Value: st.Size(), Max: opt.MaxXMPBytes}
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	props, err := parseXMP(b)
	if err != nil {
		return err
	}
	for k := range props {
		if !strings.HasPrefix(k, "xmlns ") { // a namespace declaration is no property
			return nil
		}
	}
	return errors.New("no XMP property in the file")
}
