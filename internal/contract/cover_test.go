package contract

import (
	"go/ast"
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// exported lists the exported functions and the exported methods of
// exported types in the package directory dir (non-test files), as
// "Name" and "Type.Name".
func exported(t *testing.T, dir string) []string {
	t.Helper()
	fset := token.NewFileSet()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, de := range ents {
		if de.IsDir() || !strings.HasSuffix(de.Name(), ".go") || strings.HasSuffix(de.Name(), "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, filepath.Join(dir, de.Name()), nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range f.Decls {
			fd, ok := d.(*ast.FuncDecl)
			if !ok || !fd.Name.IsExported() {
				continue
			}
			name := fd.Name.Name
			if fd.Recv != nil {
				typ := fd.Recv.List[0].Type
				if s, ok := typ.(*ast.StarExpr); ok {
					typ = s.X
				}
				id, ok := typ.(*ast.Ident)
				if !ok || !id.IsExported() {
					continue
				}
				name = id.Name + "." + name
			}
			names = append(names, name)
		}
	}
	sort.Strings(names)
	return names
}

// TestEveryExportCovered checks that the sweep has an entry for every
// exported function and method of the four library packages. Functions
// added since the table was last extended are listed; the full mode
// (KOFN_CONTRACT_FULL=1) fails on them, the CI mode reports them, so that
// a new function lands first and gets its table line with its checks.
func TestEveryExportCovered(t *testing.T) {
	covered := map[string]bool{}
	for _, e := range entries() {
		covered[e.name] = true
		for _, n := range e.also {
			covered[n] = true
		}
	}
	var missing []string
	for _, pkg := range []string{"binom", "interval", "test", "power"} {
		for _, n := range exported(t, "../../"+pkg) {
			if !covered[n] && !covered[pkg+"."+n] {
				missing = append(missing, pkg+"."+n)
			}
		}
	}
	if len(missing) == 0 {
		return
	}
	msg := "exported but not swept (add entries to internal/contract): " + strings.Join(missing, ", ")
	if full {
		t.Error(msg)
	} else {
		t.Log(msg)
	}
}
