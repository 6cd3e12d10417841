package export

import (
	"context"
	"errors"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/panel/agreement"
	"github.com/quorate-eeg/quorate/tuning/accuracy"
)

// readEventsCSV parses events.csv back into rows.
func readEventsCSV(t *testing.T, path string) []EventRow {
	rows := readCSV(t, path)
	fs := fieldsOf(reflect.TypeFor[EventRow]())
	out := make([]EventRow, len(rows)-1)
	for r, rec := range rows[1:] {
		v := reflect.ValueOf(&out[r]).Elem()
		for i, f := range fs {
			parseCell(t, v.Field(f.index), rec[i])
		}
	}
	return out
}

// TestStatisticsFromExport recomputes Fleiss' kappa per criterion (Fleiss 1971, with
// panel/agreement) and the k-of-6 sensitivity and specificity, design-weighted (with
// tuning/accuracy), from the exported events table alone, and compares them with the
// same statistics computed from the source tables: the raw ratings (hidden duplicates
// left out) and the candidate table.
func TestStatisticsFromExport(t *testing.T) {
	f := newFixture(t, 60)
	dir, _ := runExport(t, f.opts, "csv", false)
	events := readEventsCSV(t, filepath.Join(dir, "events.csv"))
	sort.Slice(events, func(i, j int) bool { return events[i].EventID < events[j].EventID })

	// Fleiss' kappa per criterion.
	for k := range 6 {
		var fromExport [][]int
		for _, e := range events {
			v := reflect.ValueOf(e)
			p := v.FieldByName("C" + string(rune('1'+k)) + "Present").Interface().(*int32)
			a := v.FieldByName("C" + string(rune('1'+k)) + "Absent").Interface().(*int32)
			if p != nil {
				fromExport = append(fromExport, []int{int(*a), int(*p)})
			}
		}
		ce, err := agreement.CountsFromRows(fromExport)
		if err != nil {
			t.Fatal(err)
		}
		got := agreement.FleissKappa(ce, nil)

		raters := map[string]int{}
		items := map[string]int{}
		for _, e := range events {
			items[e.EventID] = len(items)
		}
		for _, r := range f.opts.Ratings {
			if _, ok := raters[r.Rater]; !ok {
				raters[r.Rater] = len(raters)
			}
		}
		tab := make([][]int, len(items))
		for i := range tab {
			tab[i] = make([]int, len(raters))
			for j := range tab[i] {
				tab[i][j] = agreement.Missing
			}
		}
		for _, r := range f.opts.Ratings {
			a := r.Criteria()[k]
			if r.Duplicate || a == nil {
				continue
			}
			tab[items[r.EventID]][raters[r.Rater]] = map[bool]int{false: 0, true: 1}[*a]
		}
		tb, err := agreement.NewTable(tab, 2)
		if err != nil {
			t.Fatal(err)
		}
		want := agreement.FleissKappa(tb.Counts(), nil)
		if math.IsNaN(want) || math.Abs(got-want) > 1e-12 {
			t.Errorf("c%d: kappa from export %v, from ratings %v", k+1, got, want)
		}
	}

	// k-of-6 rules against the panel reference, weighted by the design weights.
	var crit [][]bool
	var truth []bool
	var w []float64
	for _, e := range events {
		if e.Kind != "candidate" || e.RefPanel == nil {
			continue
		}
		crit = append(crit, []bool{*e.C1Met, *e.C2Met, *e.C3Met, *e.C4Met, *e.C5Met, *e.C6Met})
		truth = append(truth, *e.RefPanel)
		w = append(w, e.Weight)
	}
	verdict := map[string]string{}
	for _, c := range f.opts.Consensus {
		verdict[c.EventID] = c.Verdict
	}
	weight := map[string]float64{}
	for _, d := range f.opts.Draw {
		weight[d.EventID] = d.Weight
	}
	cands := append(f.opts.Candidates[:0:0], f.opts.Candidates...)
	sort.Slice(cands, func(i, j int) bool { return cands[i].EventID < cands[j].EventID })
	var scrit [][]bool
	var struth []bool
	var sw []float64
	for _, c := range cands {
		v := verdict[c.EventID]
		if v != "epileptiform" && v != "not-epileptiform" { // the returns' words (FORMAT.md)
			continue
		}
		m := c.Met()
		scrit = append(scrit, m[:])
		struth = append(struth, v == "epileptiform")
		sw = append(sw, weight[c.EventID])
	}
	got, want := accuracy.KSweep(crit, truth, w), accuracy.KSweep(scrit, struth, sw)
	if len(got) != 6 || !reflect.DeepEqual(got, want) {
		t.Errorf("k-of-6 from export %v\nfrom source %v", got, want)
	}
	for k := range got {
		if got[k].Sensitivity() != want[k].Sensitivity() || got[k].Specificity() != want[k].Specificity() {
			t.Errorf("k=%d: sens/spec differ", k+1)
		}
	}
}

// TestBadInput checks the refusals: unknown format (listing the allowed ones), a
// non-empty folder without Replace, Replace moving the old folder aside intact, and a
// missing earlier step named with its command.
func TestBadInput(t *testing.T) {
	f := newFixture(t, 4)
	o := f.opts
	o.To, o.Format = filepath.Join(t.TempDir(), "x"), "xlsx"
	_, err := Run(context.Background(), o)
	var fe *formatError
	if !errors.As(err, &fe) || fe.Got != "xlsx" || !strings.Contains(err.Error(), "parquet, csv, bids") {
		t.Errorf("unknown format: %v", err)
	}

	o.Format = "csv"
	if err := os.MkdirAll(o.To, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(o.To, "notes.txt"), []byte("keep me"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), o)
	var ne *notEmptyError
	if !errors.As(err, &ne) {
		t.Errorf("non-empty folder: %v", err)
	}
	// Replace moves only an earlier export: a folder without the marker stays.
	o.Replace = true
	var nx *notExportError
	if _, err := Run(context.Background(), o); !errors.As(err, &nx) {
		t.Errorf("replace of a folder that is not an export: %v", err)
	}
	if b, err := os.ReadFile(filepath.Join(o.To, "notes.txt")); err != nil || string(b) != "keep me" {
		t.Errorf("the folder was touched: %v", err)
	}
	o.To = filepath.Join(t.TempDir(), "y")
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(o.To, "notes.txt"), []byte("keep me"), 0o644)
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	if b, err := os.ReadFile(filepath.Join(res.MovedAside, "notes.txt")); err != nil || string(b) != "keep me" {
		t.Errorf("old folder not kept at %q: %v", res.MovedAside, err)
	}
	if _, err := os.Stat(filepath.Join(o.To, "notes.txt")); err == nil {
		t.Error("old file left in the new export")
	}

	for _, c := range []struct {
		drop  func(*Options)
		table string
	}{
		{func(o *Options) { o.Draw = nil }, InputDraw},
		{func(o *Options) { o.Consensus = nil }, InputConsensus},
		{func(o *Options) { o.Recordings = nil }, InputIndex},
	} {
		o := f.opts
		o.To, o.Format = filepath.Join(t.TempDir(), "y"), "parquet"
		c.drop(&o)
		_, err := Run(context.Background(), o)
		var me *MissingStepError
		// The domain names the missing table, not the command that makes it.
		if !errors.As(err, &me) || me.Table != c.table || !strings.Contains(err.Error(), "no "+c.table) || strings.Contains(err.Error(), "quorate") {
			t.Errorf("missing step: %v, want one naming %s", err, c.table)
		}
		if _, err := os.Stat(o.To); err == nil {
			t.Error("a refused export created its folder")
		}
	}

	o = f.opts
	o.To, o.Format, o.EpochMontage = filepath.Join(t.TempDir(), "z"), "csv", "laplacian"
	var oe *optionError
	if _, err := Run(context.Background(), o); !errors.As(err, &oe) || !errors.Is(err, ErrOption) {
		t.Errorf("unknown montage: %v", err)
	}
}
