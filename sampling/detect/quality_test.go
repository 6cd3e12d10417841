package detect

import (
	"context"
	"fmt"
	"github.com/quorate-eeg/quorate/sampling/signal"
	"gonum.org/v1/gonum/dsp/fourier"
	"math"
	"math/cmplx"
	"math/rand/v2"
	"os"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

// quality is what one set of generated recordings says about the finder and
// the default cutoffs (FEATURES.md, performance).
type quality struct {
	ieds, found   int    // generated IEDs; those with a row within 20 ms
	events        int    // generated events of any kind
	extras        int    // rows within 500 ms of a generated event that are not its match
	extrasNear    [2]int // of those, 50–500 ms from a generated IED / look-alike
	duplicates    int    // rows within 500 ms of a generated event beyond one per event
	rows          int    // candidates
	critAUC       [6]float64
	critN         [6]int
	scoreAUC      float64 // IEDs against every other candidate
	sens, spec    [7]float64
	specLookalike [7]float64 // specificity among matched look-alikes only
}

// assess matches rows (onset order) to the truth of one recording and adds
// to the tallies of q; finish computes the figures.
type assessor struct {
	q        quality
	feats    [6][]float64
	meets    [6][]bool
	score    []float64
	isIED    []bool
	count    []int
	matchedL []bool // the row is a matched look-alike
}

func (a *assessor) add(rows []candidate.Row, truth []synth.Event) {
	m := match(rows, truth, 0.020)
	owner := make([]int, len(rows)) // truth index a row is matched to, or −1
	for i := range owner {
		owner[i] = -1
	}
	for k, ev := range truth {
		a.q.events++
		if ev.IsIED {
			a.q.ieds++
			if m[k] >= 0 {
				a.q.found++
			}
		}
		if m[k] < 0 {
			continue
		}
		owner[m[k]] = k
		f := rows[m[k]].Features()
		for j := range 6 {
			if !math.IsNaN(f[j]) && !ev.Unclear[j] {
				a.feats[j] = append(a.feats[j], f[j])
				a.meets[j] = append(a.meets[j], ev.Meets[j])
			}
		}
	}
	onsets := make([]float64, len(truth))
	for k, ev := range truth {
		onsets[k] = ev.Onset
	}
	sort.Float64s(onsets)
	near := make([]int, len(truth))
	for i, r := range rows {
		a.q.rows++
		if k := nearestTruth(truth, r.OnsetS); k >= 0 && math.Abs(r.OnsetS-truth[k].Onset) <= 0.5 {
			near[k]++
			if near[k] > 1 {
				a.q.duplicates++
			}
		}
		ied := owner[i] >= 0 && truth[owner[i]].IsIED
		a.score = append(a.score, r.Score)
		a.isIED = append(a.isIED, ied)
		a.count = append(a.count, int(r.AutoCount))
		a.matchedL = append(a.matchedL, owner[i] >= 0 && !ied)
		if owner[i] >= 0 {
			continue
		}
		best := nearestTruth(truth, r.OnsetS)
		if best >= 0 && math.Abs(r.OnsetS-truth[best].Onset) <= 0.5 {
			bd := math.Abs(r.OnsetS - truth[best].Onset)
			if os.Getenv("QUORATE_DIAG_EXTRAS") != "" {
				fmt.Printf("extra %s %.2f matched %v off %+.0f ms\n", truth[best].Kind, truth[best].Onset, m[best] >= 0, 1000*(r.OnsetS-truth[best].Onset))
			}
			a.q.extras++
			if bd >= 0.05 {
				if truth[best].IsIED {
					a.q.extrasNear[0]++
				} else {
					a.q.extrasNear[1]++
				}
			}
		}
	}
}

// nearestTruth is the index of the generated event whose onset is nearest
// t, or −1.
func nearestTruth(truth []synth.Event, t float64) int {
	best, bd := -1, math.Inf(1)
	for k, ev := range truth {
		if d := math.Abs(t - ev.Onset); d < bd {
			best, bd = k, d
		}
	}
	return best
}

func (a *assessor) finish() quality {
	q := a.q
	for j := range 6 {
		q.critAUC[j] = auc(a.feats[j], a.meets[j])
		q.critN[j] = len(a.feats[j])
	}
	q.scoreAUC = auc(a.score, a.isIED)
	for k := 1; k <= 6; k++ {
		var tp, p, tn, n, tnl, nl float64
		for i, c := range a.count {
			switch {
			case a.isIED[i]:
				p++
				if c >= k {
					tp++
				}
			default:
				n++
				if c < k {
					tn++
				}
				if a.matchedL[i] {
					nl++
					if c < k {
						tnl++
					}
				}
			}
		}
		q.sens[k], q.spec[k], q.specLookalike[k] = tp/p, tn/n, tnl/nl
	}
	return q
}

func (q quality) log(t *testing.T) {
	t.Logf("recall %d/%d = %.3f (20 ms); %d rows (%.1f per generated event)", q.found, q.ieds, float64(q.found)/float64(q.ieds), q.rows, float64(q.rows)/float64(q.events))
	t.Logf("extra rows within 500 ms of a generated event: %d of %d events = %.1f %% (50–500 ms from an IED %d, from a look-alike %d)",
		q.extras, q.events, 100*float64(q.extras)/float64(q.events), q.extrasNear[0], q.extrasNear[1])
	t.Logf("rows within 500 ms of a generated event beyond one per event: %d = %.1f %%", q.duplicates, 100*float64(q.duplicates)/float64(q.events))
	for j := range 6 {
		t.Logf("c%d %s AUC %.3f (n = %d)", j+1, candidate.FeatureNames[j], q.critAUC[j], q.critN[j])
	}
	t.Logf("score AUC, IEDs against every other row: %.3f", q.scoreAUC)
	for k := 1; k <= 6; k++ {
		t.Logf("auto_count ≥ %d: sensitivity %.3f, specificity %.3f (matched look-alikes only %.3f)", k, q.sens[k], q.spec[k], q.specLookalike[k])
	}
}

// TestCandidateQuality is a diagnostic, run only with QUORATE_DIAG_QUALITY
// set to a list of seeds of the first generator (design seeds 3–6,
// held-out 1 2 7 8 9 10): finder recall, extra rows beside generated
// events, per-criterion and score AUC, and auto_count ≥ k at the default
// cutoffs, in memory. QUORATE_DIAG_ROWS=file writes every row with its
// truth for choosing cutoffs.
func TestCandidateQuality(t *testing.T) {
	v := os.Getenv("QUORATE_DIAG_QUALITY")
	if v == "" {
		t.Skip("diagnostic; set QUORATE_DIAG_QUALITY=\"3 4 5 6\"")
	}
	var dump *os.File
	if p := os.Getenv("QUORATE_DIAG_ROWS"); p != "" {
		var err error
		if dump, err = os.Create(p); err != nil {
			t.Fatal(err)
		}
		defer dump.Close()
	}
	if v := strings.Fields(os.Getenv("QUORATE_DIAG_NMS")); len(v) == 3 {
		complexBeforeS, _ = strconv.ParseFloat(v[0], 64)
		complexAfterS, _ = strconv.ParseFloat(v[1], 64)
		complexFrac, _ = strconv.ParseFloat(v[2], 64)
	}
	if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_LEAD"), 64); err == nil {
		complexLeadS = v
	}
	if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_KEEP"), 64); err == nil {
		complexKeepFrac = v
	}
	rate := 256.0
	if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_RATE"), 64); err == nil {
		rate = v
	}
	var a assessor
	for _, f := range strings.Fields(v) {
		seed, _ := strconv.ParseUint(f, 10, 64)
		g := generatedAt(t, seed, 10, rate)
		in := inputOf(g)
		if k, err := strconv.Atoi(os.Getenv("QUORATE_DIAG_UPSAMPLE")); err == nil && k > 1 {
			in = upsampled(in, k)
		}
		if g, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_GAIN"), 64); err == nil {
			src := in.Src.(memSource)
			out := make(memSource, len(src))
			for c, x := range src {
				out[c] = make([]float32, len(x))
				for i, v := range x {
					out[c][i] = float32(g) * v
				}
			}
			in.Src = out
		}
		if d, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_SHIFT"), 64); err == nil {
			in = shifted(in, d)
		}
		if r, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_RESAMPLE"), 64); err == nil {
			in = resampled(in, int(math.Round(float64(in.Len)*r/in.Rate)))
		}
		if k, err := strconv.Atoi(os.Getenv("QUORATE_DIAG_DECIMATE")); err == nil && k > 1 {
			in = decimatedIn(t, in, k)
		}
		if v := strings.Fields(os.Getenv("QUORATE_DIAG_MAINS")); len(v) == 2 {
			// mains interference: "Hz µV", amplitude 0.5–1.5 × µV per
			// channel (electrode impedances differ), common phase
			hz, _ := strconv.ParseFloat(v[0], 64)
			uv, _ := strconv.ParseFloat(v[1], 64)
			in = withMains(in, hz, uv, seed)
		}
		notch := 0.0
		if v, err := strconv.ParseFloat(os.Getenv("QUORATE_DIAG_NOTCH"), 64); err == nil {
			notch = v
		}
		rows, _, err := Detect(context.Background(), in, Options{NotchHz: notch})
		if err != nil {
			t.Fatal(err)
		}
		a.add(rows, g.Truth)
		if dump != nil {
			writeRowsTruth(dump, seed, rows, g.Truth)
		}
	}
	a.finish().log(t)
}

// writeRowsTruth writes one line per row: seed, the matched event's kind
// (or "none") and its labels, and the features the cutoffs act on.
func writeRowsTruth(f *os.File, seed uint64, rows []candidate.Row, truth []synth.Event) {
	m := match(rows, truth, 0.020)
	kind := make([]string, len(rows))
	lab := make([]string, len(rows))
	for i := range rows {
		kind[i], lab[i] = "none", "------"
	}
	for k, ev := range truth {
		if m[k] < 0 {
			continue
		}
		kind[m[k]] = ev.Kind
		s := ""
		for j, b := range ev.Meets {
			c := map[bool]string{true: "1", false: "0"}[b]
			if ev.Unclear[j] {
				c = "?"
			}
			s += c
		}
		lab[m[k]] = s
	}
	for i, r := range rows {
		fmt.Fprintf(f, "%d\t%.3f\t%s\t%s\t%.2f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%.4f\t%d\t%.4f\n", seed, r.OnsetS, kind[i], lab[i],
			r.C1DurationMS, r.C1Sharpness, r.C2DurationLogRatio, r.C3Asymmetry, r.C4SlowWaveRatio, r.C5Disruption, r.C6DipoleGOF, r.C6FieldExtent, r.Score-float64(r.AutoCount))
	}
}

// TestComplexDump is a diagnostic, run only with QUORATE_DIAG_COMPLEX set
// to seeds: every merged cluster (before suppression) within 500 ms of a
// generated event, with its offset and ranking statistics.
func TestComplexDump(t *testing.T) {
	v := os.Getenv("QUORATE_DIAG_COMPLEX")
	if v == "" {
		t.Skip("diagnostic")
	}
	complexBeforeS, complexAfterS = 0, 0
	for _, f := range strings.Fields(v) {
		seed, _ := strconv.ParseUint(f, 10, 64)
		g := generated(t, seed, 10)
		in := inputOf(g)
		s, _ := (&Options{}).settings()
		cls, on := findAll(t, s, &in)
		for _, ev := range g.Truth {
			line := fmt.Sprintf("%d %s %.2f %s snr %.1f:", seed, ev.Kind, ev.Onset, ev.PeakElectrode, ev.SNR)
			for k, o := range on {
				if math.Abs(o-ev.Onset) <= 0.5 {
					c := cls[k]
					line += fmt.Sprintf(" [%+.0f %s n%d z%.1f a%.1f p%.1f d%d r%.1f]", 1000*(o-ev.Onset), in.Labels[c.best.deriv], len(c.members), c.best.z, c.best.amp, c.best.point, c.best.ph.right-c.best.ph.left, c.best.rank())
				}
			}
			fmt.Println(line)
		}
	}
}

// upsampled is in with every channel interpolated to k times its rate
// (resampled).
func upsampled(in Input, k int) Input { return resampled(in, len(in.Src.(memSource)[0])*k) }

// resampled is in with every channel resampled to m samples by zero-padding
// or truncating its discrete Fourier transform (band-limited
// interpolation): the same waveforms at another rate, for checking that the
// finder and the features do not depend on the rate. Truncation drops the
// band above the new Nyquist frequency.
func resampled(in Input, m int) Input {
	src := in.Src.(memSource)
	n := len(src[0])
	fwd := fourier.NewFFT(n)
	inv := fourier.NewFFT(m)
	out := make(memSource, len(src))
	x := make([]float64, n)
	h := min(n, m) / 2 // bins kept below the lower Nyquist frequency
	for c, ch := range src {
		for i, v := range ch {
			x[i] = float64(v)
		}
		co := fwd.Coefficients(nil, x)
		big := make([]complex128, m/2+1)
		copy(big, co[:h])
		big[h] = co[h] / 2 // the lower Nyquist bin, split between ±f
		y := inv.Sequence(nil, big)
		out[c] = make([]float32, m)
		for i, v := range y {
			out[c][i] = float32(v / float64(n))
		}
	}
	in.Src, in.Rate, in.Len = out, in.Rate*float64(m)/float64(n), int64(m)
	return in
}

// TestRateCompare is a diagnostic, run only with QUORATE_DIAG_RATECMP set
// to seeds: each recording detected as generated (256 Hz) and upsampled
// k-fold (QUORATE_DIAG_UPSAMPLE, default 2); rows matched within 5 ms, and
// per feature the median and 10th–90th percentiles of the difference.
func TestRateCompare(t *testing.T) {
	v := os.Getenv("QUORATE_DIAG_RATECMP")
	if v == "" {
		t.Skip("diagnostic")
	}
	k := 2
	if n, err := strconv.Atoi(os.Getenv("QUORATE_DIAG_UPSAMPLE")); err == nil && n > 1 {
		k = n
	}
	names := []string{"c1dur", "c1", "c2", "c3", "c4", "c5", "c6", "amp", "score"}
	diffs := make([][]float64, len(names))
	nA, nB, both := 0, 0, 0
	for _, f := range strings.Fields(v) {
		seed, _ := strconv.ParseUint(f, 10, 64)
		in := inputOf(generated(t, seed, 10))
		a, _, err := Detect(context.Background(), in, Options{})
		if err != nil {
			t.Fatal(err)
		}
		b, _, err := Detect(context.Background(), upsampled(in, k), Options{})
		if err != nil {
			t.Fatal(err)
		}
		nA, nB = nA+len(a), nB+len(b)
		for _, r := range a {
			for _, s := range b {
				if math.Abs(r.OnsetS-s.OnsetS) > 0.005 || r.PeakChannel != s.PeakChannel {
					continue
				}
				both++
				x := []float64{r.C1DurationMS, r.C1Sharpness, r.C2DurationLogRatio, r.C3Asymmetry, r.C4SlowWaveRatio, r.C5Disruption, r.C6DipoleGOF, r.AmplitudeUV, r.Score}
				y := []float64{s.C1DurationMS, s.C1Sharpness, s.C2DurationLogRatio, s.C3Asymmetry, s.C4SlowWaveRatio, s.C5Disruption, s.C6DipoleGOF, s.AmplitudeUV, s.Score}
				for i := range x {
					if !math.IsNaN(x[i]) && !math.IsNaN(y[i]) {
						diffs[i] = append(diffs[i], y[i]-x[i])
					}
				}
				break
			}
		}
	}
	t.Logf("rows: %d at the generated rate, %d upsampled %d-fold, %d matched (same channel, 5 ms)", nA, nB, k, both)
	for i, d := range diffs {
		slices.Sort(d)
		if len(d) == 0 {
			continue
		}
		q := func(p float64) float64 { return d[int(p*float64(len(d)-1))] }
		t.Logf("%-6s upsampled − generated: median %+.3f, 10th %+.3f, 90th %+.3f", names[i], q(0.5), q(0.1), q(0.9))
	}
}

// decimatedIn is in low-passed (Butterworth order 8, 0.4 of the new rate,
// zero phase) and decimated k-fold, whole.
func decimatedIn(t testing.TB, in Input, k int) Input {
	src := in.Src.(memSource)
	sos, err := signal.Butterworth(signal.LowPass, 8, in.Rate, 0.4*in.Rate/float64(k))
	if err != nil {
		t.Fatal(err)
	}
	out := make(memSource, len(src))
	for c, ch := range src {
		x := slices.Clone(ch)
		if err := signal.FiltFilt32(sos, x); err != nil {
			t.Fatal(err)
		}
		out[c] = make([]float32, len(x)/k)
		for i := range out[c] {
			out[c][i] = x[i*k]
		}
	}
	in.Src, in.Rate, in.Len = out, in.Rate/float64(k), int64(len(out[0]))
	return in
}

// shifted is in with every channel delayed by d samples (a fraction), by a
// linear phase on its discrete Fourier transform: the same waveforms on a
// grid moved by d.
func shifted(in Input, d float64) Input {
	src := in.Src.(memSource)
	n := len(src[0])
	fft := fourier.NewFFT(n)
	out := make(memSource, len(src))
	x := make([]float64, n)
	for c, ch := range src {
		for i, v := range ch {
			x[i] = float64(v)
		}
		co := fft.Coefficients(nil, x)
		for k := range co {
			co[k] *= cmplx.Exp(complex(0, -2*math.Pi*float64(k)*d/float64(n)))
		}
		co[n/2] = complex(real(co[n/2]), 0)
		y := fft.Sequence(nil, co)
		out[c] = make([]float32, n)
		for i, v := range y {
			out[c][i] = float32(v / float64(n))
		}
	}
	in.Src = out
	return in
}

// withMains is in with a sinusoid of hz Hz added to every channel, its
// amplitude 0.5–1.5 × uv drawn per channel from seed, in phase across
// channels.
func withMains(in Input, hz, uv float64, seed uint64) Input {
	r := rand.New(rand.NewPCG(seed, 60))
	amp := make([]float64, len(in.Labels))
	for c := range amp {
		amp[c] = uv * (0.5 + r.Float64())
	}
	return withSinusoid(in, hz, 0, amp)
}
