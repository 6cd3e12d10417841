package detect

import "math"

// lanczosA is the Lanczos kernel's half-width, samples: the conditioned
// trace is band-limited below 70 Hz, well under the Nyquist frequency of a
// rate near designRate, so a short windowed-sinc kernel recovers it between
// samples (Duchon 1979).
const lanczosA = 4

// at returns the trace's band-limited interpolation at fractional sample
// position u (Lanczos, a = lanczosA), samples beyond [lo, hi) left out.
func (t *trace) at(u float64) float64 {
	i0 := int(math.Floor(u))
	if float64(i0) == u {
		return float64(t.x[i0])
	}
	var s, w float64
	for i := i0 - lanczosA + 1; i <= i0+lanczosA; i++ {
		if i < t.lo || i >= t.hi {
			continue
		}
		d := u - float64(i)
		k := sinc(d) * sinc(d/lanczosA)
		s += k * float64(t.x[i])
		w += k
	}
	if w == 0 {
		return math.NaN()
	}
	return s / w
}

func sinc(x float64) float64 {
	if x == 0 {
		return 1
	}
	return math.Sin(math.Pi*x) / (math.Pi * x)
}

// apex returns the position, in fractional samples, and value of the
// extremum of the interpolated trace within a sample of peak p (sign s),
// to 1/32 of a sample: the waveform's own apex, which lies anywhere
// between samples.
func (t *trace) apex(p int, s float64) (u, v float64) {
	u, v = float64(p), float64(t.x[p])
	for k := -32; k <= 32; k++ {
		c := float64(p) + float64(k)/32
		if c < float64(t.lo) || c > float64(t.hi-1) {
			continue
		}
		if w := t.at(c); s*w > s*v {
			u, v = c, w
		}
	}
	return u, v
}

// crossing returns the fractional sample position where the interpolated
// trace, walking from position u in direction dir, first falls to level
// (in sign s, relative to baseline b): bracketed on the samples, refined by
// bisection to 1/1024 of a sample. n bounds the walk, samples; the bound is
// returned when the trace never gets there.
func (t *trace) crossing(u float64, dir int, s, b, level float64, n int) float64 {
	prev := u
	i := int(math.Floor(u))
	if dir > 0 {
		i++
	} else if float64(i) == u {
		i--
	}
	for k := 0; k < n && i >= t.lo && i < t.hi; k, i = k+1, i+dir {
		v := s * (float64(t.x[i]) - b)
		if v <= level {
			a, c := prev, float64(i) // above at a, at or below at c
			for range 10 {
				m := (a + c) / 2
				if s*(t.at(m)-b) > level {
					a = m
				} else {
					c = m
				}
			}
			return (a + c) / 2
		}
		prev = float64(i)
	}
	return u + float64(dir*n)
}
