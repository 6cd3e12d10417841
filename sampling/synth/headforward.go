package synth

import (
	"fmt"
	"strings"
	"sync"

	"github.com/quorate-eeg/quorate/sampling/headmodel"
)

// HeadForward is the Forward of the default multi-shell head (headmodel.DefaultHead):
// sources given on the unit sphere are placed at that fraction of the scalp radius, and
// the potentials are re-referenced to their common average. Electrode positions are
// computed once per montage. It panics on an electrode with no 10-10 position, which is
// a programming error in a generator configuration.
func HeadForward() Forward {
	head := headmodel.DefaultHead()
	R := head.Radius()
	var mu sync.Mutex
	cache := map[string][]headmodel.Vec3{}
	return func(electrodes []string, pos, moment [3]float64) []float64 {
		key := strings.Join(electrodes, ",")
		mu.Lock()
		el, ok := cache[key]
		if !ok {
			var missing []string
			el, missing = headmodel.Positions(electrodes)
			if len(missing) > 0 {
				mu.Unlock()
				panic(fmt.Sprintf("synth: no 10-10 position for %v", missing))
			}
			for i := range el {
				el[i] = headmodel.Vec3{el[i][0] * R, el[i][1] * R, el[i][2] * R}
			}
			cache[key] = el
		}
		mu.Unlock()
		v := make([]float64, len(el))
		p := headmodel.Vec3{pos[0] * R, pos[1] * R, pos[2] * R}
		head.Potentials(v, el, p, headmodel.Vec3(moment))
		mean := 0.0
		for _, x := range v {
			mean += x
		}
		mean /= float64(len(v))
		for i := range v {
			v[i] -= mean
		}
		return v
	}
}
