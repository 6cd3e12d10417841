package report

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// FuzzReadOperatingPoint: any operating-point.json gives a point or an error naming the
// file; applying what is accepted never panics.
func FuzzReadOperatingPoint(f *testing.F) {
	f.Add([]byte(`{"rule":"k ≥ 4 of 6","cutoffs":[{"criterion":1,"value":0.6,"met":">="},{"criterion":4,"value":1,"met":">="}],"k":4}`))
	f.Add([]byte(`{"cutoffs":[{"criterion":9,"value":null,"met":"<="}]}`))
	f.Add([]byte(`null`))
	f.Fuzz(func(t *testing.T, b []byte) {
		p := filepath.Join(t.TempDir(), PointFile)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		op, err := ReadOperatingPoint(p)
		if err != nil {
			return
		}
		op.Decide([6]float64{1, 2, 3, math.NaN(), 0, -1}, 0.5)
	})
}
