package robust_test

import (
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestPackageCommentInDocGo checks the layout rule of the style guide for
// every library package of the module (commands, package main, keep their
// comment in main.go as Go commands do): the package comment is in doc.go
// and in no other file of the package.
func TestPackageCommentInDocGo(t *testing.T) {
	root := filepath.Join("..", "..")
	dirs := map[string][]string{} // directory -> non-test Go files
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && p != root && (strings.HasPrefix(d.Name(), ".") || d.Name() == "testdata") {
			return filepath.SkipDir
		}
		if !d.IsDir() && strings.HasSuffix(p, ".go") && !strings.HasSuffix(p, "_test.go") {
			dirs[filepath.Dir(p)] = append(dirs[filepath.Dir(p)], p)
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for dir, files := range dirs {
		fset := token.NewFileSet()
		var withDoc []string
		isMain := false
		for _, f := range files {
			src, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			af, err := parser.ParseFile(fset, f, src, parser.PackageClauseOnly|parser.ParseComments)
			if err != nil {
				t.Fatal(err)
			}
			if af.Name.Name == "main" {
				isMain = true
			}
			if af.Doc != nil {
				withDoc = append(withDoc, filepath.Base(f))
			}
		}
		if isMain {
			continue
		}
		checked++
		if len(withDoc) != 1 || withDoc[0] != "doc.go" {
			t.Errorf("%s: package comment in %v, want in doc.go alone", dir, withDoc)
		}
	}
	if checked < 10 {
		t.Errorf("only %d library packages found under %s", checked, root)
	}
}
