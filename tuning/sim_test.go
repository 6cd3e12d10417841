package tuning

import (
	"fmt"
	"math/rand/v2"
)

// simulate builds a study of nSubj subjects with perSubj events each: an
// IED has each criterion present by panel majority with probability 0.75,
// a non-IED with 0.25; each feature is the criterion's decision plus unit
// Gaussian noise (so its criterion AUC is Φ(sep/√2)); the score is the
// mean of the features. High-score events are drawn with π = 2/3
// (weight 1.5), the rest with π = 1/4 (weight 4).
func simulate(rng *rand.Rand, nSubj, perSubj int, sep float64) []Event {
	var ev []Event
	for s := range nSubj {
		subjShift := rng.NormFloat64() * 0.2
		for k := range perSubj {
			e := Event{
				EventID: fmt.Sprintf("ev-%d-%d", s, k), Subject: fmt.Sprintf("sub-%03d", s),
				Recording: fmt.Sprintf("rec-%d", s), Kind: "candidate",
			}
			ied := rng.Float64() < 0.3
			e.Reference = 0
			if ied {
				e.Reference = 1
			}
			p := 0.25
			if ied {
				p = 0.75
			}
			var sum float64
			for j := range 6 {
				present := rng.Float64() < p
				e.Majority[j] = 0
				if present {
					e.Majority[j] = 1
				}
				x := rng.NormFloat64() + subjShift
				if present {
					x += sep
				}
				e.Features[j] = x
				e.AutoMet[j] = x > sep/2
				sum += x
			}
			e.Score = sum / 6
			e.Stratum, e.Weight = "low", 4
			if e.Score > 0.5 {
				e.Stratum, e.Weight = "high", 1.5
			}
			if k%10 == 9 {
				e.Kind = "control"
			}
			ev = append(ev, e)
		}
	}
	return ev
}
