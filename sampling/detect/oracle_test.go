package detect

import (
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/synth"
	"github.com/quorate-eeg/quorate/sampling/textbook"
)

// TestBackgroundOracle is a diagnostic, run only with QUORATE_DIAG_ORACLE
// set to seeds ("3 4 5 6"): it asks what limits c2 and c3 by measuring each
// matched event again on the events alone. The generator draws events from
// their own random stream, so the same seed without events is the same
// background sample for sample, and conditioning is linear: the difference
// of the two conditioned traces is the conditioned events. Each event is
// measured on its actual trace, on the events alone (at the finder's main
// phase, and at a main phase walked again on the clean trace), and on the
// events plus the background's slow part or fast part only (split by a
// centred box of 2k+1 samples, k = QUORATE_DIAG_BOX, default 16: about
// 8 Hz at 256 Hz). It reads c3 on the peak derivation, as c3 was read when
// this diagnostic led to its virtual channel (virtual.go). With
// QUORATE_DIAG_GEN=textbook it reads the second generator's recordings
// (4 min each; seeds 101–108 are its held-out ones), whose background is
// drawn before its events as well. FEATURES.md quotes the figures.
func TestBackgroundOracle(t *testing.T) {
	v := os.Getenv("QUORATE_DIAG_ORACLE")
	if v == "" {
		t.Skip("diagnostic; set QUORATE_DIAG_ORACLE=\"3 4 5 6\"")
	}
	k := 16
	if b, err := strconv.Atoi(os.Getenv("QUORATE_DIAG_BOX")); err == nil {
		k = b
	}
	variants := []string{"actual", "clean", "clean, own phase", "clean + slow background", "clean + fast background"}
	var c2v, c3v [5][]float64
	var c2l, c3l []bool
	for _, f := range strings.Fields(v) {
		seed, _ := strconv.ParseUint(f, 10, 64)
		g := generated(t, seed, 10)
		bg, err := synth.Generate(synth.Config{Seed: seed, Duration: 600, Forward: headForward})
		if os.Getenv("QUORATE_DIAG_GEN") == "textbook" {
			// the second generator draws its background before its events too
			if g, err = textbook.Generate(textbook.Config{Seed: seed, Duration: 240, IEDRate: 6, LookalikeRate: 10}); err == nil {
				bg, err = textbook.Generate(textbook.Config{Seed: seed, Duration: 240})
			}
		}
		if err != nil {
			t.Fatal(err)
		}
		in, inB := inputOf(g), inputOf(bg)
		s, _ := (&Options{}).settings()
		e, eb := newEngine(s, &in), newEngine(s, &inB)
		if err := e.setRate(in.Rate); err != nil {
			t.Fatal(err)
		}
		if err := eb.setRate(in.Rate); err != nil {
			t.Fatal(err)
		}
		W := int64(math.Round(s.windowS * in.Rate))
		C := int64(math.Ceil(max(contextNeed, s.backS/2+0.5) * in.Rate))
		var rows []candidate.Row
		var c2s, c3s [][5]float64
		for ws := int64(0); ws < in.Len; ws += W {
			we := min(ws+W, in.Len)
			w, ok, err := e.condition(max(ws-C, 0), min(we+C, in.Len), ws, we)
			if err != nil || !ok {
				t.Fatal(err, ok)
			}
			if _, ok, err := eb.condition(max(ws-C, 0), min(we+C, in.Len), ws, we); err != nil || !ok {
				t.Fatal(err, ok)
			}
			for _, c := range e.find(w, ws, we) {
				rows = append(rows, e.row(w, c))
				x, b := e.det[c.best.deriv], eb.det[c.best.deriv]
				clean, slow, fast := make([]float32, len(x)), make([]float32, len(x)), make([]float32, len(x))
				for i := range x {
					clean[i] = x[i] - b[i]
				}
				for i := k; i+k < len(x); i++ {
					var m float64
					for j := i - k; j <= i+k; j++ {
						m += float64(b[j])
					}
					m /= float64(2*k + 1)
					slow[i], fast[i] = clean[i]+float32(m), clean[i]+b[i]-float32(m)
				}
				tr := func(y []float32) *trace { return &trace{x: y, lo: w.lo, hi: w.hi, fs: e.rate} }
				ph := c.best.ph
				own := mainPhase(clean[:w.hi], ph.peak, ph.sign, int(math.Ceil(maxPhaseS*e.rate)), 0)
				act := tr(x)
				// c2 always takes the background period from the actual trace
				c2 := func(y *trace, p phase) float64 {
					fb := dominantHz(act, ph.peak, specSpanS, &e.sc)
					d := float64(p.right - p.left)
					if !(oppositePhase(y, p, &e.sc) >= phaseFloor) {
						d = waveDuration(y, p, &e.sc)
					}
					return math.Abs(math.Log(d / e.rate * 1000 / (500 / fb)))
				}
				c3 := func(y *trace, p phase) float64 { r, _, _ := asymmetry(y, p, &e.sc); return r }
				c2s = append(c2s, [5]float64{c2(act, ph), c2(tr(clean), ph), c2(tr(clean), own), c2(tr(slow), ph), c2(tr(fast), ph)})
				c3s = append(c3s, [5]float64{c3(act, ph), c3(tr(clean), ph), c3(tr(clean), own), c3(tr(slow), ph), c3(tr(fast), ph)})
			}
		}
		m := match(rows, g.Truth, 0.020)
		keep := func(v [5]float64) bool {
			for _, x := range v {
				if math.IsNaN(x) {
					return false
				}
			}
			return true
		}
		for i, ev := range g.Truth {
			if m[i] < 0 {
				continue
			}
			if r := c2s[m[i]]; !ev.Unclear[synth.C2Duration] && keep(r) {
				for j := range r {
					c2v[j] = append(c2v[j], r[j])
				}
				c2l = append(c2l, ev.Meets[synth.C2Duration])
			}
			if r := c3s[m[i]]; !ev.Unclear[synth.C3Asymmetry] && keep(r) {
				for j := range r {
					c3v[j] = append(c3v[j], r[j])
				}
				c3l = append(c3l, ev.Meets[synth.C3Asymmetry])
			}
		}
	}
	for j, name := range variants {
		t.Logf("%-24s c2 AUC %.3f (n = %d)  c3 AUC %.3f (n = %d)", name, auc(c2v[j], c2l), len(c2l), auc(c3v[j], c3l), len(c3l))
	}
}
