package signal

import "math/cmplx"

// zpk is a transfer function as zeros, poles and gain:
// H(s) = k ∏(s − z)/∏(s − p), or the same in z.
type zpk struct {
	z, p []complex128
	k    float64
}

// lowToLow scales the prototype cut-off to w rad/s: s → s/w
// (Oppenheim & Schafer 2010, §7.4; Parks & Burrus, Digital Filter Design,
// 1987, §7.2).
func lowToLow(f zpk, w float64) zpk {
	deg := len(f.p) - len(f.z)
	out := zpk{k: f.k}
	for _, z := range f.z {
		out.z = append(out.z, z*complex(w, 0))
	}
	for _, p := range f.p {
		out.p = append(out.p, p*complex(w, 0))
	}
	for range deg {
		out.k *= w
	}
	return out
}

// lowToHigh maps s → w/s; the prototype's zeros at infinity move to the
// origin.
func lowToHigh(f zpk, w float64) zpk {
	deg := len(f.p) - len(f.z)
	out := zpk{k: f.k}
	num, den := complex(1, 0), complex(1, 0)
	for _, z := range f.z {
		out.z = append(out.z, complex(w, 0)/z)
		num *= -z
	}
	for _, p := range f.p {
		out.p = append(out.p, complex(w, 0)/p)
		den *= -p
	}
	for range deg {
		out.z = append(out.z, 0)
	}
	out.k *= real(num / den)
	return out
}

// lowToBand maps s → (s² + w0²)/(s·bw): each prototype root r gives the
// pair r·bw/2 ± √((r·bw/2)² − w0²), and the zeros at infinity split
// between the origin and infinity.
func lowToBand(f zpk, w0, bw float64) zpk {
	deg := len(f.p) - len(f.z)
	out := zpk{k: f.k}
	split := func(r complex128) (complex128, complex128) {
		h := r * complex(bw/2, 0)
		d := cmplx.Sqrt(h*h - complex(w0*w0, 0))
		return h + d, h - d
	}
	var zhi, plo, phi []complex128
	for _, z := range f.z {
		a, b := split(z)
		out.z = append(out.z, a)
		zhi = append(zhi, b)
	}
	out.z = append(out.z, zhi...)
	for _, p := range f.p {
		a, b := split(p)
		plo = append(plo, a)
		phi = append(phi, b)
	}
	out.p = append(plo, phi...)
	for range deg {
		out.z = append(out.z, 0)
		out.k *= bw
	}
	return out
}

// lowToStop maps s → s·bw/(s² + w0²): roots r give
// (bw/2)/r ± √(((bw/2)/r)² − w0²), and the zeros at infinity move to ±j·w0.
func lowToStop(f zpk, w0, bw float64) zpk {
	deg := len(f.p) - len(f.z)
	out := zpk{k: f.k}
	num, den := complex(1, 0), complex(1, 0)
	split := func(r complex128) (complex128, complex128) {
		h := complex(bw/2, 0) / r
		d := cmplx.Sqrt(h*h - complex(w0*w0, 0))
		return h + d, h - d
	}
	var zhi, phi []complex128
	for _, z := range f.z {
		a, b := split(z)
		out.z = append(out.z, a)
		zhi = append(zhi, b)
		num *= -z
	}
	out.z = append(out.z, zhi...)
	for _, p := range f.p {
		a, b := split(p)
		out.p = append(out.p, a)
		phi = append(phi, b)
		den *= -p
	}
	out.p = append(out.p, phi...)
	for range deg {
		out.z = append(out.z, complex(0, w0))
	}
	for range deg {
		out.z = append(out.z, complex(0, -w0))
	}
	out.k *= real(num / den)
	return out
}

// bilinear maps an analogue zpk to digital with s = 2fs·(z−1)/(z+1)
// (Oppenheim & Schafer 2010, §7.2.2, eq. 7.20): each root r goes to
// (2fs + r)/(2fs − r), and zeros at infinity land on z = −1.
func bilinear(f zpk, fs float64) zpk {
	deg := len(f.p) - len(f.z)
	c := complex(2*fs, 0)
	out := zpk{k: f.k}
	num, den := complex(1, 0), complex(1, 0)
	for _, z := range f.z {
		out.z = append(out.z, (c+z)/(c-z))
		num *= c - z
	}
	for _, p := range f.p {
		out.p = append(out.p, (c+p)/(c-p))
		den *= c - p
	}
	for range deg {
		out.z = append(out.z, -1)
	}
	out.k *= real(num / den)
	return out
}
