package headmodel

import (
	"math"
	"strings"
	"testing"
)

func pos(t *testing.T, name string) Vec3 {
	t.Helper()
	p, ok := Position(name)
	if !ok {
		t.Fatalf("no position for %s", name)
	}
	return p
}

func elevation(p Vec3) float64 { return math.Asin(p[2]) / deg }

// Jasper (1958) proportional rule on a sphere whose fiducials lie on the
// equator: each 10 % of a 180° arc is 18°.
func TestTenTwentyRule(t *testing.T) {
	const tol = 1e-12
	near := func(what string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > tol {
			t.Errorf("%s = %.12g, want %g", what, got, want)
		}
	}
	cz := pos(t, "Cz")
	near("Cz z", cz[2], 1)
	// Fpz and Oz 10 % of the nasion–inion arc above the equator.
	near("Fpz elevation", elevation(pos(t, "Fpz")), 18)
	near("Oz elevation", elevation(pos(t, "Oz")), 18)
	near("Fpz x", pos(t, "Fpz")[0], 0)
	if pos(t, "Fpz")[1] <= 0 || pos(t, "Oz")[1] >= 0 {
		t.Error("Fpz must be anterior and Oz posterior")
	}
	// Midline steps: Fpz–Fz–Cz–Pz–Oz are 20 % (36°) apart; AFz, FCz, CPz,
	// POz halve them (Chatrian et al. 1985).
	mid := []string{"Nz", "Fpz", "AFz", "Fz", "FCz", "Cz", "CPz", "Pz", "POz", "Oz", "Iz"}
	for i := 1; i < len(mid); i++ {
		near(mid[i-1]+"–"+mid[i], pos(t, mid[i-1]).Angle(pos(t, mid[i]))/deg, 18)
	}
	// T7/T8: 10 % of the preauricular arc above the equator, on the
	// coronal plane of Cz, and at 50 % of the Fpz–Oz half-circumference.
	for _, n := range []string{"T7", "T8"} {
		p := pos(t, n)
		near(n+" elevation", elevation(p), 18)
		near(n+" y", p[1], 0)
		near(n+"–Fpz", p.Angle(pos(t, "Fpz"))/deg, pos(t, n).Angle(pos(t, "Oz"))/deg)
	}
	near("T7 x sign", math.Copysign(1, pos(t, "T7")[0]), -1)
	// The 10 % ring: consecutive electrodes equally spaced (equal chords
	// on the horizontal circle at 18°).
	ringR := []string{"Fpz", "Fp2", "AF8", "F8", "FT8", "T8", "TP8", "P8", "PO8", "O2", "Oz"}
	ringL := []string{"Fpz", "Fp1", "AF7", "F7", "FT7", "T7", "TP7", "P7", "PO7", "O1", "Oz"}
	for _, r := range [][]string{ringR, ringL} {
		step := pos(t, r[0]).Sub(pos(t, r[1])).Norm()
		for i := 1; i < len(r); i++ {
			near(r[i-1]+"–"+r[i]+" chord", pos(t, r[i-1]).Sub(pos(t, r[i])).Norm(), step)
			near(r[i]+" elevation", elevation(pos(t, r[i])), 18)
		}
	}
	// Coronal rows: neighbours equally spaced along the row.
	rows := [][]string{
		{"F7", "F5", "F3", "F1", "Fz", "F2", "F4", "F6", "F8"},
		{"FT7", "FC5", "FC3", "FC1", "FCz", "FC2", "FC4", "FC6", "FT8"},
		{"T7", "C5", "C3", "C1", "Cz", "C2", "C4", "C6", "T8"},
		{"TP7", "CP5", "CP3", "CP1", "CPz", "CP2", "CP4", "CP6", "TP8"},
		{"P7", "P5", "P3", "P1", "Pz", "P2", "P4", "P6", "P8"},
		{"AF7", "AF3", "AFz", "AF4", "AF8"},
		{"PO7", "PO3", "POz", "PO4", "PO8"},
	}
	for _, r := range rows {
		step := pos(t, r[0]).Sub(pos(t, r[1])).Norm()
		for i := 1; i < len(r); i++ {
			near(r[i-1]+"–"+r[i], pos(t, r[i-1]).Sub(pos(t, r[i])).Norm(), step)
		}
	}
	// The C row is the great circle T7–Cz–T8: 10 % steps of 18°.
	near("C3 elevation", elevation(pos(t, "C3")), 54)
	near("C1–Cz", pos(t, "C1").Angle(cz)/deg, 18)
	// Equator electrodes under their 10 % ring neighbours.
	for _, pair := range [][2]string{{"F9", "F7"}, {"FT10", "FT8"}, {"T9", "T7"}, {"TP9", "TP7"}, {"P10", "P8"}, {"Nz", "Fpz"}, {"Iz", "Oz"}} {
		e, r := pos(t, pair[0]), pos(t, pair[1])
		near(pair[0]+" elevation", elevation(e), 0)
		near(pair[0]+" azimuth", math.Atan2(e[0], e[1]), math.Atan2(r[0], r[1]))
	}
}

func TestPositionsSymmetryAndNames(t *testing.T) {
	names := Names1010()
	if len(names) < 70 {
		t.Fatalf("only %d names", len(names))
	}
	for _, n := range names {
		p := pos(t, n)
		if math.Abs(p.Norm()-1) > 1e-12 {
			t.Errorf("%s off the unit sphere: %v", n, p)
		}
		// Mirror partner: odd ↔ even number, z ↔ z.
		if strings.HasSuffix(n, "z") || n == "Nz" || n == "Iz" {
			if math.Abs(p[0]) > 1e-12 {
				t.Errorf("%s not midline", n)
			}
		}
	}
	pairs := [][2]string{{"Fp1", "Fp2"}, {"F3", "F4"}, {"FC5", "FC6"}, {"CP1", "CP2"}, {"P9", "P10"}, {"PO3", "PO4"}, {"O1", "O2"}, {"A1", "A2"}, {"M1", "M2"}, {"AF3", "AF4"}}
	for _, pr := range pairs {
		l, r := pos(t, pr[0]), pos(t, pr[1])
		if l[0] >= 0 || math.Abs(l[0]+r[0]) > 1e-12 || math.Abs(l[1]-r[1]) > 1e-12 || math.Abs(l[2]-r[2]) > 1e-12 {
			t.Errorf("%s %v and %s %v are not left/right mirror images", pr[0], l, pr[1], r)
		}
	}
	// Old 10-20 names and case.
	for old, nw := range map[string]string{"T3": "T7", "t4": "T8", "T5": "P7", "T6": "P8", "FP1": "Fp1", " cz ": "Cz"} {
		if pos(t, old) != pos(t, nw) {
			t.Errorf("%s ≠ %s", old, nw)
		}
	}
	got, missing := Positions([]string{"Fz", "X1", "Cz", "EKG"})
	if len(got) != 2 || len(missing) != 2 || missing[0] != "X1" {
		t.Errorf("Positions: %v missing %v", got, missing)
	}
}
