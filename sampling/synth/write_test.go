package synth

import (
	"math"
	"os"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/edf"
)

// The real head model behind the generator: a radial source under Cz gives the largest
// potential at Cz and a field symmetric between C3 and C4 (a centred radial dipole's map
// is rotationally symmetric about its axis; Brody, Terry & Ideker 1973).
func TestHeadForwardRadialSourceUnderCz(t *testing.T) {
	f := HeadForward()
	el := []string{"Fp1", "C3", "Cz", "C4", "O1"}
	v := f(el, [3]float64{0, 0, 0.8}, [3]float64{0, 0, 1})
	if math.Abs(v[2]) < math.Abs(v[1]) || math.Abs(v[2]) < math.Abs(v[0]) {
		t.Errorf("potentials %v: Cz not the largest", v)
	}
	if math.Abs(v[1]-v[3]) > 1e-9*math.Abs(v[2]) {
		t.Errorf("C3 %g and C4 %g differ under a midline radial source", v[1], v[3])
	}
	sum := 0.0
	for _, x := range v {
		sum += x
	}
	if math.Abs(sum) > 1e-9*math.Abs(v[2]) {
		t.Errorf("not common-average referenced: sum %g", sum)
	}
}

func TestWriteArchiveReadsBack(t *testing.T) {
	subs := Archive(ArchiveConfig{Seed: 5, Subjects: 2, Recordings: 1, Duration: 20, Forward: HeadForward()})
	arch, truth := t.TempDir(), t.TempDir()
	ws, err := WriteArchive(arch, truth, subs)
	if err != nil {
		t.Fatal(err)
	}
	if len(ws) != 2 {
		t.Fatalf("%d recordings written, want 2", len(ws))
	}
	for _, w := range ws {
		r, err := edf.Open(w.Path)
		if err != nil {
			t.Fatal(err)
		}
		h := r.Header()
		if h.Duration() != 20 || h.Format != edf.EDFPlusC || h.PatientID != w.Subject.PatientID {
			t.Errorf("%s: duration %v format %v patient %q", w.Path, h.Duration(), h.Format, h.PatientID)
		}
		eeg := 0
		for _, s := range h.Signals {
			if s.Kind == edf.EEG {
				eeg++
			}
		}
		if eeg != len(DefaultElectrodes) {
			t.Errorf("%d EEG signals, want %d", eeg, len(DefaultElectrodes))
		}
		if h.Signals[0].Name != "Fp1" {
			t.Errorf("first label %q normalised to %q, want Fp1", h.Signals[0].Label, h.Signals[0].Name)
		}
		// A sample read back equals the generator's within one digital step (0.1 µV).
		g, _ := NewGenerator(w.Spec.Config)
		want := make([][]float32, len(g.Labels()))
		for i := range want {
			want[i] = make([]float32, 256)
		}
		g.Read(want)
		got := make([]float32, 256)
		if _, err := r.ReadSignal(3, 0, got); err != nil {
			t.Fatal(err)
		}
		for j := range got {
			if math.Abs(float64(got[j]-want[3][j])) > 0.1 {
				t.Fatalf("sample %d: %g read back, %g generated", j, got[j], want[3][j])
			}
		}
		// The vigilance states are annotated, one per state span.
		var stages int
		for a, err := range r.AllAnnotations() {
			if err != nil {
				t.Fatal(err)
			}
			if strings.HasPrefix(a.Text, "Sleep stage ") {
				stages++
			}
		}
		if stages == 0 {
			t.Errorf("%d stage annotations written", stages)
		}
		r.Close()
		b, err := os.ReadFile(w.TruthPath)
		if err != nil || !strings.HasPrefix(string(b), strings.Join(TruthHeader, ",")) {
			t.Errorf("truth file %s: %v", w.TruthPath, err)
		}
	}
}

func TestNearest(t *testing.T) {
	evs := []Event{{ID: "a", Onset: 1}, {ID: "b", Onset: 2}, {ID: "c", Onset: 2.03}}
	cases := []struct {
		at   float64
		want string
		ok   bool
	}{{1.02, "a", true}, {2.02, "c", true}, {1.5, "", false}, {0, "", false}, {2.07, "c", true}, {2.09, "", false}}
	for _, c := range cases {
		e, ok := Nearest(evs, c.at, 0.05)
		if ok != c.ok || e.ID != c.want {
			t.Errorf("Nearest(%v) = %q, %v; want %q, %v", c.at, e.ID, ok, c.want, c.ok)
		}
	}
}
