package main

import (
	"math"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/internal/jsonx"
	"github.com/quorate-eeg/quorate/panel/consensus"
)

// Fleiss' kappa is undefined when every answer is the same (p_e = 1, Fleiss
// 1971): merge and the demo say so in words, never "NaN".
func TestKappaTextSaysUndefined(t *testing.T) {
	nan := jsonx.Float(math.NaN())
	if s := kappaText(consensus.Estimate{Value: nan, Lo: nan, Hi: nan}, ""); strings.Contains(s, "NaN") || !strings.HasPrefix(s, "undefined") {
		t.Errorf("undefined kappa printed as %q", s)
	}
	if s := kappaText(consensus.Estimate{Value: 0.52, Lo: 0.45, Hi: 0.59}, "moderate"); s != "0.52 (0.45 to 0.59) moderate" {
		t.Errorf("kappa printed as %q", s)
	}
	if s := kappaText(consensus.Estimate{Value: 0.07, Lo: nan, Hi: nan}, "slight"); strings.Contains(s, "NaN") {
		t.Errorf("kappa without interval printed as %q", s)
	}
}
