package draw

import (
	"encoding/json"
	"errors"
	"os"
	"reflect"
	"strings"
	"testing"
)

func TestQuantileEdgesNumpy(t *testing.T) {
	b, err := os.ReadFile("testdata/quantiles.json")
	if err != nil {
		t.Fatal(err)
	}
	var cases []struct {
		X     []float64
		K     int
		Edges []float64
	}
	if err := json.Unmarshal(b, &cases); err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		// testdata/quantiles.py: numpy.quantile(method="inverted_cdf"),
		// Hyndman & Fan (1996) definition 1.
		if got := QuantileEdges(c.X, c.K); !reflect.DeepEqual(got, c.Edges) {
			t.Errorf("n=%d k=%d: edges %v, numpy %v", len(c.X), c.K, got, c.Edges)
		}
	}
}

func TestStratifyLabelsAndEmptyBins(t *testing.T) {
	f := &Frame{
		ID:      []string{"a", "b", "c", "d", "e", "f", "g", "h", "i", "j"},
		Subject: make([]string, 10),
		Num:     map[string][]float64{"score": {0, 0, 0, 0, 0, 0, 0, 0, 1, 2}},
		Cat:     map[string][]string{"region": {"t", "t", "t", "t", "t", "f", "f", "f", "f", "f"}},
	}
	specs, err := ParseStrata("score:q5,region")
	if err != nil {
		t.Fatal(err)
	}
	st, err := Stratify(f, specs)
	if err != nil {
		t.Fatal(err)
	}
	// Edges x_(2), x_(4), x_(6), x_(8) are all 0 (ties stay together):
	// q1 holds the eight zeros, q5 holds 1 and 2, q2–q4 are empty.
	want := []string{"score=q1|region=f", "score=q1|region=t", "score=q5|region=f"}
	if !reflect.DeepEqual(st.Labels, want) {
		t.Errorf("labels %q, want %q", st.Labels, want)
	}
	if !reflect.DeepEqual(st.Size, []int{3, 5, 2}) {
		t.Errorf("sizes %v", st.Size)
	}
	var empty []string
	for _, w := range st.Warnings {
		empty = append(empty, w.Stratum)
	}
	if !reflect.DeepEqual(empty, []string{"score=q2", "score=q3", "score=q4"}) {
		t.Errorf("warnings %v", st.Warnings)
	}

	specs, _ = ParseStrata("score:edges=0,1,2.5")
	st, err = Stratify(f, specs)
	if err != nil {
		t.Fatal(err)
	}
	// [0,1) holds the zeros, [1,2.5) holds 1 and 2; nothing below 0 or ≥ 2.5.
	if want := []string{"score=[0,1)", "score=[1,2.5)"}; !reflect.DeepEqual(st.Labels, want) {
		t.Errorf("edge labels %q, want %q", st.Labels, want)
	}
}

func TestUnknownColumn(t *testing.T) {
	f := fixture()
	_, err := Draw(f, Design{Strata: []StratumSpec{{Column: "polarity"}}, Alloc: Allocation{Method: Equal, N: 3}})
	var ce *columnError
	if !errors.As(err, &ce) || ce.Column != "polarity" || !reflect.DeepEqual(ce.Available, []string{"region", "score"}) {
		t.Fatalf("error %v, want *columnError listing region, score", err)
	}
	if !strings.Contains(err.Error(), "region, score") {
		t.Errorf("message %q does not list the columns", err)
	}
	var se *specError
	if _, err := Stratify(f, []StratumSpec{{Column: "score"}}); !errors.As(err, &se) {
		t.Errorf("numeric column without bins: %v", err)
	}
}

func TestParseStrata(t *testing.T) {
	got, err := ParseStrata("score:edges=0,1,2.5, region ,auto_count:q3")
	want := []StratumSpec{{Column: "score", Edges: []float64{0, 1, 2.5}}, {Column: "region"}, {Column: "auto_count", Bins: 3}}
	if err != nil || !reflect.DeepEqual(got, want) {
		t.Errorf("got %+v, %v", got, err)
	}
	if s := FormatStrata(got); s != "score:edges=0,1,2.5,region,auto_count:q3" {
		t.Errorf("FormatStrata = %q", s)
	}
	for _, bad := range []string{"score:q0", "score:bins", ",region", "score:edges=x", ":q5"} {
		_, err := ParseStrata(bad)
		var pe *parseError
		if !errors.As(err, &pe) {
			t.Errorf("%q: error %v, want *parseError", bad, err)
		}
	}
}
