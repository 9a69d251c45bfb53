package report

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// sinkFormats are the four sinks beside the whole-audit writers they must
// match byte for byte.
var sinkFormats = []struct {
	name  string
	write func(io.Writer, *Audit) error
	sink  func(w io.Writer, head *Audit, photos []Photo) Sink
}{
	{"json", WriteJSON, func(w io.Writer, h *Audit, _ []Photo) Sink { return NewJSONSink(w, h) }},
	{"csv", WriteCSV, func(w io.Writer, _ *Audit, _ []Photo) Sink { return NewCSVSink(w) }},
	{"geojson", WriteGeoJSON, func(w io.Writer, _ *Audit, _ []Photo) Sink { return NewGeoJSONSink(w) }},
	{"html", WriteHTML, func(w io.Writer, h *Audit, ps []Photo) Sink { return NewHTMLSink(w, h, Carded(verdictsOf(ps))) }},
}

// manyVerdicts is a batch of n photos (already in report order) whose
// verdicts cycle through a few, so that Carded has to choose.
func manyVerdicts(n int) *Audit {
	vs := []string{"consistent", "consistent", "unverified", "clock_offset", "zone_slip", "not_a_verdict"}
	a := &Audit{Schema: SchemaID, Tool: Tool{Name: "gnomon"}}
	for i := range n {
		a.Photos = append(a.Photos, Photo{Path: fmt.Sprintf("roll/%06d.jpg", i), Verdict: vs[i%len(vs)]})
	}
	return a
}

// streamAll feeds a's photos, in report order, through the sink of one format.
func streamAll(t testing.TB, mk func(io.Writer, *Audit, []Photo) Sink, w io.Writer, a *Audit) {
	t.Helper()
	c := sorted(a)
	s := mk(w, a, c.Photos) // the unsorted audit as head: the sink sorts the cameras itself
	for i := range c.Photos {
		if err := s.Photo(&c.Photos[i]); err != nil {
			t.Fatalf("Photo %d: %v", i, err)
		}
	}
	if err := s.Close(); err != nil {
		t.Fatalf("Close: %v", err)
	}
}

// TestSinkMatchesWriter: a sink fed the photos one by one writes exactly the
// bytes of the whole-audit writer, and for the fixture exactly the golden
// files (which were checked against RFC 8259/4180/7946 parsers when made).
func TestSinkMatchesWriter(t *testing.T) {
	audits := []struct {
		name, golden, source string
		a                    *Audit
	}{
		{"fixture", "fixture", "testdata/fixture.{json,csv,geojson} (golden files)", fixtureAudit()},
		{"empty", "", `Write* of an empty audit (e.g. "photos": [], RFC 8259 §5)`, &Audit{}},
		{"3,000 photos, cards chosen", "", "Write* of the same audit; card rule of Carded", manyVerdicts(3000)},
		{"1,000 fixture photos", "", "Write* of the same audit (benchAudit)", benchAudit(1000)},
	}
	for _, tc := range audits {
		for _, f := range sinkFormats {
			t.Run(tc.name+"/"+f.name, func(t *testing.T) {
				var want, got bytes.Buffer
				if err := f.write(&want, tc.a); err != nil {
					t.Fatal(err)
				}
				ids := func() (s []string) {
					for _, c := range tc.a.Cameras {
						s = append(s, c.ID)
					}
					return s
				}
				before := ids()
				streamAll(t, f.sink, &got, tc.a)
				if !slices.Equal(ids(), before) {
					t.Errorf("the sink reordered the caller's cameras: %q, was %q", ids(), before)
				}
				if !bytes.Equal(got.Bytes(), want.Bytes()) {
					t.Fatalf("sink differs from Write* (%s):\n%s", tc.source, firstDiff(got.Bytes(), want.Bytes()))
				}
				if tc.golden == "" || f.name == "html" {
					return
				}
				golden, err := os.ReadFile(filepath.Join("testdata", tc.golden+"."+f.name))
				if err != nil {
					t.Fatal(err)
				}
				if !bytes.Equal(got.Bytes(), golden) {
					t.Fatalf("sink differs from the golden file (%s):\n%s", tc.source, firstDiff(got.Bytes(), golden))
				}
			})
		}
	}
}

// chunkWriter records the size of every Write.
type chunkWriter struct {
	bytes.Buffer
	chunks []int
}

func (c *chunkWriter) Write(p []byte) (int, error) {
	c.chunks = append(c.chunks, len(p))
	return c.Buffer.Write(p)
}

// TestSinkStreams: the JSON and GeoJSON sinks pass text on while photos
// arrive, in pieces of about jsonFlushBytes (the contract in its doc), not
// as one document at Close.
func TestSinkStreams(t *testing.T) {
	a := sorted(benchAudit(2000))
	tests := []struct {
		name string
		sink Sink
		w    *chunkWriter
	}{}
	for _, name := range []string{"json", "geojson"} {
		w := &chunkWriter{}
		var s Sink = NewJSONSink(w, a)
		if name == "geojson" {
			s = NewGeoJSONSink(w)
		}
		tests = append(tests, struct {
			name string
			sink Sink
			w    *chunkWriter
		}{name, s, w})
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for i := range a.Photos {
				if err := tc.sink.Photo(&a.Photos[i]); err != nil {
					t.Fatal(err)
				}
			}
			before := tc.w.Len()
			if err := tc.sink.Close(); err != nil {
				t.Fatal(err)
			}
			if before == 0 || tc.w.Len()-before > 2*jsonFlushBytes {
				t.Errorf("%d bytes written before Close, %d at Close: not streamed (jsonFlushBytes %d)", before, tc.w.Len()-before, jsonFlushBytes)
			}
			for i, n := range tc.w.chunks {
				// A piece ends at the element that took it past
				// jsonFlushBytes; one photo is a few KB.
				if n > jsonFlushBytes+16<<10 {
					t.Errorf("write %d is %d bytes, want at most about jsonFlushBytes (%d)", i, n, jsonFlushBytes)
				}
			}
		})
	}
}

// TestSinkOrder: every sink refuses a photo out of report order (Path, then
// Root, byte-wise, as the Sink doc and sorted() define it), names both paths,
// and writes nothing more; equal keys are in order (sorted keeps them).
func TestSinkOrder(t *testing.T) {
	tests := []struct {
		name         string
		first, next  Photo
		wantErr      bool
		source       string
		wantInErrMsg []string
	}{
		{"path descends", Photo{Path: "b.jpg"}, Photo{Path: "a.jpg"}, true, "Sink doc: by Path", []string{`"a.jpg"`, `"b.jpg"`}},
		{"same path, root descends", Photo{Path: "x.jpg", Root: "/z"}, Photo{Path: "x.jpg", Root: "/a"}, true, "Sink doc: then Root", []string{`"/z"`, `"/a"`}},
		{"byte order, not case-folded", Photo{Path: "a.jpg"}, Photo{Path: "B.jpg"}, true, "strings.Compare: 'B' (0x42) < 'a' (0x61)", []string{`"a.jpg"`, `"B.jpg"`}},
		{"path ascends, root descends", Photo{Path: "a.jpg", Root: "/z"}, Photo{Path: "b.jpg", Root: "/a"}, false, "Sink doc: Path decides first", nil},
		{"equal keys", Photo{Path: "a.jpg", Root: "/r"}, Photo{Path: "a.jpg", Root: "/r"}, false, "sorted() is a stable sort: duplicates stay", nil},
	}
	for _, tc := range tests {
		for _, f := range sinkFormats {
			t.Run(tc.name+"/"+f.name, func(t *testing.T) {
				var w bytes.Buffer
				s := f.sink(&w, &Audit{}, nil)
				if err := s.Photo(&tc.first); err != nil {
					t.Fatal(err)
				}
				n := w.Len()
				err := s.Photo(&tc.next)
				if !tc.wantErr {
					if err != nil {
						t.Fatalf("in order (%s), got %v", tc.source, err)
					}
					if err := s.Close(); err != nil {
						t.Fatal(err)
					}
					return
				}
				if !errors.Is(err, ErrOrder) {
					t.Fatalf("err = %v, want ErrOrder (%s)", err, tc.source)
				}
				for _, s := range tc.wantInErrMsg {
					if !strings.Contains(err.Error(), s) {
						t.Errorf("error %q does not name %s", err, s)
					}
				}
				later := tc.next
				later.Path = "zzz.jpg"
				if err2 := s.Photo(&later); !errors.Is(err2, ErrOrder) {
					t.Errorf("a photo after the error: %v, want the same error", err2)
				}
				if err2 := s.Close(); !errors.Is(err2, ErrOrder) {
					t.Errorf("Close after the error: %v, want the same error", err2)
				}
				if w.Len() != n {
					t.Errorf("%d bytes written after the error, want none", w.Len()-n)
				}
			})
		}
	}
}

// TestHTMLSinkMemoryBound: the HTML sink keeps at most MaxCards photos
// whatever the batch, while its tally and "no card" note count every photo
// (the rule in NewHTMLSink's doc and the README's Cards section).
func TestHTMLSinkMemoryBound(t *testing.T) {
	a := manyVerdicts(5 * MaxCards)
	allTrue := make([]bool, len(a.Photos))
	for i := range allTrue {
		allTrue[i] = true
	}
	tests := []struct {
		name      string
		carded    []bool
		wantCards int
		source    string
	}{
		{"Carded's choice", Carded(verdictsOf(a.Photos)), MaxCards, "Carded doc: at most MaxCards"},
		{"every photo marked", allTrue, MaxCards, "NewHTMLSink doc: at most MaxCards are kept"},
		{"short carded slice", allTrue[:10], 10, "Sink brief: an index beyond len(carded) gets none"},
		{"nil carded", nil, 0, "Sink brief: an index beyond len(carded) gets none"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b bytes.Buffer
			s := NewHTMLSink(&b, a, tc.carded).(*htmlSink)
			for i := range a.Photos {
				if err := s.Photo(&a.Photos[i]); err != nil {
					t.Fatal(err)
				}
				if len(s.cards) > MaxCards {
					t.Fatalf("after %d photos the sink holds %d, want at most MaxCards=%d", i+1, len(s.cards), MaxCards)
				}
			}
			if len(s.cards) != tc.wantCards {
				t.Errorf("holds %d photos, want %d (%s)", len(s.cards), tc.wantCards, tc.source)
			}
			if err := s.Close(); err != nil {
				t.Fatal(err)
			}
			page := b.String()
			left := 5*MaxCards - tc.wantCards
			for _, want := range []string{
				fmt.Sprintf(`<td class="n"><b>%d</b></td>`, 5*MaxCards), // the tally's total row
				fmt.Sprintf("<b>%d files have no card here</b>", left),
				fmt.Sprintf("(%d with a card below;", tc.wantCards),
			} {
				if !strings.Contains(page, want) {
					t.Errorf("page lacks %q", want)
				}
			}
			if n := strings.Count(page, `<article class="card`); n != tc.wantCards {
				t.Errorf("page has %d cards, want %d", n, tc.wantCards)
			}
		})
	}
}

// BenchmarkJSONSink streams 10,000 photos built from the fixture into
// report.json; allocations per photo should not grow with the batch.
func BenchmarkJSONSink(b *testing.B) {
	a := sorted(benchAudit(10_000))
	b.ReportAllocs()
	for b.Loop() {
		s := NewJSONSink(io.Discard, a)
		for i := range a.Photos {
			if err := s.Photo(&a.Photos[i]); err != nil {
				b.Fatal(err)
			}
		}
		if err := s.Close(); err != nil {
			b.Fatal(err)
		}
	}
}

// TestFlagged: the verdicts that call for attention are those that say
// something is off (README, verdict table); a photo nothing could test, a
// wall time whose readings the evidence does not separate (no accusation)
// and a sidecar read with its photo do not.
func TestFlagged(t *testing.T) {
	for _, s := range verdictStyles {
		want := !(s.Code == "consistent" || s.Code == "unverified" || s.Code == "ambiguous" || s.Code == "sidecar")
		if Flagged(s.Code) != want {
			t.Errorf("Flagged(%q) = %v, want %v", s.Code, !want, want)
		}
	}
	if !Flagged("not_a_verdict") {
		t.Error("an unknown verdict must call for attention, not pass unseen")
	}
}
