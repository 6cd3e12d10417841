package accuracy

import (
	"encoding/json"
	"os"
	"testing"
)

// libRef holds testdata/reference.json, written by testdata/reference.py
// with scikit-learn 1.2, scipy 1.10 and statsmodels 0.13.
type libRef struct {
	AltmanBland struct {
		Sensitivity, Specificity, PPV, NPV float64
	} `json:"altman_bland"`
	Wilson []struct {
		X, N   float64
		Lo, Hi float64
		CCLo   float64 `json:"cc_lo"`
		CCHi   float64 `json:"cc_hi"`
		SMLo   float64 `json:"sm_lo"`
		SMHi   float64 `json:"sm_hi"`
	}
	HanleyMcNeil struct {
		ROCAUCScore    float64 `json:"roc_auc_score"`
		MannWhitneyAUC float64 `json:"mannwhitney_auc"`
		SENumpy        float64 `json:"se_numpy"`
	} `json:"hanley_mcneil"`
}

func readLibRef(t testing.TB) libRef {
	t.Helper()
	b, err := os.ReadFile("testdata/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var r libRef
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	if len(r.Wilson) == 0 || r.AltmanBland.Sensitivity == 0 || r.HanleyMcNeil.ROCAUCScore == 0 {
		t.Fatal("testdata/reference.json is incomplete")
	}
	return r
}
