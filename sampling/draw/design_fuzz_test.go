package draw

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzReadDesign: any design.json gives a design a top-up can repeat or an error; never
// a panic.
func FuzzReadDesign(f *testing.F) {
	f.Add([]byte(`{"strata":"score:q5,region","allocation":"proportional","n":60,"min_per_stratum":2,"subject_cap":0,"seed":11,"controls":10,"control_epoch_s":2,"control_min_distance_s":5}`))
	f.Add([]byte(`{"strata":"score:edges=0,2,4","allocation":"table","table":{"a":1}}`))
	f.Add([]byte(`{"allocation":"neyman","sd":{"x":1e308}}`))
	f.Fuzz(func(t *testing.T, b []byte) {
		p := filepath.Join(t.TempDir(), DesignFile)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		d, err := readDesign(p)
		if err != nil {
			return
		}
		FormatStrata(d.Strata)
	})
}
