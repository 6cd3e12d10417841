package agreement

import "math"

// RaterVsOthers scores one rater against the leave-one-out majority of the
// other raters, treating category 0 as "absent" and any other category as
// "present" (so it serves binary criteria directly):
//
//	sens = TP / (TP + FN),  spec = TN / (TN + FP),
//
// where the reference for item i is "present" when more of the other raters'
// answers are present than absent, "absent" when fewer. Items where the rater
// is Missing, where no other rater answered, or where the others tie are
// skipped; n is the number of items used. sens or spec is NaN when its
// denominator is zero. Leaving the rater out keeps the rater's own answer
// from voting for itself (common practice in reader studies).
func RaterVsOthers(t Table, rater int) (sens, spec float64, n int) {
	var tp, fn, tn, fp int
	for _, row := range t.Ratings {
		own := row[rater]
		if own == Missing {
			continue
		}
		var pos, neg int
		for j, v := range row {
			switch {
			case j == rater || v == Missing:
			case v != 0:
				pos++
			default:
				neg++
			}
		}
		if pos == neg {
			continue
		}
		n++
		switch {
		case pos > neg && own != 0:
			tp++
		case pos > neg:
			fn++
		case own == 0:
			tn++
		default:
			fp++
		}
	}
	return ratio(tp, tp+fn), ratio(tn, tn+fp), n
}

func ratio(a, b int) float64 {
	if b == 0 {
		return math.NaN()
	}
	return float64(a) / float64(b)
}
