package draw

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

func TestRunAdaptiveTopUpRecordsPhases(t *testing.T) {
	cands, recs := runFixture()
	dir := t.TempDir()
	specs, _ := ParseStrata("score:q3,region")
	o := Options{Candidates: cands, Recordings: recs, OutDir: dir,
		Design: Design{Strata: specs, Alloc: Allocation{Method: Accuracy, N: 45}, Seed: 5}}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(filepath.Join(dir, DrawFile))
	bad := o
	bad.TopUp = -10
	if _, err := Run(context.Background(), bad); err == nil {
		t.Fatal("top-up of -10 accepted")
	}
	if after, _ := os.ReadFile(filepath.Join(dir, DrawFile)); !bytes.Equal(before, after) {
		t.Fatal("a refused top-up changed the draw")
	}
	top := o
	top.TopUp = 30
	top.Adaptive = map[string]PhaseEstimate{"score=q3|region=frontal-right": {Prevalence: 0.6, Disagreement: 0.3, Rated: 5}}
	res, err := Run(context.Background(), top)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Rows) != 75 {
		c := map[int32]int{}
		for _, r := range res.Rows {
			c[r.Phase]++
		}
		t.Errorf("%d rows after the top-up, want 75: %v", len(res.Rows), c)
	}
	b, _ := os.ReadFile(filepath.Join(dir, DesignFile))
	var sd savedDesign
	if err := json.Unmarshal(b, &sd); err != nil {
		t.Fatal(err)
	}
	if len(sd.Phases) != 2 || sd.Phases[0].Method != "accuracy" || sd.Phases[1].Method != "accuracy (adaptive)" ||
		sd.Phases[1].N != 30 || len(sd.Phases[1].Lambda) == 0 || len(sd.Phases[0].Prior) == 0 {
		t.Errorf("design.json phases: %s", b)
	}
}
