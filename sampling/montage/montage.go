package montage

import "fmt"

// minAverage is the fewest good electrodes for which a common average is
// built without a warning (common practice: the average approximates a
// neutral reference only with wide, dense coverage).
const minAverage = 16

// Derivation is one displayed trace: input channel Plus minus
// MinusWeight × the sum of channels Minus. A referential derivation has
// no Minus; a bipolar one has one Minus with weight 1; a common-average
// one has all good scalp electrodes in Minus with weight 1/len(Minus).
type Derivation struct {
	Name        string // e.g. "Fp1-F7", "Fp1-Avg", "Fp1-Ref"
	Plus        int    // index into the recording's channels
	Minus       []int
	MinusWeight float64
}

// Montage is a list of derivations over a recording's channels.
type Montage struct {
	Kind  Kind
	deriv []Derivation
	nIn   int
	group []int   // per derivation: index into groups, or −1 (no Minus)
	sets  [][]int // distinct Minus sets, shared by slice identity
}

// buildError reports a montage that cannot be built.
type buildError struct {
	Kind  Kind
	Field string // "bad", "kind" or "electrodes"
	Msg   string
}

func (e *buildError) Error() string {
	return fmt.Sprintf("montage: %s: %s: %s", e.Kind, e.Field, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *buildError) Unwrap() error { return ErrInput }

// Build makes a montage of kind from a recording's channel labels
// (normalised 10-10 names; other labels such as ECG are ignored) and
// per-channel bad flags (nil for none; see ChannelQuality). A derivation
// that needs a missing or bad electrode is dropped and a warning says
// which, so the montage degrades visibly; Build fails only when no
// derivation remains. A label that occurs twice is used at its first
// occurrence, with a warning. Common average uses every good scalp
// electrode in the recording, not only the 10-20 subset.
func Build(kind Kind, labels []string, bad []bool) (*Montage, []string, error) {
	if bad != nil && len(bad) != len(labels) {
		return nil, nil, &buildError{Kind: kind, Field: "bad", Msg: fmt.Sprintf("%d flags for %d labels", len(bad), len(labels))}
	}
	isBad := func(i int) bool { return bad != nil && bad[i] }
	var warn []string
	index := map[string]int{}
	for i, l := range labels {
		if !IsElectrode(l) {
			continue
		}
		if _, dup := index[l]; dup {
			warn = append(warn, fmt.Sprintf("%s: duplicate label at channel %d ignored", l, i))
			continue
		}
		index[l] = i
	}
	m := &Montage{Kind: kind, nIn: len(labels)}
	switch kind {
	case Referential, CommonAverage:
		var good []int
		for i, l := range labels {
			if j, ok := index[l]; !ok || j != i {
				continue
			}
			if isBad(i) {
				warn = append(warn, fmt.Sprintf("%s: marked bad, left out", l))
				continue
			}
			good = append(good, i)
		}
		if kind == CommonAverage && len(good) > 0 && len(good) < minAverage {
			warn = append(warn, fmt.Sprintf("average of only %d electrodes: each one weighs heavily in the reference", len(good)))
		}
		for _, i := range good {
			d := Derivation{Name: labels[i] + "-Ref", Plus: i}
			if kind == CommonAverage {
				d = Derivation{Name: labels[i] + "-Avg", Plus: i, Minus: good, MinusWeight: 1 / float64(len(good))}
			}
			m.deriv = append(m.deriv, d)
		}
	case LongitudinalBipolar, TransverseBipolar:
		chains := longitudinal
		if kind == TransverseBipolar {
			chains = transverse
		}
		for _, c := range chains {
			for k := 0; k+1 < len(c); k++ {
				a, b := c[k], c[k+1]
				name := a + "-" + b
				if why := unusable(a, index, isBad) + unusable(b, index, isBad); why != "" {
					warn = append(warn, fmt.Sprintf("%s: dropped (%s)", name, why[:len(why)-2]))
					continue
				}
				m.deriv = append(m.deriv, Derivation{Name: name, Plus: index[a], Minus: []int{index[b]}, MinusWeight: 1})
			}
		}
	default:
		return nil, warn, &buildError{Kind: kind, Field: "kind", Msg: "unknown montage kind"}
	}
	if len(m.deriv) == 0 {
		return nil, warn, &buildError{Kind: kind, Field: "electrodes", Msg: "no derivation has all its electrodes present and good"}
	}
	m.groupMinus()
	return m, warn, nil
}

// unusable says why electrode e cannot be used, "" if it can; non-empty
// answers end in "; " so two can be joined.
func unusable(e string, index map[string]int, isBad func(int) bool) string {
	i, ok := index[e]
	switch {
	case !ok:
		return e + " missing; "
	case isBad(i):
		return e + " bad; "
	}
	return ""
}

// groupMinus finds derivations sharing one multi-channel Minus set (the
// common average) so Apply forms that average once per sample.
func (m *Montage) groupMinus() {
	m.group = make([]int, len(m.deriv))
	for i, d := range m.deriv {
		m.group[i] = -1
		if len(d.Minus) < 2 {
			continue
		}
		for g, s := range m.sets {
			if &s[0] == &d.Minus[0] && len(s) == len(d.Minus) {
				m.group[i] = g
			}
		}
		if m.group[i] < 0 {
			m.sets = append(m.sets, d.Minus)
			m.group[i] = len(m.sets) - 1
		}
	}
}

// Names returns the derivation names in display order.
func (m *Montage) Names() []string {
	out := make([]string, len(m.deriv))
	for i, d := range m.deriv {
		out[i] = d.Name
	}
	return out
}

// Derivations returns a copy of the derivations.
func (m *Montage) Derivations() []Derivation {
	out := make([]Derivation, len(m.deriv))
	for i, d := range m.deriv {
		d.Minus = append([]int(nil), d.Minus...)
		out[i] = d
	}
	return out
}

// Len returns the number of derivations.
func (m *Montage) Len() int { return len(m.deriv) }

// Apply computes a block of derivations: in holds one slice per recording
// channel (all the same length n), out one slice per derivation (each at
// least n long). Averages are accumulated in float64. Apply panics if the
// shapes do not match, as slicing would.
func (m *Montage) Apply(in [][]float32, out [][]float32) {
	if len(in) != m.nIn || len(out) < len(m.deriv) {
		panic(fmt.Sprintf("montage: Apply with %d inputs and %d outputs, want %d and %d", len(in), len(out), m.nIn, len(m.deriv)))
	}
	n := 0
	if len(in) > 0 {
		n = len(in[0])
	}
	means := make([][]float64, len(m.sets))
	for g, s := range m.sets {
		acc := make([]float64, n)
		for _, c := range s {
			for t, v := range in[c][:n] {
				acc[t] += float64(v)
			}
		}
		means[g] = acc
	}
	for i, d := range m.deriv {
		plus, o := in[d.Plus][:n], out[i][:n]
		switch {
		case m.group[i] >= 0:
			acc, w := means[m.group[i]], d.MinusWeight
			for t, v := range plus {
				o[t] = float32(float64(v) - w*acc[t])
			}
		case len(d.Minus) == 1 && d.MinusWeight == 1:
			minus := in[d.Minus[0]][:n]
			for t, v := range plus {
				o[t] = v - minus[t]
			}
		default:
			for t, v := range plus {
				s := 0.0
				for _, c := range d.Minus {
					s += float64(in[c][t])
				}
				o[t] = float32(float64(v) - d.MinusWeight*s)
			}
		}
	}
}
