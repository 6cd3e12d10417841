package draw

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sort"
	"strconv"
)

// Interval is a time span [Start, End) in seconds from the recording start.
type Interval struct{ Start, End float64 }

// RecordingSpan describes one recording for background controls. Gaps are
// spans without usable signal (discontinuities of EDF+D, artefact).
type RecordingSpan struct {
	ID       string
	Subject  string
	Duration float64 // seconds
	Gaps     []Interval
}

// Control is one background epoch drawn away from all candidates.
type Control struct {
	ID        string // "ctl-<recording>-<epoch index>"
	Recording string
	Subject   string
	Epoch     int     // index k of the epoch [k·L, (k+1)·L)
	Onset     float64 // seconds, k·L
	Pi        float64 // m / M_eligible
	Weight    float64
	Order     int // 1-based, a random permutation of the controls
}

// Drawn returns c as a Drawn row of kind control in stratum "control".
func (c Control) Drawn() Drawn {
	return Drawn{EventID: c.ID, Stratum: "control", Subject: c.Subject, Recording: c.Recording,
		Pi: c.Pi, Weight: c.Weight, Phase: 1, Order: c.Order, Kind: KindControl}
}

// controlError reports an impossible control draw; Recording is empty when
// the problem is not tied to one recording.
type controlError struct {
	Recording string
	Msg       string
}

func (e *controlError) Error() string {
	if e.Recording == "" {
		return "draw: controls: " + e.Msg
	}
	return fmt.Sprintf("draw: controls, recording %q: %s", e.Recording, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *controlError) Unwrap() error { return ErrInput }

// DrawControls lays a grid of non-overlapping epochs [k·L, (k+1)·L),
// k = 0 … ⌊D/L⌋−1, over each recording; an epoch is eligible when it
// overlaps no gap and every candidate onset of its recording lies at least
// minDist seconds from it (distance from a point to an interval, 0 inside).
// A simple random sample without replacement of m of the M eligible epochs
// of all recordings is drawn, so π = m/M for each. It returns the controls
// sorted by Order and M.
func DrawControls(recs []RecordingSpan, onsets map[string][]float64, epochLen, minDist float64, m int, seed uint64) ([]Control, int, error) {
	if !(epochLen > 0) || minDist < 0 || math.IsNaN(minDist) {
		return nil, 0, &controlError{Msg: fmt.Sprintf("need epochLen > 0 and minDist ≥ 0, got %v, %v", epochLen, minDist)}
	}
	rs := slices.Clone(recs)
	sort.Slice(rs, func(i, j int) bool { return rs[i].ID < rs[j].ID })
	var eligible []Control
	for i, r := range rs {
		if i > 0 && rs[i-1].ID == r.ID {
			return nil, 0, &controlError{Recording: r.ID, Msg: "recording listed twice"}
		}
		on := slices.Clone(onsets[r.ID])
		slices.Sort(on)
		K := int(math.Floor(r.Duration / epochLen))
		for k := 0; k < K; k++ {
			a, b := float64(k)*epochLen, float64(k+1)*epochLen
			if overlapsGap(a, b, r.Gaps) || nearOnset(a, b, minDist, on) {
				continue
			}
			eligible = append(eligible, Control{
				ID: "ctl-" + r.ID + "-" + strconv.Itoa(k), Recording: r.ID, Subject: r.Subject, Epoch: k, Onset: a,
			})
		}
	}
	M := len(eligible)
	if m < 0 || m > M {
		return nil, M, &controlError{Msg: fmt.Sprintf("m=%d controls requested, %d eligible epochs", m, M)}
	}
	rng := rand.New(rand.NewPCG(seed, streamControl))
	for i := 0; i < m; i++ {
		j := i + rng.IntN(M-i)
		eligible[i], eligible[j] = eligible[j], eligible[i]
	}
	out := eligible[:m:m]
	pi := float64(m) / float64(M)
	for i, j := range rng.Perm(m) {
		out[i].Pi, out[i].Weight, out[i].Order = pi, 1/pi, j+1
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Order < out[j].Order })
	return out, M, nil
}

func overlapsGap(a, b float64, gaps []Interval) bool {
	for _, g := range gaps {
		if g.Start < b && a < g.End {
			return true
		}
	}
	return false
}

// nearOnset reports whether a sorted onset lies closer than d to [a, b].
func nearOnset(a, b, d float64, on []float64) bool {
	i := sort.Search(len(on), func(j int) bool { return on[j] > a-d })
	return i < len(on) && on[i] < b+d
}
