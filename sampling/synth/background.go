package synth

import (
	"math"
	"math/rand/v2"
	"slices"
)

// Background layout constants (common practice for a plausible-looking
// ongoing EEG; not fitted to data).
const (
	nPinkSources = 32   // dipolar 1/f sources mixed through the forward model
	localShare   = 0.25 // share of background variance independent per channel
	alphaBW      = 0.8  // alpha resonance bandwidth, Hz
	thetaBW      = 1.5  // theta resonance bandwidth, Hz
	thetaFreq    = 5.5  // drowsy theta centre frequency, Hz
	envTau       = 2.0  // waxing and waning time constant of alpha, s
	envDepth     = 0.4  // relative spread of the alpha envelope
	burnIn       = 4096 // samples run before the first output sample
)

// background is the ongoing activity: pink dipolar sources, independent
// pink noise per channel, posterior alpha and drowsy theta resonators.
type background struct {
	nEEG   int
	src    []*arFilter // pink sources, then alpha, then theta
	nPink  int
	nAlpha int
	mix    [][]float64 // [channel][source] gain including calibration
	local  []*arFilter // one per EEG channel, plus one for EOG
	localG float64
	env    *arFilter // alpha envelope
	s      []float64 // source values of the current sample
	rng    *rand.Rand
}

// resonator returns AR(2) coefficients with poles at radius exp(−π·bw/fs)
// and angle 2π·f/fs: a narrow-band rhythm whose amplitude waxes and wanes.
func resonator(f, bw, fs float64) []float64 {
	r := math.Exp(-math.Pi * bw / fs)
	return []float64{1, -2 * r * math.Cos(2*math.Pi*f/fs), r * r}
}

// newBackground lays out sources with the layout stream and calibrates them
// so that the 1/f part has median channel RMS cfg.BackgroundRMS and alpha
// and theta have their configured RMS at their maximal channel.
func newBackground(cfg *Config, layout, noise *rand.Rand) (*background, error) {
	nEEG := len(cfg.Electrodes)
	b := &background{nEEG: nEEG, rng: noise, nPink: nPinkSources}
	pink := pinkCoefficients(cfg.Exponent, pinkOrder)
	pinkGain := 1 / math.Sqrt(arVariance(pink))
	fwd := func(pos, mom [3]float64) ([]float64, error) {
		v := cfg.Forward(cfg.Electrodes, pos, mom)
		if len(v) != nEEG {
			return nil, &forwardError{Pos: pos, Moment: mom, Got: len(v), Want: nEEG}
		}
		for _, x := range v {
			if math.IsNaN(x) || math.IsInf(x, 0) {
				return nil, &forwardError{Pos: pos, Moment: mom, Got: len(v), Want: nEEG}
			}
		}
		return slices.Clone(v), nil
	}
	var cols [][]float64
	for range nPinkSources {
		d := cortical(layout)
		g, err := fwd(scale(d, uni(layout, 0.6, 0.85)), randUnit(layout))
		if err != nil {
			return nil, err
		}
		cols = append(cols, g)
		b.src = append(b.src, newARFilterGain(pink, pinkGain))
	}
	// Calibrate the dipolar part to (1−localShare) of the target variance
	// at the median channel; the local part supplies the rest everywhere.
	v := make([]float64, nEEG)
	for c := range v {
		for _, g := range cols {
			v[c] += g[c] * g[c]
		}
	}
	med := slices.Clone(v)
	slices.Sort(med)
	m := med[nEEG/2]
	if nEEG%2 == 0 {
		m = (med[nEEG/2-1] + med[nEEG/2]) / 2
	}
	if m == 0 {
		return nil, &forwardError{Want: nEEG, Got: nEEG}
	}
	k := math.Sqrt((1-localShare)/m) * cfg.BackgroundRMS
	for _, g := range cols {
		for c := range g {
			g[c] *= k
		}
	}
	b.localG = math.Sqrt(localShare) * cfg.BackgroundRMS

	group := func(dirs [][3]float64, radius, f, bw, rms float64, radial bool) error {
		var gs [][]float64
		for i, d := range dirs {
			d = jitter(layout, d, 5)
			mom := d
			if !radial {
				mom = unit(add(d, scale(tangent(layout, d), 0.5)))
			}
			g, err := fwd(scale(d, radius), mom)
			if err != nil {
				return err
			}
			gs = append(gs, g)
			fi := f + 0.15*float64(i-len(dirs)/2) // slightly detuned generators
			b.src = append(b.src, newARFilter(resonator(fi, bw, cfg.Rate)))
		}
		var top float64
		for c := range nEEG {
			var s float64
			for _, g := range gs {
				s += g[c] * g[c]
			}
			top = max(top, s)
		}
		for _, g := range gs {
			for c := range g {
				if top > 0 {
					g[c] *= rms / math.Sqrt(top)
				}
			}
		}
		cols = append(cols, gs...)
		return nil
	}
	alphaRMS := cfg.AlphaRMS / math.Sqrt(1+envDepth*envDepth) // the envelope adds variance
	if err := group([][3]float64{dirO1, dirPz, dirO2}, 0.8, cfg.AlphaFreq, alphaBW, alphaRMS, false); err != nil {
		return nil, err
	}
	b.nAlpha = 3
	// Deeper theta generators give the diffuse frontocentral field of drowsiness.
	if err := group([][3]float64{dirF3, dirFz, dirF4}, 0.5, thetaFreq, thetaBW, cfg.ThetaRMS, true); err != nil {
		return nil, err
	}
	b.mix = make([][]float64, nEEG)
	for c := range b.mix {
		b.mix[c] = make([]float64, len(cols))
		for k, g := range cols {
			b.mix[c][k] = g[c]
		}
	}
	for range nEEG + 1 {
		b.local = append(b.local, newARFilterGain(pink, pinkGain))
	}
	phi := math.Exp(-1 / (envTau * cfg.Rate))
	b.env = newARFilter([]float64{1, -phi})
	b.s = make([]float64, len(b.src))
	for range burnIn {
		b.step(0)
		for _, f := range b.local {
			f.next(noise.NormFloat64())
		}
	}
	return b, nil
}

// step advances every generator by one sample at drowsiness d (0 awake, 1
// drowsy): alpha scales by 1−0.75d, theta by 0.25+0.75d (common practice:
// alpha drops out and theta appears with drowsiness).
func (b *background) step(d float64) {
	ag := (1 - 0.75*d) * max(0, 1+envDepth*b.env.next(b.rng.NormFloat64()))
	tg := 0.25 + 0.75*d
	for k, f := range b.src {
		x := f.next(b.rng.NormFloat64())
		switch {
		case k >= b.nPink+b.nAlpha:
			x *= tg
		case k >= b.nPink:
			x *= ag
		}
		b.s[k] = x
	}
}

// eeg returns the background at EEG channel c for the current sample.
func (b *background) eeg(c int) float64 {
	var v float64
	for k, g := range b.mix[c] {
		v += g * b.s[k]
	}
	return v + b.localG*b.local[c].next(b.rng.NormFloat64())
}

// eogNoise returns the slow ongoing activity of the EOG channel, µV.
func (b *background) eogNoise() float64 {
	return 15 * b.local[b.nEEG].next(b.rng.NormFloat64())
}

// stateGain2 returns the mean-square state scaling of source k at
// drowsiness d, as step applies it: 1 for the 1/f sources, (1−0.75d)²
// times the envelope's mean square 1+envDepth² for alpha, (0.25+0.75d)²
// for theta.
func (b *background) stateGain2(k int, d float64) float64 {
	switch {
	case k < b.nPink:
		return 1
	case k < b.nPink+b.nAlpha:
		return (1 - 0.75*d) * (1 - 0.75*d) * (1 + envDepth*envDepth)
	}
	return (0.25 + 0.75*d) * (0.25 + 0.75*d)
}

// rmsAt returns the background's root mean square at EEG channel c and
// drowsiness d, from the mixing gains of its unit-variance sources, their
// state scaling (stateGain2) and the channel's own 1/f noise.
func (b *background) rmsAt(c int, d float64) float64 {
	v := b.localG * b.localG
	for k, g := range b.mix[c] {
		v += g * g * b.stateGain2(k, d)
	}
	return math.Sqrt(v)
}
