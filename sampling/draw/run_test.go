package draw

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

func runFixture() ([]candidate.Row, []archive.Recording) {
	var rows []candidate.Row
	regions := []string{"temporal-left", "frontal-right", "central-midline"}
	for i := 0; i < 600; i++ {
		rec := fmt.Sprintf("rec-%d", i%4)
		rows = append(rows, candidate.Row{EventID: fmt.Sprintf("ev-%04d", i), RecordingID: rec, SubjectKey: fmt.Sprintf("sub-%d", i%4/2),
			OnsetS: float64(10 + (i/4)*20), Region: regions[i%3], Score: float64((i * 37) % 101), Polarity: "negative"})
	}
	var recs []archive.Recording
	for r := 0; r < 4; r++ {
		recs = append(recs, archive.Recording{RecordingID: fmt.Sprintf("rec-%d", r), SubjectKey: fmt.Sprintf("sub-%d", r/2), DurationS: 4000})
	}
	return rows, recs
}

func TestRunDrawTopUpReplace(t *testing.T) {
	cands, recs := runFixture()
	dir := t.TempDir()
	specs, _ := ParseStrata("score:q5,region")
	o := Options{Candidates: cands, Recordings: recs, OutDir: dir,
		Design:   Design{Strata: specs, Alloc: Allocation{Method: Proportional, N: 60, Min: 2}, Seed: 11},
		Controls: 10, ControlEpochS: 2, ControlDistS: 5}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	var nc, ne int
	for _, r := range res.Rows {
		if r.Kind == KindControl {
			nc++
			// A control epoch of 2 s lies at least 5 s from every candidate of its recording.
			for _, c := range cands {
				if c.RecordingID == r.RecordingID && math.Abs(c.OnsetS-r.OnsetS) < 5+1 {
					t.Errorf("control at %.1f s is within 5 s of candidate at %.1f s", r.OnsetS, c.OnsetS)
				}
			}
		} else {
			ne++
		}
		if math.Abs(r.Pi*r.Weight-1) > 1e-12 || r.Pi <= 0 || r.Pi > 1 {
			t.Errorf("row %s: pi %v weight %v", r.EventID, r.Pi, r.Weight)
		}
	}
	if ne != 60 || nc != 10 {
		t.Fatalf("%d events and %d controls, want 60 and 10", ne, nc)
	}
	first, _ := os.ReadFile(filepath.Join(dir, DrawFile))

	// The same inputs in another order give the same bytes.
	rev := append([]candidate.Row(nil), cands...)
	for i, j := 0, len(rev)-1; i < j; i, j = i+1, j-1 {
		rev[i], rev[j] = rev[j], rev[i]
	}
	dir2 := t.TempDir()
	o2 := o
	o2.Candidates, o2.OutDir = rev, dir2
	if _, err := Run(context.Background(), o2); err != nil {
		t.Fatal(err)
	}
	second, _ := os.ReadFile(filepath.Join(dir2, DrawFile))
	if !bytes.Equal(first, second) {
		t.Error("input row order changed the draw")
	}

	if _, err := Run(context.Background(), o); !errors.Is(err, ErrDrawExists) {
		t.Fatalf("second draw without --replace: %v, want ErrDrawExists", err)
	}
	top := o
	top.TopUp = 30
	res2, err := Run(context.Background(), top)
	if err != nil {
		t.Fatal(err)
	}
	phase2 := 0
	for _, r := range res2.Rows {
		if r.Phase == 2 {
			phase2++
		}
	}
	if phase2 != 30 || len(res2.Rows) != 100 {
		t.Fatalf("top-up: %d new rows, %d in all; want 30 and 100", phase2, len(res2.Rows))
	}
	// The draw before the top-up is kept.
	if before, err := ReadRows(filepath.Join(dir, "draw.before-top-up-1.parquet")); err != nil || len(before) != 70 {
		t.Fatalf("draw before the top-up: %d rows, %v; want the first 70 kept", len(before), err)
	}
	rep := o
	rep.Replace = true
	if _, err := Run(context.Background(), rep); err != nil {
		t.Fatal(err)
	}
	kept, err := os.ReadFile(filepath.Join(dir, "draw.replaced-1.parquet"))
	if err != nil {
		t.Fatal("replaced draw not kept:", err)
	}
	old, _ := ReadRows(filepath.Join(dir, "draw.replaced-1.parquet"))
	if len(old) != 100 || len(kept) == 0 {
		t.Errorf("kept draw has %d rows, want the 100 of the topped-up draw", len(old))
	}
}

func TestRunRefusesUnknownColumn(t *testing.T) {
	cands, recs := runFixture()
	specs, _ := ParseStrata("loudness:q4")
	_, err := Run(context.Background(), Options{Candidates: cands, Recordings: recs, OutDir: t.TempDir(),
		Design: Design{Strata: specs, Alloc: Allocation{Method: Equal, N: 10}, Seed: 1}})
	var ce *columnError
	if !errors.As(err, &ce) {
		t.Fatalf("err = %v, want a columnError listing the columns", err)
	}
}

// Too few eligible background epochs: all are taken, with a warning, as a small
// stratum is taken whole.
func TestRunTakesAllControlsWhenFew(t *testing.T) {
	cands, recs := runFixture()
	specs, _ := ParseStrata("region")
	res, err := Run(context.Background(), Options{Candidates: cands, Recordings: recs, OutDir: t.TempDir(),
		Design:   Design{Strata: specs, Alloc: Allocation{Method: Equal, N: 30}, Seed: 2},
		Controls: 100000, ControlEpochS: 2, ControlDistS: 5})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, r := range res.Rows {
		if r.Kind == KindControl {
			n++
			if r.Pi != 1 {
				t.Errorf("control %s has π %v, want 1 (every eligible epoch drawn)", r.EventID, r.Pi)
			}
		}
	}
	if n != res.Eligible || n == 0 || len(res.Warnings) == 0 {
		t.Fatalf("%d controls of %d eligible, warnings %v", n, res.Eligible, res.Warnings)
	}
}

// A negative top-up once fell through to a fresh draw written over the old one with no
// copy kept; it must be refused and leave the draw as it was.
func TestRunRefusesNegativeTopUp(t *testing.T) {
	cands, recs := runFixture()
	dir := t.TempDir()
	specs, _ := ParseStrata("region")
	o := Options{Candidates: cands, Recordings: recs, OutDir: dir,
		Design: Design{Strata: specs, Alloc: Allocation{Method: Proportional, N: 30}, Seed: 3}}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	before, _ := os.ReadFile(filepath.Join(dir, DrawFile))
	o.TopUp = -10
	o.Design.Seed = 4
	if _, err := Run(context.Background(), o); err == nil {
		t.Fatal("top-up of -10 accepted")
	}
	after, _ := os.ReadFile(filepath.Join(dir, DrawFile))
	if !bytes.Equal(before, after) {
		t.Error("a refused top-up changed draw.parquet")
	}
	if m, _ := filepath.Glob(filepath.Join(dir, "draw.*-1.parquet")); len(m) != 0 {
		t.Errorf("a refused top-up left %v", m)
	}
}

// Negative controls were once taken as none, silently.
func TestRunRefusesNegativeControls(t *testing.T) {
	cands, recs := runFixture()
	specs, _ := ParseStrata("region")
	o := Options{Candidates: cands, Recordings: recs, OutDir: t.TempDir(), Controls: -5,
		Design: Design{Strata: specs, Alloc: Allocation{Method: Proportional, N: 30}, Seed: 3}}
	if _, err := Run(context.Background(), o); err == nil || !strings.Contains(err.Error(), "controls") {
		t.Errorf("controls -5: %v", err)
	}
}

// A cancelled context stops a draw before anything is written.
func TestRunCancelled(t *testing.T) {
	cands, recs := runFixture()
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	specs, _ := ParseStrata("region")
	_, err := Run(ctx, Options{Candidates: cands, Recordings: recs, OutDir: dir,
		Design: Design{Strata: specs, Alloc: Allocation{Method: Equal, N: 10}, Seed: 1}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err %v, want context.Canceled", err)
	}
	if _, err := os.Stat(filepath.Join(dir, DrawFile)); !os.IsNotExist(err) {
		t.Errorf("%s written under a cancelled context", DrawFile)
	}
}

// The missing inputs of a draw are sentinels in the domain's words.
func TestRunMissingInputs(t *testing.T) {
	cands, recs := runFixture()
	specs, _ := ParseStrata("region")
	d := Design{Strata: specs, Alloc: Allocation{Method: Equal, N: 10}, Seed: 1}
	if _, err := Run(context.Background(), Options{Recordings: recs, OutDir: t.TempDir(), Design: d}); !errors.Is(err, candidate.ErrNoCandidates) {
		t.Errorf("no candidates: %v", err)
	}
	_, err := Run(context.Background(), Options{Candidates: cands, Recordings: recs, OutDir: t.TempDir(), Design: d, TopUp: 5})
	if !errors.Is(err, ErrNoDraw) || strings.Contains(err.Error(), "--") {
		t.Errorf("top-up without a draw: %v, want ErrNoDraw without flags", err)
	}
}
