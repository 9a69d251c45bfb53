package zone

import (
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestNoHostZones scans every Go file of the module. time.LoadLocation
// reads $ZONEINFO and the host's zoneinfo before the copy in time/tzdata,
// so an answer that used it would change with the machine (issue 10, defect
// 5): outside this package no production file may call it; zones come from
// DB. And no test may import time/tzdata, which would let a test pass on
// zones the shipped binary does not carry.
func TestNoHostZones(t *testing.T) {
	root, err := filepath.Abs(filepath.Join("..", ".."))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(root, "go.mod")); err != nil {
		t.Fatalf("module root not found at %s: %v", root, err)
	}
	own, _ := filepath.Abs(".")
	scanned := 0
	err = filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if n := d.Name(); n != "." && (strings.HasPrefix(n, ".") || n == "testdata" || n == "vendor") && p != root {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(p, ".go") {
			return nil
		}
		fset := token.NewFileSet()
		f, err := parser.ParseFile(fset, p, nil, 0)
		if err != nil {
			return err
		}
		scanned++
		rel, _ := filepath.Rel(root, p)
		isTest := strings.HasSuffix(p, "_test.go")
		timeName := ""
		for _, im := range f.Imports {
			path, _ := strconv.Unquote(im.Path.Value)
			if path == "time/tzdata" && isTest {
				t.Errorf("%s imports time/tzdata: tests must use the zones the binary carries (zone.DB)", rel)
			}
			if path == "time" {
				timeName = "time"
				if im.Name != nil {
					timeName = im.Name.Name
				}
			}
		}
		if isTest || filepath.Dir(p) == own || timeName == "" {
			return nil
		}
		ast.Inspect(f, func(n ast.Node) bool {
			if sel, ok := n.(*ast.SelectorExpr); ok && sel.Sel.Name == "LoadLocation" {
				if x, ok := sel.X.(*ast.Ident); ok && x.Name == timeName {
					t.Errorf("%s: calls time.LoadLocation, which reads the host's zones; use zone.DB", fset.Position(sel.Pos()))
				}
			}
			return true
		})
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if scanned < 100 { // the walk must have reached the whole module
		t.Fatalf("scanned only %d Go files under %s", scanned, root)
	}
}
