package report

import (
	"io"
	"math"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"
	"github.com/quorate-eeg/quorate/tuning"
)

// SweepRow is one evaluated point of any analysis: unweighted and
// design-weighted counts and the rates derived from them (NaN where a
// denominator is empty).
type SweepRow struct {
	Analysis  string  `parquet:"analysis,dict"` // k-sweep, subset-rule, criterion-roc, auto-rule, score
	Rule      string  `parquet:"rule"`
	Criterion int32   `parquet:"criterion"` // 1…6 for criterion-roc, else 0
	Threshold float64 `parquet:"threshold"` // feature cutoff, score, or k
	TP        float64 `parquet:"tp"`
	FP        float64 `parquet:"fp"`
	TN        float64 `parquet:"tn"`
	FN        float64 `parquet:"fn"`
	WTP       float64 `parquet:"weighted_tp"`
	WFP       float64 `parquet:"weighted_fp"`
	WTN       float64 `parquet:"weighted_tn"`
	WFN       float64 `parquet:"weighted_fn"`
	// Rates are null where their denominator is empty (nothing called
	// negative gives no NPV), never a number made of rounding error.
	Sens    *float64 `parquet:"sensitivity,optional"` // unweighted
	Spec    *float64 `parquet:"specificity,optional"`
	PPV     *float64 `parquet:"ppv,optional"`
	WSens   *float64 `parquet:"weighted_sensitivity,optional"`
	WSpec   *float64 `parquet:"weighted_specificity,optional"`
	WPPV    *float64 `parquet:"weighted_ppv,optional"`
	WNPV    *float64 `parquet:"weighted_npv,optional"`
	WYouden *float64 `parquet:"weighted_youden_j,optional"`
	FPH     *float64 `parquet:"false_per_hour,optional"`
}

func row(analysis string, crit int, p tuning.Point) SweepRow {
	c, w := p.Counts, p.Weighted
	return SweepRow{Analysis: analysis, Rule: p.Rule, Criterion: int32(crit), Threshold: p.Threshold,
		TP: c.TP, FP: c.FP, TN: c.TN, FN: c.FN, WTP: w.TP, WFP: w.FP, WTN: w.TN, WFN: w.FN,
		Sens: null(c.Sensitivity()), Spec: null(c.Specificity()), PPV: null(c.PPV()),
		WSens: null(w.Sensitivity()), WSpec: null(w.Specificity()), WPPV: null(w.PPV()), WNPV: null(w.NPV()), WYouden: null(w.Youden()),
		FPH: null(p.FalsePerHour)}
}

// null makes an undefined (NaN) rate a parquet null.
func null(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

// SweepRows lists every point the tuner evaluated, analysis by analysis.
func SweepRows(res *tuning.Result) []SweepRow {
	var rows []SweepRow
	for _, k := range res.KSweep.Rows {
		rows = append(rows, row("k-sweep", 0, tuning.Point{Rule: kRule(k.K), Threshold: float64(k.K), Counts: k.Counts, Weighted: k.Weighted, FalsePerHour: k.FalsePerHour.Value}))
	}
	for _, r := range res.Subsets.Rules {
		rows = append(rows, row("subset-rule", 0, r.Point))
	}
	for _, c := range res.Criteria {
		for _, p := range c.Curve {
			rows = append(rows, row("criterion-roc", c.Criterion, p))
		}
	}
	for _, a := range res.Auto.ByK {
		rows = append(rows, row("auto-rule", 0, a.Point))
	}
	for _, p := range res.Score.Curve {
		rows = append(rows, row("score", 0, p))
	}
	return rows
}

func writeSweep(w io.Writer, rows []SweepRow) error {
	pw := parquet.NewGenericWriter[SweepRow](w, parquet.Compression(&zstd.Codec{}))
	if _, err := pw.Write(rows); err != nil {
		return err
	}
	return pw.Close()
}
