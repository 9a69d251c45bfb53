package report

import (
	"bytes"
	"flag"
	"io"
	"os"
	"path/filepath"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden files in testdata/")

// TestGolden pins the exact bytes of the three machine-readable files for the
// fixture, so that a change of layout is a reviewed change (the files were
// read by hand when written: go test ./report -run Golden -update). It also
// shows reruns and other machines give byte-identical output (issue 5).
//
// These files are change detectors, not witnesses: they hold whatever the
// writers printed when last updated, so a value that was wrong then is
// pinned wrong. The correctness of each field comes from the tests that
// compare it with an outside value (the writers' own tests against RFC 4180,
// RFC 7946 and encoding/json; the astronomy, zone and clock packages against
// their published references).
func TestGolden(t *testing.T) {
	tests := []struct {
		file  string
		write func(io.Writer, *Audit) error
	}{
		{"fixture.json", WriteJSON},
		{"fixture.csv", WriteCSV},
		{"fixture.geojson", WriteGeoJSON},
	}
	for _, tc := range tests {
		t.Run(tc.file, func(t *testing.T) {
			var b bytes.Buffer
			if err := tc.write(&b, fixtureAudit()); err != nil {
				t.Fatal(err)
			}
			path := filepath.Join("testdata", tc.file)
			if *update {
				if err := os.WriteFile(path, b.Bytes(), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (run with -update to create it)", err)
			}
			if !bytes.Equal(b.Bytes(), want) {
				t.Errorf("%s differs from the golden file:\n%s", tc.file, firstDiff(b.Bytes(), want))
			}
		})
	}
}
