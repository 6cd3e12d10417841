package detect

import (
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"github.com/quorate-eeg/quorate/sampling/textbook"
)

// diagExtra computes experimental per-event values for TestFeatureDump
// (none by default; a scratch test file may set it while trying a feature).
var diagStates []synth.StateSpan

var diagExtra = func(e *engine, w window, c cluster, t *trace) []float64 { return nil }

// TestFeatureDump is a diagnostic, run only with QUORATE_DIAG_DUMP set to a
// file name: it writes one line per generated event matched by a candidate
// (seeds QUORATE_DIAG_SEEDS, default 3–6), with the truth and the features,
// and logs each headline's AUC.
func TestFeatureDump(t *testing.T) {
	path := os.Getenv("QUORATE_DIAG_DUMP")
	if path == "" {
		t.Skip("diagnostic; set QUORATE_DIAG_DUMP=file")
	}
	seeds := []uint64{3, 4, 5, 6}
	if v := os.Getenv("QUORATE_DIAG_SEEDS"); v != "" {
		seeds = nil
		for _, f := range strings.Fields(v) {
			x, _ := strconv.ParseUint(f, 10, 64)
			seeds = append(seeds, x)
		}
	}
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var feats [6][]float64
	var meets [6][]bool
	var extra [][]float64
	var xmeets, xunclear [][6]bool
	for _, seed := range seeds {
		g := generated(t, seed, 10)
		if os.Getenv("QUORATE_DIAG_GEN") == "textbook" {
			var err error
			if g, err = textbook.Generate(textbook.Config{Seed: seed, Duration: 240, IEDRate: 6, LookalikeRate: 10}); err != nil {
				t.Fatal(err)
			}
		}
		diagStates = g.States
		in := inputOf(g)
		s, _ := (&Options{}).settings()
		var rows []candidate.Row
		var ex [][]float64
		eachEvent(t, s, &in, func(e *engine, w window, c cluster) {
			rows = append(rows, e.row(w, c))
			tr, _, _ := e.traceOf(w, c)
			ex = append(ex, diagExtra(e, w, c, tr))
		})
		m := match(rows, g.Truth, 0.020)
		for i, ev := range g.Truth {
			if m[i] < 0 {
				continue
			}
			r := rows[m[i]]
			ft := r.Features()
			for j := range 6 {
				if !math.IsNaN(ft[j]) && !ev.Unclear[j] {
					feats[j] = append(feats[j], ft[j])
					meets[j] = append(meets[j], ev.Meets[j])
				}
			}
			extra = append(extra, ex[m[i]])
			xmeets = append(xmeets, ev.Meets)
			xunclear = append(xunclear, ev.Unclear)
			mt := ""
			for j, b := range ev.Meets {
				mt += map[bool]string{true: "1", false: "0"}[b]
				if ev.Unclear[j] {
					mt = mt[:len(mt)-1] + "?"
				}
			}
			fmt.Fprintf(f, "%d\t%s\t%s\t%.1f\t%.1f\t%.1f\t%.2f\t%s\t%s\t%.1f\t%.2f\t%d\t%.3f\t%.0f\t%.2f\t%.2f\t%.2f\t%.3f\t%.2f\t%.2f\t%.2f\t%d", seed, ev.Kind, mt, ev.Duration, ev.Rise, ev.SNR, ev.Onset, ev.PeakElectrode, r.PeakChannel,
				r.C1DurationMS, r.C1Sharpness, r.C1Phases, r.C2DurationLogRatio, r.C2BackgroundMS, r.C3Asymmetry, r.C4SlowWaveRatio, r.C5Disruption, r.C6DipoleGOF, r.C6DipoleX, r.C6DipoleY, r.C6DipoleZ, r.C6FieldExtent)
			fmt.Fprintf(f, "\t%.1f\t%.1f\t%s\t%.3f\t%.2f\t%.1f\t%.1f", ev.C2DurationMs, ev.BackgroundHalfMs, stateAtDiag(g.States, ev.Onset), ev.Attenuation, ev.SlowWave, r.C3RiseMS, r.C3FallMS)
			for _, v := range ex[m[i]] {
				fmt.Fprintf(f, "\t%.4g", v)
			}
			fmt.Fprintln(f)
		}
	}
	for j := range 6 {
		t.Logf("c%d %s AUC %.3f (n = %d)", j+1, candidate.FeatureNames[j], auc(feats[j], meets[j]), len(feats[j]))
	}
	if len(extra) > 0 && len(extra[0]) > 0 {
		for k := range extra[0] {
			line := fmt.Sprintf("extra %d:", k)
			for j := range 6 {
				var x []float64
				var y []bool
				for i := range extra {
					if v := extra[i][k]; !math.IsNaN(v) && !xunclear[i][j] {
						x, y = append(x, v), append(y, xmeets[i][j])
					}
				}
				line += fmt.Sprintf(" c%d %.3f", j+1, auc(x, y))
			}
			t.Log(line)
		}
	}
}

// stateAtDiag is the generator's vigilance state at t s, for the dump.
func stateAtDiag(sp []synth.StateSpan, t float64) string {
	for _, s := range sp {
		if t >= s.Start && t < s.End {
			return string(s.State)
		}
	}
	return "-"
}
