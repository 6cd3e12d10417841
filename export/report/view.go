package report

import (
	"fmt"
	"math"
	"strconv"
	"time"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/tuning"
)

// view is what both reports show, already formatted.
type view struct {
	Caution   string
	Meta      Meta
	Generated string
	Res       *tuning.Result
	Policy    string
	Headline  []figureRow
	Expect    expectTable
	ExpectWhy string
	Cutoffs   []string
	Confusion [2][4]string // unweighted, weighted: TP FP FN TN
	KRows     [][]string
	Criteria  [][]string
	AutoByK   [][]string
	AutoHow   string // how the automatic rule's cutoffs and k were fitted
	Subsets   [][]string
	Score     []string // summary lines
	Agreement [][]string
	Figures   map[string]string
}

func newView(res *tuning.Result, agr *consensus.Agreement, meta Meta) view {
	v := view{Caution: Caution, Meta: meta, Generated: meta.Generated.UTC().Format(time.RFC3339), Res: res,
		Policy: res.Policy.String(), Headline: headline(res), Expect: expect(res), ExpectWhy: expectExplain}
	f := res.Final
	v.AutoHow = "Fitted as the " + f.Analysis + "; the best rule for each k is listed, and the policy picked one."
	for _, c := range f.Cutoffs {
		v.Cutoffs = append(v.Cutoffs, fmt.Sprintf("c%d: %s", c.Criterion, c.String()))
	}
	if f.Score.Direction != 0 {
		v.Cutoffs = append(v.Cutoffs, "detector score (one more vote): "+f.Score.String())
	}
	for i, c := range []struct{ TP, FP, FN, TN float64 }{
		{f.InSample.Counts.TP, f.InSample.Counts.FP, f.InSample.Counts.FN, f.InSample.Counts.TN},
		{f.InSample.Weighted.TP, f.InSample.Weighted.FP, f.InSample.Weighted.FN, f.InSample.Weighted.TN},
	} {
		v.Confusion[i] = [4]string{num(c.TP), num(c.FP), num(c.FN), num(c.TN)}
	}
	for i, r := range res.KSweep.Rows {
		mark := ""
		if i == res.KSweep.Chosen {
			mark = "◀ policy"
		}
		v.KRows = append(v.KRows, []string{fmt.Sprintf("≥ %d", r.K), pctCI(r.Plain.Sens), pctCI(r.Plain.Spec), pctCI(r.Plain.PPV),
			pctCI(r.Design.Sens), pctCI(r.Design.Spec), pctCI(r.Design.PPV), numCI(r.Plain.LRPos), numCI(r.Plain.LRNeg), numCI(r.Plain.Youden), mark})
	}
	for _, c := range res.Criteria {
		if c.Skipped != "" {
			v.Criteria = append(v.Criteria, []string{fmt.Sprintf("c%d", c.Criterion), c.Feature, "–", "–", "–", "–", "–", c.Skipped})
			continue
		}
		dir := "≥"
		if c.Direction < 0 {
			dir = "≤"
		}
		v.Criteria = append(v.Criteria, []string{fmt.Sprintf("c%d", c.Criterion), c.Feature, fmt.Sprintf("%d (%d present)", c.N, c.Present),
			numCI(c.AUC), dir + " " + strconv.FormatFloat(c.Cutoff, 'g', -1, 64), pct(c.AtCutoff.Weighted.Sensitivity()), pct(c.AtCutoff.Weighted.Specificity()), ""})
	}
	for i, a := range res.Auto.ByK {
		mark := ""
		if i == res.Auto.Chosen {
			mark = "◀ chosen"
		}
		v.AutoByK = append(v.AutoByK, []string{fmt.Sprintf("≥ %d", a.K), a.Rule, pct(a.Weighted.Sensitivity()), pct(a.Weighted.Specificity()), pct(a.Weighted.PPV()), num(a.FalsePerHour), mark})
	}
	for _, t := range res.Subsets.Top {
		chosen := "–"
		if res.Subsets.CV != nil {
			chosen = fmt.Sprintf("%d of %d", t.TimesChosen, res.Subsets.CV.Folds)
		}
		v.Subsets = append(v.Subsets, []string{t.Name, pctCI(t.Design.Sens), pctCI(t.Design.Spec), num(t.Design.Youden.Value), chosen})
	}
	sc := res.Score
	v.Score = append(v.Score, fmt.Sprintf("%d events with a score; AUC %s (DeLong interval), design-weighted AUC %s.", sc.N, numCI(sc.AUC), num(sc.WeightedAUC)))
	if sc.At != nil {
		pt := sc.Curve[sc.Chosen]
		v.Score = append(v.Score, fmt.Sprintf("Policy %s picks score ≥ %s: sensitivity %s, PPV %s, %s false detections per hour (design-weighted).",
			v.Policy, num(pt.Threshold), pctCI(sc.At.Design.Sens), pctCI(sc.At.Design.PPV), numCI(sc.At.FalsePerHour)))
	} else if sc.N > 0 {
		v.Score = append(v.Score, fmt.Sprintf("No score threshold meets %s.", v.Policy))
	}
	if c := res.Controls; c.Rated > 0 {
		line := fmt.Sprintf("The panel rated %d background controls (epochs drawn at random away from every candidate, kept out of the figures above) and called %d of them IEDs: IEDs the finder missed.", c.Rated, c.IEDs)
		if !math.IsNaN(c.MissedPerHour.Lo) {
			line += fmt.Sprintf(" Projected to the archive: %s missed IEDs per hour of recording, carried by %d control(s).", numCI(c.MissedPerHour), c.IEDs)
		}
		if c.Warning != "" {
			line += " Caution: " + c.Warning + "."
		}
		v.Score = append(v.Score, line)
	}
	if agr != nil {
		for _, q := range agr.Questions {
			v.Agreement = append(v.Agreement, []string{q.Question, fmt.Sprint(q.Items),
				agrCI(q.Observed, true), agrCI(q.Fleiss, false) + " " + q.FleissBand, agrCI(q.AC1, false), agrCI(q.Alpha, false)})
		}
	}
	return v
}

func agrCI(e consensus.Estimate, prop bool) string {
	t := tuning.Estimate{Value: float64(e.Value), Lo: float64(e.Lo), Hi: float64(e.Hi)}
	if prop {
		return pctCI(t)
	}
	return numCI(t)
}
