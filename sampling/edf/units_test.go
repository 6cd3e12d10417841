package edf

import "testing"

// TestMicrovolts checks the unit factors against the SI prefixes (BIPM,
// The International System of Units, 9th ed. 2019, Table 7: milli 10⁻³,
// micro 10⁻⁶, nano 10⁻⁹) for the dimensions the EDF+ specification
// recommends (Kemp & Olivan 2003), and that anything else is taken as µV
// and reported as not understood.
func TestMicrovolts(t *testing.T) {
	for _, c := range []struct {
		dim    string
		factor float64
		ok     bool
	}{
		{"uV", 1, true}, {" uV  ", 1, true}, {"UV", 1, true}, {"µV", 1, true}, {"μV", 1, true},
		{"mV", 1e3, true}, {"V", 1e6, true}, {"nV", 1e-3, true},
		{"", 1, false}, {"MV", 1, false}, {"mmHg", 1, false}, {"%", 1, false},
	} {
		s := Signal{PhysDim: c.dim}
		f, ok := s.Microvolts()
		if f != c.factor || ok != c.ok {
			t.Errorf("%q: %g %v, want %g %v", c.dim, f, ok, c.factor, c.ok)
		}
	}
}
