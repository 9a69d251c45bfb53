package report

import (
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"slices"
	"strconv"
	"testing"
)

// constantsOf returns the string constants of type typ declared in the Go
// files of dir: the outside witness for the page's word tables is the
// source of the package that defines the codes, so a code added there and
// not here fails this test.
func constantsOf(t *testing.T, dir, typ string) []string {
	t.Helper()
	files, err := filepath.Glob(filepath.Join(dir, "*.go"))
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	fset := token.NewFileSet()
	for _, name := range files {
		if filepath.Ext(name) != ".go" || len(name) > 8 && name[len(name)-8:] == "_test.go" {
			continue
		}
		f, err := parser.ParseFile(fset, name, nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			vs, ok := n.(*ast.ValueSpec)
			if !ok || vs.Type == nil {
				return true
			}
			if id, ok := vs.Type.(*ast.Ident); !ok || id.Name != typ {
				return true
			}
			for _, v := range vs.Values {
				if lit, ok := v.(*ast.BasicLit); ok && lit.Kind == token.STRING {
					s, _ := strconv.Unquote(lit.Value)
					out = append(out, s)
				}
			}
			return true
		})
	}
	if len(out) == 0 {
		t.Fatalf("no constants of type %s in %s", typ, dir)
	}
	return out
}

// TestWordsCoverCodes ties the page's words to the codes: every verdict of
// solarcheck.Verdict has a label of its own (issue 11: the HTML verdict
// labels had no test tying them to the constants), and every check kind,
// check status and claim rule has plain words, so no code reaches a card.
func TestWordsCoverCodes(t *testing.T) {
	var verdictCodes []string
	for _, s := range verdictStyles {
		verdictCodes = append(verdictCodes, s.Code)
	}
	codes := func(ws []codeWord) []string {
		var out []string
		for _, w := range ws {
			out = append(out, w.Code)
		}
		return out
	}
	tests := []struct {
		dir, typ string
		have     []string
	}{
		{"../solarcheck", "Verdict", verdictCodes},
		{"../solarcheck", "Kind", codes(checkKindWords)},
		{"../solarcheck", "Status", codes(checkStatusWords)},
		{"../solarcheck/zone", "Rule", codes(claimSourceWords)},
	}
	for _, tc := range tests {
		want := constantsOf(t, tc.dir, tc.typ)
		for _, c := range want {
			if !slices.Contains(tc.have, c) {
				t.Errorf("%s.%s %q has no words on the page", filepath.Base(tc.dir), tc.typ, c)
			}
		}
		for _, c := range tc.have {
			if !slices.Contains(want, c) {
				t.Errorf("the page has words for %q, which is no %s.%s", c, filepath.Base(tc.dir), tc.typ)
			}
		}
	}
	labels := map[string]string{}
	for _, s := range verdictStyles {
		if other, dup := labels[s.Label]; dup {
			t.Errorf("verdicts %q and %q share the label %q", other, s.Code, s.Label)
		}
		labels[s.Label] = s.Code
		if s.Label == s.Code {
			t.Errorf("verdict %q is labelled with its code", s.Code)
		}
	}
}
