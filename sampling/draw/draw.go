package draw

import (
	"fmt"
	"math"
	"math/rand/v2"
	"sort"
)

// Kinds of drawn unit.
const (
	KindCandidate = "candidate"
	KindControl   = "control"
)

// Stream identifiers: the second PCG word, so that thinning, each phase's
// draw and the control draw use independent streams of one seed.
const (
	streamThin    = 0x7468696e // "thin"
	streamPhase   = 0x70680000 // "ph" + phase number
	streamControl = 0x63746c00 // "ctl"
)

// Design is a complete description of a stratified draw.
type Design struct {
	Strata []StratumSpec
	Alloc  Allocation
	Cap    int    // per-subject cap within a stratum; 0 = none
	Seed   uint64 // seeds thinning and the phase-1 draw
}

// Drawn is one selected unit.
type Drawn struct {
	EventID   string
	Stratum   string
	Subject   string
	Recording string
	Pi        float64 // first-order inclusion probability for the union of phases so far; after an adaptive top-up, 1/Weight (see TopUpAdaptive)
	Weight    float64 // 1/Pi
	Phase     int     // 1 for the first draw, 2, … for top-ups
	Order     int     // 1-based rating order: a random permutation of the sample
	Kind      string  // KindCandidate or KindControl
}

// StratumSummary describes one stratum of a draw.
type StratumSummary struct {
	Label  string
	N      int // N_h, units in the stratum
	Capped int // N'_h = Σ_s min(N_sh, cap), units left after the cap (= N_h without one)
	Sample int // n_h, units drawn so far (all phases)
}

// Result is the outcome of Draw or TopUp.
type Result struct {
	Drawn    []Drawn // sorted by Order
	Strata   []StratumSummary
	Warnings []Warning
	Phase    PhaseRecord // the phase this call drew
}

// frameDesign is the deterministic part of a design applied to a frame:
// strata, thinned pools and thinning probabilities.
type frameDesign struct {
	f      *Frame
	st     *Strata
	pool   [][]int   // pool[h]: rows of the thinned stratum, in a seed-determined order
	thin   []float64 // thin[row]: probability the row survives the cap (0 if thinned out)
	labels []string
}

func prepare(f *Frame, d Design) (*frameDesign, error) {
	rows, err := f.sortedRows()
	if err != nil {
		return nil, err
	}
	if d.Cap < 0 {
		return nil, &allocationError{Msg: fmt.Sprintf("negative per-subject cap %d", d.Cap)}
	}
	st, err := Stratify(f, d.Strata)
	if err != nil {
		return nil, err
	}
	H := len(st.Labels)
	members := make([][]int, H)
	for h := range members {
		members[h] = make([]int, 0, st.Size[h])
	}
	for _, r := range rows {
		members[st.Row[r]] = append(members[st.Row[r]], r)
	}
	fd := &frameDesign{f: f, st: st, pool: members, thin: make([]float64, f.Len()), labels: st.Labels}
	for i := range fd.thin {
		fd.thin[i] = 1
	}
	if d.Cap == 0 {
		return fd, nil
	}
	rng := rand.New(rand.NewPCG(d.Seed, streamThin))
	for h, m := range members {
		bySubject := make(map[string][]int)
		for _, r := range m {
			s := f.Subject[r]
			bySubject[s] = append(bySubject[s], r)
		}
		// Subjects are taken in the order of their first event ID, not of their
		// keys: subject keys are keyed with the study secret, and the draw must
		// depend only on the candidates and the seed.
		subjects := make([]string, 0, len(bySubject))
		seen := make(map[string]bool, len(bySubject))
		for _, r := range m { // m is in event-ID order
			if s := f.Subject[r]; !seen[s] {
				seen[s] = true
				subjects = append(subjects, s)
			}
		}
		pool := make([]int, 0, len(m))
		for _, s := range subjects {
			g := bySubject[s]
			if len(g) <= d.Cap {
				pool = append(pool, g...)
				continue
			}
			p := float64(d.Cap) / float64(len(g))
			for _, r := range g {
				fd.thin[r] = 0
			}
			partialShuffle(rng, g, d.Cap)
			for _, r := range g[:d.Cap] {
				fd.thin[r] = p
			}
			pool = append(pool, g[:d.Cap]...)
		}
		fd.pool[h] = pool
	}
	return fd, nil
}

// partialShuffle moves a simple random sample without replacement of k
// elements of a into a[:k] (the first k steps of a Fisher–Yates shuffle;
// Knuth 1997, TAOCP vol. 2, §3.4.2, Algorithm P).
func partialShuffle(rng *rand.Rand, a []int, k int) {
	for i := 0; i < k; i++ {
		j := i + rng.IntN(len(a)-i)
		a[i], a[j] = a[j], a[i]
	}
}

// sd returns S_h for Neyman allocation: the stated guess, else the pilot
// column's within-stratum standard deviation (computed once for all strata).
func (fd *frameDesign) sd(a Allocation) func(h int) (float64, error) {
	var pilot []float64
	return func(h int) (float64, error) {
		l := fd.labels[h]
		if s, ok := a.SD[l]; ok {
			if s < 0 || math.IsNaN(s) || math.IsInf(s, 0) {
				return 0, &allocationError{Stratum: l, Msg: fmt.Sprintf("invalid standard deviation %v", s)}
			}
			return s, nil
		}
		if a.SDColumn == "" {
			return 0, &allocationError{Stratum: l, Msg: "Neyman allocation needs SD for every stratum or an SDColumn"}
		}
		if pilot == nil {
			col, ok := fd.f.Num[a.SDColumn]
			if !ok {
				return 0, &columnError{Column: a.SDColumn, Available: fd.f.Columns()}
			}
			pilot = stratumSD(col, fd.st.Row, len(fd.labels))
		}
		return pilot[h], nil
	}
}

// stratumSD returns the sample standard deviation (divisor N_h−1, NaN
// values skipped, 0 for fewer than two values) of col within each stratum,
// by Welford's update (Welford 1962, Technometrics 4:419–420).
func stratumSD(col []float64, row []int, H int) []float64 {
	n, mean, m2 := make([]float64, H), make([]float64, H), make([]float64, H)
	for r, h := range row {
		x := col[r]
		if math.IsNaN(x) {
			continue
		}
		n[h]++
		d := x - mean[h]
		mean[h] += d / n[h]
		m2[h] += d * (x - mean[h])
	}
	sd := make([]float64, H)
	for h := range sd {
		if n[h] >= 2 {
			sd[h] = math.Sqrt(m2[h] / (n[h] - 1))
		}
	}
	return sd
}

func (fd *frameDesign) cappedSizes() []int {
	s := make([]int, len(fd.pool))
	for h, p := range fd.pool {
		s[h] = len(p)
	}
	return s
}

func (fd *frameDesign) sizeError(n, cap int) error {
	avail := 0
	for _, p := range fd.pool {
		avail += len(p)
	}
	return &sizeError{N: n, Available: avail, Population: fd.f.Len(), Cap: cap}
}

// Draw takes a stratified sample from f according to d and returns every
// selected unit with its exact inclusion probability (see the package
// documentation for the design).
func Draw(f *Frame, d Design) (*Result, error) {
	fd, err := prepare(f, d)
	if err != nil {
		return nil, err
	}
	capped := fd.cappedSizes()
	w, n, err := d.Alloc.weights(fd.labels, capped, fd.sd(d.Alloc), func() ([]float64, error) { return fd.priorOf(d.Alloc) })
	if err != nil {
		return nil, err
	}
	if n < 1 {
		return nil, &allocationError{Msg: fmt.Sprintf("total sample size %d, want ≥ 1", n)}
	}
	avail := 0
	for _, c := range capped {
		avail += c
	}
	if n > avail {
		return nil, fd.sizeError(n, d.Cap)
	}
	alloc, warns, err := Allocate(fd.labels, capped, w, n, d.Alloc.floor())
	if err != nil {
		return nil, err
	}
	res := &Result{Warnings: append(append([]Warning(nil), fd.st.Warnings...), warns...)}
	res.Phase = PhaseRecord{Phase: 1, N: n, Method: d.Alloc.Method.String(), Why: "first phase: the design's allocation",
		Allocation: byLabel(fd.labels, alloc)}
	if d.Alloc.Method == Accuracy {
		p, _ := fd.priorOf(d.Alloc) // computed without error by weights above
		res.Phase.Prior = byLabel(fd.labels, p)
	}
	rng := rand.New(rand.NewPCG(d.Seed, streamPhase+1))
	for h, pool := range fd.pool {
		k := alloc[h]
		p := append([]int(nil), pool...)
		partialShuffle(rng, p, k)
		for _, r := range p[:k] {
			res.Drawn = append(res.Drawn, fd.unit(r, h, k, 1))
		}
		res.Strata = append(res.Strata, StratumSummary{Label: fd.labels[h], N: fd.st.Size[h], Capped: capped[h], Sample: k})
	}
	for i, j := range rng.Perm(len(res.Drawn)) {
		res.Drawn[i].Order = j + 1
	}
	sort.SliceStable(res.Drawn, func(i, j int) bool { return res.Drawn[i].Order < res.Drawn[j].Order })
	return res, nil
}

// unit builds the Drawn row for row r of stratum h when n units of the
// thinned stratum are in the sample.
func (fd *frameDesign) unit(r, h, n, phase int) Drawn {
	pi := fd.thin[r] * float64(n) / float64(len(fd.pool[h]))
	return Drawn{
		EventID:   fd.f.ID[r],
		Stratum:   fd.labels[h],
		Subject:   fd.f.Subject[r],
		Recording: fd.f.recording(r),
		Pi:        pi,
		Weight:    1 / pi,
		Phase:     phase,
		Kind:      KindCandidate,
	}
}
