package returns

import (
	"bytes"
	"strings"
	"testing"
)

// A sheet saved with semicolons (spreadsheets in locales with a decimal comma) once gave
// twelve problems, one per column, and no word on why; it gives one that names the
// separator.
func TestParseCSVSemicolonHint(t *testing.T) {
	semi := bytes.ReplaceAll(fixture.sheet, []byte(","), []byte(";"))
	_, err := Parse("sheet.csv", semi, fixture.m)
	ps := problems(t, err)
	if len(ps) != 1 || ps[0].Field != "header" || !strings.Contains(err.Error(), "semicolons") {
		t.Errorf("problems %+v, want one naming the semicolons", ps)
	}
}
