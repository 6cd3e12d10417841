package signal

import "fmt"

// Kind is the pass-band shape of a filter design.
type Kind int

const (
	LowPass  Kind = iota // passes 0 … edge
	HighPass             // passes edge … Nyquist
	BandPass             // passes edges[0] … edges[1]
	BandStop             // rejects edges[0] … edges[1]
)

// String returns the lower-case hyphenated name of k.
func (k Kind) String() string {
	switch k {
	case LowPass:
		return "low-pass"
	case HighPass:
		return "high-pass"
	case BandPass:
		return "band-pass"
	case BandStop:
		return "band-stop"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// edges is the number of edge frequencies k needs.
func (k Kind) edges() int {
	if k == BandPass || k == BandStop {
		return 2
	}
	return 1
}
