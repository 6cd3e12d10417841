package main

import (
	"go/ast"
	"go/token"
	"regexp"
	"strconv"
	"testing"
)

// artefactName is a whole string literal that names a file: a stem and one of the
// extensions quorate writes or reads ("draw.parquet", "consensus/agreement.json").
// A bare extension or suffix (".parquet", "_events.tsv") is not a name.
var artefactName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9_.\-/]*\.(parquet|json|jsonl|csv|tsv|html|md|yaml|edf|bdf|txt)$`)

// Artefact file names are spelt once, as exported constants (draw.DrawFile,
// merge.LedgerFile, study.GenerationsFile…), so that a reader, a writer and check
// cannot disagree on a name: no file name appears as a string literal outside a const
// declaration in any package (tests aside).
func TestArtefactNamesAreConstants(t *testing.T) {
	checked := 0
	eachSource(t, []string{"cmd", "sampling", "panel", "tuning", "export", "internal"}, func(_ string, fset *token.FileSet, f *ast.File) {
		inConst := map[*ast.BasicLit]bool{}
		for _, decl := range f.Decls {
			if g, ok := decl.(*ast.GenDecl); ok && g.Tok == token.CONST {
				ast.Inspect(g, func(n ast.Node) bool {
					if b, ok := n.(*ast.BasicLit); ok {
						inConst[b] = true
					}
					return true
				})
			}
		}
		ast.Inspect(f, func(n ast.Node) bool {
			lit, ok := n.(*ast.BasicLit)
			if !ok || lit.Kind != token.STRING {
				return true
			}
			checked++
			if s, err := strconv.Unquote(lit.Value); err == nil && artefactName.MatchString(s) && !inConst[lit] {
				t.Errorf("%s: file name %q as a literal; use (or add) an exported constant", fset.Position(lit.Pos()), s)
			}
			return true
		})
	})
	if checked < 1000 {
		t.Fatalf("only %d string literals read: the walk missed the packages", checked)
	}
}
