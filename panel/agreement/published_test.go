package agreement

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

func readCSV(t *testing.T, path string) [][]int {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][]int
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		var row []int
		for _, s := range strings.Split(strings.TrimSpace(sc.Text()), ",") {
			v, err := strconv.Atoi(s)
			if err != nil {
				t.Fatal(err)
			}
			row = append(row, v)
		}
		rows = append(rows, row)
	}
	return rows
}

// readReference loads the statsmodels values written by testdata/reference.py.
func readReference(t *testing.T) map[string]float64 {
	t.Helper()
	b, err := os.ReadFile("testdata/reference.txt")
	if err != nil {
		t.Fatal(err)
	}
	ref := make(map[string]float64)
	for _, line := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		f := strings.Fields(line)
		v, err := strconv.ParseFloat(f[1], 64)
		if err != nil {
			t.Fatal(err)
		}
		ref[f[0]] = v
	}
	return ref
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol || math.IsNaN(got) {
		t.Errorf("%s = %.7f, want %.7f ± %g", what, got, want, tol)
	}
}

func TestFleiss1971(t *testing.T) {
	// Fleiss (1971), Table 1: 30 patients, 6 psychiatrists per patient,
	// 5 diagnoses; transcribed in testdata/fleiss1971.csv.
	c, err := CountsFromRows(readCSV(t, "testdata/fleiss1971.csv"))
	if err != nil {
		t.Fatal(err)
	}
	// Fleiss (1971), p. 381: κ = .430.
	near(t, "FleissKappa", FleissKappa(c, nil), 0.430, 5e-4)
	// statsmodels 0.13.5 fleiss_kappa, testdata/reference.py.
	near(t, "FleissKappa vs statsmodels", FleissKappa(c, nil), readReference(t)["fleiss1971_kappa"], 1e-9)

	// The first 15 patients are Gwet's (2014, Handbook of Inter-Rater
	// Reliability, 4th ed.) dataset distrib.6raters; values as printed in the
	// author's irrCAC package documentation.
	c15 := &Counts{K: c.K, N: c.N[:15*c.K]}
	near(t, "ObservedAgreement 15", ObservedAgreement(c15, nil), 0.5511111, 5e-8)
	near(t, "FleissKappa 15", FleissKappa(c15, nil), 0.4139265, 5e-8)
	near(t, "GwetAC1 15", GwetAC1(c15, nil), 0.4448007, 5e-8)
	near(t, "KrippendorffAlpha 15", KrippendorffAlphaNominal(c15, nil), 0.4204384, 5e-8)
}

// krippendorff2011 is the reliability data of Krippendorff (2011), section C
// ("nominal data, any number of observers, missing data"): 4 observers ×
// 12 units, categories 1–5 recoded 0–4, transposed to items × raters.
var krippendorff2011 = [][]int{
	{0, 0, Missing, 0},
	{1, 1, 2, 1},
	{2, 2, 2, 2},
	{2, 2, 2, 2},
	{1, 1, 1, 1},
	{0, 1, 2, 3},
	{3, 3, 3, 3},
	{0, 0, 1, 0},
	{1, 1, 1, 1},
	{Missing, 4, 4, 4},
	{Missing, Missing, 0, 0},
	{Missing, Missing, 2, Missing},
}

func TestKrippendorff2011(t *testing.T) {
	tab, err := NewTable(krippendorff2011, 5)
	if err != nil {
		t.Fatal(err)
	}
	c := tab.Counts()
	// Krippendorff (2011), section C: α = 0.743.
	near(t, "KrippendorffAlphaNominal", KrippendorffAlphaNominal(c, nil), 0.743, 5e-4)
	// The same data are Gwet's (2014) cac.raw4raters; irrCAC documentation:
	// percent agreement 0.8181818, Fleiss' kappa 0.76117, AC1 0.77544
	// (p_e 0.1903212), alpha 0.74342.
	near(t, "ObservedAgreement", ObservedAgreement(c, nil), 0.8181818, 5e-8)
	near(t, "FleissKappa", FleissKappa(c, nil), 0.76117, 5e-6)
	near(t, "GwetAC1", GwetAC1(c, nil), 0.77544, 5e-6)
	near(t, "KrippendorffAlphaNominal 5dp", KrippendorffAlphaNominal(c, nil), 0.74342, 5e-6)
}

// expand turns a contingency table into two raters' answer vectors.
func expand(m [][]float64) (a, b []int) {
	for j, row := range m {
		for l, v := range row {
			for range int(v) {
				a = append(a, j)
				b = append(b, l)
			}
		}
	}
	return a, b
}

func TestCohenPublished(t *testing.T) {
	ref := readReference(t)
	cases := []struct {
		name string
		m    [][]float64
		want float64
		tol  float64
		src  string
	}{
		// Cohen (1960), Table 1: 200 items, 3 categories, p_o = .70,
		// p_e = .41, κ = .492 (cells from memory; their margins, p_o and
		// p_e reproduce the printed summary); statsmodels cohens_kappa on
		// the same cells gives the full-precision value of the next case
		// (testdata/reference.py).
		{"cohen1960", [][]float64{{88, 14, 18}, {10, 40, 10}, {2, 6, 12}}, 0.492, 5e-4, "Cohen 1960"},
		{"cohen1960 statsmodels", [][]float64{{88, 14, 18}, {10, 40, 10}, {2, 6, 12}}, ref["cohen1960_kappa"], 1e-9, "statsmodels"},
		// 2×2: p_o = 0.7, p_e = 0.5·0.6+0.5·0.4 = 0.5, κ = 0.4 (closed form;
		// statsmodels agrees, testdata/reference.py).
		{"2x2", [][]float64{{20, 5}, {10, 15}}, 0.4, 1e-12, "closed form"},
		{"2x2 statsmodels", [][]float64{{20, 5}, {10, 15}}, ref["twobytwo_kappa"], 1e-9, "statsmodels"},
		// Gwet (2014), cont3x3abstractors (2 abstractors, 100 pregnant
		// women; ectopic / AIU / NIU): κ = 0.7964094 in the irrCAC
		// documentation.
		{"gwet2014", [][]float64{{13, 0, 0}, {0, 20, 7}, {0, 4, 56}}, 0.7964094, 5e-8, "Gwet 2014"},
	}
	for _, tc := range cases {
		near(t, tc.name+" matrix", CohenKappaMatrix(tc.m), tc.want, tc.tol)
		a, b := expand(tc.m)
		near(t, tc.name+" vectors", CohenKappa(a, b), tc.want, tc.tol)
		// Pairs with a Missing side must be skipped, not counted.
		a = append(a, Missing, 0, Missing)
		b = append(b, 1, Missing, Missing)
		near(t, tc.name+" with missing", CohenKappa(a, b), tc.want, tc.tol)
	}
}

func TestBinary7Statsmodels(t *testing.T) {
	ref := readReference(t)
	tab, err := NewTable(readCSV(t, "testdata/binary7.csv"), 2)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "FleissKappa", FleissKappa(tab.Counts(), nil), ref["binary7_fleiss"], 1e-9)
	pc := PairwiseCohen(tab)
	for a := range 7 {
		for b := a + 1; b < 7; b++ {
			key := "binary7_cohen_" + strconv.Itoa(a) + "_" + strconv.Itoa(b)
			near(t, key, pc[a][b], ref[key], 1e-9)
			near(t, key+" symmetric", pc[b][a], ref[key], 1e-9)
		}
	}
}

func TestLandisKoch(t *testing.T) {
	// Landis & Koch (1977), Biometrics 33:159, table on p. 165: every published
	// limit, both ends of each band.
	published := []struct {
		lo, hi float64
		want   string
	}{
		{0.00, 0.20, "slight"}, {0.21, 0.40, "fair"}, {0.41, 0.60, "moderate"},
		{0.61, 0.80, "substantial"}, {0.81, 1.00, "almost perfect"},
	}
	for _, b := range published {
		for _, k := range []float64{b.lo, b.hi} {
			if got := LandisKoch(k); got != b.want {
				t.Errorf("LandisKoch(%.2f) = %q, want %q (published band %.2f–%.2f)", k, got, b.want, b.lo, b.hi)
			}
		}
	}
	// Below the table, and values between the printed limits placed by their
	// two-decimal printing (rule documented on LandisKoch).
	cases := []struct {
		k    float64
		want string
	}{
		{-0.01, "poor"}, {-1, "poor"}, {0.30, "fair"}, {0.56, "moderate"},
		{0.1 + 0.3, "fair"}, // 0.4000000000000001, prints 0.40
		{0.404, "fair"},     // prints 0.40
		{0.406, "moderate"}, // prints 0.41
		{0.2049, "slight"},  // prints 0.20
		{0.2051, "fair"},    // prints 0.21
		{0.6 + 1e-12, "moderate"}, {0.8 + 1e-12, "substantial"},
		{math.NaN(), ""},
	}
	for _, tc := range cases {
		if got := LandisKoch(tc.k); got != tc.want {
			t.Errorf("LandisKoch(%v) = %q, want %q", tc.k, got, tc.want)
		}
		if math.IsNaN(tc.k) {
			continue
		}
		// The word must agree with the kappa as the reports print it.
		printed, _ := strconv.ParseFloat(fmt.Sprintf("%.2f", tc.k), 64)
		if LandisKoch(printed) != LandisKoch(tc.k) {
			t.Errorf("LandisKoch(%v) disagrees with its printed value %.2f", tc.k, printed)
		}
	}
}
