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
