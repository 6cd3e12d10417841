package accuracy

import (
	"cmp"
	"math/rand/v2"
	"slices"
)

// groupIndex lists the distinct groups in order of first appearance and the
// event indices of each, ascending.
func groupIndex(groups []string) (names []string, members [][]int) {
	pos := make(map[string]int)
	for i, g := range groups {
		j, ok := pos[g]
		if !ok {
			j = len(names)
			pos[g] = j
			names = append(names, g)
			members = append(members, nil)
		}
		members[j] = append(members[j], i)
	}
	return names, members
}

// GroupKFold splits events into k test folds such that all events of a
// group (a subject) fall in the same fold, so that no subject is both
// tuned on and tested on. It returns, for each fold, the ascending indices
// of its test events.
//
// Groups are placed largest first, each into the fold with the fewest
// events so far (lowest fold number on ties): the longest-processing-time
// rule, whose largest fold is at most (4/3 − 1/(3k)) times the best
// possible (Graham 1969, SIAM Journal on Applied Mathematics
// 17:416–429). Groups of equal size are ordered by a shuffle seeded with
// seed, so the split is deterministic given groups, k and seed.
//
// GroupKFold panics if k < 2 or k exceeds the number of distinct groups.
func GroupKFold(groups []string, k int, seed uint64) [][]int {
	_, members := groupIndex(groups)
	if k < 2 || k > len(members) {
		panic("accuracy: GroupKFold needs 2 ≤ k ≤ number of groups")
	}
	rng := rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15))
	rng.Shuffle(len(members), func(i, j int) { members[i], members[j] = members[j], members[i] })
	slices.SortStableFunc(members, func(a, b []int) int { return cmp.Compare(len(b), len(a)) })
	folds := make([][]int, k)
	for _, m := range members {
		f := 0
		for i := range folds {
			if len(folds[i]) < len(folds[f]) {
				f = i
			}
		}
		folds[f] = append(folds[f], m...)
	}
	for _, f := range folds {
		slices.Sort(f)
	}
	return folds
}

// ClusterResample draws one cluster bootstrap resample: as many groups as
// there are distinct groups, uniformly with replacement, each contributing
// all its events (Davison & Hinkley 1997, Bootstrap Methods and their
// Application, Cambridge University Press). Resampling subjects
// rather than events keeps the dependence between events of one subject,
// which an event-level bootstrap would ignore. The result lists event
// indices, group by group in draw order; a group drawn twice appears
// twice. It returns nil for no events.
func ClusterResample(groups []string, rng *rand.Rand) []int {
	_, members := groupIndex(groups)
	if len(members) == 0 {
		return nil
	}
	out := make([]int, 0, len(groups))
	for range members {
		out = append(out, members[rng.IntN(len(members))]...)
	}
	return out
}
