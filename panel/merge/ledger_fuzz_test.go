package merge

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzReadLedger: any ledger gives entries or an error naming the file and line; what
// counts is computed without a panic.
func FuzzReadLedger(f *testing.F) {
	f.Add([]byte(`{"time":"2026-01-02T03:04:05Z","original_name":"a.json","sha256":"ab","stored":"ab.json","kind":"json","packet":"P-a","rater":"a","answered":3,"unrated":0}` + "\n"))
	f.Add([]byte("{}\n{}\n"))
	f.Add([]byte("not json\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		p := filepath.Join(t.TempDir(), LedgerFile)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		led, err := ReadLedger(p)
		if err != nil {
			if !strings.Contains(err.Error(), p) && !strings.Contains(err.Error(), "token too long") {
				t.Errorf("error %q does not name the file", err)
			}
			return
		}
		Counting(led)
	})
}
