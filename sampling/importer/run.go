package importer

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/candidate"
)

// RejectsFile is the name of the rejection list inside the import's folder.
const RejectsFile = "rejected.csv"

// Run imports the events of o.Files (or of the archive's EDF+ annotations), measures
// them with o.Measure, and writes OutDir/import=<source>/<recording_id>.parquet per
// recording plus rejected.csv. Every table is written atomically, and nothing is
// written unless every recording with events was measured. Rows tied to no recording,
// or with an onset outside the recording, are rejected, not fatal; a file that cannot
// be read as a table, a missing column, or a bad option is an error.
func Run(ctx context.Context, o Options) (*Result, error) {
	pattern, err := checkOptions(&o)
	if err != nil {
		return nil, err
	}
	res := &Result{Source: "import:" + o.Source, Dir: filepath.Join(o.OutDir, "import="+o.Source)}
	old, err := earlierImport(res.Dir)
	if err != nil {
		return nil, err
	}
	if len(old) > 0 && !o.Replace {
		return nil, &ExistsError{Dir: res.Dir}
	}
	rs := newResolver(o.Recordings)
	evs, err := gather(ctx, &o, rs, pattern, res)
	if err != nil {
		return nil, err
	}
	res.Read = len(evs)

	byRec := map[int][]placed{}
	for _, ev := range evs {
		p, rej := place(ev, rs)
		if rej != nil {
			res.Rejected = append(res.Rejected, *rej)
			continue
		}
		byRec[p.rec] = append(byRec[p.rec], p)
	}
	recs := make([]int, 0, len(byRec))
	for i := range byRec {
		recs = append(recs, i)
	}
	slices.SortFunc(recs, func(a, b int) int { return strings.Compare(o.Recordings[a].RecordingID, o.Recordings[b].RecordingID) })

	tables := make([][]candidate.Row, len(recs))
	for k, i := range recs {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		rec := o.Recordings[i]
		period := samplePeriod(rec)
		ps, n := mergeDuplicates(byRec[i], period)
		res.Merged += n
		onsets := make([]float64, len(ps))
		for j, p := range ps {
			onsets[j] = p.onset
		}
		rows, notes, err := o.Measure(rec, onsets)
		if err != nil {
			return nil, &measureError{RecordingID: rec.RecordingID, Err: err}
		}
		if len(rows) != len(onsets) {
			return nil, &measureError{RecordingID: rec.RecordingID,
				Err: fmt.Errorf("%d rows for %d onsets: want one row per onset", len(rows), len(onsets))}
		}
		for _, s := range notes {
			res.Notes = append(res.Notes, rec.RecordingID+": "+s)
		}
		for j := range rows {
			r := &rows[j]
			r.RecordingID, r.SubjectKey, r.Source = rec.RecordingID, rec.SubjectKey, res.Source
			// The id names the team's event (its onset as imported), not the peak the
			// measurement settles on, so a re-import keeps ids whatever the measurer does.
			r.EventID = candidate.EventID(rec.RecordingID, res.Source, int64(math.Round(ps[j].onset/period)))
			r.Imported = ps[j].score
			if r.PeakChannel == "" {
				r.PeakChannel = ps[j].channel
			}
		}
		tables[k] = rows
	}

	if err := os.MkdirAll(res.Dir, 0o755); err != nil {
		return nil, err
	}
	written := map[string]bool{}
	for k, i := range recs {
		id := o.Recordings[i].RecordingID
		name := id + ".parquet"
		if id == "" || name != filepath.Base(name) || strings.HasPrefix(id, ".") || strings.ContainsAny(id, `/\`) {
			return nil, &optionError{Field: "Recordings", Value: id, Want: "recording ids usable as file names"}
		}
		p := filepath.Join(res.Dir, name)
		if err := candidate.Write(p, tables[k]); err != nil {
			return nil, err
		}
		written[name] = true
		res.Files = append(res.Files, p)
		res.Kept += len(tables[k])
	}
	res.Rejects = filepath.Join(res.Dir, RejectsFile)
	if err := writeRejects(res.Rejects, res.Rejected); err != nil {
		return nil, err
	}
	for _, name := range old {
		if name != RejectsFile && !written[name] {
			if err := os.Remove(filepath.Join(res.Dir, name)); err != nil && !errors.Is(err, os.ErrNotExist) {
				return nil, err
			}
		}
	}
	return res, nil
}

// earlierImport lists the tables and rejection list an earlier import left in dir.
func earlierImport(dir string) ([]string, error) {
	ents, err := os.ReadDir(dir)
	if errors.Is(err, os.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var out []string
	for _, e := range ents {
		n := e.Name()
		if !e.IsDir() && !strings.HasPrefix(n, ".") && (filepath.Ext(n) == ".parquet" || n == RejectsFile) {
			out = append(out, n)
		}
	}
	return out, nil
}

// checkOptions validates o and compiles its pattern (nil when none applies).
func checkOptions(o *Options) (*regexp.Regexp, error) {
	if !safeSource.MatchString(o.Source) {
		return nil, &optionError{Field: "Source", Value: o.Source,
			Want: "a detector name of lower-case letters, digits, '.', '_' or '-', starting with a letter or digit, at most 64 characters"}
	}
	if o.Measure == nil {
		return nil, &optionError{Field: "Measure", Value: "nil", Want: "a function measuring the criterion features"}
	}
	if o.OutDir == "" {
		return nil, &optionError{Field: "OutDir", Value: "", Want: "the study's candidates folder"}
	}
	if len(o.Recordings) == 0 {
		return nil, &optionError{Field: "Recordings", Value: "0 recordings", Want: "the archive index's recordings"}
	}
	switch o.Kind {
	case KindCSV, KindTSV, KindBIDS:
		if len(o.Files) == 0 {
			return nil, &optionError{Field: "Files", Value: "", Want: "at least one event file"}
		}
		if o.Recording != "" && len(o.Files) > 1 {
			return nil, &optionError{Field: "Recording", Value: o.Recording,
				Want: fmt.Sprintf("a single event file, not %d: give the others a recording column or mapping", len(o.Files))}
		}
	case KindEDFAnnotations:
		if o.Pattern == "" {
			return nil, &optionError{Field: "Pattern", Value: "", Want: "a pattern selecting annotation texts, e.g. spike|sharp"}
		}
		if o.Recording != "" {
			return nil, &optionError{Field: "Recording", Value: o.Recording, Want: "nothing for edf-annotations: name recordings in Files"}
		}
	default:
		return nil, &optionError{Field: "Kind", Value: o.Kind, Want: "csv, tsv, bids or edf-annotations"}
	}
	if o.Pattern == "" {
		return nil, nil
	}
	if o.Kind == KindCSV || o.Kind == KindTSV {
		return nil, &optionError{Field: "Pattern", Value: o.Pattern, Want: "no pattern: it selects bids trial_type and edf-annotations texts"}
	}
	expr := o.Pattern
	if !o.CaseSensitive {
		expr = "(?i)" + expr
	}
	re, err := regexp.Compile(expr)
	if err != nil {
		return nil, &optionError{Field: "Pattern", Value: o.Pattern, Want: "a Go regular expression: " + err.Error()}
	}
	return re, nil
}
