package detect

import (
	"fmt"

	"github.com/quorate-eeg/quorate/sampling/signal"
)

// designRate is the sampling rate, Hz, the finder and the six features were
// designed and validated at (FEATURES.md): the kernel widths, the
// main-phase walk, the apex curvature and the flank levels all meet a
// transient on a grid of samples, and the same waveform on another grid
// reads differently (TestRateInvariance; FEATURES.md, "Sampling rate and
// grid"). A recording at any other rate is read through a view at
// designRate (atDesignRate): decimated when its rate is an integer multiple
// (512, 1024, 2048 Hz), otherwise interpolated. Nothing the features read
// lies above the conditioning filter's 70 Hz.
const designRate = 256.0

// antiAliasOrder is the Butterworth order of the anti-aliasing low-pass,
// applied forward and backward (so 16 in attenuation), at antiAliasFrac of
// the new rate: content that would fold below the 70 Hz conditioning edge
// lies above 1.7 × the edge, where it is attenuated by more than 70 dB.
const (
	antiAliasOrder = 8
	antiAliasFrac  = 0.4
)

// decimated wraps in as a view at 1/m of its rate: channel samples
// low-passed (zero phase, windowed by signal.Conditioner) and every m-th
// kept, so sample i of the view is sample i·m of the input. FirstSample
// stays in the input's samples (see engine.row).
func decimated(in Input, m int) (Input, error) {
	fs := in.Rate / float64(m)
	sos, err := signal.Butterworth(signal.LowPass, antiAliasOrder, in.Rate, antiAliasFrac*fs)
	if err != nil {
		return in, err
	}
	c, err := signal.NewConditioner(sos, in.Src, in.Len, signal.Margin(sos, filterTol))
	if err != nil {
		return in, fmt.Errorf("decimating %g Hz to %g Hz: %w", in.Rate, fs, err)
	}
	in.Src = &decimSource{c: c, m: m}
	in.Rate = fs
	in.Len = (in.Len + int64(m) - 1) / int64(m)
	return in, nil
}

// decimSource serves every m-th sample of a low-passed source.
type decimSource struct {
	c   *signal.Conditioner
	m   int
	buf []float32
}

func (d *decimSource) ReadAt(ch int, start int64, dst []float32) error {
	if len(dst) == 0 {
		return nil
	}
	n := (len(dst)-1)*d.m + 1
	if cap(d.buf) < n {
		d.buf = make([]float32, n)
	}
	buf := d.buf[:n]
	if err := d.c.Read(ch, start*int64(d.m), buf); err != nil {
		return err
	}
	for i := range dst {
		dst[i] = buf[i*d.m]
	}
	return nil
}
