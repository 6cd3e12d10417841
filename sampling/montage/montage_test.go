package montage

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"
)

// tenTwenty is the 19-electrode 10-20 set with 10-10 names, plus two
// non-EEG channels that must be ignored.
var tenTwenty = []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "T7", "C3", "Cz",
	"C4", "T8", "P7", "P3", "Pz", "P4", "P8", "O1", "O2", "ECG", "A1"}

func TestLongitudinalGuideline(t *testing.T) {
	// ACNS Guideline 3 (Acharya et al. 2016), longitudinal bipolar
	// montage, 18 channels in display order; from memory.
	want := []string{
		"Fp1-F7", "F7-T7", "T7-P7", "P7-O1",
		"Fp2-F8", "F8-T8", "T8-P8", "P8-O2",
		"Fp1-F3", "F3-C3", "C3-P3", "P3-O1",
		"Fp2-F4", "F4-C4", "C4-P4", "P4-O2",
		"Fz-Cz", "Cz-Pz",
	}
	m, warn, err := Build(LongitudinalBipolar, tenTwenty, nil)
	if err != nil || len(warn) != 0 {
		t.Fatalf("err %v warnings %v", err, warn)
	}
	if got := m.Names(); !slices.Equal(got, want) {
		t.Errorf("got %v\nwant %v", got, want)
	}
}

func TestTransverseGuideline(t *testing.T) {
	// ACNS Guideline 3 (Acharya et al. 2016), transverse bipolar montage;
	// from memory.
	want := []string{
		"F7-Fp1", "Fp1-Fp2", "Fp2-F8",
		"F7-F3", "F3-Fz", "Fz-F4", "F4-F8",
		"T7-C3", "C3-Cz", "Cz-C4", "C4-T8",
		"P7-P3", "P3-Pz", "Pz-P4", "P4-P8",
		"O1-O2",
	}
	m, warn, err := Build(TransverseBipolar, tenTwenty, nil)
	if err != nil || len(warn) != 0 {
		t.Fatalf("err %v warnings %v", err, warn)
	}
	if got := m.Names(); !slices.Equal(got, want) {
		t.Errorf("got %v\nwant %v", got, want)
	}
}

// order of 10-20 rows front to back, and of positions left to right, as laid
// out in the 10-20 system (Jasper 1958, "The ten-twenty electrode system of
// the International Federation", Electroencephalogr Clin Neurophysiol
// 10:371–375).
var (
	frontBack = map[string]int{"Fp": 0, "F": 1, "T": 2, "C": 2, "P": 3, "O": 4}
	leftRight = map[int]int{7: 0, 3: 1, 1: 2, 0: 3, 2: 4, 4: 5, 8: 6} // F7 lateral of F3 …
)

func TestChainsRunInGuidelineDirections(t *testing.T) {
	// Guideline 3 chains run front to back (longitudinal) or left to right
	// (transverse), each electrode joined to a neighbour.
	for _, c := range Chains(LongitudinalBipolar) {
		for k := 1; k < len(c); k++ {
			r0, _, _ := split(c[k-1])
			r1, _, _ := split(c[k])
			if frontBack[r1] <= frontBack[r0] {
				t.Errorf("longitudinal %v: %s does not lie behind %s", c, c[k], c[k-1])
			}
		}
	}
	for _, c := range Chains(TransverseBipolar) {
		for k := 1; k < len(c); k++ {
			_, p0, _ := split(c[k-1])
			_, p1, _ := split(c[k])
			if leftRight[p1] <= leftRight[p0] {
				t.Errorf("transverse %v: %s is not right of %s", c, c[k], c[k-1])
			}
		}
	}
}

// weights recovers each derivation's weight on each channel by applying the
// montage to unit impulses: column t of the input is channel t alone.
func weights(m *Montage, nch int) [][]float32 {
	in := make([][]float32, nch)
	for c := range in {
		in[c] = make([]float32, nch)
		in[c][c] = 1
	}
	out := make([][]float32, m.Len())
	for i := range out {
		out[i] = make([]float32, nch)
	}
	m.Apply(in, out)
	return out
}

func TestCommonAverageRowsSumToZero(t *testing.T) {
	// Average reference: V_i − (1/N)ΣV_j; the weights sum to 1 − N/N = 0,
	// so a potential common to all electrodes vanishes (Offner 1950).
	bad := make([]bool, len(tenTwenty))
	bad[7] = true // T7
	m, warn, err := Build(CommonAverage, tenTwenty, bad)
	if err != nil {
		t.Fatal(err)
	}
	if m.Len() != 18 || !strings.Contains(strings.Join(warn, "|"), "T7") {
		t.Fatalf("%d derivations, warnings %v", m.Len(), warn)
	}
	w := weights(m, len(tenTwenty))
	for i, row := range w {
		s := 0.0
		for _, v := range row {
			s += float64(v)
		}
		if math.Abs(s) > 1e-6 {
			t.Errorf("%s: weights sum to %g", m.Names()[i], s)
		}
		if row[7] != 0 || row[19] != 0 || row[20] != 0 {
			t.Errorf("%s: bad or non-EEG channel in the average", m.Names()[i])
		}
		if d := m.Derivations()[i]; math.Abs(float64(row[d.Plus])-(1-1.0/18)) > 1e-6 {
			t.Errorf("%s: own weight %g, want 17/18", d.Name, row[d.Plus])
		}
	}
}

func TestBipolarWeights(t *testing.T) {
	m, _, _ := Build(LongitudinalBipolar, tenTwenty, nil)
	w := weights(m, len(tenTwenty))
	for i, d := range m.Derivations() {
		for c, v := range w[i] {
			want := float32(0)
			switch c {
			case d.Plus:
				want = 1
			case d.Minus[0]:
				want = -1
			}
			if v != want {
				t.Errorf("%s channel %d: weight %g want %g", d.Name, c, v, want)
			}
		}
	}
}

func TestDegradation(t *testing.T) {
	labels := slices.DeleteFunc(slices.Clone(tenTwenty), func(s string) bool { return s == "T7" })
	bad := make([]bool, len(labels))
	bad[slices.Index(labels, "C3")] = true
	m, warn, err := Build(LongitudinalBipolar, labels, bad)
	if err != nil {
		t.Fatal(err)
	}
	for _, gone := range []string{"F7-T7", "T7-P7", "F3-C3", "C3-P3"} {
		if slices.Contains(m.Names(), gone) {
			t.Errorf("%s kept", gone)
		}
	}
	if m.Len() != 14 || len(warn) != 4 {
		t.Errorf("%d derivations, warnings %q", m.Len(), warn)
	}
	if !strings.Contains(warn[0], "T7 missing") || !strings.Contains(warn[2], "C3 bad") {
		t.Errorf("warnings do not say why: %q", warn)
	}
	_, _, err = Build(TransverseBipolar, []string{"Fp1", "ECG"}, nil)
	var be *buildError
	if !errors.As(err, &be) || be.Field != "electrodes" {
		t.Errorf("want buildError on electrodes, got %v", err)
	}
	if _, _, err := Build(Referential, tenTwenty, []bool{true}); !errors.As(err, &be) || be.Field != "bad" {
		t.Errorf("want buildError on bad, got %v", err)
	}
}

func TestApplyValues(t *testing.T) {
	labels := []string{"Fz", "Cz", "Pz"}
	in := [][]float32{{10, 1}, {4, 2}, {1, 3}}
	m, _, _ := Build(LongitudinalBipolar, labels, nil)
	out := [][]float32{make([]float32, 2), make([]float32, 2)}
	m.Apply(in, out)
	if !slices.Equal(out[0], []float32{6, -1}) || !slices.Equal(out[1], []float32{3, -1}) {
		t.Errorf("bipolar %v", out)
	}
	m, _, _ = Build(CommonAverage, labels, nil)
	out = [][]float32{make([]float32, 2), make([]float32, 2), make([]float32, 2)}
	m.Apply(in, out)
	// means 5 and 2
	want := [][]float32{{5, -1}, {-1, 0}, {-4, 1}}
	for i := range want {
		if !slices.Equal(out[i], want[i]) {
			t.Errorf("average %s: %v want %v", m.Names()[i], out[i], want[i])
		}
	}
	m, _, _ = Build(Referential, labels, nil)
	m.Apply(in, out)
	if !slices.Equal(out[2], in[2]) || m.Names()[0] != "Fz-Ref" {
		t.Errorf("referential %v %v", m.Names(), out)
	}
}

func TestParseKind(t *testing.T) {
	for _, k := range []Kind{Referential, CommonAverage, LongitudinalBipolar, TransverseBipolar} {
		got, err := ParseKind(k.String())
		if err != nil || got != k {
			t.Errorf("%v: got %v, %v", k, got, err)
		}
	}
	var ke *kindError
	if _, err := ParseKind("banana"); !errors.As(err, &ke) || ke.Name != "banana" {
		t.Errorf("got %v", err)
	}
}

func TestRegion(t *testing.T) {
	// Positions per the 10-10 layout (ACNS Guideline 2, Acharya et al.
	// 2016; Oostenveld & Praamstra 2001): odd left, even right, z midline.
	cases := []struct{ name, lobe, side string }{
		{"Fp1", "frontal", "left"}, {"AF4", "frontal", "right"}, {"Fz", "frontal", "midline"},
		{"F3", "frontal", "left"}, {"F7", "temporal", "left"}, {"F8", "temporal", "right"},
		{"FT9", "temporal", "left"}, {"T8", "temporal", "right"}, {"TP7", "temporal", "left"},
		{"FC5", "central", "left"}, {"Cz", "central", "midline"}, {"CP2", "central", "right"},
		{"P7", "parietal", "left"}, {"POz", "parietal", "midline"}, {"O2", "occipital", "right"},
		{"Iz", "occipital", "midline"}, {"Nz", "frontal", "midline"},
	}
	for _, c := range cases {
		if l, s := Region(c.name); l != c.lobe || s != c.side {
			t.Errorf("%s: %s %s, want %s %s", c.name, l, s, c.lobe, c.side)
		}
	}
	for _, n := range []string{"A1", "M2", "ECG", "T3", "C7", "Tz", "Fp3", "F0", "F11", "", "fp1"} {
		if IsElectrode(n) {
			t.Errorf("%q accepted as a 10-10 electrode", n)
		}
	}
	if got := Present(tenTwenty); len(got) != 19 {
		t.Errorf("present %v", got)
	}
}

func TestChannelQuality(t *testing.T) {
	rng := [2]float64{-3276.8, 3276.7} // 16-bit EDF at 0.1 µV per step
	sine := make([]float32, 2560)
	for i := range sine {
		sine[i] = float32(40 * math.Sin(2*math.Pi*10*float64(i)/256))
	}
	if q := ChannelQuality(sine, rng); q.Flat || q.Saturated || math.Abs(q.Spread-80) > 1 {
		t.Errorf("sine: %+v", q) // spread ≈ 2×40 µV for a 10 Hz sine
	}
	flat := make([]float32, 2560)
	flat[100] = 500 // one artefact does not hide a dead channel
	if q := ChannelQuality(flat, rng); !q.Flat || q.Saturated {
		t.Errorf("flat: %+v", q)
	}
	clip := slices.Clone(sine)
	for i := range clip {
		clip[i] *= 200
		clip[i] = float32(math.Max(math.Min(float64(clip[i]), rng[1]), rng[0]))
	}
	if q := ChannelQuality(clip, rng); !q.Saturated || q.Flat || q.Clipped < 0.1 {
		t.Errorf("clipped: %+v", q)
	}
	if q := ChannelQuality(clip, [2]float64{0, 0}); q.Saturated {
		t.Errorf("no range given: %+v", q)
	}
	nan := []float32{float32(math.NaN()), float32(math.Inf(1))}
	if q := ChannelQuality(nan, rng); !q.Flat || q.NonFinite != 2 {
		t.Errorf("non-finite: %+v", q)
	}
}
