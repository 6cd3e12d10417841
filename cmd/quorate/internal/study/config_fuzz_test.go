package study

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// FuzzReadConfig: any study.yaml gives a checked protocol or an error naming the file;
// never a panic.
func FuzzReadConfig(f *testing.F) {
	dir := f.TempDir()
	if err := Init(filepath.Join(dir, "s"), []string{dir}, 1); err != nil {
		f.Fatal(err)
	}
	good, _ := os.ReadFile(filepath.Join(dir, "s", ConfigFile))
	f.Add(good)
	f.Add([]byte(""))
	f.Add([]byte("study: {id: x}\npanel: {quorum: 99, raters: [a]}\n"))
	f.Add([]byte("draw: &a [*a]\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		p := filepath.Join(t.TempDir(), ConfigFile)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		c, err := ReadConfig(p)
		if err != nil {
			if !strings.Contains(err.Error(), p) {
				t.Errorf("error %q does not name the file", err)
			}
			return
		}
		if c.Study.ID == "" || c.Panel.Quorum < 0 || c.Draw.Controls < 0 || c.Tuning.Folds < 0 {
			t.Errorf("accepted %+v", c)
		}
	})
}
