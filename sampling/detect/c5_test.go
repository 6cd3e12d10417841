package detect

import (
	"math"
	"testing"
)

// TestDisruptionFloor checks c5 on a constructed channel against its closed
// form. The channel is a floor that no event changes — the alternating
// sequence ±n, whose first difference is ±2n in every sample (mean square
// 4n², like flat amplifier noise under Δx) — plus a 20 Hz background of
// amplitude A, whose first difference has mean square 2A² sin²(π f/fs)
// (the sampled sine's, a closed form), paused for 1 s eight seconds before
// the event, so that the quietest half-second holds the floor alone, and
// attenuated by a = 0.5 over [p+0.3 s, p+1.0 s]. The background's
// attenuation above the floor is then exactly a, and c5 = −ln(1 − a) =
// ln 2, within 0.05 (the cross terms of the two over the 0.7 s window are
// not zero, but small). The measure before this round (the same ratio without the floor)
// reads −½ ln((0.25 S + F)/(S + F)), S and F the two mean squares; the
// test checks that too, so that it fails if the floor is not removed.
func TestDisruptionFloor(t *testing.T) {
	const fs, f, A, n, a = 256.0, 20.0, 20.0, 3.0, 0.5
	N := int(40 * fs)
	p := N / 2
	x := make([]float32, N)
	for i := range x {
		v := n
		if i%2 == 1 {
			v = -n
		}
		s := A * math.Sin(2*math.Pi*f*float64(i)/fs)
		ts := float64(i-p) / fs
		switch {
		case ts >= -8.5 && ts < -7.5:
			s = 0
		case ts >= postFromS && ts <= postToS+0.01:
			s *= 1 - a
		}
		x[i] = float32(v + s)
	}
	tr := &trace{x: x, lo: 0, hi: N, fs: fs}
	ph := phase{peak: p, left: p - 5, right: p + 5, sign: 1}
	got := disruption(tr, ph)
	t.Logf("c5 = %.4f (want %.4f)", got, -math.Log(1-a))
	if want := -math.Log(1 - a); math.Abs(got-want) > 0.05 {
		t.Errorf("c5 = %.4f, want −ln(1 − a) = %.4f", got, want)
	}
	S := 2 * A * A * math.Pow(math.Sin(math.Pi*f/fs), 2)
	F := 4 * n * n
	old := -0.5 * math.Log(((1-a)*(1-a)*S+F)/(S+F))
	if math.Abs(got-old) < 0.1 {
		t.Errorf("c5 = %.4f is the floor-blind ratio's %.4f: the floor is not removed", got, old)
	}
}
