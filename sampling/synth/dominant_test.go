package synth

import "testing"

// TestDominantPink checks the dominant rhythm of a background without
// rhythms against the closed form of the 1/f^α spectrum S(f) ∝
// |2 sin(πf/fs)|^−α (Kasdin 1995): f·S(f) falls with f for α > 1, so the
// argmax over 1–30 Hz is the band's lowest frequency, and rises for α < 1,
// so it is the highest.
func TestDominantPink(t *testing.T) {
	for _, c := range []struct{ exp, want float64 }{{1.5, domLowHz}, {0.5, domHighHz}} {
		g, err := NewGenerator(Config{Seed: 3, Duration: 4, Forward: standInForward, AlphaRMS: 1e-9, ThetaRMS: 1e-9, Exponent: c.exp})
		if err != nil {
			t.Fatal(err)
		}
		for ch := range DefaultElectrodes {
			for _, d := range []float64{0, 1} {
				if got := g.bg.dominantHz(ch, d, g.cfg.Rate); got != c.want {
					t.Errorf("α=%g channel %d drowsiness %g: %g Hz, want %g", c.exp, ch, d, got, c.want)
				}
			}
		}
	}
	// with alpha at its default size, the occipital channels are dominated
	// by it in the awake state
	g, err := NewGenerator(Config{Seed: 3, Duration: 4, Forward: standInForward, AlphaFreq: 10})
	if err != nil {
		t.Fatal(err)
	}
	if got := g.bg.dominantHz(17, 0, g.cfg.Rate); got < 9.5 || got > 10.5 { // O1
		t.Errorf("O1 awake: dominant %g Hz, want the 10 Hz alpha", got)
	}
}
