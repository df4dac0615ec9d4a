package multipitch

import (
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"testing"
)

// make test runs this package without the race detector (the Makefile's
// RACEFREE), which can find nothing where only one goroutine runs. That
// holds while no file of the package, code or test, starts a goroutine:
// one that does must take the package out of RACEFREE.
func TestThePackageStartsNoGoroutine(t *testing.T) {
	files, err := filepath.Glob("*.go")
	if err != nil || len(files) == 0 {
		t.Fatalf("no Go files here (%v)", err)
	}
	fset := token.NewFileSet()
	for _, name := range files {
		f, err := parser.ParseFile(fset, name, nil, parser.SkipObjectResolution)
		if err != nil {
			t.Fatal(err)
		}
		ast.Inspect(f, func(n ast.Node) bool {
			if g, ok := n.(*ast.GoStmt); ok {
				t.Errorf("%s starts a goroutine: take multipitch out of the Makefile's RACEFREE", fset.Position(g.Pos()))
			}
			return true
		})
	}
}
