package report

import (
	"context"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/parquet-go/parquet-go"
	"github.com/quorate-eeg/quorate/internal/jsonx"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/tuning"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

func result(t *testing.T) *tuning.Result {
	t.Helper()
	rng := rand.New(rand.NewPCG(8, 9))
	var ev []tuning.Event
	for s := range 20 {
		for k := range 25 {
			e := tuning.Event{EventID: fmt.Sprintf("e%d-%d", s, k), Subject: fmt.Sprintf("s%d", s), Kind: "candidate", Stratum: "a", Weight: 2}
			ied := rng.Float64() < 0.35
			p := 0.25
			if ied {
				e.Reference, p = 1, 0.75
			}
			for j := range 6 {
				if rng.Float64() < p {
					e.Majority[j] = 1
					e.Features[j] = 1.3
				}
				e.Features[j] += rng.NormFloat64()
				e.Score += e.Features[j] / 6
			}
			if e.Score > 0.6 {
				e.Stratum, e.Weight = "b", 1.25
			}
			e.Features[5] = math.NaN() // an unmeasured feature must not break the report
			ev = append(ev, e)
		}
	}
	res, err := tuning.Run(context.Background(), tuning.Options{Events: ev, RecordingHours: 40,
		Policy: accuracy.Policy{Kind: accuracy.Youden}, Bootstrap: 100, Seed: 1, ReferenceName: "panel majority verdict"})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func agreementFixture() *consensus.Agreement {
	e := consensus.Estimate{Value: 0.61, Lo: 0.5, Hi: jsonx.Float(math.NaN())}
	return &consensus.Agreement{Raters: []string{"r1", "r2", "r3"}, Events: 500, Subjects: 20, Level: 0.95,
		Questions: []consensus.QuestionAgreement{{Question: "verdict", Items: 500, Observed: e, Fleiss: e, FleissBand: "substantial", AC1: e, Alpha: e}}}
}

func TestWrite(t *testing.T) {
	res := result(t)
	dir := t.TempDir()
	meta := Meta{StudyID: "demo", Version: "v0.0.0-test", Generated: time.Date(2026, 1, 2, 3, 4, 5, 0, time.UTC),
		InputHashes: map[string]string{"consensus/consensus.parquet": strings.Repeat("ab", 32)}}
	if err := Write(dir, res, agreementFixture(), meta); err != nil {
		t.Fatal(err)
	}

	// operating-point.json parses (encoding/json rejects NaN, so NaN must be null).
	b, err := os.ReadFile(filepath.Join(dir, PointFile))
	if err != nil {
		t.Fatal(err)
	}
	var op map[string]any
	if err := json.Unmarshal(b, &op); err != nil {
		t.Fatalf("operating-point.json: %v", err)
	}
	if op["rule"] != res.Final.Rule || op["policy"] != "youden" || op["reference_standard"] != "panel majority verdict" {
		t.Errorf("operating point header: rule %v policy %v reference %v", op["rule"], op["policy"], op["reference_standard"])
	}
	if h, ok := op["headline"].(map[string]any); !ok || h["method"] == "" || h["sensitivity"] == nil || h["false_per_hour"] == nil {
		t.Errorf("operating point lacks the headline with its method: %v", op["headline"])
	}
	if op["cross_validated"] == nil || op["bootstrap"] == nil || op["input_sha256"] == nil {
		t.Error("operating point lacks cross-validated, bootstrap or input hashes")
	}
	cut := op["cutoffs"].([]any)
	if len(cut) != 7 { // six criteria and the score's vote (the default method)
		t.Fatalf("%d cutoffs", len(cut))
	}
	if c := cut[6].(map[string]any); c["criterion"] != 0.0 || c["feature"] != ScoreFeature || c["met_when"] != ">=" {
		t.Errorf("the score's cutoff reads %v", c)
	}

	// sweep.parquet reads back row for row.
	rows, err := parquet.ReadFile[SweepRow](filepath.Join(dir, SweepFile))
	if err != nil {
		t.Fatal(err)
	}
	want := SweepRows(res)
	if len(rows) != len(want) || len(rows) < 6+249 {
		t.Fatalf("sweep.parquet has %d rows, want %d", len(rows), len(want))
	}
	for i := range rows {
		if rows[i].Analysis != want[i].Analysis || rows[i].Rule != want[i].Rule || rows[i].TP != want[i].TP || rows[i].WFP != want[i].WFP {
			t.Fatalf("row %d = %+v, want %+v", i, rows[i], want[i])
		}
	}

	h, err := os.ReadFile(filepath.Join(dir, HTMLFile))
	if err != nil {
		t.Fatal(err)
	}
	html := string(h)
	checkHTML(t, html)
	if !strings.Contains(html, "Fleiss") || !strings.Contains(html, "substantial") {
		t.Error("agreement summary missing")
	}
	md, err := os.ReadFile(filepath.Join(dir, MarkdownFile))
	if err != nil {
		t.Fatal(err)
	}
	if i := strings.Index(string(md), Caution); i < 0 || i > 400 {
		t.Errorf("caution not near the top of report.md (at %d)", i)
	}
	if e, i := strings.Index(string(md), "to expect on new recordings"), strings.Index(string(md), "In sample, unweighted"); e < 0 || e > i {
		t.Error("report.md does not lead with the figures to expect on new recordings")
	}
	if !strings.Contains(string(md), res.Final.Rule) {
		t.Error("report.md lacks the rule")
	}
	if !strings.Contains(string(md), res.Final.Analysis) || !strings.Contains(string(md), "detector score (one more vote): score ≥ ") {
		t.Error("report.md does not say how the automatic rule was fitted or lacks the score's cutoff")
	}
}

var tagRe = regexp.MustCompile(`<(/?)(html|head|body|table|tr|figure|ul|h1|h2|h3)\b`)

// checkHTML makes the structural checks the standard library allows: the
// caution near the top, balanced container tags, every inline SVG
// well-formed XML (encoding/xml), and no external resource of any kind.
func checkHTML(t *testing.T, html string) {
	t.Helper()
	if !strings.HasPrefix(html, "<!DOCTYPE html>") || !strings.HasSuffix(strings.TrimSpace(html), "</html>") {
		t.Error("not a complete HTML document")
	}
	if i := strings.Index(html, Caution); i < 0 || i > 3000 {
		t.Errorf("caution not near the top (at %d)", i)
	}
	depth := map[string]int{}
	for _, m := range tagRe.FindAllStringSubmatch(html, -1) {
		if m[1] == "/" {
			depth[m[2]]--
		} else {
			depth[m[2]]++
		}
	}
	for tag, d := range depth {
		if d != 0 {
			t.Errorf("<%s> unbalanced by %d", tag, d)
		}
	}
	n := 0
	for rest := html; ; {
		i := strings.Index(rest, "<svg")
		if i < 0 {
			break
		}
		j := strings.Index(rest[i:], "</svg>")
		if j < 0 {
			t.Fatal("unterminated <svg>")
		}
		frag := rest[i : i+j+len("</svg>")]
		d := xml.NewDecoder(strings.NewReader(frag))
		for {
			if _, err := d.Token(); err != nil {
				if err.Error() != "EOF" {
					t.Errorf("svg %d: %v", n, err)
				}
				break
			}
		}
		n++
		rest = rest[i+j:]
	}
	if n < 3 {
		t.Errorf("%d inline SVG figures, want at least 3", n)
	}
	// XML namespace names are identifiers, not fetched; anything else with a
	// scheme, or any src/href/url()/@import, would load from outside.
	clean := regexp.MustCompile(`xmlns(:\w+)?="[^"]*"`).ReplaceAllString(html, "")
	for _, bad := range []string{"http:", "https:", "src=", "href=", "url(", "@import", "//cdn"} {
		if strings.Contains(clean, bad) {
			t.Errorf("report.html contains %q", bad)
		}
	}
}

func TestWriteNoResult(t *testing.T) {
	if err := Write(t.TempDir(), nil, nil, Meta{}); err == nil {
		t.Error("nil result accepted")
	}
}

func TestOperatingPointDecide(t *testing.T) {
	op := &OperatingPoint{K: 2, Cutoffs: []CutoffJSON{
		{Criterion: 1, Met: ">=", Value: 5}, {Criterion: 3, Met: "<=", Value: 1.2}, {Criterion: 6, Met: ">=", Value: 0.8},
		{Criterion: 2, Met: "left out"},
	}}
	nan := math.NaN()
	cases := []struct {
		f    [6]float64
		want bool
	}{
		{[6]float64{6, 0, 1.0, 0, 0, 0.5}, true},   // c1 and c3 met
		{[6]float64{6, 99, 2.0, 0, 0, 0.5}, false}, // only c1 (c2 left out)
		{[6]float64{nan, 0, 1.0, 0, 0, 0.9}, true}, // c3 and c6
		{[6]float64{5, 0, 1.2, 0, 0, nan}, true},   // cutoffs are inclusive
		{[6]float64{nan, 0, nan, 0, 0, 0.9}, false},
	}
	for _, c := range cases {
		got, ok := op.Decide(c.f, 100) // no score cutoff: the score never counts
		if !ok || got != c.want {
			t.Errorf("Decide(%v) = %v, %v; want %v", c.f, got, ok, c.want)
		}
	}
	// With the score as one more vote, one criterion and the score make two.
	op.Cutoffs = append(op.Cutoffs, CutoffJSON{Criterion: 0, Feature: ScoreFeature, Met: ">=", Value: 0.7})
	for _, c := range []struct {
		score float64
		want  bool
	}{{0.7, true}, {0.69, false}, {math.NaN(), false}} {
		if got, ok := op.Decide([6]float64{6, 99, 2.0, 0, 0, 0.5}, c.score); !ok || got != c.want {
			t.Errorf("Decide(only c1, score %v) = %v, %v; want %v", c.score, got, ok, c.want)
		}
	}
	if _, ok := (&OperatingPoint{K: 4, Cutoffs: []CutoffJSON{{Criterion: 1, Met: "left out"}}}).Decide([6]float64{}, 1); ok {
		t.Error("a point without cutoffs claimed a decision")
	}
}

// The panel's warnings (outstanding packets, events without the quorum, slight verdict
// agreement: merge.Readiness) stand in both reports before the operating point.
func TestWarningsLeadTheReport(t *testing.T) {
	res := result(t)
	res.Warnings = append([]string{"2 of 3 packets are outstanding (7 items owed): the reference rests on part of the panel",
		"the panel's verdict agreement is slight (Fleiss' kappa 0.15): the reference standard is weak"}, res.Warnings...)
	dir := t.TempDir()
	if err := Write(dir, res, agreementFixture(), Meta{StudyID: "demo"}); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{HTMLFile, MarkdownFile} {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		s := string(b)
		op := strings.Index(s, "The chosen operating point")
		for _, w := range res.Warnings[:2] {
			if name == HTMLFile {
				w = strings.ReplaceAll(w, "'", "&#39;") // html/template's escape of '
			}
			if i := strings.Index(s, w); i < 0 || i > op {
				t.Errorf("%s: warning %q at %d, operating point at %d", name, w, i, op)
			}
		}
	}
	if b, _ := os.ReadFile(filepath.Join(dir, HTMLFile)); strings.Count(string(b), "<h2>Warnings</h2>") != 1 {
		t.Error("report.html: want one Warnings section")
	}
}
