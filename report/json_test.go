package report

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

func encodeJSON(t *testing.T, a *Audit) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := WriteJSON(&b, a); err != nil {
		t.Fatalf("WriteJSON: %v", err)
	}
	return b.Bytes()
}

// TestJSONRoundTrip: decoding report.json and encoding it again gives the
// same bytes, and the original strings (including invalid UTF-8) come back.
func TestJSONRoundTrip(t *testing.T) {
	valid := fixtureAudit()
	valid.Photos = slices.DeleteFunc(valid.Photos, func(p Photo) bool { return p.Path == hostInvalid })
	valid.Cameras = valid.Cameras[:2]
	tests := []struct {
		name, source string
		a            *Audit
	}{
		{"valid UTF-8 only", "RFC 8259 §8.1 (UTF-8 text)", valid},
		{"hostile, invalid UTF-8, NaN", "RFC 8259 §8.1; package doc sibling rule", fixtureAudit()},
		{"empty audit", "RFC 8259 §5 (empty arrays)", &Audit{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			first := encodeJSON(t, tc.a)
			if !json.Valid(first) {
				t.Fatalf("output is not valid JSON (%s)", tc.source)
			}
			if !bytes.HasSuffix(first, []byte("}\n")) {
				t.Errorf("output does not end with a newline")
			}
			back, err := ReadJSON(bytes.NewReader(first))
			if err != nil {
				t.Fatalf("ReadJSON: %v", err)
			}
			second := encodeJSON(t, back)
			if !bytes.Equal(first, second) {
				t.Fatalf("re-encoding differs:\n%s", firstDiff(first, second))
			}
			want := sorted(tc.a)
			for i, p := range back.Photos {
				if p.Path != want.Photos[i].Path || p.Error != want.Photos[i].Error {
					t.Errorf("photo %d: path/error %q/%q, want exact bytes %q/%q", i, p.Path, p.Error, want.Photos[i].Path, want.Photos[i].Error)
				}
				if (p.Lat == nil) != (want.Photos[i].Lat == nil) || p.Lat != nil && !sameFloat(*p.Lat, *want.Photos[i].Lat) {
					t.Errorf("photo %d: lat %v, want %v", i, p.Lat, want.Photos[i].Lat)
				}
			}
			for i, c := range back.Cameras {
				if !slices.Equal(c.Outliers, want.Cameras[i].Outliers) || c.ID != want.Cameras[i].ID {
					t.Errorf("camera %d: %q %q, want %q %q", i, c.ID, c.Outliers, want.Cameras[i].ID, want.Cameras[i].Outliers)
				}
			}
		})
	}
}

func sameFloat(a, b float64) bool { return a == b || math.IsNaN(a) && math.IsNaN(b) }

func firstDiff(a, b []byte) string {
	n := min(len(a), len(b))
	i := 0
	for i < n && a[i] == b[i] {
		i++
	}
	lo := max(0, i-80)
	return "first:  …" + string(a[lo:min(len(a), i+80)]) + "\nsecond: …" + string(b[lo:min(len(b), i+80)])
}

// TestJSONAnyBytes: for hostile byte sequences in a path, the output is
// valid JSON and the sibling carries the exact bytes.
func TestJSONAnyBytes(t *testing.T) {
	all := make([]byte, 256)
	for i := range all {
		all[i] = byte(i)
	}
	tests := []struct {
		name, path, wantB64, source string
	}{
		{"two invalid bytes", "\xff\xfe", "//4=", "coreutils `printf '\\377\\376' | base64`"},
		{"every byte value", string(all), "", "RFC 8259 §7 (escaping of control characters)"},
		{"UTF-16 surrogate encoded in UTF-8", "a\xed\xa0\x80b", "Ye2ggGI=", "coreutils base64; RFC 3629 §3 (surrogates are invalid)"},
		{"overlong slash", "\xc0\xaf", "wK8=", "coreutils base64; RFC 3629 §10 (overlong forms)"},
		{"truncated sequence", "caf\xc3", "Y2Fmww==", "coreutils base64"},
		{"valid but odd: U+2028 and NUL", "a\u2028\x00b", "", "RFC 8259 §7; valid UTF-8 needs no sibling"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			a := &Audit{Photos: []Photo{{Path: tc.path}}}
			out := encodeJSON(t, a)
			if !json.Valid(out) {
				t.Fatalf("invalid JSON (%s)", tc.source)
			}
			var g struct {
				Photos []map[string]any `json:"photos"`
			}
			if err := json.Unmarshal(out, &g); err != nil {
				t.Fatal(err)
			}
			got, has := g.Photos[0]["path"+rawB64Suffix]
			if tc.wantB64 != "" && got != tc.wantB64 {
				t.Errorf("path_raw_b64 = %v, want %q (%s)", got, tc.wantB64, tc.source)
			}
			if strings.ToValidUTF8(tc.path, "x") == tc.path && has {
				t.Errorf("sibling present for valid UTF-8")
			}
			back, err := ReadJSON(bytes.NewReader(out))
			if err != nil {
				t.Fatal(err)
			}
			if back.Photos[0].Path != tc.path {
				t.Errorf("recovered %q, want %q", back.Photos[0].Path, tc.path)
			}
		})
	}
}

// TestJSONFields: the members issue 5 requires are present, with the names it gives.
func TestJSONFields(t *testing.T) {
	out := encodeJSON(t, fixtureAudit())
	var g map[string]any
	if err := json.Unmarshal(out, &g); err != nil {
		t.Fatal(err)
	}
	if g["schema"] != "gnomon.audit/1" {
		t.Errorf("schema = %v", g["schema"])
	}
	photo := g["photos"].([]any)[0].(map[string]any)
	camera := g["cameras"].([]any)[0].(map[string]any)
	tests := []struct {
		where  string
		obj    map[string]any
		keys   []string
		source string
	}{
		{"top", g, []string{"schema", "tool", "run", "photos", "cameras"}, "issue 5, report.json"},
		{"run", g["run"].(map[string]any), []string{"command_line", "inputs", "delta_t_model", "tzdata_version", "magnetic_model", "self_test"}, "issue 5, run header"},
		{"photo", photo, []string{"path", "sha256", "camera", "claimed_local", "zone", "claimed_utc", "lat", "lon", "sun", "checks",
			"verdict", "offset_s", "offset_low_s", "offset_high_s", "corrected_utc_earliest", "corrected_utc_latest", "explanation"}, "issue 5, each photo"},
		{"camera", camera, []string{"id", "photos", "offset_s", "drift_s_per_day", "outliers"}, "issue 5, each camera"},
	}
	for _, tc := range tests {
		for _, k := range tc.keys {
			if _, ok := tc.obj[k]; !ok {
				t.Errorf("%s: member %q missing (%s)", tc.where, k, tc.source)
			}
		}
	}
	for _, k := range []string{"Thumbnail", "SunPath", "BestFit", "thumbnail"} {
		if _, ok := photo[k]; ok {
			t.Errorf("HTML-only field %q leaked into JSON", k)
		}
	}
}

// TestJSONOrderAndDeterminism: photos by path, cameras by id, the caller's
// slices untouched, and two writes give the same bytes.
func TestJSONOrderAndDeterminism(t *testing.T) {
	a := fixtureAudit()
	before := slices.Clone(a.Photos)
	first, second := encodeJSON(t, a), encodeJSON(t, a)
	if !bytes.Equal(first, second) {
		t.Fatal("two writes differ")
	}
	if a.Photos[0].Path != before[0].Path {
		t.Error("WriteJSON reordered the caller's photos")
	}
	var g struct {
		Photos  []struct{ Path string }
		Cameras []struct{ ID string }
	}
	if err := json.Unmarshal(first, &g); err != nil {
		t.Fatal(err)
	}
	if !slices.IsSortedFunc(g.Photos, func(x, y struct{ Path string }) int { return strings.Compare(x.Path, y.Path) }) {
		t.Error("photos not sorted by path")
	}
	if !slices.IsSortedFunc(g.Cameras, func(x, y struct{ ID string }) int { return strings.Compare(x.ID, y.ID) }) {
		t.Error("cameras not sorted by id")
	}
	if !bytes.Contains(first, []byte("\n  \"photos\": [\n    {\n      \"path\": ")) {
		t.Error("not indented by two spaces per level")
	}
}

// TestJSONNonFinite: NaN and infinities, which JSON cannot hold (RFC 8259 §6),
// become null with a "_nonfinite" sibling.
func TestJSONNonFinite(t *testing.T) {
	tests := []struct {
		lat  float64
		want string
	}{
		{math.NaN(), `"lat": null,` + "\n      \"lat_nonfinite\": \"NaN\""},
		{math.Inf(1), `"lat": null,` + "\n      \"lat_nonfinite\": \"+Inf\""},
		{math.Inf(-1), `"lat": null,` + "\n      \"lat_nonfinite\": \"-Inf\""},
		{-33.5, `"lat": -33.5,` + "\n      \"lon\""},
	}
	for _, tc := range tests {
		out := encodeJSON(t, &Audit{Photos: []Photo{{Lat: fp(tc.lat)}}})
		if !bytes.Contains(out, []byte(tc.want)) {
			t.Errorf("lat %v: output lacks %q:\n%s", tc.lat, tc.want, out)
		}
	}
}

func TestJSONInvalidMapKey(t *testing.T) {
	a := &Audit{Run: Run{Counts: Counts{ByVerdict: map[string]int{"ok\xff": 1}}}}
	err := WriteJSON(&bytes.Buffer{}, a)
	if !errors.Is(err, ErrInvalidKey) {
		t.Fatalf("err = %v, want ErrInvalidKey", err)
	}
}

// TestJSONMatchesEncodingJSON: for valid UTF-8 without hidden characters
// and finite numbers, the output is exactly what encoding/json's MarshalIndent writes for the same
// document (an independent encoder), so the sibling rules add nothing else.
func TestJSONMatchesEncodingJSON(t *testing.T) {
	valid := fixtureAudit()
	valid.Photos = slices.DeleteFunc(valid.Photos, func(p Photo) bool {
		return p.Path == hostInvalid || p.Path == hostScript
	})
	valid.Cameras = valid.Cameras[:2]
	valid.Run.CommandLine = valid.Run.CommandLine[:5] // drop the RTL override, which we escape and encoding/json does not
	ours := encodeJSON(t, valid)
	var decoded Audit // decoding turns every absent list into [], as we write it
	if err := json.Unmarshal(ours, &decoded); err != nil {
		t.Fatal(err)
	}
	theirs, err := json.MarshalIndent(&decoded, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	theirs = append(theirs, '\n')
	if !bytes.Equal(ours, theirs) {
		t.Fatalf("differs from encoding/json:\n%s", firstDiff(ours, theirs))
	}
}

// TestJSONScalarsMatchEncodingJSON: strings and numbers are written byte for
// byte as encoding/json writes them (the witness), hidden characters aside.
func TestJSONScalarsMatchEncodingJSON(t *testing.T) {
	encode := func(v any) []byte {
		var b bytes.Buffer
		if err := EncodeJSON(&b, v); err != nil {
			t.Fatalf("EncodeJSON(%v): %v", v, err)
		}
		return bytes.TrimSuffix(b.Bytes(), []byte("\n"))
	}
	for _, s := range []string{"", "plain", "q\"b\\s", "<a href='x'>&amp;</a>", "\x00\x01\x1f\x7f", "\b\f\n\r\t",
		"\u2028\u2029", "\xff", "caf\xc3", "é日本\U0001F600", "\xed\xa0\x80", "\ufffd"} {
		want, _ := json.Marshal(s)
		if got := encode(s); !bytes.Equal(got, want) {
			t.Errorf("string %q: %s, encoding/json %s", s, got, want)
		}
	}
	// The one departure: hidden characters are escaped, and decode the same.
	for _, tc := range []struct{ in, want string }{
		{"holiday\u202egpj.exe", `"holiday\u202egpj.exe"`},
		{"a\u200bb\ufeff", `"a\u200bb\ufeff"`},
		{"\u0085", `"\u0085"`},
	} {
		got := encode(tc.in)
		var back string
		if string(got) != tc.want || json.Unmarshal(got, &back) != nil || back != tc.in {
			t.Errorf("string %q: %s (decodes to %q), want %s", tc.in, got, back, tc.want)
		}
	}
	for _, f := range []float64{0, math.Copysign(0, -1), 1, -7200, 0.1, 1e-6, 9.99e-7, 1e-9, 1e20, 1e21, 123456789.125, math.MaxFloat64, math.SmallestNonzeroFloat64} {
		want, _ := json.Marshal(f)
		if got := encode(f); !bytes.Equal(got, want) {
			t.Errorf("number %v: %s, encoding/json %s", f, got, want)
		}
	}
}
