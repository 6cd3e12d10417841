package accuracy

import (
	"encoding/json"
	"math"
	"os"
	"testing"
)

func TestDeLongClusteredReference(t *testing.T) {
	// Obuchowski (1997), Biometrics 53:567, computed by brute force over
	// all pairs with numpy in testdata/obuchowski.py.
	raw, err := os.ReadFile("testdata/obuchowski.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Rows []struct {
			Cluster string  `json:"cluster"`
			Truth   bool    `json:"truth"`
			Score   float64 `json:"score"`
		} `json:"rows"`
		AUC          float64 `json:"auc"`
		VarClustered float64 `json:"var_clustered"`
		VarDeLong    float64 `json:"var_delong"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	var s []float64
	var tr []bool
	var cl []string
	for _, r := range ref.Rows {
		s, tr, cl = append(s, r.Score), append(tr, r.Truth), append(cl, r.Cluster)
	}
	a, v := DeLongClustered(s, tr, cl)
	if math.Abs(a-ref.AUC) > 1e-12 || math.Abs(v-ref.VarClustered) > 1e-12 {
		t.Errorf("clustered AUC %v var %v, want %v %v", a, v, ref.AUC, ref.VarClustered)
	}
	if _, v := DeLong(s, tr); math.Abs(v-ref.VarDeLong) > 1e-12 {
		t.Errorf("DeLong var %v, want %v", v, ref.VarDeLong)
	}
	if _, v := DeLongClustered(s, tr, make([]string, len(s))); !math.IsNaN(v) {
		t.Errorf("one cluster: variance %v, want NaN", v)
	}
}
