package signal

import (
	"math"
	"math/cmplx"
	"slices"
)

// SOS is a cascade of second-order sections. Each row is
// [b0 b1 b2 a0 a1 a2] of
//
//	H_i(z) = (b0 + b1 z⁻¹ + b2 z⁻²)/(a0 + a1 z⁻¹ + a2 z⁻²)
//
// with a0 = 1; the overall response is the product of the rows.
type SOS [][6]float64

// FrequencyResponse returns H(e^{j2πf/fs}) of the cascade at f Hz.
func FrequencyResponse(sos SOS, f, fs float64) complex128 {
	zi := cmplx.Exp(complex(0, -2*math.Pi*f/fs)) // z⁻¹
	h := complex(1, 0)
	for _, s := range sos {
		num := complex(s[0], 0) + zi*(complex(s[1], 0)+zi*complex(s[2], 0))
		den := complex(s[3], 0) + zi*(complex(s[4], 0)+zi*complex(s[5], 0))
		h *= num / den
	}
	return h
}

// realTol is the relative size of an imaginary part below which a root is
// taken as real, 100 machine epsilons.
const realTol = 100 * 2.220446049250313e-16

// splitRoots returns the upper-half-plane member of each conjugate pair,
// ordered by real part then |imag|, followed by the real roots in ascending
// order. Design routines only produce conjugate-symmetric root sets.
func splitRoots(r []complex128) (cplx []complex128, re []float64) {
	for _, v := range r {
		switch {
		case math.Abs(imag(v)) <= realTol*cmplx.Abs(v):
			re = append(re, real(v))
		case imag(v) > 0:
			cplx = append(cplx, v)
		}
	}
	slices.SortStableFunc(cplx, func(a, b complex128) int {
		if c := cmpFloat(real(a), real(b)); c != 0 {
			return c
		}
		return cmpFloat(imag(a), imag(b))
	})
	slices.Sort(re)
	return cplx, re
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// root is one element of a conjugate-symmetric root set: a real root, or
// a complex root standing for itself and its conjugate.
type root struct {
	v    complex128
	real bool
}

func roots(r []complex128) []root {
	c, re := splitRoots(r)
	out := make([]root, 0, len(c)+len(re))
	for _, v := range c {
		out = append(out, root{v: v})
	}
	for _, v := range re {
		out = append(out, root{v: complex(v, 0), real: true})
	}
	return out
}

// toSOS groups a digital zpk into second-order sections by nearest
// pairing: repeatedly take the remaining pole closest to the unit circle,
// pair it with its conjugate (or the next real pole nearest the circle) and
// with the zeros nearest to it, and place that section last, so the
// sections with the highest gain peaking come at the end of the cascade
// where the signal has already been band-limited (Jackson, Digital Filters
// and Signal Processing, 3rd ed., 1996, §11.4; the section from memory;
// the sections checked against scipy.signal.butter(output="sos") in
// TestButterworthScipy, testdata/gen_scipy.py). Odd orders
// get a pole and zero at the origin. The overall gain k goes into the
// first section.
// This is the grouping scipy.signal.zpk2sos calls "nearest", so sections
// compare one-to-one with it.
func toSOS(f zpk) SOS {
	z := slices.Clone(f.z)
	p := slices.Clone(f.p)
	for len(p) < len(z) {
		p = append(p, 0)
	}
	for len(z) < len(p) {
		z = append(z, 0)
	}
	if len(p)%2 == 1 {
		p = append(p, 0)
		z = append(z, 0)
	}
	n := len(p) / 2
	zs, ps := roots(z), roots(p)
	sos := make(SOS, n)
	worst := func(rs []root, realOnly bool) int {
		best, d := -1, math.Inf(1)
		for i, r := range rs {
			if realOnly && !r.real {
				continue
			}
			if e := math.Abs(1 - cmplx.Abs(r.v)); e < d {
				best, d = i, e
			}
		}
		return best
	}
	// nearest returns the index of the zero closest to v among those of
	// the wanted class (0 any, 1 real, 2 complex); ties keep the first.
	nearest := func(v complex128, class int) int {
		best, d := -1, math.Inf(1)
		for i, r := range zs {
			if (class == 1 && !r.real) || (class == 2 && r.real) {
				continue
			}
			if e := cmplx.Abs(r.v - v); e < d {
				best, d = i, e
			}
		}
		return best
	}
	countReal := func(rs []root) int {
		c := 0
		for _, r := range rs {
			if r.real {
				c++
			}
		}
		return c
	}
	take := func(rs []root, i int) ([]root, root) {
		r := rs[i]
		return slices.Delete(rs, i, i+1), r
	}
	for si := n - 1; si >= 0; si-- {
		var p1 root
		ps, p1 = take(ps, worst(ps, false))
		switch {
		case p1.real && countReal(ps) == 0:
			// the last real pole: a first-order section
			var z1 root
			zs, z1 = take(zs, nearest(p1.v, 1))
			sos[si] = section([]complex128{z1.v, 0}, []complex128{p1.v, 0})
		case len(ps)+1 == len(zs) && !p1.real && countReal(ps) == 1 && countReal(zs) == 1:
			// one real pole and one real zero remain: they must pair with
			// each other, so this complex pole takes a complex zero
			var z1 root
			zs, z1 = take(zs, nearest(p1.v, 2))
			sos[si] = section(conjPair(z1.v), conjPair(p1.v))
		default:
			var pp []complex128
			if p1.real {
				var p2 root
				ps, p2 = take(ps, worst(ps, true))
				pp = []complex128{p1.v, p2.v}
			} else {
				pp = conjPair(p1.v)
			}
			if len(zs) == 0 {
				sos[si] = section(nil, pp)
				break
			}
			var z1 root
			zs, z1 = take(zs, nearest(p1.v, 0))
			switch {
			case !z1.real:
				sos[si] = section(conjPair(z1.v), pp)
			case len(zs) > 0:
				var z2 root
				zs, z2 = take(zs, nearest(p1.v, 1))
				sos[si] = section([]complex128{z1.v, z2.v}, pp)
			default:
				sos[si] = section([]complex128{z1.v}, pp)
			}
		}
	}
	for i := range 3 {
		sos[0][i] *= f.k
	}
	return sos
}

func conjPair(v complex128) []complex128 { return []complex128{v, cmplx.Conj(v)} }

// section expands up to two zeros and two poles into one row, right-aligned
// so that missing roots leave trailing zero coefficients.
func section(z, p []complex128) [6]float64 {
	var s [6]float64
	b := polyFromRoots(z)
	a := polyFromRoots(p)
	for i, v := range b {
		s[3-len(b)+i] = real(v)
	}
	for i, v := range a {
		s[6-len(a)+i] = real(v)
	}
	return s
}
