package design

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

type clusterUnit struct {
	Stratum string  `json:"stratum"`
	Cluster string  `json:"cluster"`
	Weight  float64 `json:"weight"`
	Truth   bool    `json:"truth"`
	Pred    bool    `json:"pred"`
}

func clusterSample(t *testing.T, us []clusterUnit) (Sample, []bool, []bool) {
	t.Helper()
	var s Sample
	var pred, truth []bool
	for _, u := range us {
		s.Stratum = append(s.Stratum, u.Stratum)
		s.Cluster = append(s.Cluster, u.Cluster)
		s.Weight = append(s.Weight, u.Weight)
		pred = append(pred, u.Pred)
		truth = append(truth, u.Truth)
	}
	return s, pred, truth
}

func TestClusterVarianceReference(t *testing.T) {
	raw, err := os.ReadFile("testdata/cluster.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Spread struct {
			Units         []clusterUnit `json:"units"`
			Prevalence    float64       `json:"prevalence"`
			PrevalenceVar float64       `json:"prevalence_var"`
			DF            float64       `json:"df"`
		} `json:"spread"`
		Nested struct {
			Units          []clusterUnit `json:"units"`
			Sensitivity    float64       `json:"sensitivity"`
			SensitivityVar float64       `json:"sensitivity_var"`
			DF             float64       `json:"df"`
		} `json:"nested"`
		T975 map[string]float64 `json:"t975"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}

	// Subjects spread over all strata: the strata collapse into one and the
	// variance is statsmodels' cluster-robust WLS variance of the weighted
	// mean (testdata/cluster.py, part 1).
	s, _, truth := clusterSample(t, ref.Spread.Units)
	e, err := Prevalence(s, truth)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "spread prevalence", e.Value, ref.Spread.Prevalence, 1e-12)
	near(t, "spread prevalence var (statsmodels cluster)", e.Var, ref.Spread.PrevalenceVar, 1e-12)
	near(t, "spread df", e.DF, ref.Spread.DF, 0)

	// Subjects nested in strata: stratified ultimate cluster, df = PSUs −
	// strata (testdata/cluster.py, part 2, numpy closed form).
	s, pred, truth := clusterSample(t, ref.Nested.Units)
	e, err = Sensitivity(s, pred, truth)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "nested sensitivity", e.Value, ref.Nested.Sensitivity, 1e-12)
	near(t, "nested sensitivity var", e.Var, ref.Nested.SensitivityVar, 1e-12)
	near(t, "nested df", e.DF, ref.Nested.DF, 0)

	// t interval on the design df: t_{0.975, 9} = 2.2621571627409915,
	// scipy.stats.t.ppf(0.975, 9) (testdata/cluster.py, part 3).
	lo, hi := e.CI(0.95)
	if h := (hi - lo) / 2 / e.SE(); e.DF != 9 || math.Abs(h-ref.T975["9"]) > 1e-9 {
		t.Errorf("t quantile on %v df = %.10f, want scipy %.10f on 9 df", e.DF, h, ref.T975["9"])
	}
}

func TestClusterOfOneUnitEachIsUnclustered(t *testing.T) {
	// Every unit its own cluster, one stratum: the ultimate-cluster
	// estimator is the f=0 stratified estimator (Wolter 2007, §1.4).
	s := Sample{Stratum: []string{"a", "a", "a", "b", "b"}, Weight: []float64{2, 2, 3, 5, 4}}
	y := []float64{1, 0, 1, 1, 0}
	plain, _ := Total(s, y)
	s.Cluster = []string{"1", "2", "3", "4", "5"}
	cl, _ := Total(s, y)
	near(t, "var", cl.Var, plain.Var, 1e-12)
	near(t, "df", cl.DF, 3, 0)
	s.Cluster = []string{"1", "2", ""}
	if _, err := Total(s, y); err == nil {
		t.Error("short cluster slice accepted")
	}
}

func TestEffectiveSizeKornGraubard(t *testing.T) {
	// Korn & Graubard (1998): n* = p(1−p)/v · (t_{n−1}/t_df)²; with df = n−1
	// it is Kish's p(1−p)/v.
	e := Estimate{Value: 0.3, Var: 0.0021, DF: 199}
	near(t, "df = n−1", e.EffectiveSize(200, 0.95), 0.21/0.0021, 1e-9)
	e.DF = 9
	// t_{0.975,199} and t_{0.975,9}: scipy.stats.t.ppf, testdata/cluster.py
	// part 3 (written to testdata/cluster.json).
	tq := readT975(t)
	want := 0.21 / 0.0021 * math.Pow(tq["199"]/tq["9"], 2)
	near(t, "df = 9", e.EffectiveSize(200, 0.95), want, 1e-9)
	near(t, "capped at n", e.EffectiveSize(60, 0.95), 60, 0)
}

// readT975 reads the scipy t quantiles of testdata/cluster.json.
func readT975(t *testing.T) map[string]float64 {
	t.Helper()
	raw, err := os.ReadFile("testdata/cluster.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		T975 map[string]float64 `json:"t975"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	if ref.T975["9"] == 0 || ref.T975["199"] == 0 {
		t.Fatal("testdata/cluster.json has no t975 quantiles")
	}
	return ref.T975
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))) {
		t.Errorf("%s = %.15g, want %.15g", what, got, want)
	}
}
