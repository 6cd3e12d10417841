package detect

import (
	"context"
	"fmt"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// featuresGolden holds every candidate's features on the generated
// recordings of seeds 1–4 (10 min each, default options), one row per
// line as featureLine writes it, made by the code before the speed work
// on the running median, block scales, filter kernels, channel quality
// and dipole fit (commit 3f3b9dc). That work changes how the values are
// computed, not what they are, so they must agree bit for bit. Rewritten
// (QUORATE_GOLDEN=write) when c3 became the 20–80 % transition-duration
// ratio read between samples, which changed c3_asymmetry, auto_count and
// score and nothing else (FEATURES.md, c3), and again when the main
// phase's amplitude of negative peaks was corrected, which changed the
// candidates (TestMainPhaseAmplitudeSign).
const featuresGolden = "testdata/features_golden.txt"

// featureNames names featureLine's fields after the seed and onset.
var featureNames = strings.Fields("peak_channel polarity n_channels c1_duration_ms c1_sharpness c1_phases " +
	"c2_duration_log_ratio c2_background_ms c3_asymmetry c3_rise_ms c3_fall_ms c4_slow_wave_ratio " +
	"c5_disruption c6_dipole_gof c6_dipole_x c6_dipole_y c6_dipole_z c6_orientation c6_field_extent score auto_count")

// featureLine writes one row's features, floats with 17 significant
// digits so that they read back exactly.
func featureLine(seed uint64, r candidate.Row) string {
	return fmt.Sprintf("%d %.17g %s %s %d %.17g %.17g %d %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %s %d %.17g %d",
		seed, r.OnsetS, r.PeakChannel, r.Polarity, len(r.Channels), r.C1DurationMS, r.C1Sharpness, r.C1Phases,
		r.C2DurationLogRatio, r.C2BackgroundMS, r.C3Asymmetry, r.C3RiseMS, r.C3FallMS, r.C4SlowWaveRatio,
		r.C5Disruption, r.C6DipoleGOF, r.C6DipoleX, r.C6DipoleY, r.C6DipoleZ, orientOrDash(r.C6Orientation), r.C6FieldExtent, r.Score, r.AutoCount)
}

func orientOrDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// TestFeaturesUnchanged detects on the generated recordings of seeds 1–4
// and compares every row with featuresGolden: the same events (seed and
// onset), and every feature within 1e-9 relative (bit for bit on amd64; the
// margin allows for fused multiply–add on other processors). It logs, per
// feature, the number of rows that differ at all and the largest absolute
// and relative difference (FEATURES.md, speed). When a feature's definition
// changes on purpose, write the file again with QUORATE_GOLDEN=write and
// say so in the commit.
func TestFeaturesUnchanged(t *testing.T) {
	var lines []string
	for _, seed := range []uint64{1, 2, 3, 4} {
		rows, _, err := Detect(context.Background(), inputOf(generated(t, seed, 10)), Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range rows {
			lines = append(lines, featureLine(seed, r))
		}
	}
	if os.Getenv("QUORATE_GOLDEN") == "write" {
		if err := os.WriteFile(featuresGolden, []byte(strings.Join(lines, "\n")+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		t.Skipf("wrote %s (%d rows)", featuresGolden, len(lines))
	}
	b, err := os.ReadFile(featuresGolden)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][]string{}
	var order []string
	for _, l := range strings.Split(strings.TrimSpace(string(b)), "\n") {
		f := strings.Fields(l)
		want[f[0]+" "+f[1]] = f[2:]
		order = append(order, f[0]+" "+f[1])
	}
	got := map[string][]string{}
	for _, l := range lines {
		f := strings.Fields(l)
		got[f[0]+" "+f[1]] = f[2:]
	}
	if len(got) != len(want) {
		t.Errorf("%d events, golden %d", len(got), len(want))
	}
	type diff struct {
		n        int
		abs, rel float64
	}
	diffs := make([]diff, len(featureNames))
	for _, k := range order {
		g, ok := got[k]
		if !ok {
			t.Errorf("event seed/onset %s of the golden file not found", k)
			continue
		}
		for i, w := range want[k] {
			if g[i] == w {
				continue
			}
			diffs[i].n++
			x, err1 := strconv.ParseFloat(w, 64)
			y, err2 := strconv.ParseFloat(g[i], 64)
			if err1 != nil || err2 != nil || math.IsNaN(x) != math.IsNaN(y) {
				t.Errorf("event %s %s: %s, golden %s", k, featureNames[i], g[i], w)
				continue
			}
			d := math.Abs(x - y)
			diffs[i].abs = max(diffs[i].abs, d)
			diffs[i].rel = max(diffs[i].rel, d/max(math.Abs(x), 1e-300))
		}
	}
	for i, d := range diffs {
		t.Logf("%-22s rows differing %d, max |Δ| %.3g, max relative %.3g", featureNames[i], d.n, d.abs, d.rel)
		if d.rel > 1e-9 {
			t.Errorf("%s changed: max |Δ| %.3g, relative %.3g", featureNames[i], d.abs, d.rel)
		}
	}
}
