package textbook

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/headmodel"
	"github.com/quorate-eeg/quorate/sampling/synth"
)

var cached = map[uint64]*synth.Recording{}

func gen(t *testing.T, seed uint64) *synth.Recording {
	t.Helper()
	if r, ok := cached[seed]; ok {
		return r
	}
	r, err := Generate(Config{Seed: seed, IEDRate: 8, LookalikeRate: 12})
	if err != nil {
		t.Fatal(err)
	}
	cached[seed] = r
	return r
}

func TestDeterministic(t *testing.T) {
	a := gen(t, 3)
	b, err := Generate(Config{Seed: 3, IEDRate: 8, LookalikeRate: 12})
	if err != nil {
		t.Fatal(err)
	}
	// every command is deterministic for its seed (common practice)
	if !slices.Equal(a.Data[5], b.Data[5]) || len(a.Truth) != len(b.Truth) || a.Truth[7].Onset != b.Truth[7].Onset || a.Truth[7].Kind != b.Truth[7].Kind {
		t.Error("same seed, different recording")
	}
}

// Spikes last 20 to <70 ms and sharp waves 70–200 ms (Kane et al. 2017,
// glossary); an IED meets at least 4 of the 6 criteria (Kural et al. 2020);
// look-alikes here never have an after-going slow wave or a disrupted
// background, so meet at most 4.
func TestTruthFollowsTheGlossary(t *testing.T) {
	kinds := map[string]int{}
	for _, seed := range []uint64{1, 2, 3} {
		for _, e := range gen(t, seed).Truth {
			kinds[e.Kind]++
			switch e.Kind {
			case synth.Spike:
				if e.Duration < 20 || e.Duration >= 70 {
					t.Errorf("%s: spike of %.1f ms", e.ID, e.Duration)
				}
			case synth.SharpWave:
				if e.Duration < 70 || e.Duration > 200 {
					t.Errorf("%s: sharp wave of %.1f ms", e.ID, e.Duration)
				}
			}
			if e.IsIED && e.MetCount() < 4 {
				t.Errorf("%s: IED meeting %d criteria", e.ID, e.MetCount())
			}
			if !e.IsIED && (e.Meets[synth.C4SlowWave] || e.Meets[synth.C5Disruption]) {
				t.Errorf("%s %s: look-alike built with a slow wave or disruption", e.ID, e.Kind)
			}
			if e.Start > e.Onset || e.Onset > e.End {
				t.Errorf("%s: onset %.3f outside [%.3f, %.3f]", e.ID, e.Onset, e.Start, e.End)
			}
		}
	}
	for _, k := range []string{synth.Spike, SpikeWave, Polyspike, synth.Wicket, synth.Vertex, POSTS, synth.Pop, synth.Muscle} {
		if kinds[k] == 0 {
			t.Errorf("no %s in three recordings: %v", k, kinds)
		}
	}
}

// The after-going slow wave has the spike's polarity (Kane et al. 2017,
// "spike-and-slow-wave complex"): at the peak electrode the largest value
// in the slow-wave window has the apex's sign.
func TestSlowWaveHasSpikePolarity(t *testing.T) {
	h, err := newHead(synth.DefaultElectrodes)
	if err != nil {
		t.Fatal(err)
	}
	m := &maker{r: rand.New(rand.NewPCG(9, 9)), h: h, rate: 256, nch: 19, alpha: 10, focus: [3]float64{0.9, 0.1, 0.1}}
	checked := 0
	for range 200 {
		b := m.ied(0, span{State: Awake})
		ev := b.rows[0].ev
		if ev.SlowWave == 0 {
			continue
		}
		c := slices.Index(synth.DefaultElectrodes, maxAbsChannel(b))
		apex := b.w[c][b.rows[0].peak]
		lo := b.rows[0].peak + 26
		hi := min(len(b.w[c]), lo+int(ev.SlowWave/1000*256)+10)
		big := 0.0
		for _, y := range b.w[c][lo:hi] {
			if math.Abs(y) > math.Abs(big) {
				big = y
			}
		}
		if big*apex <= 0 {
			t.Errorf("%s: apex %.1f, slow wave %.1f", ev.Kind, apex, big)
		}
		checked++
	}
	if checked < 50 {
		t.Errorf("only %d IEDs with a slow wave in 200", checked)
	}
}

func maxAbsChannel(b *built) string {
	k, best := b.rows[0].peak, 0
	for c := range b.w {
		if math.Abs(b.w[c][k]) > math.Abs(b.w[best][k]) {
			best = c
		}
	}
	return synth.DefaultElectrodes[best]
}

// An electrode pop is confined to one electrode (Niedermeyer, artefacts;
// from memory): no other channel carries any of it.
func TestPopConfinedToOneElectrode(t *testing.T) {
	h, _ := newHead(synth.DefaultElectrodes)
	m := &maker{r: rand.New(rand.NewPCG(1, 2)), h: h, rate: 256, nch: 19, alpha: 10}
	b := m.pop(0, span{State: Awake})
	touched := 0
	for c := range b.w {
		if slices.ContainsFunc(b.w[c], func(y float64) bool { return y != 0 }) {
			touched++
		}
	}
	if touched != 1 {
		t.Errorf("pop touches %d electrodes", touched)
	}
}

// The Berg & Scherg (1994) approximation stays within a few per cent of the
// exact series for the four-shell head (they report errors near 1 % for
// three shells; from memory).
func TestHeadMatchesSeries(t *testing.T) {
	h, err := newHead(synth.DefaultElectrodes)
	if err != nil {
		t.Fatal(err)
	}
	s := FourShell()
	pos, m := [3]float64{0.5, 0.2, 0.5}, [3]float64{0.3, -0.2, 0.9}
	approx := h.project(pos, m)
	exact := make([]float64, len(h.el))
	s.Potentials(exact, h.el, headmodel.Vec3(pos).Scale(h.R), headmodel.Vec3(m))
	mean := 0.0
	for _, v := range exact {
		mean += v
	}
	var num, den float64
	for i := range exact {
		d := exact[i] - mean/float64(len(exact)) - approx[i]
		num += d * d
		den += approx[i] * approx[i]
	}
	if rel := math.Sqrt(num / den); rel > 0.05 {
		t.Errorf("relative error %.3f", rel)
	}
}

// A radial source gives one dominant pole; a tangential one two poles of
// like size, positive and negative (Schomer & Lopes da Silva 2018, ch. on
// EEG generation; from memory).
func TestOrientationShapesTheField(t *testing.T) {
	h, _ := newHead(synth.DefaultElectrodes)
	r := rand.New(rand.NewPCG(4, 4))
	pos := [3]float64{0, -0.2, 0.75}
	ratio := func(kind string) float64 {
		v := h.project(pos, orient(r, pos, kind))
		hi, lo := slices.Max(v), slices.Min(v)
		return math.Min(hi, -lo) / math.Max(hi, -lo)
	}
	if rad, tan := ratio("radial"), ratio("tangential"); !(tan > 0.6 && rad < tan) {
		t.Errorf("pole ratio radial %.2f, tangential %.2f", rad, tan)
	}
}

// The posterior alpha rhythm is attenuated by eye opening (Kane et al. 2017,
// "alpha rhythm"); spindles (11–15 Hz) belong to N2.
func TestAlphaReactsAndSpindlesComeInN2(t *testing.T) {
	rec, err := Generate(Config{Seed: 11, AlphaFreq: 10})
	if err != nil {
		t.Fatal(err)
	}
	r := rand.New(rand.NewPCG(11, 0x54455854))
	drawFocus(r) // the draw Generate makes before the states when AlphaFreq is given
	spans := drawStates(r, 240)
	o1, cz := slices.Index(rec.Labels, "O1"), slices.Index(rec.Labels, "Cz")
	band := func(c int, s span, lo, hi float64) float64 {
		a, b := int((s.Start+2)*rec.Rate), int((s.End-2)*rec.Rate)
		return bandPower(rec.Data[c][a:b], rec.Rate, lo, hi)
	}
	closed, open := band(o1, spans[0], 8, 12), band(o1, spans[1], 8, 12)
	if closed < 4*open {
		t.Errorf("alpha power eyes closed %.1f, open %.1f", closed, open)
	}
	if n2, dr := band(cz, spans[4], 11, 15), band(cz, spans[3], 11, 15); n2 < 2*dr {
		t.Errorf("sigma power N2 %.2f, drowsy %.2f", n2, dr)
	}
}

// bandPower is the mean periodogram power in [lo, hi] Hz (direct DFT at
// each 0.25 Hz bin of 4 s segments).
func bandPower(x []float32, rate, lo, hi float64) float64 {
	seg := int(4 * rate)
	var p float64
	n := 0
	for a := 0; a+seg <= len(x); a += seg {
		for f := lo; f <= hi; f += 0.25 {
			var re, im float64
			for k := range seg {
				w := 2 * math.Pi * f * float64(k) / rate
				re += float64(x[a+k]) * math.Cos(w)
				im += float64(x[a+k]) * math.Sin(w)
			}
			p += (re*re + im*im) / float64(seg)
			n++
		}
	}
	return p / float64(n)
}

func TestWriteArchive(t *testing.T) {
	dir := t.TempDir()
	subs := Archive(ArchiveConfig{Seed: 5, Subjects: 2, Duration: 60})
	w, err := WriteArchive(filepath.Join(dir, "a"), filepath.Join(dir, "t"), subs)
	if err != nil {
		t.Fatal(err)
	}
	if len(w) != 2 {
		t.Fatalf("%d recordings", len(w))
	}
	r, err := edf.Open(w[0].Path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	h := r.Header()
	// EDF+ normalised labels: "EEG Fp1-AVG" reads as Fp1 (EDF+ signal-type
	// prefix and reference suffix, Kemp & Olivan 2003)
	if h.Signals[0].Name != "Fp1" || h.NumRecords != 60 {
		t.Errorf("first signal %q, %d records", h.Signals[0].Name, h.NumRecords)
	}
	var texts []string
	for a, err := range r.AllAnnotations() {
		if err != nil {
			t.Fatal(err)
		}
		texts = append(texts, a.Text)
	}
	if !slices.Contains(texts, "Sleep stage W") {
		t.Errorf("annotations %v", texts)
	}
	b, err := os.ReadFile(w[0].TruthPath)
	if err != nil {
		t.Fatal(err)
	}
	if first, _, _ := strings.Cut(string(b), "\n"); first != strings.Join(synth.TruthHeader, ",") {
		t.Errorf("truth header %q", first)
	}
	if !strings.HasPrefix(w[0].Subject.PatientID, "BNS-0001 ") || w[0].Spec.Start.Before(time.Date(2022, 1, 1, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("subject %+v", w[0].Subject)
	}
}

func TestConfigErrors(t *testing.T) {
	for _, c := range []Config{{Rate: 50}, {Duration: 5}, {IEDRate: -1}, {AlphaFreq: 20}, {Electrodes: []string{"Cz"}}} {
		if _, err := Generate(c); err == nil {
			t.Errorf("%+v accepted", c)
		}
	}
	if _, err := Generate(Config{Electrodes: []string{"Fp1", "Fp2", "F3", "F4", "C3", "C4", "P3", "Xq9"}}); err == nil {
		t.Error("unknown electrode accepted")
	}
}
