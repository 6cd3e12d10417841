package agreement

import "math"

// LandisKoch returns the Landis & Koch (1977, "The measurement of observer
// agreement for categorical data", Biometrics 33:159–174, p. 165) strength of
// agreement word for a kappa-type coefficient:
//
//	κ < 0 "poor", 0–0.20 "slight", 0.21–0.40 "fair", 0.41–0.60 "moderate",
//	0.61–0.80 "substantial", 0.81–1.00 "almost perfect".
//
// The published bands are given to two decimals and leave gaps
// (0.20 < κ < 0.21); here each band is closed above and open below, so a value
// belongs to the band whose printed upper limit it does not exceed: 0.20 is
// "slight", 0.205 and 0.30 "fair", 0.56 "moderate". 0 is "slight". NaN
// returns "".
func LandisKoch(kappa float64) string {
	switch {
	case math.IsNaN(kappa):
		return ""
	case kappa < 0:
		return "poor"
	case kappa <= 0.20:
		return "slight"
	case kappa <= 0.40:
		return "fair"
	case kappa <= 0.60:
		return "moderate"
	case kappa <= 0.80:
		return "substantial"
	default:
		return "almost perfect"
	}
}
