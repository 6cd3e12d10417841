package draw

import "github.com/quorate-eeg/quorate/sampling/design"

// Sample returns the candidate units of r as a design.Sample (strata and
// weights 1/π, in the order of r.Drawn, controls left out) for the
// estimators of package design. The sampling fraction is f_h = n_h/N_h for
// strata the cap did not thin; for thinned strata it is left at 0, the
// with-replacement approximation, because 1 − n_h/N'_h would ignore the
// variance added by thinning.
func (r *Result) Sample() design.Sample {
	s := design.Sample{FPC: make(map[string]float64)}
	for _, u := range r.Drawn {
		if u.Kind != KindCandidate {
			continue
		}
		s.Stratum = append(s.Stratum, u.Stratum)
		s.Weight = append(s.Weight, u.Weight)
	}
	for _, st := range r.Strata {
		if st.Capped == st.N && st.N > 0 {
			s.FPC[st.Label] = float64(st.Sample) / float64(st.N)
		}
	}
	return s
}
