package signal

import (
	"math"
	"math/cmplx"
)

// Source supplies samples of a multichannel recording: ReadAt fills dst
// with channel ch from sample start onward. An EDF reader satisfies it by
// converting digital values to physical units.
type Source interface {
	ReadAt(ch int, start int64, dst []float32) error
}

// Conditioner filters arbitrary windows of a long recording forward and
// backward without holding the recording in memory. A request for samples
// [start, end) reads [start−M, end+M) clipped to the recording, filters
// that with ZeroPhase and keeps the centre. The margin M is chosen (see
// Margin) so the start-up transients of both passes, which are free
// responses of the filter and decay like its impulse response, have died
// away before they reach the kept samples. Where the margin is clipped by
// the recording's first or last sample both computations see the same edge
// padding, so the windowed result matches whole-signal forward–backward
// filtering there too.
//
// Memory is O(window + 2M) per call. A Conditioner is not safe for
// concurrent use.
type Conditioner struct {
	src    Source
	n      int64
	margin int
	zp     *ZeroPhase
	buf    []float32
}

// NewConditioner returns a Conditioner over n samples per channel of src,
// filtering through sos with margin samples on each side of every window.
// Use Margin to choose margin.
func NewConditioner(sos SOS, src Source, n int64, margin int) (*Conditioner, error) {
	zp := NewZeroPhase(sos)
	if n <= int64(zp.Pad()) {
		return nil, &shortSignalError{N: int(n), Pad: zp.Pad()}
	}
	if margin < 0 {
		return nil, &designError{Field: "margin", Value: float64(margin), Msg: "must not be negative"}
	}
	return &Conditioner{src: src, n: n, margin: margin, zp: zp}, nil
}

// Margin returns the margin in samples.
func (c *Conditioner) Margin() int { return c.margin }

// Read fills dst with filtered samples [start, start+len(dst)) of channel
// ch. Errors from the source, and ranges outside the recording, are
// returned as *windowError.
func (c *Conditioner) Read(ch int, start int64, dst []float32) error {
	end := start + int64(len(dst))
	if start < 0 || end > c.n {
		return &windowError{Channel: ch, Start: start, End: end, Err: errOutside}
	}
	lo := max(start-int64(c.margin), 0)
	hi := min(end+int64(c.margin), c.n)
	// Too short to pad: widen the read, which changes nothing far from
	// the recording's ends and only happens for short requests.
	for hi-lo <= int64(c.zp.Pad()) {
		lo = max(lo-1, 0)
		hi = min(hi+1, c.n)
	}
	m := int(hi - lo)
	if cap(c.buf) < m {
		c.buf = make([]float32, m)
	}
	buf := c.buf[:m]
	if err := c.src.ReadAt(ch, lo, buf); err != nil {
		return &windowError{Channel: ch, Start: start, End: end, Err: err}
	}
	if err := c.zp.Apply32(buf); err != nil {
		return &windowError{Channel: ch, Start: start, End: end, Err: err}
	}
	copy(dst, buf[start-lo:])
	return nil
}

type outsideError struct{}

func (outsideError) Error() string { return "range outside the recording" }

var errOutside error = outsideError{}

// Margin returns the smallest L such that the impulse response h of the
// cascade satisfies Σ_{k≥L}|h[k]| ≤ tol·Σ_k|h[k]|. A start-up transient is
// a free response of the same poles, so after L samples it is below tol
// relative to the filter's ℓ1 gain (the bound on output size per unit of
// input size). The response is followed for 8·ln(1/tol)/(1−r) samples,
// r the largest pole radius, which covers the polynomial growth of
// repeated poles. It returns −1 if a pole is on or outside the unit circle.
//
// For example a 4th-order 0.5–70 Hz band-pass at 256 Hz with a 50 Hz
// notch (q = 30) needs 2772 samples (10.8 s) for tol = 1e−6 and 1306
// (5.1 s) for tol = 1e−3; the 0.5 Hz edge dominates.
func Margin(sos SOS, tol float64) int {
	c := normalise(sos)
	r := 0.0
	for _, s := range c {
		d := cmplx.Sqrt(complex(s[4]*s[4]-4*s[5], 0))
		for _, p := range []complex128{(complex(-s[4], 0) + d) / 2, (complex(-s[4], 0) - d) / 2} {
			r = math.Max(r, cmplx.Abs(p))
		}
	}
	if r >= 1 {
		return -1
	}
	if !(tol > 0 && tol < 1) {
		tol = 1e-6
	}
	n := 64 + int(math.Ceil(8*math.Log(1/tol)/(1-r)))
	h := make([]float64, n)
	h[0] = 1
	forward(c, make([][2]float64, len(c)), h)
	total := 0.0
	for _, v := range h {
		total += math.Abs(v)
	}
	tail := 0.0
	for k := n - 1; k >= 0; k-- {
		tail += math.Abs(h[k])
		if tail > tol*total {
			return k + 1
		}
	}
	return 0
}
