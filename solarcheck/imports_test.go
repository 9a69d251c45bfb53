package solarcheck

import (
	"go/parser"
	"go/token"
	"io/fs"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestNoSheetInTheDomain: the measurement sheet is an input reader, like
// exifread; the checks take their own Measurement and Override values
// (internal/audit converts the sheet's rows). No non-test file of
// solarcheck or of its packages other than the sheet itself may import it,
// so a sheet layout change never reaches the domain (issue 11, layout).
func TestNoSheetInTheDomain(t *testing.T) {
	const sheetPkg = "github.com/gnomon-forensics/gnomon/solarcheck/sheet"
	scanned := 0
	err := filepath.WalkDir(".", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && (p == "sheet" || d.Name() == "testdata") {
			return filepath.SkipDir
		}
		if d.IsDir() || !strings.HasSuffix(p, ".go") || strings.HasSuffix(p, "_test.go") {
			return nil
		}
		f, err := parser.ParseFile(token.NewFileSet(), p, nil, parser.ImportsOnly)
		if err != nil {
			return err
		}
		scanned++
		for _, im := range f.Imports {
			if path, _ := strconv.Unquote(im.Path.Value); path == sheetPkg {
				t.Errorf("%s imports %s", p, sheetPkg)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if scanned < 10 { // the scan must have seen the package's own files
		t.Fatalf("scanned only %d files", scanned)
	}
}
