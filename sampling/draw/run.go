package draw

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// File names inside the draw folder.
const (
	DrawFile   = "draw.parquet"
	DesignFile = "design.json"
	StrataFile = "strata.csv"
)

// Options configure a draw (Run).
type Options struct {
	Candidates []candidate.Row
	Recordings []archive.Recording
	OutDir     string
	Design     Design
	// Controls is the number of background epochs to draw (0 for none), of
	// ControlEpochS seconds, at least ControlDistS seconds from any candidate.
	Controls      int
	ControlEpochS float64
	ControlDistS  float64
	TopUp         int // >0: add this many events to the existing draw as a new phase
	// Adaptive, with TopUp, allocates the new phase from the panel's
	// returns per stratum (TopUpAdaptive); nil repeats the design's
	// allocation (TopUp).
	Adaptive map[string]PhaseEstimate
	Replace  bool // replace an existing draw, keeping the old files beside the new
}

// RunResult summarises a draw.
type RunResult struct {
	Rows     []Row
	Strata   []StratumSummary
	Warnings []Warning
	Eligible int // eligible control epochs (M)
	Replaced string
	Phase    PhaseRecord // the phase this run drew
}

// savedDesign is design.json: what a top-up needs to repeat the design exactly.
type savedDesign struct {
	Strata        string             `json:"strata"`
	Method        string             `json:"allocation"`
	N             int                `json:"n"`
	Min           int                `json:"min_per_stratum"`
	SDColumn      string             `json:"sd_column,omitempty"`
	SD            map[string]float64 `json:"sd,omitempty"`
	Table         map[string]int     `json:"table,omitempty"`
	Cap           int                `json:"subject_cap"`
	Seed          uint64             `json:"seed"`
	Controls      int                `json:"controls"`
	ControlEpochS float64            `json:"control_epoch_s"`
	ControlDistS  float64            `json:"control_min_distance_s"`
	Prior         map[string]float64 `json:"prior_prevalence,omitempty"`
	PriorColumn   string             `json:"prior_column,omitempty"`
	PriorAt       float64            `json:"prior_at,omitempty"`
	Phases        []PhaseRecord      `json:"phases,omitempty"`
}

// ErrDrawExists is returned when a draw exists and neither TopUp nor Replace is set.
var ErrDrawExists = errors.New("a draw already exists")

// ErrNoDraw is returned when TopUp is set and there is no draw to add to.
var ErrNoDraw = errors.New("no draw to top up")

// Run draws events (and background controls) and writes draw.parquet, design.json and
// strata.csv. An existing draw is never silently replaced.
func Run(ctx context.Context, o Options) (*RunResult, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if o.TopUp < 0 {
		return nil, fmt.Errorf("top-up: got %d events, want at least 1", o.TopUp)
	}
	if o.Controls < 0 || o.ControlEpochS < 0 || o.ControlDistS < 0 {
		return nil, fmt.Errorf("background controls: got %d epochs of %g s at %g s from candidates, want numbers ≥ 0", o.Controls, o.ControlEpochS, o.ControlDistS)
	}
	out := filepath.Join(o.OutDir, DrawFile)
	_, statErr := os.Stat(out)
	exists := statErr == nil
	if exists && o.TopUp == 0 && !o.Replace {
		return nil, fmt.Errorf("%s: %w", out, ErrDrawExists)
	}
	if !exists && o.TopUp > 0 {
		return nil, fmt.Errorf("%s: %w", out, ErrNoDraw)
	}
	if len(o.Candidates) == 0 {
		return nil, candidate.ErrNoCandidates
	}
	f := FrameOf(o.Candidates)
	onset := make(map[string]float64, len(o.Candidates))
	for _, c := range o.Candidates {
		onset[c.EventID] = c.OnsetS
	}
	res := &RunResult{}
	var rows []Row
	if o.TopUp > 0 {
		prev, err := ReadRows(out)
		if err != nil {
			return nil, err
		}
		d, err := readDesign(filepath.Join(o.OutDir, DesignFile))
		if err != nil {
			return nil, err
		}
		o.Design = d
		prevDrawn := make([]Drawn, len(prev))
		maxPhase := 0
		for i, r := range prev {
			prevDrawn[i] = Drawn{EventID: r.EventID, Stratum: r.Stratum, Subject: r.SubjectKey, Recording: r.RecordingID,
				Pi: r.Pi, Weight: r.Weight, Phase: int(r.Phase), Order: int(r.Order), Kind: r.Kind}
			onset[r.EventID] = r.OnsetS
			maxPhase = max(maxPhase, int(r.Phase))
		}
		draw := TopUp
		if o.Adaptive != nil {
			draw = func(f *Frame, d Design, prev []Drawn, n int, seed uint64) (*Result, error) {
				return TopUpAdaptive(f, d, prev, n, seed, o.Adaptive)
			}
		}
		dr, err := draw(f, d, prevDrawn, o.TopUp, d.Seed+uint64(maxPhase))
		if err != nil {
			return nil, err
		}
		res.Strata, res.Warnings, res.Phase = dr.Strata, dr.Warnings, dr.Phase
		for _, x := range dr.Drawn {
			rows = append(rows, rowOf(x, onset[x.EventID]))
		}
	} else {
		dr, err := Draw(f, o.Design)
		if err != nil {
			return nil, err
		}
		res.Strata, res.Warnings, res.Phase = dr.Strata, dr.Warnings, dr.Phase
		for _, x := range dr.Drawn {
			rows = append(rows, rowOf(x, onset[x.EventID]))
		}
		if o.Controls > 0 {
			ctl, m, err := drawControls(o, o.Controls)
			var ce *controlError
			if errors.As(err, &ce) && m < o.Controls {
				// Fewer eligible epochs than asked for: take them all, as a stratum smaller
				// than its allocation is taken whole, and say so.
				res.Warnings = append(res.Warnings, Warning{Stratum: "control",
					Msg: fmt.Sprintf("only %d background epochs lie %.3g s or more from every candidate; all of them are drawn instead of %d", m, o.ControlDistS, o.Controls)})
				ctl, m, err = drawControls(o, m)
			}
			if err != nil {
				return nil, err
			}
			res.Eligible = m
			next := len(rows)
			for _, c := range ctl {
				d := c.Drawn()
				d.Order += next
				rows = append(rows, rowOf(d, c.Onset+o.ControlEpochS/2))
			}
		}
	}
	sort.Slice(rows, func(i, j int) bool { return rows[i].Order < rows[j].Order })
	res.Rows = rows
	// Whatever replaces draw.parquet keeps the earlier one: a replaced draw is moved
	// aside whole, a topped-up one is copied first (its design.json stays in force).
	if exists && o.Replace {
		old, err := keepAside(o.OutDir, "replaced", true)
		if err != nil {
			return nil, err
		}
		res.Replaced = old
	} else if exists {
		old, err := keepAside(o.OutDir, "before-top-up", false)
		if err != nil {
			return nil, err
		}
		res.Replaced = old
	}
	if err := WriteRows(out, rows); err != nil {
		return nil, err
	}
	if o.TopUp == 0 {
		if err := writeDesign(filepath.Join(o.OutDir, DesignFile), o, res.Phase); err != nil {
			return nil, err
		}
	} else if err := appendPhase(filepath.Join(o.OutDir, DesignFile), res.Phase); err != nil {
		return nil, err
	}
	return res, writeStrata(filepath.Join(o.OutDir, StrataFile), res.Strata)
}

func rowOf(d Drawn, onset float64) Row {
	return Row{EventID: d.EventID, Kind: d.Kind, Stratum: d.Stratum, SubjectKey: d.Subject, RecordingID: d.Recording,
		OnsetS: onset, Pi: d.Pi, Weight: d.Weight, Phase: int32(d.Phase), Order: int32(d.Order)}
}

func drawControls(o Options, m int) ([]Control, int, error) {
	spans := make([]RecordingSpan, 0, len(o.Recordings))
	for _, r := range o.Recordings {
		spans = append(spans, RecordingSpan{ID: r.RecordingID, Subject: r.SubjectKey, Duration: r.DurationS})
	}
	onsets := map[string][]float64{}
	for _, c := range o.Candidates {
		onsets[c.RecordingID] = append(onsets[c.RecordingID], c.OnsetS)
	}
	return DrawControls(spans, onsets, o.ControlEpochS, o.ControlDistS, m, o.Design.Seed)
}

// keepAside keeps the current draw files as draw.TAG-N.* (moved, or copied when move is
// false) so that nothing is lost, and returns the kept draw.parquet's path.
func keepAside(dir, tag string, move bool) (string, error) {
	for n := 1; ; n++ {
		t := fmt.Sprintf("%s-%d", tag, n)
		dst := filepath.Join(dir, "draw."+t+".parquet")
		if _, err := os.Lstat(dst); err == nil {
			continue
		}
		for _, name := range []string{DrawFile, DesignFile, StrataFile} {
			src := filepath.Join(dir, name)
			ext := filepath.Ext(name)
			to := filepath.Join(dir, strings.TrimSuffix(name, ext)+"."+t+ext)
			if _, err := os.Stat(src); err != nil {
				continue
			}
			if move {
				if err := os.Rename(src, to); err != nil {
					return "", err
				}
				continue
			}
			b, err := os.ReadFile(src)
			if err != nil {
				return "", err
			}
			if err := atomicfile.Create(to, b, 0o644); err != nil {
				return "", err
			}
		}
		return dst, nil
	}
}

func writeDesign(path string, o Options, phase PhaseRecord) error {
	a := o.Design.Alloc
	sd := savedDesign{Strata: FormatStrata(o.Design.Strata), Method: a.Method.String(), N: a.N, Min: a.Min,
		SDColumn: a.SDColumn, SD: a.SD, Table: a.Table, Cap: o.Design.Cap, Seed: o.Design.Seed,
		Controls: o.Controls, ControlEpochS: o.ControlEpochS, ControlDistS: o.ControlDistS,
		Prior: a.Prior, PriorColumn: a.PriorColumn, PriorAt: a.PriorAt, Phases: []PhaseRecord{phase}}
	return saveDesign(path, sd)
}

// appendPhase adds a top-up's record to design.json, keeping all else.
func appendPhase(path string, phase PhaseRecord) error {
	b, err := os.ReadFile(path)
	if err != nil {
		return err
	}
	var sd savedDesign
	if err := json.Unmarshal(b, &sd); err != nil {
		return fmt.Errorf("%s: %w", path, err)
	}
	sd.Phases = append(sd.Phases, phase)
	return saveDesign(path, sd)
}

func saveDesign(path string, sd savedDesign) error {
	b, err := json.MarshalIndent(sd, "", "  ")
	if err != nil {
		return err
	}
	return atomicfile.WriteBytes(path, append(b, '\n'), 0o644)
}

func readDesign(path string) (Design, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return Design{}, err
	}
	var sd savedDesign
	if err := json.Unmarshal(b, &sd); err != nil {
		return Design{}, fmt.Errorf("%s: %w", path, err)
	}
	specs, err := ParseStrata(sd.Strata)
	if err != nil {
		return Design{}, fmt.Errorf("%s: strata: %w", path, err)
	}
	m, err := ParseMethod(sd.Method)
	if err != nil {
		return Design{}, fmt.Errorf("%s: %w", path, err)
	}
	return Design{Strata: specs, Cap: sd.Cap, Seed: sd.Seed,
		Alloc: Allocation{Method: m, N: sd.N, Min: sd.Min, SDColumn: sd.SDColumn, SD: sd.SD, Table: sd.Table,
			Prior: sd.Prior, PriorColumn: sd.PriorColumn, PriorAt: sd.PriorAt}}, nil
}

// ParseMethod reads an allocation name: equal, proportional, neyman, accuracy or table.
func ParseMethod(s string) (Method, error) {
	for _, m := range []Method{Equal, Proportional, Neyman, Accuracy, Table} {
		if m.String() == s {
			return m, nil
		}
	}
	return 0, fmt.Errorf("allocation: got %q, want equal, proportional, neyman, accuracy or table", s)
}

func writeStrata(path string, ss []StratumSummary) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		fmt.Fprintln(w, "stratum,candidates,after_cap,drawn")
		for _, s := range ss {
			fmt.Fprintf(w, "%q,%d,%d,%d\n", s.Label, s.N, s.Capped, s.Sample)
		}
		return nil
	})
}

// FrameOf turns candidate rows into a draw frame: every numeric column of the candidate
// table can stratify or pilot a Neyman allocation, every text column can be a category.
func FrameOf(rows []candidate.Row) *Frame {
	f := &Frame{ID: make([]string, len(rows)), Subject: make([]string, len(rows)), Recording: make([]string, len(rows)),
		Num: map[string][]float64{}, Cat: map[string][]string{}}
	t := reflect.TypeOf(candidate.Row{})
	skip := map[string]bool{"event_id": true, "recording_id": true, "subject_key": true}
	type col struct {
		i    int
		name string
		kind reflect.Kind
	}
	var cols []col
	for i := range t.NumField() {
		name, _, _ := strings.Cut(t.Field(i).Tag.Get("parquet"), ",")
		k := t.Field(i).Type.Kind()
		if skip[name] || name == "" {
			continue
		}
		switch k {
		case reflect.Float64, reflect.Int32:
			f.Num[name] = make([]float64, len(rows))
		case reflect.String:
			f.Cat[name] = make([]string, len(rows))
		case reflect.Bool:
			f.Cat[name] = make([]string, len(rows))
		default:
			continue
		}
		cols = append(cols, col{i, name, k})
	}
	for r := range rows {
		f.ID[r], f.Subject[r], f.Recording[r] = rows[r].EventID, rows[r].SubjectKey, rows[r].RecordingID
		v := reflect.ValueOf(&rows[r]).Elem()
		for _, c := range cols {
			fv := v.Field(c.i)
			switch c.kind {
			case reflect.Float64:
				f.Num[c.name][r] = fv.Float()
			case reflect.Int32:
				f.Num[c.name][r] = float64(fv.Int())
			case reflect.String:
				f.Cat[c.name][r] = fv.String()
			case reflect.Bool:
				f.Cat[c.name][r] = fmt.Sprint(fv.Bool())
			}
		}
	}
	return f
}
