package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzReadAllocationTable: any table:FILE gives stratum sizes ≥ 0 or an error naming
// the file; never a panic.
func FuzzReadAllocationTable(f *testing.F) {
	f.Add("stratum,n\nscore=q1|lobe=temporal,10\nscore=q2|lobe=frontal,0\n")
	f.Add("stratum;n\na;1\n")
	f.Add("stratum,n\na\n")
	f.Add("stratum,n\n\"a,b\",-1\n")
	f.Fuzz(func(t *testing.T, body string) {
		p := filepath.Join(t.TempDir(), "alloc.csv")
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		tbl, err := readAllocationTable(p)
		if err != nil {
			if !strings.Contains(err.Error(), p) {
				t.Errorf("error %q does not name the file", err)
			}
			return
		}
		for s, n := range tbl {
			if n < 0 {
				t.Errorf("stratum %q: n %d", s, n)
			}
		}
	})
}

// An allocation table saved with semicolons (a spreadsheet's "CSV" in many locales)
// is refused with one error that names the separator, not only "want the header".
func TestAllocationTableSemicolonHint(t *testing.T) {
	for _, body := range []string{"stratum;n\na;1\n", "stratum\tn\na\t1\n"} {
		p := filepath.Join(t.TempDir(), "alloc.csv")
		os.WriteFile(p, []byte(body), 0o644)
		_, err := readAllocationTable(p)
		if err == nil || !strings.Contains(err.Error(), p) || !strings.Contains(err.Error(), "semicolons or tabs") || !strings.Contains(err.Error(), "comma-separated") {
			t.Errorf("%q: %v, want an error naming the file and the separator", body, err)
		}
	}
	p := filepath.Join(t.TempDir(), "alloc.csv")
	os.WriteFile(p, []byte("stratum,n\nscore=q1,3\n"), 0o644)
	if tbl, err := readAllocationTable(p); err != nil || tbl["score=q1"] != 3 {
		t.Errorf("comma table: %v, %v", tbl, err)
	}
}
