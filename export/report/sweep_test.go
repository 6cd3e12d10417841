package report

import (
	"bytes"
	"encoding/json"
	"math"
	"os"
	"testing"

	"github.com/parquet-go/parquet-go"

	"github.com/quorate-eeg/quorate/tuning"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// sweep.parquet against exact rational arithmetic (testdata/sweep_reference.py, Python
// fractions): weighted cells never negative, equal to the exact counts, and NPV null
// exactly where nothing is called negative.
func TestSweepAgainstExactCounts(t *testing.T) {
	b, err := os.ReadFile("testdata/sweep_reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Scores  []float64
		Truth   []int
		Weights []float64
		Rows    []struct {
			WTP, WFP, WTN, WFN float64
			NPV                *float64 `json:"weighted_npv"`
		}
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	truth := make([]bool, len(ref.Truth))
	for i, v := range ref.Truth {
		truth[i] = v == 1
	}
	th, counts := accuracy.Counts(ref.Scores, truth, ref.Weights)
	res := &tuning.Result{}
	for i := range th {
		res.Score.Curve = append(res.Score.Curve, tuning.Point{Rule: "score", Threshold: th[i], Weighted: counts[i], FalsePerHour: math.NaN()})
	}
	var buf bytes.Buffer
	if err := writeSweep(&buf, SweepRows(res)); err != nil {
		t.Fatal(err)
	}
	rows, err := parquet.Read[SweepRow](bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(ref.Rows) {
		t.Fatalf("%d rows, want %d", len(rows), len(ref.Rows))
	}
	for i, r := range rows {
		want := ref.Rows[i]
		for _, c := range [][2]float64{{r.WTP, want.WTP}, {r.WFP, want.WFP}, {r.WTN, want.WTN}, {r.WFN, want.WFN}} {
			if c[0] < 0 || math.Abs(c[0]-c[1]) > 1e-12 {
				t.Errorf("row %d: weighted cell %v, exact %v", i, c[0], c[1])
			}
		}
		switch {
		case (r.WNPV == nil) != (want.NPV == nil):
			t.Errorf("row %d: weighted_npv %v, exact %v (nil is null)", i, r.WNPV, want.NPV)
		case r.WNPV != nil && math.Abs(*r.WNPV-*want.NPV) > 1e-12:
			t.Errorf("row %d: weighted_npv %v, exact %v", i, *r.WNPV, *want.NPV)
		}
		if r.FPH != nil {
			t.Errorf("row %d: false_per_hour %v where it is undefined, want null", i, *r.FPH)
		}
	}
}
