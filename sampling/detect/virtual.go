package detect

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// Criterion 3 is read on the event's virtual channel: the one linear
// combination of all derivations that passes the event's voltage map at its
// peak unchanged and lets through the least of the background around it,
// the linearly constrained minimum-variance (LCMV) spatial filter of Van
// Veen et al. (1997) with the measured map in place of a model's lead field:
//
//	w = R⁻¹a / (aᵀR⁻¹a),  y(t) = wᵀx(t),  R = C + δ·(tr C / n)·I
//
// a the derivations' values at the peak less their centred moving mean (the
// map in the band C describes), in the peak's polarity, C the
// covariance of the background ranges (backgroundSpan within specSpanS, and
// within the event's vigilance state when known, as criterion 2's spectrum)
// after removing a centred moving mean of about 1/vcHighHz (so that C is the
// background above about 8 Hz), δ = vcLoading (diagonal loading, which keeps
// R invertible under the common-average reference's zero sum). An
// asymmetry is a difference of a few samples between two flanks, and the
// background between about 8 and 30 Hz is what blurs it: on the events
// alone c3 separates perfectly, with that band added back it does not
// (FEATURES.md, the background oracle). Alpha and the widespread part of
// the background have fields of their own, which the filter cancels
// wherever the event's map differs from theirs; y has the event's time
// course, since every derivation carries it scaled by its map value.
const (
	vcHighHz  = 8.0   // the background band the filter is fitted to: above about this
	vcLoading = 1e-3  // diagonal loading, share of the mean derivation variance
	vcStride  = 2     // every vcStride-th background sample enters C
	vcMinS    = 4.0   // least background, s, for C; else the peak derivation is used
	vcPeakS   = 0.012 // how far the virtual channel's peak may lie from the detection's, s
)

// virtualScratch is per-worker space for the virtual channel.
type virtualScratch struct {
	a []float64
	y []float32
	r []float64
}

// virtualChannel returns the event's trace through the LCMV spatial filter
// over derivations xs (t is the peak derivation's trace, ph its main phase,
// bc the window's background covariances): the stretch that asymmetry reads
// around the peak, and the main phase walked again on it around its own
// peak (within vcPeakS of ph.peak). ok is false when there are fewer than four
// derivations, less than vcMinS of background, or R cannot be factorised;
// criterion 3 then reads the peak derivation.
func virtualChannel(xs [][]float32, t *trace, ph phase, bc *blockCov, vs *virtualScratch) (*trace, phase, bool) {
	n := len(xs)
	maxN := int(math.Ceil(maxPhaseS * t.fs))
	// room for the main phase, the baseline before it and asymmetry's
	// search for the return on either side
	ext := max(maxN+int(math.Round(preBaseS*t.fs))+vcPeakN(t.fs), int(math.Round(returnMaxS*t.fs)))
	lo, hi := ph.peak-ext, ph.peak+ext+1
	if n < 4 || n != bc.n || lo < t.lo || hi > t.hi {
		return nil, ph, false
	}
	vs.r = grow64(vs.r, n*n)
	rows := bc.sum(t.sameState().backgroundSpan(ph.peak, specSpanS), vs.r)
	if rows < int(vcMinS*t.fs)/vcStride {
		rows = bc.sum(t.backgroundSpan(ph.peak, specSpanS), vs.r)
	}
	if rows < int(vcMinS*t.fs)/vcStride {
		return nil, ph, false
	}
	R := mat.NewSymDense(n, vs.r[:n*n])
	var tr float64
	for i := range n {
		tr += R.At(i, i)
	}
	for i := range n {
		R.SetSym(i, i, R.At(i, i)+vcLoading*tr/float64(n))
	}
	var ch mat.Cholesky
	if !ch.Factorize(R) {
		return nil, ph, false
	}
	// the map in the band C describes: the peak less the centred mean
	// the high-pass removes, so that slow background passing under the
	// peak is not part of what the filter must pass
	vs.a = grow64(vs.a, n)
	h := vcHalf(t.fs)
	for i, x := range xs {
		var m float64
		for _, v := range x[ph.peak-h : ph.peak+h+1] {
			m += float64(v)
		}
		vs.a[i] = ph.sign * (float64(x[ph.peak]) - m/float64(2*h+1))
	}
	a := mat.NewVecDense(n, vs.a[:n])
	var w mat.VecDense
	if err := ch.SolveVecTo(&w, a); err != nil {
		return nil, ph, false
	}
	g := mat.Dot(&w, a)
	if !(g > 0) {
		return nil, ph, false
	}
	// y carries the event in its own polarity, with unit gain on a
	if cap(vs.y) < hi-lo {
		vs.y = make([]float32, hi-lo)
	}
	y := vs.y[:hi-lo]
	clear(y)
	for i, x := range xs {
		wi := float32(w.AtVec(i) / g)
		for s, v := range x[lo:hi] {
			y[s] += wi * v
		}
	}
	p := ph.peak - lo
	d := vcPeakN(t.fs)
	for q := ph.peak - lo - d; q <= ph.peak-lo+d; q++ {
		if ph.sign*float64(y[q]) > ph.sign*float64(y[p]) {
			p = q
		}
	}
	yt := &trace{x: y, lo: 0, hi: len(y), fs: t.fs}
	return yt, mainPhase(y, p, ph.sign, maxN, 0), true
}

// blockCov holds, for one conditioned window, the background's second
// moments after the moving-mean high-pass, in blocks of one second: the
// covariance of any background ranges is then a sum over whole blocks,
// computed once per window instead of once per event. A block's moments
// depend on its own samples only, and are computed when a sum first
// needs them: blocks no event's background reaches (most of the window's
// context, stretches without events) are not computed at all.
type blockCov struct {
	n, origin, size int
	blocks          int
	mom             []float64 // per block: n sums, then the n×n sums of products
	cnt             []int     // samples per block
	done            []bool    // per block: mom and cnt computed
	z               []float64 // scratch: one block's high-passed samples, sample-major
	xs              [][]float32
	h               int
}

// build prepares the block moments of derivations xs over [lo, hi) at fs,
// buffer index i being input sample base+i. Blocks are aligned to whole
// seconds of the input, not to the window, so that a window cut
// differently (MeasureAt's) gives the same blocks around an event. xs must
// not change while the moments are read (sum).
func (bc *blockCov) build(xs [][]float32, lo, hi int, base int64, fs float64) {
	n := len(xs)
	h := vcHalf(fs)
	bc.n, bc.size, bc.xs, bc.h = n, max(1, int(math.Round(fs))), xs, h
	size := int64(bc.size)
	bc.origin = lo + h + int((size-(base+int64(lo+h))%size)%size)
	end := hi - h
	bc.blocks = max(0, (end-bc.origin)/bc.size)
	stride := n + n*n
	bc.mom = grow64(bc.mom, bc.blocks*stride)
	if cap(bc.cnt) < bc.blocks {
		bc.cnt = make([]int, bc.blocks)
	}
	bc.cnt = bc.cnt[:bc.blocks]
	if cap(bc.done) < bc.blocks {
		bc.done = make([]bool, bc.blocks)
	}
	bc.done = bc.done[:bc.blocks]
	clear(bc.done)
	per := (bc.size + vcStride - 1) / vcStride
	bc.z = grow64(bc.z, per*n)
}

// block computes block b's moments.
func (bc *blockCov) block(b int) {
	n, h, xs := bc.n, bc.h, bc.xs
	stride := n + n*n
	per := (bc.size + vcStride - 1) / vcStride
	inv := 1 / float64(2*h+1)
	s0 := bc.origin + b*bc.size
	for c, x := range xs {
		var m float64
		for j := s0 - h; j <= s0+h; j++ {
			m += float64(x[j])
		}
		// every vcStride-th sample, the moving mean advanced over
		// the others without a test per sample
		k, s := 0, s0
		if vcStride == 2 {
			for ; s+1 < s0+bc.size; s += 2 {
				bc.z[k*n+c] = float64(x[s]) - m*inv
				k++
				m += float64(x[s+h+1]) - float64(x[s-h])
				m += float64(x[s+h+2]) - float64(x[s+1-h])
			}
		}
		for ; s < s0+bc.size; s += vcStride {
			bc.z[k*n+c] = float64(x[s]) - m*inv
			k++
			for t := s; t < min(s+vcStride, s0+bc.size); t++ {
				m += float64(x[t+h+1]) - float64(x[t-h])
			}
		}
	}
	mom := bc.mom[b*stride : (b+1)*stride]
	clear(mom)
	for k := range per {
		for c := range n {
			mom[c] += bc.z[k*n+c]
		}
	}
	rankK(mom[n:n+n*n], bc.z[:per*n], n)
	bc.cnt[b] = per
	bc.done[b] = true
}

// rankK adds to the upper triangle of the n×n row-major s the products
// zᵀz of the rows of z (k×n, row-major): s_ij += Σ_l z_li·z_lj, i ≤ j. It
// is BLAS dsyrk (upper, transposed; Dongarra et al. 1990, "A set of level 3
// basic linear algebra subprograms", ACM Trans Math Softw 16:1–17) with
// the accumulation order of gonum's: each s_ij gains its terms in
// increasing l, rows whose z_li is zero skipped, every product rounded
// before it is added (no fused multiply–add), so the sums are the same bit
// for bit; one loop here rather than a call per row and term.
//
// Rows are taken two at a time, each sum gaining the first row's term and
// then the second's in one pass over s.
func rankK(s, z []float64, n int) {
	l := 0
	for ; l+2*n <= len(z); l += 2 * n {
		zl, zm := z[l:l+n], z[l+n:l+2*n]
		for i, a := range zl {
			c := zm[i]
			row := s[i*n+i : i*n+n]
			zr, zq := zl[i:], zm[i:]
			zr, zq = zr[:len(row)], zq[:len(row)]
			switch {
			case a != 0 && c != 0:
				for j := range row {
					row[j] = row[j] + float64(a*zr[j]) + float64(c*zq[j])
				}
			case a != 0:
				for j := range row {
					row[j] += float64(a * zr[j])
				}
			case c != 0:
				for j := range row {
					row[j] += float64(c * zq[j])
				}
			}
		}
	}
	for ; l+n <= len(z); l += n {
		zl := z[l : l+n]
		for i, a := range zl {
			if a == 0 {
				continue
			}
			row := s[i*n+i : i*n+n]
			zr := zl[i:]
			zr = zr[:len(row)]
			for j := range row {
				row[j] += float64(a * zr[j])
			}
		}
	}
}

// sum writes to dst (n×n, row-major) the covariance of the high-passed
// background over the whole blocks inside ranges rs, and returns the number
// of samples it rests on (0 when none: dst is then undefined).
func (bc *blockCov) sum(rs [][2]int, dst []float64) int {
	n := bc.n
	stride := n + n*n
	clear(dst[:n*n])
	mean := make([]float64, n)
	N := 0
	for _, r := range rs {
		b0 := max(0, (r[0]-bc.origin+bc.size-1)/bc.size)
		b1 := min(bc.blocks, (r[1]-bc.origin)/bc.size)
		if r[1] < bc.origin {
			continue
		}
		for b := b0; b < b1; b++ {
			if !bc.done[b] {
				bc.block(b)
			}
			mom := bc.mom[b*stride : (b+1)*stride]
			for c := range n {
				mean[c] += mom[c]
			}
			for i := range n {
				for j := i; j < n; j++ {
					dst[i*n+j] += mom[n+i*n+j]
				}
			}
			N += bc.cnt[b]
		}
	}
	if N == 0 {
		return 0
	}
	for c := range mean {
		mean[c] /= float64(N)
	}
	for i := range n {
		for j := i; j < n; j++ {
			dst[i*n+j] = dst[i*n+j]/float64(N) - mean[i]*mean[j]
		}
	}
	return N
}

// vcHalf is the half-width, samples, of the centred moving mean whose
// removal is the virtual channel's high-pass: a box of about 1/vcHighHz,
// whose transfer function has its first zero at vcHighHz.
func vcHalf(fs float64) int { return max(1, int(math.Round(fs/vcHighHz/2))) }

// vcPeakN is vcPeakS in samples, at least one.
func vcPeakN(fs float64) int { return max(1, int(math.Round(vcPeakS*fs))) }

// span returns the number of samples in half-open ranges.
func span(rs [][2]int) int {
	n := 0
	for _, r := range rs {
		n += max(0, r[1]-r[0])
	}
	return n
}

// grow64 returns b with length n, reallocating only when it is too short.
func grow64(b []float64, n int) []float64 {
	if cap(b) < n {
		return make([]float64, n)
	}
	return b[:n]
}
