package main

import (
	"bytes"
	"encoding/json"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestPlanAndAdaptiveTopUpOnDemo(t *testing.T) {
	if testing.Short() {
		t.Skip("demo-based test skipped in -short mode")
	}
	out := filepath.Join(t.TempDir(), "demo")
	runDemoForTest(t, out, "3")
	st := filepath.Join(out, "study")
	run := func(args ...string) (string, error) {
		var buf bytes.Buffer
		g := &globals{argv: append([]string{"quorate"}, args...), stdout: &buf}
		root := newRoot(g)
		root.SetArgs(append([]string{"--quiet", "--study", st}, args...))
		err := root.Execute()
		return buf.String(), err
	}
	o, err := run("plan", "--allocation", "accuracy", "--sizes", "50,100", "--raters", "5")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"expected IEDs", "sensitivity ±", "rater-hours", "not a diagnostic device"} {
		if !strings.Contains(o, want) {
			t.Errorf("plan output lacks %q:\n%s", want, o)
		}
	}
	// (100 events + the study's 30 controls) × 5 raters × 30 s = 5.4 rater-hours.
	found := false
	for _, line := range strings.Split(o, "\n") {
		if f := strings.Fields(line); len(f) > 0 && f[0] == "100" && f[len(f)-1] == "5.4" {
			found = true
		}
	}
	if !found {
		t.Errorf("plan output lacks the 100-event row with 5.4 rater-hours:\n%s", o)
	}
	if _, err := run("draw", "--top-up", "-10"); err == nil {
		t.Error("draw --top-up -10 accepted")
	}
	if o, err := run("draw", "--top-up", "40", "--adaptive"); err != nil {
		t.Fatal(err)
	} else if !strings.Contains(o, "Phase 2: drew 40 more events") || strings.Contains(o, "of 0 eligible") {
		// A top-up draws no controls; it once reported "of 0 eligible epochs".
		t.Errorf("top-up summary:\n%s", o)
	}
	b, err := os.ReadFile(filepath.Join(st, "draw", draw.DesignFile))
	if err != nil {
		t.Fatal(err)
	}
	var d struct {
		Phases []struct {
			Phase  int    `json:"phase"`
			Method string `json:"allocation"`
		} `json:"phases"`
	}
	if err := json.Unmarshal(b, &d); err != nil || len(d.Phases) != 2 || d.Phases[1].Method != "accuracy (adaptive)" {
		t.Errorf("design.json phases %+v, %v", d.Phases, err)
	}
	if o, err := run("plan", "--prevalence", "returns", "--sizes", "100"); err != nil || !strings.Contains(o, "expected IEDs") {
		t.Errorf("plan --prevalence returns: %v\n%s", err, o)
	}
}
