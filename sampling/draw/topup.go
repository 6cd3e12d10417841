package draw

import (
	"fmt"
	"math/rand/v2"
	"sort"
)

// TopUp draws n more candidate units with the design d that produced prev
// (same frame, strata, cap and d.Seed, which fixes the thinned strata) and
// returns the union with inclusion probabilities recomputed for it.
//
// Within each stratum the new units are a simple random sample without
// replacement of n2_h from the N'_h − n1_h thinned units not yet drawn; n1_h
// and n2_h are fixed before the draw, so the union is a simple random sample
// of n1_h + n2_h from N'_h and π = min(1, c/N_sh)·(n1_h+n2_h)/N'_h for every
// unit in it. The n extra units are shared by Allocate with the weights of
// d.Alloc computed on N'_h, capacity N'_h − n1_h and no minimum.
//
// Strata must be the same between phases: every candidate in prev must be
// in the frame, in the stratum its label names and in the thinned stratum;
// otherwise TopUp returns a *phaseError. (Quantile edges are recomputed from
// the frame, so adding candidates to the frame changes the strata.) Units
// of kind control in prev are returned unchanged. New units get Phase one
// more than the largest in prev, and Order values after the largest in prev,
// in a random permutation; seed drives this phase's draw.
func TopUp(f *Frame, d Design, prev []Drawn, n int, seed uint64) (*Result, error) {
	return topUp(f, d, prev, n, seed, nil)
}

func topUp(f *Frame, d Design, prev []Drawn, n int, seed uint64, est map[string]PhaseEstimate) (*Result, error) {
	if n < 1 {
		return nil, &allocationError{Msg: fmt.Sprintf("top-up of %d events, want ≥ 1", n)}
	}
	fd, err := prepare(f, d)
	if err != nil {
		return nil, err
	}
	rowOf := make(map[string]int, f.Len())
	for i, id := range f.ID {
		rowOf[id] = i
	}
	H := len(fd.labels)
	taken := make(map[int]bool, len(prev))
	n1 := make([]int, H)
	maxPhase, maxOrder := 0, 0
	var controls []Drawn
	for _, u := range prev {
		maxPhase = max(maxPhase, u.Phase)
		maxOrder = max(maxOrder, u.Order)
		if u.Kind == KindControl {
			controls = append(controls, u)
			continue
		}
		r, ok := rowOf[u.EventID]
		if !ok {
			return nil, &phaseError{EventID: u.EventID, Msg: "not in the frame"}
		}
		h := fd.st.Row[r]
		if fd.labels[h] != u.Stratum {
			return nil, &phaseError{EventID: u.EventID, Msg: "stratum was " + u.Stratum + ", is now " + fd.labels[h] + ": strata must be the same between phases"}
		}
		if fd.thin[r] == 0 {
			return nil, &phaseError{EventID: u.EventID, Msg: "not in the thinned stratum: cap or seed differ from the earlier phase"}
		}
		if taken[r] {
			return nil, &phaseError{EventID: u.EventID, Msg: "drawn twice"}
		}
		taken[r] = true
		n1[h]++
	}
	capped := fd.cappedSizes()
	w, _, err := d.Alloc.weights(fd.labels, capped, fd.sd(d.Alloc), func() ([]float64, error) { return fd.priorOf(d.Alloc) })
	if err != nil {
		return nil, err
	}
	room := make([]int, H)
	avail := 0
	for h := range room {
		room[h] = capped[h] - n1[h]
		avail += room[h]
	}
	if n > avail {
		return nil, &allocationError{Msg: fmt.Sprintf("top-up of %d exceeds the %d undrawn units of the thinned strata", n, avail)}
	}
	var ad *adaptive
	var alloc []int
	var warns []Warning
	if est != nil {
		ad, warns, err = planAdaptive(fd, d.Alloc, n1, room, w, n, est)
		alloc = ad.alloc
	} else {
		alloc, warns, err = Allocate(fd.labels, room, w, n, 0)
	}
	if err != nil {
		return nil, err
	}
	res := &Result{Warnings: append(append([]Warning(nil), fd.st.Warnings...), warns...)}
	res.Phase = PhaseRecord{Phase: maxPhase + 1, N: n, Method: d.Alloc.Method.String(),
		Why: "the design's allocation on the undrawn units; union of phases is one simple random sample per stratum", Allocation: byLabel(fd.labels, alloc)}
	if ad != nil {
		res.Phase = ad.record(maxPhase+1, n, fd.labels)
	}
	rng := rand.New(rand.NewPCG(seed, streamPhase+uint64(maxPhase+1)))
	var fresh []Drawn
	for h, pool := range fd.pool {
		total := n1[h] + alloc[h]
		rest := make([]int, 0, room[h])
		for _, r := range pool {
			if taken[r] {
				res.Drawn = append(res.Drawn, fd.unit(r, h, total, 0))
			} else {
				rest = append(rest, r)
			}
		}
		partialShuffle(rng, rest, alloc[h])
		for _, r := range rest[:alloc[h]] {
			fresh = append(fresh, fd.unit(r, h, total, maxPhase+1))
		}
		res.Strata = append(res.Strata, StratumSummary{Label: fd.labels[h], N: fd.st.Size[h], Capped: capped[h], Sample: total})
	}
	// Keep the history: earlier units keep their phase and order.
	old := make(map[string]Drawn, len(prev))
	for _, u := range prev {
		old[u.EventID] = u
	}
	for i := range res.Drawn {
		u := old[res.Drawn[i].EventID]
		res.Drawn[i].Phase, res.Drawn[i].Order = u.Phase, u.Order
	}
	for i, j := range rng.Perm(len(fresh)) {
		fresh[i].Order = maxOrder + j + 1
	}
	if ad != nil {
		ad.reweight(fd, res.Drawn, old, maxPhase+1)
		ad.reweight(fd, fresh, old, maxPhase+1)
	}
	res.Drawn = append(append(res.Drawn, fresh...), controls...)
	sort.SliceStable(res.Drawn, func(i, j int) bool { return res.Drawn[i].Order < res.Drawn[j].Order })
	return res, nil
}
