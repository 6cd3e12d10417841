package edf

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// Recovered is a scalp electrode the file does not record as a signal of
// its own but whose potential its bipolar derivations determine (see
// recoverElectrodes): Σ Weight·x_Signal over the Terms, x in µV (each
// term's weight includes its signal's Signal.Microvolts factor). Every
// term's signal has the same SamplesPerRecord.
type Recovered struct {
	Name  string
	Group int // linked group, from 0: potentials are relative to their group's mean
	Terms []Term
}

// Term is one signal's share in a Recovered electrode.
type Term struct {
	Signal int
	Weight float64
}

// minGroup is the fewest electrodes a linked group of bipolar derivations
// needs before its potentials are recovered: with two or three, the
// potentials less their mean say little more than the derivations do.
const minGroup = 4

// recoverElectrodes recovers the scalp potentials of a recording stored
// only as bipolar derivations ("Fp1-F7", "F7-T7", …, a longitudinal
// bipolar chain; no signal is an EEG electrode of its own). A derivation
// holds d = V_a − V_b; a set of them is d = B·V with B the incidence
// matrix of the graph whose nodes are electrodes and whose edges are
// derivations. Over a connected group of c electrodes the least-squares
// solution of least norm,
//
//	V̂ = L⁺ Bᵀ d,  L = BᵀB (the graph Laplacian),  L⁺ = (L + J/c)⁻¹ − J/c
//
// (J the all-ones matrix), is the group's potentials less their mean: the
// common average over the group, which is the reference the finder's
// default montage uses anyway, since the unknown reference of the
// potentials cancels in any difference. A chain whose electrodes are
// linked twice (the parasagittal and temporal chains meeting at Fp1 and
// O1) is solved in the least-squares sense, which averages the two paths.
// Groups that no derivation links (the left and right chains of a double
// banana without a transverse derivation, or a midline chain) are each
// relative to their own mean, which a warning says: their maps cannot be
// compared across groups. Groups of fewer than minGroup electrodes are
// left out. Only derivations at the most common sampling rate among them,
// and with usable scaling (finite, non-zero gain), take part; the others
// stay unknown signals.
func recoverElectrodes(h *Header) {
	for _, s := range h.Signals {
		if s.Kind == EEG {
			return
		}
	}
	var edges []derivation
	spr := map[int]int{}
	for i, s := range h.Signals {
		if s.Kind != Other {
			continue
		}
		a, b, ok := electrodePair(s.Label)
		if !ok || a == b {
			continue
		}
		if _, k := NormalizeLabel(b); k != EEG {
			continue
		}
		if g := s.Gain(); math.IsNaN(g) || math.IsInf(g, 0) || g == 0 {
			continue // unusable scaling would spread to every electrode of its group
		}
		edges = append(edges, derivation{i, a, b})
		spr[s.SamplesPerRecord]++
	}
	best := 0
	for n, c := range spr {
		if c > spr[best] || (c == spr[best] && n > best) {
			best = n
		}
	}
	edges = slices.DeleteFunc(edges, func(e derivation) bool { return h.Signals[e.sig].SamplesPerRecord != best })
	if len(edges) < minGroup-1 {
		return
	}
	// groups of linked electrodes (union–find)
	parent := map[string]string{}
	var find func(string) string
	find = func(x string) string {
		if parent[x] == x {
			return x
		}
		parent[x] = find(parent[x])
		return parent[x]
	}
	for _, e := range edges {
		for _, x := range []string{e.a, e.b} {
			if _, ok := parent[x]; !ok {
				parent[x] = x
			}
		}
		parent[find(e.a)] = find(e.b)
	}
	groups := map[string][]string{}
	for x := range parent {
		groups[find(x)] = append(groups[find(x)], x)
	}
	var kept [][]string
	var dropped []string
	for _, g := range groups {
		sort.Strings(g)
		if len(g) >= minGroup {
			kept = append(kept, g)
		} else {
			dropped = append(dropped, strings.Join(g, ", "))
		}
	}
	if len(kept) == 0 {
		return
	}
	sort.Slice(kept, func(i, j int) bool { return kept[i][0] < kept[j][0] })
	sort.Strings(dropped)
	used := 0
	for gi, g := range kept {
		var ge []derivation
		for _, e := range edges {
			if slices.Contains(g, e.a) {
				ge = append(ge, e)
			}
		}
		used += len(ge)
		rs := solveGroup(h, g, ge)
		for i := range rs {
			rs[i].Group = gi
		}
		h.Recovered = append(h.Recovered, rs...)
	}
	w := fmt.Sprintf("%d signals are bipolar derivations and no signal is an electrode of its own: %d electrodes recovered from them as potentials less their mean", used, countRecovered(kept))
	if len(kept) > 1 {
		w += fmt.Sprintf("; %d groups are not linked by any derivation (%s), and each group's potentials are relative to its own mean, so a voltage map across groups is not comparable", len(kept), groupNames(kept))
	}
	if len(dropped) > 0 {
		w += "; too few electrodes linked to recover: " + strings.Join(dropped, "; ")
	}
	h.Warnings = append(h.Warnings, w)
}

// derivation is one bipolar signal: V_a − V_b.
type derivation struct {
	sig  int
	a, b string
}

// solveGroup returns the recovered electrodes of one linked group g (sorted
// names) from its derivations: row i of W = L⁺Bᵀ gives electrode i as a
// weighted sum of the derivations.
func solveGroup(h *Header, g []string, edges []derivation) []Recovered {
	c, m := len(g), len(edges)
	idx := map[string]int{}
	for i, x := range g {
		idx[x] = i
	}
	B := mat.NewDense(m, c, nil)
	for r, e := range edges {
		B.Set(r, idx[e.a], 1)
		B.Set(r, idx[e.b], -1)
	}
	var L mat.Dense
	L.Mul(B.T(), B)
	for i := range c {
		for j := range c {
			L.Set(i, j, L.At(i, j)+1/float64(c))
		}
	}
	var inv mat.Dense
	if err := inv.Inverse(&L); err != nil {
		return nil // a connected group's L + J/c is positive definite
	}
	// L⁺Bᵀ = ((L+J/c)⁻¹ − J/c)Bᵀ = (L+J/c)⁻¹Bᵀ, since each row of B sums to zero
	var W mat.Dense
	W.Mul(&inv, B.T())
	out := make([]Recovered, c)
	for i, x := range g {
		out[i].Name = x
		for r, e := range edges {
			if w := W.At(i, r); math.Abs(w) > 1e-12 {
				k, _ := h.Signals[e.sig].Microvolts()
				out[i].Terms = append(out[i].Terms, Term{Signal: e.sig, Weight: w * k})
			}
		}
	}
	return out
}

func countRecovered(groups [][]string) int {
	n := 0
	for _, g := range groups {
		n += len(g)
	}
	return n
}

// groupNames lists each group by its first electrodes.
func groupNames(groups [][]string) string {
	var parts []string
	for _, g := range groups {
		s := strings.Join(g[:min(3, len(g))], ", ")
		if len(g) > 3 {
			s += ", …"
		}
		parts = append(parts, s)
	}
	return strings.Join(parts, "; ")
}
