package agreement

import (
	"math"
	"strconv"
)

// LandisKoch returns the Landis & Koch (1977, "The measurement of observer
// agreement for categorical data", Biometrics 33:159–174, p. 165) strength of
// agreement word for a kappa-type coefficient, with the bands as published:
//
//	κ < 0.00 "poor", 0.00–0.20 "slight", 0.21–0.40 "fair",
//	0.41–0.60 "moderate", 0.61–0.80 "substantial", 0.81–1.00 "almost perfect".
//
// The published limits are two-decimal numbers and every upper limit belongs
// to its band (0.20 is slight, 0.40 fair, 0.60 moderate, 0.80 substantial).
// A coefficient is placed by its value rounded to two decimals exactly as
// strconv/fmt print it with 'f' and precision 2, so the word always agrees
// with a kappa printed as %.2f: a computed 0.4000000000000001 or 0.404 prints
// 0.40 and is "fair", 0.406 prints 0.41 and is "moderate". The gap between
// published bands (0.20 < κ < 0.21) therefore closes at the printed rounding:
// 0.2049 is "slight", 0.2051 "fair" (0.205 itself is stored as
// 0.20499999999999998 and is "slight"). A value that prints as -0.00 is
// "slight". NaN returns "".
func LandisKoch(kappa float64) string {
	if math.IsNaN(kappa) {
		return ""
	}
	k, _ := strconv.ParseFloat(strconv.FormatFloat(kappa, 'f', 2, 64), 64)
	switch {
	case k < 0:
		return "poor"
	case k <= 0.20:
		return "slight"
	case k <= 0.40:
		return "fair"
	case k <= 0.60:
		return "moderate"
	case k <= 0.80:
		return "substantial"
	default:
		return "almost perfect"
	}
}
