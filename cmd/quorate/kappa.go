package main

import (
	"fmt"
	"math"

	"github.com/quorate-eeg/quorate/panel/consensus"
)

// kappaText prints a Fleiss' kappa with its interval and Landis & Koch
// (1977) band, or says why there is none: kappa is undefined when every
// answer to a question is the same (chance agreement p_e = 1) or no event has
// two answers (Fleiss 1971).
func kappaText(e consensus.Estimate, band string) string {
	v := float64(e.Value)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "undefined (every answer alike, or no event answered twice)"
	}
	lo, hi := float64(e.Lo), float64(e.Hi)
	if math.IsNaN(lo) || math.IsNaN(hi) {
		return fmt.Sprintf("%.2f (no interval) %s", v, band)
	}
	return fmt.Sprintf("%.2f (%.2f to %.2f) %s", v, lo, hi, band)
}
