package filter

import (
	"go/ast"
	"go/doc"
	"go/parser"
	"go/token"
	"os"
	"regexp"
	"strings"
	"testing"
	"unicode"
)

// TestExportedDocsNameNoUnexported checks that the doc comments of the
// package's exported names do not send the reader to an identifier they
// cannot look up: an unexported type or function, or an unexported method
// (written T.m), of this package.
func TestExportedDocsNameNoUnexported(t *testing.T) {
	fset := token.NewFileSet()
	pkgs, err := parser.ParseDir(fset, ".", func(fi os.FileInfo) bool {
		return !strings.HasSuffix(fi.Name(), "_test.go")
	}, parser.ParseComments)
	if err != nil {
		t.Fatal(err)
	}
	pkg, ok := pkgs["filter"]
	if !ok {
		t.Fatal("package filter not parsed")
	}
	// Unexported names of the package: top-level types and functions, and
	// methods as "Recv.name".
	hidden := map[string]bool{}
	for _, f := range pkg.Files {
		for _, d := range f.Decls {
			switch d := d.(type) {
			case *ast.FuncDecl:
				if d.Name.IsExported() {
					continue
				}
				if d.Recv == nil {
					hidden[d.Name.Name] = true
					continue
				}
				recv := d.Recv.List[0].Type
				if s, ok := recv.(*ast.StarExpr); ok {
					recv = s.X
				}
				if id, ok := recv.(*ast.Ident); ok {
					hidden[id.Name+"."+d.Name.Name] = true
				}
			case *ast.GenDecl:
				for _, sp := range d.Specs {
					if ts, ok := sp.(*ast.TypeSpec); ok && !ts.Name.IsExported() {
						hidden[ts.Name.Name] = true
					}
				}
			}
		}
	}
	word := regexp.MustCompile(`[A-Za-z_][A-Za-z0-9_]*(\.[A-Za-z_][A-Za-z0-9_]*)?`)
	check := func(name, text string) {
		for _, w := range word.FindAllString(text, -1) {
			head, _, dotted := strings.Cut(w, ".")
			switch {
			case dotted && hidden[w]:
				t.Errorf("doc of %s names the unexported method %s", name, w)
			case dotted && hidden[head]:
				t.Errorf("doc of %s names the unexported %s", name, w)
			case !dotted && hidden[w] && camel(w):
				// A plain English word that happens to name a helper
				// ("design", "resolve") is fine; a camelCase one is code.
				t.Errorf("doc of %s names the unexported %s", name, w)
			}
		}
	}
	d := doc.New(pkg, "github.com/rolloff/rolloff/filter", 0)
	for _, f := range d.Funcs {
		check(f.Name, f.Doc)
	}
	for _, ty := range d.Types {
		check(ty.Name, ty.Doc)
		for _, f := range ty.Funcs {
			check(f.Name, f.Doc)
		}
		for _, m := range ty.Methods {
			check(ty.Name+"."+m.Name, m.Doc)
		}
	}
	for _, v := range append(d.Consts, d.Vars...) {
		check(strings.Join(v.Names, ", "), v.Doc)
	}
}

// camel reports whether s has an upper-case letter after its first.
func camel(s string) bool {
	for i, r := range s {
		if i > 0 && unicode.IsUpper(r) {
			return true
		}
	}
	return false
}
