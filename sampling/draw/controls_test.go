package draw

import (
	"testing"
)

func TestControls(t *testing.T) {
	recs := []RecordingSpan{
		{ID: "r2", Subject: "P2", Duration: 35, Gaps: []Interval{{12, 14}}},
		{ID: "r1", Subject: "P1", Duration: 100},
	}
	onsets := map[string][]float64{"r1": {71, 25}}
	// By hand, 10 s epochs, minDist 5: r1 loses [20,30) (holds 25),
	// [60,70) (1 s from 71) and [70,80); [10,20) and [30,40) are exactly
	// 5 s away and stay. r2 has 3 whole epochs and loses [10,20) to the gap.
	// M = 7 + 2 = 9.
	const m = 3
	count := map[string]int{}
	for r := 0; r < monteCarloDraws; r++ {
		cs, M, err := DrawControls(recs, onsets, 10, 5, m, uint64(r))
		if err != nil {
			t.Fatal(err)
		}
		if M != 9 || len(cs) != m {
			t.Fatalf("M = %d, %d controls", M, len(cs))
		}
		for _, c := range cs {
			count[c.ID]++
			if c.Pi != 1.0/3 {
				t.Fatalf("π = %v, want m/M = 1/3", c.Pi)
			}
		}
	}
	pi := map[string]float64{}
	for _, id := range []string{"ctl-r1-0", "ctl-r1-1", "ctl-r1-3", "ctl-r1-4", "ctl-r1-5", "ctl-r1-8", "ctl-r1-9", "ctl-r2-0", "ctl-r2-2"} {
		pi[id] = 1.0 / 3
	}
	if len(count) != len(pi) {
		t.Errorf("drawn epochs %v, eligible %v", count, pi)
	}
	checkFrequencies(t, "controls", count, monteCarloDraws, pi)
	if _, _, err := DrawControls(recs, onsets, 10, 5, 10, 1); err == nil {
		t.Error("m > M accepted")
	}
}
