package detect

import (
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// tuningHistory matches the record of how a feature was tuned: an AUC
// figure, the seeds a figure was read on, or a before → after pair.
var tuningHistory = regexp.MustCompile(`\bAUC\b|\bseeds? [0-9]|[0-9]\.[0-9]+ *→ *[0-9]|\bused before\b|\btried and\b|\bthis round\b`)

// TestDocCommentsCarryNoTuningHistory keeps the comments of the finder and
// the feature files to formula, unit, NaN meaning and paper: the figures a
// choice was made on belong in FEATURES.md, where a reader of the tuning
// looks for them (and where they are kept beside their context).
func TestDocCommentsCarryNoTuningHistory(t *testing.T) {
	files, err := filepath.Glob("*.go")
	if err != nil {
		t.Fatal(err)
	}
	checked := 0
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		src, err := os.ReadFile(name)
		if err != nil {
			t.Fatal(err)
		}
		fset := token.NewFileSet()
		f, err := parser.ParseFile(fset, name, src, parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		for _, g := range f.Comments {
			for _, c := range g.List {
				checked++
				if m := tuningHistory.FindString(c.Text); m != "" {
					t.Errorf("%s: %q in a comment: tuning history belongs in FEATURES.md", fset.Position(c.Pos()), m)
				}
			}
		}
	}
	if checked == 0 {
		t.Fatal("no comments read: the test would pass on nothing")
	}
}
