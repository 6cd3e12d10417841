package consensus

import (
	"fmt"
	"math"
	"sort"

	"github.com/quorate-eeg/quorate/internal/jsonx"
	"github.com/quorate-eeg/quorate/panel/agreement"
	"github.com/quorate-eeg/quorate/panel/latent"
)

// Questions are the seven questions a rater answers, in report order.
var Questions = [7]string{"c1", "c2", "c3", "c4", "c5", "c6", "verdict"}

// Estimate is a coefficient with its bootstrap interval (subjects resampled).
type Estimate struct {
	Value jsonx.Float `json:"value"`
	Lo    jsonx.Float `json:"ci_low"`
	Hi    jsonx.Float `json:"ci_high"`
}

// RaterAccuracy is one rater's sensitivity and specificity against the majority of the
// other raters, and as estimated by the Dawid–Skene model.
type RaterAccuracy struct {
	Rater  string      `json:"rater"`
	Sens   jsonx.Float `json:"sensitivity_vs_others"`
	Spec   jsonx.Float `json:"specificity_vs_others"`
	N      int         `json:"items"`
	DSSens jsonx.Float `json:"ds_sensitivity"`
	DSSpec jsonx.Float `json:"ds_specificity"`
}

// Intra is one rater's agreement with themself on hidden duplicates.
type Intra struct {
	Rater    string      `json:"rater"`
	Observed jsonx.Float `json:"observed"`
	Kappa    jsonx.Float `json:"kappa"`
	Pairs    int         `json:"pairs"`
}

// Pair is Cohen's kappa for two raters.
type Pair struct {
	A     string      `json:"rater_a"`
	B     string      `json:"rater_b"`
	Kappa jsonx.Float `json:"kappa"`
}

// QuestionAgreement is the agreement on one question.
type QuestionAgreement struct {
	Question   string          `json:"question"`
	Items      int             `json:"items"`
	Observed   Estimate        `json:"observed_agreement"`
	Fleiss     Estimate        `json:"fleiss_kappa"`
	FleissBand string          `json:"fleiss_kappa_band"` // Landis & Koch (1977)
	AC1        Estimate        `json:"gwet_ac1"`
	Alpha      Estimate        `json:"krippendorff_alpha"`
	Cohen      []Pair          `json:"cohen_kappa_pairs"`
	Raters     []RaterAccuracy `json:"raters"`
	Intra      []Intra         `json:"intra_rater"`
}

// Agreement is the whole agreement report.
type Agreement struct {
	Raters     []string            `json:"raters"`
	Events     int                 `json:"events"`
	Subjects   int                 `json:"subjects"`
	Replicates int                 `json:"bootstrap_replicates"`
	Level      jsonx.Float         `json:"confidence_level"`
	Questions  []QuestionAgreement `json:"questions"`
}

// Measure computes every agreement statistic for each question. subjectOf maps an event
// to its subject: intervals resample subjects, because events of one patient are alike.
// ds, when not nil, receives each event's Dawid–Skene probability of being an IED (fitted
// on the overall verdict).
func Measure(ratings []Rating, subjectOf map[string]string, reps int, seed uint64, level float64) (*Agreement, map[string]float64, error) {
	raterSet := map[string]bool{}
	eventSet := map[string]bool{}
	for _, r := range ratings {
		raterSet[r.Rater] = true
		if !r.Duplicate {
			eventSet[r.EventID] = true
		}
	}
	raters := keys(raterSet)
	events := keys(eventSet)
	if len(events) == 0 || len(raters) < 2 {
		return nil, nil, fmt.Errorf("agreement needs at least two raters and one rated event (have %d raters, %d events)", len(raters), len(events))
	}
	ri := index(raters)
	ei := index(events)
	subj := map[string]int{}
	clusters := make([]int, len(events))
	for i, e := range events {
		s, ok := subjectOf[e]
		if !ok {
			s = "event:" + e // unknown subject: the event is its own cluster
		}
		if _, ok := subj[s]; !ok {
			subj[s] = len(subj)
		}
		clusters[i] = subj[s]
	}
	// tables[q][event][rater]; dup[q][rater] pairs of first/second answers.
	var tables [7][][]int
	for q := range tables {
		tables[q] = make([][]int, len(events))
		for i := range tables[q] {
			row := make([]int, len(raters))
			for j := range row {
				row[j] = agreement.Missing
			}
			tables[q][i] = row
		}
	}
	type dkey struct{ event, rater string }
	first := map[dkey]*Rating{}
	for i := range ratings {
		r := &ratings[i]
		if r.Duplicate {
			continue
		}
		first[dkey{r.EventID, r.Rater}] = r
		for q, a := range answers(r) {
			if a != nil {
				tables[q][ei[r.EventID]][ri[r.Rater]] = b2i(*a)
			}
		}
	}
	var dupA, dupB [7][][]int // per question, per rater
	for q := range dupA {
		dupA[q] = make([][]int, len(raters))
		dupB[q] = make([][]int, len(raters))
	}
	for i := range ratings {
		r := &ratings[i]
		if !r.Duplicate {
			continue
		}
		f := first[dkey{r.EventID, r.Rater}]
		if f == nil {
			continue
		}
		fa, ra := answers(f), answers(r)
		for q := range 7 {
			if fa[q] != nil && ra[q] != nil {
				j := ri[r.Rater]
				dupA[q][j] = append(dupA[q][j], b2i(*fa[q]))
				dupB[q][j] = append(dupB[q][j], b2i(*ra[q]))
			}
		}
	}

	rep := &Agreement{Raters: raters, Events: len(events), Subjects: len(subj), Replicates: reps, Level: jsonx.Float(level)}
	var ds map[string]float64
	for q := range 7 {
		tab, err := agreement.NewTable(tables[q], 2)
		if err != nil {
			return nil, nil, err
		}
		c := tab.Counts()
		stats := []agreement.Statistic{(*agreement.Totals).ObservedAgreement, (*agreement.Totals).FleissKappa,
			(*agreement.Totals).GwetAC1, (*agreement.Totals).KrippendorffAlphaNominal}
		ivs, err := agreement.Bootstrap(c, clusters, stats, reps, seed, level)
		if err != nil {
			return nil, nil, err
		}
		tot := c.Totals(nil)
		est := func(v float64, iv agreement.Interval) Estimate {
			return Estimate{jsonx.Float(v), jsonx.Float(iv.Lo), jsonx.Float(iv.Hi)}
		}
		qa := QuestionAgreement{Question: Questions[q], Items: len(events),
			Observed: est(tot.ObservedAgreement(), ivs[0]),
			Fleiss:   est(tot.FleissKappa(), ivs[1]),
			AC1:      est(tot.GwetAC1(), ivs[2]),
			Alpha:    est(tot.KrippendorffAlphaNominal(), ivs[3]),
		}
		qa.FleissBand = agreement.LandisKoch(float64(qa.Fleiss.Value))
		pw := agreement.PairwiseCohen(tab)
		for a := range raters {
			for b := a + 1; b < len(raters); b++ {
				qa.Cohen = append(qa.Cohen, Pair{raters[a], raters[b], jsonx.Float(pw[a][b])})
			}
		}
		fit, fitErr := latent.Fit(tables[q], 2, latent.Options{})
		for j, name := range raters {
			s, sp, n := agreement.RaterVsOthers(tab, j)
			ra := RaterAccuracy{Rater: name, Sens: jsonx.Float(s), Spec: jsonx.Float(sp), N: n,
				DSSens: jsonx.Float(math.NaN()), DSSpec: jsonx.Float(math.NaN())}
			if fitErr == nil {
				ra.DSSens, ra.DSSpec = jsonx.Float(fit.Sensitivity(j)), jsonx.Float(fit.Specificity(j))
			}
			qa.Raters = append(qa.Raters, ra)
			po, k, n := agreement.IntraRater(dupA[q][j], dupB[q][j])
			qa.Intra = append(qa.Intra, Intra{Rater: name, Observed: jsonx.Float(po), Kappa: jsonx.Float(k), Pairs: n})
		}
		if q == 6 && fitErr == nil {
			ds = map[string]float64{}
			for i, p := range fit.PositiveProb() {
				ds[events[i]] = p
			}
		}
		rep.Questions = append(rep.Questions, qa)
	}
	return rep, ds, nil
}

func answers(r *Rating) [7]*bool {
	return [7]*bool{r.C1, r.C2, r.C3, r.C4, r.C5, r.C6, r.Epileptiform}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

func keys(m map[string]bool) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

func index(s []string) map[string]int {
	m := make(map[string]int, len(s))
	for i, v := range s {
		m[v] = i
	}
	return m
}
