package edf

import (
	"bytes"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"
)

// doubleBanana is the longitudinal bipolar montage's 18 derivations
// (ACNS guideline 6, 2016, from memory): temporal and parasagittal
// chains on each side and the midline.
var doubleBanana = [][2]string{
	{"Fp1", "F7"}, {"F7", "T7"}, {"T7", "P7"}, {"P7", "O1"},
	{"Fp1", "F3"}, {"F3", "C3"}, {"C3", "P3"}, {"P3", "O1"},
	{"Fp2", "F8"}, {"F8", "T8"}, {"T8", "P8"}, {"P8", "O2"},
	{"Fp2", "F4"}, {"F4", "C4"}, {"C4", "P4"}, {"P4", "O2"},
	{"Fz", "Cz"}, {"Cz", "Pz"},
}

// writeBipolar writes nrec one-second records at 256 Hz of the derivations
// pairs of random potentials, and returns the file and the potentials
// (electrode → samples, µV). Signals listed in mV are stored in mV.
func writeBipolar(t *testing.T, pairs [][2]string, nrec int, mV map[int]bool) ([]byte, map[string][]float64) {
	t.Helper()
	const spr = 256
	rng := rand.New(rand.NewPCG(7, 11))
	V := map[string][]float64{}
	for _, p := range pairs {
		for _, e := range p {
			if V[e] == nil {
				V[e] = make([]float64, nrec*spr)
				off := rng.NormFloat64() * 200 // the unknown reference's share
				for i := range V[e] {
					V[e][i] = off + 40*rng.NormFloat64()
				}
			}
		}
	}
	sigs := make([]Signal, len(pairs))
	for j, p := range pairs {
		sigs[j] = Signal{Label: "EEG " + p[0] + "-" + p[1], PhysDim: "uV", PhysMin: -2000, PhysMax: 2000, DigMin: -32768, DigMax: 32767, SamplesPerRecord: spr}
		if mV[j] {
			sigs[j].PhysDim, sigs[j].PhysMin, sigs[j].PhysMax = "mV", -2, 2
		}
	}
	var buf bytes.Buffer
	w, err := NewWriter(&buf, WriterHeader{Format: EDF, PatientID: "X X X X", Start: time.Date(2024, 3, 5, 10, 0, 0, 0, time.UTC),
		RecordDuration: 1, NumRecords: int64(nrec), Signals: sigs})
	if err != nil {
		t.Fatal(err)
	}
	for r := range nrec {
		x := make([][]float32, len(pairs))
		for j, p := range pairs {
			x[j] = make([]float32, spr)
			for k := range x[j] {
				d := V[p[0]][r*spr+k] - V[p[1]][r*spr+k]
				if mV[j] {
					d /= 1000
				}
				x[j][k] = float32(d)
			}
		}
		if err := w.WriteRecord(x); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes(), V
}

// TestRecoverElectrodes checks potentials recovered from bipolar
// derivations against the recording's own potentials less their mean over
// the linked electrodes, the common average reference (common practice):
// a derivation V_a − V_b loses the reference, which the common average
// removes as well, so the two must agree up to the file's quantisation
// (4000 µV over 16 bits, 0.06 µV a step).
func TestRecoverElectrodes(t *testing.T) {
	linked := append(append([][2]string{}, doubleBanana...), [2]string{"C3", "Cz"}, [2]string{"Cz", "C4"})
	for _, c := range []struct {
		name   string
		pairs  [][2]string
		groups [][]string // expected groups of recovered electrodes
		warn   []string   // the warning must contain each
	}{
		{"double banana linked through Cz", linked,
			[][]string{{"C3", "C4", "Cz", "F3", "F4", "F7", "F8", "Fp1", "Fp2", "Fz", "O1", "O2", "P3", "P4", "P7", "P8", "Pz", "T7", "T8"}},
			[]string{"20 signals are bipolar derivations", "19 electrodes recovered"}},
		{"double banana alone", doubleBanana,
			[][]string{{"C3", "F3", "F7", "Fp1", "O1", "P3", "P7", "T7"}, {"C4", "F4", "F8", "Fp2", "O2", "P4", "P8", "T8"}},
			[]string{"16 electrodes", "2 groups are not linked", "too few electrodes linked to recover: Cz, Fz, Pz"}},
	} {
		b, V := writeBipolar(t, c.pairs, 3, map[int]bool{1: true})
		r := open(t, b)
		h := r.Header()
		var names []string
		for _, e := range h.Recovered {
			names = append(names, e.Name)
		}
		var want []string
		for _, g := range c.groups {
			want = append(want, g...)
		}
		if strings.Join(names, ",") != strings.Join(want, ",") {
			t.Fatalf("%s: recovered %v, want %v", c.name, names, want)
		}
		w := strings.Join(h.Warnings, "\n")
		for _, s := range c.warn {
			if !strings.Contains(w, s) {
				t.Errorf("%s: warnings %q lack %q", c.name, w, s)
			}
		}
		rec := make([][]float32, len(h.Signals))
		for _, s := range h.TermSignals() {
			rec[s] = make([]float32, 256)
		}
		if err := r.ReadRecord(1, rec); err != nil {
			t.Fatal(err)
		}
		k := 0
		for _, g := range c.groups {
			n := 3 * 256
			mean := make([]float64, n)
			for _, e := range g {
				for i := range n {
					mean[i] += V[e][i] / float64(len(g))
				}
			}
			for _, e := range g {
				got := make([]float32, 300)
				if n, err := r.ReadRecovered(k, 200, got); err != nil || n != 300 {
					t.Fatalf("%s: ReadRecovered %s: %d samples, %v", c.name, e, n, err)
				}
				fromRec := make([]float32, 256)
				h.RecoverRecord(k, rec, fromRec)
				worst := 0.0
				for i, v := range got {
					worst = max(worst, math.Abs(float64(v)-(V[e][200+i]-mean[200+i])))
				}
				for i, v := range fromRec {
					worst = max(worst, math.Abs(float64(v)-(V[e][256+i]-mean[256+i])))
				}
				if worst > 0.3 {
					t.Errorf("%s: %s recovered within %.3f µV of its common-average potential, want ≤ 0.3", c.name, e, worst)
				}
				k++
			}
		}
	}
}

// TestRecoverOnlyBipolar checks that a recording with any electrode of its
// own, or too few derivations, is left as it is.
func TestRecoverOnlyBipolar(t *testing.T) {
	for _, labels := range [][]string{
		{"Fp1", "Fp1-F7", "F7-T7", "T7-P7", "P7-O1"},
		{"Fp1-F7", "F7-T7"},
		{"Fp1-Cz", "F3-Cz", "C3-Cz", "O1-Cz"}, // a common reference: commonReference's
	} {
		h := &Header{}
		for _, l := range labels {
			n, k := NormalizeLabel(l)
			h.Signals = append(h.Signals, Signal{Label: l, Name: n, Kind: k, SamplesPerRecord: 256, PhysMin: -1000, PhysMax: 1000, DigMin: -32768, DigMax: 32767})
		}
		commonReference(h)
		recoverElectrodes(h)
		if len(h.Recovered) != 0 {
			t.Errorf("%v: recovered %d electrodes, want none", labels, len(h.Recovered))
		}
	}
}

// TestRecoverSkipsUnusableScaling checks that a derivation whose header
// gives no usable gain (digital minimum equal to maximum) takes no part in
// the recovery, which would otherwise spread its infinite values to every
// electrode of its group; the loop of the left temporal and parasagittal
// chains stays linked without it.
func TestRecoverSkipsUnusableScaling(t *testing.T) {
	h := &Header{}
	for i, p := range doubleBanana[:8] {
		l := "EEG " + p[0] + "-" + p[1]
		n, k := NormalizeLabel(l)
		s := Signal{Label: l, Name: n, Kind: k, SamplesPerRecord: 256, PhysMin: -1000, PhysMax: 1000, DigMin: -32768, DigMax: 32767}
		if i == 2 {
			s.DigMax = s.DigMin
		}
		h.Signals = append(h.Signals, s)
	}
	recoverElectrodes(h)
	if len(h.Recovered) != 8 {
		t.Fatalf("%d electrodes recovered, want the loop's 8", len(h.Recovered))
	}
	for _, e := range h.Recovered {
		for _, tm := range e.Terms {
			if tm.Signal == 2 {
				t.Fatalf("%s is read from the derivation with unusable scaling", e.Name)
			}
			if math.IsNaN(tm.Weight) || math.IsInf(tm.Weight, 0) {
				t.Fatalf("%s: weight %g", e.Name, tm.Weight)
			}
		}
	}
}
