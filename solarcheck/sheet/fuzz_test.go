package sheet

import (
	"bytes"
	"encoding/csv"
	"errors"
	"strings"
	"testing"
)

// FuzzParse checks invariants that hold for any input: no panic; every
// problem is a located *ParseError of a known kind; the error is nil exactly
// when there are no problems; every returned row has a photo and a kind, and
// its angles lie in their documented ranges; and a row's photo name written
// back through WriteTemplate is read back unchanged.
func FuzzParse(f *testing.F) {
	seeds := []string{
		header + "x.jpg,p,2,3,40,,,,,,,\n",
		"\uFEFFphoto;sun_azimuth;sun_altitude\r\nx.jpg;181,5;-3,25\r\n",
		"photo,note\n\"a,b.jpg\",\"multi\nline \"\"quoted\"\"\"\n",
		"photo,lat,lon,time\nx.jpg,45,7,2026-05-03T14:22:05Z\ny.jpg,,,2026:05:03 14:22:05\n",
		"photo,shadow_bearing,bearing_ref,declination\nx.jpg,400,grid,3\n",
		"photo,slope,slope_toward,object_height,shadow_length,shadow_bearing\nx,10,90,1,2,3\n",
		"photo\n\"unterminated\n",
		"photo,a,b\n1,2,3,4,5\n;;;\n",
		"",
	}
	for _, s := range seeds {
		f.Add([]byte(s))
	}
	kinds := []error{ErrSyntax, ErrEncoding, ErrTooLarge, ErrNoHeader, ErrUnknownColumn, ErrDuplicateColumn,
		ErrExtraField, ErrMissing, ErrNotNumber, ErrOutOfRange, ErrNotPositive, ErrUnknownRef, ErrBadTime,
		ErrConflict, ErrIncomplete, ErrDuplicate}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Parse(bytes.NewReader(data), "f.csv")
		if s == nil {
			t.Fatal("nil sheet")
		}
		if (err == nil) != (len(s.Problems) == 0) {
			t.Fatalf("err %v with %d problems", err, len(s.Problems))
		}
		for _, p := range s.Problems {
			if p.File != "f.csv" || p.Line < 1 || p.Column < 0 {
				t.Fatalf("badly located problem %#v", p)
			}
			known := false
			for _, k := range kinds {
				known = known || errors.Is(p, k)
			}
			if !known {
				t.Fatalf("problem of no documented kind: %v", p)
			}
		}
		in := func(p *float64, lo, hi float64) bool { return p == nil || (*p >= lo && *p <= hi) }
		var tmpl []TemplateRow
		seen := map[string]bool{}
		for _, r := range s.Rows {
			if r.Photo == "" || r.Kind < KindShadow || r.Kind > KindOverride {
				t.Fatalf("bad row %+v", r)
			}
			if !in(r.ShadowBearingDeg, 0, 360) || !in(r.SunAzimuthDeg, 0, 360) || !in(r.SunAltitudeDeg, -90, 90) ||
				!in(r.Lat, -90, 90) || !in(r.Lon, -180, 180) || r.SlopeDeg < 0 || r.SlopeDeg >= 90 {
				t.Fatalf("angle out of range in %+v", r)
			}
			// Round-trippable names: no CR (encoding/csv normalises it inside
			// quotes), no surrounding space (cells are trimmed), not starting
			// with an apostrophe (that is the neutralisation mark), unique.
			if strings.ContainsRune(r.Photo, '\r') || strings.TrimSpace(r.Photo) != r.Photo ||
				strings.HasPrefix(r.Photo, "'") || seen[r.Photo] {
				continue
			}
			seen[r.Photo] = true
			tmpl = append(tmpl, TemplateRow{Photo: r.Photo})
		}
		var buf bytes.Buffer
		if err := WriteTemplate(&buf, tmpl); err != nil {
			t.Fatal(err)
		}
		// The same names with a sighting each, written as WriteTemplate
		// writes cells, come back unchanged and in order.
		var filled bytes.Buffer
		cw := csv.NewWriter(&filled)
		cw.Write([]string{ColPhoto, ColSunAzimuth})
		for _, r := range tmpl {
			cw.Write([]string{neutralise(r.Photo), "10"})
		}
		cw.Flush()
		rt, err := Parse(&filled, "rt.csv")
		if err != nil || len(rt.Rows) != len(tmpl) {
			t.Fatalf("round trip: %v, %d rows for %d names", err, len(rt.Rows), len(tmpl))
		}
		for i, r := range rt.Rows {
			if r.Photo != tmpl[i].Photo {
				t.Fatalf("round trip photo %q, want %q", r.Photo, tmpl[i].Photo)
			}
		}
		// Resolve against the names themselves: no panic, only given paths
		// come back, no row twice, and every lost row is explained.
		paths := make([]Name, len(tmpl))
		for i, r := range tmpl {
			paths[i] = Name{ID: r.Photo, Rel: r.Photo}
		}
		matched, rerr := s.Resolve(paths)
		total := 0
		for p, rows := range matched {
			if !seen[p] {
				t.Fatalf("Resolve returned unknown path %q", p)
			}
			total += len(rows)
		}
		if total > len(s.Rows) || (total < len(s.Rows) && rerr == nil) {
			t.Fatalf("Resolve kept %d of %d rows, err %v", total, len(s.Rows), rerr)
		}
		back, err := Parse(bytes.NewReader(buf.Bytes()), "back.csv")
		if err != nil || len(back.Rows) != 0 {
			t.Fatalf("unfilled template read back: %v, %d rows", err, len(back.Rows))
		}
	})
}
