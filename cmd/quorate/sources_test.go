package main

import (
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"path/filepath"
	"strings"
	"testing"
)

// eachSource parses every non-test Go file under the repository folders pkgs (cmd,
// sampling, …) and hands it to fn with its file set; source-reading tests share it.
func eachSource(t *testing.T, pkgs []string, fn func(path string, fset *token.FileSet, f *ast.File)) {
	t.Helper()
	root := filepath.Join("..", "..")
	for _, pkg := range pkgs {
		err := filepath.WalkDir(filepath.Join(root, pkg), func(p string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() || !strings.HasSuffix(p, ".go") || strings.HasSuffix(p, "_test.go") {
				return err
			}
			fset := token.NewFileSet()
			f, err := parser.ParseFile(fset, p, nil, 0)
			if err != nil {
				return err
			}
			fn(p, fset, f)
			return nil
		})
		if err != nil {
			t.Fatal(err)
		}
	}
}
