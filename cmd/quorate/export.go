package main

import (
	"context"
	"crypto/rand"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math/big"
	"os"
	"sort"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/tuning"
)

type exportFlags struct {
	to, format, montage, reference string
	window                         float64
	epochs, replace, shift, notes  bool
}

// dateShiftFile keeps each subject's date offset, so that every export of the study
// shifts a subject's dates alike; it sits beside the secret and is never exported.
const dateShiftFile = ".quorate/date-shifts.json"

func newExportCmd(g *globals) *cobra.Command {
	f := &exportFlags{}
	cmd := &cobra.Command{
		Use:   "export",
		Short: "Export the labelled reference set for research (Parquet, CSV or BIDS)",
		Long: `export writes the reference set for the tools researchers already use: an events table
(one row per drawn event: ids, onset, region, every feature, the automatic decision per
criterion, the panel's votes and majority per criterion, the labels under each reference
standard, the Dawid–Skene probability, stratum, inclusion probability and design weight,
and the operating point's decision when tune has run), the ratings (long form), the
recordings, and a data dictionary (data-dictionary.md and schema.json).

Only subject keys and recording ids leave the study: no patient identification, file name
or path. Dates are reduced to the year unless --shift-dates moves them by a per-subject
offset kept in the study. --epochs adds the raw samples around each event.`,
		Example: `  quorate --study /studies/ied-2027 export --to /shared/ied-2027-v1 --format parquet --epochs
  quorate --study /studies/ied-2027 export --to /shared/ied-2027-bids --format bids --shift-dates`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			if f.to == "" {
				return usageError{fmt.Errorf("--to: the export folder is required")}
			}
			return runExport(cmd.Context(), g, s, f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.to, "to", "", "export folder (must not exist or be empty, unless --replace)")
	fl.StringVar(&f.format, "format", "parquet", "parquet | csv | bids")
	fl.BoolVar(&f.epochs, "epochs", false, "add the raw samples around each event (epochs.parquet)")
	fl.Float64Var(&f.window, "epoch-window", 10, "epoch length in seconds, centred on the event")
	fl.StringVar(&f.montage, "epoch-montage", "common-average", "epoch montage: referential, common-average, longitudinal-bipolar, transverse-bipolar")
	fl.BoolVar(&f.replace, "replace", false, "move an existing export folder aside (it is kept, never deleted)")
	fl.BoolVar(&f.shift, "shift-dates", false, "move all dates by a per-subject random offset kept in the study")
	fl.BoolVar(&f.notes, "comments", false, "include raters' free-text comments (they may carry names: check them first)")
	fl.StringVar(&f.reference, "reference", "", "external reference table for the ref_external column (event_id,reference or subject_key,reference)")
	return cmd
}

func runExport(ctx context.Context, g *globals, s *study.Study, f *exportFlags) error {
	recs, err := readIndex(s)
	if err != nil {
		return missingOr(err, export.InputIndex)
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		return missingOr(err, export.InputDraw)
	}
	ratings, err := merge.ReadRatings(s.Path(study.ConsensusDir, merge.RatingsFile))
	if err != nil {
		return missingOr(err, export.InputRatings)
	}
	cons, err := merge.ReadConsensus(s.Path(study.ConsensusDir, merge.ConsensusFile))
	if err != nil {
		return missingOr(err, export.InputConsensus)
	}
	cands, err := candidate.ReadDir(s.Path(study.CandidatesDir))
	if err != nil {
		return err
	}
	info := make([]export.DrawInfo, len(rows))
	for i, r := range rows {
		info[i] = export.DrawInfo{EventID: r.EventID, Stratum: r.Stratum, Kind: r.Kind, Pi: r.Pi, Weight: r.Weight,
			Phase: int(r.Phase), RecordingID: r.RecordingID, SubjectKey: r.SubjectKey, OnsetS: r.OnsetS}
		if r.Kind == draw.KindControl {
			info[i].OnsetS = r.OnsetS - s.Config.Draw.ControlEpochS/2
		}
	}
	o := export.Options{To: f.to, Format: f.format, Replace: f.replace, Epochs: f.epochs, EpochWindowS: f.window,
		EpochMontage: f.montage, ShiftDates: f.shift, Protect: append([]string{s.Dir}, s.Config.Archive.Roots...), Comments: f.notes, Recordings: recs, ArchiveRoots: s.Config.Archive.Roots,
		Candidates: cands, Draw: info, Ratings: ratings, Consensus: cons, Progress: g.progress}
	opPath := s.Path(study.TuningDir, report.PointFile)
	if op, err := report.ReadOperatingPoint(opPath); err == nil {
		dec := map[string]bool{}
		for _, c := range cands {
			if v, ok := op.Decide(c.Features(), c.Score); ok {
				dec[c.EventID] = v
			}
		}
		if len(dec) > 0 {
			o.OperatingPoint = &export.OPDecision{Rule: op.Rule, Headline: op.HeadlineWords(), Decision: dec}
		}
	}
	if f.reference != "" {
		ids := make([]string, len(rows))
		subj := map[string]string{}
		for i, r := range rows {
			ids[i], subj[r.EventID] = r.EventID, r.SubjectKey
		}
		ext, err := tuning.ReadExternalReference(f.reference, ids, subj)
		if err != nil {
			return err
		}
		o.External = map[string]*bool{}
		for id, v := range ext {
			if v >= 0 {
				b := v == 1
				o.External[id] = &b
			}
		}
	}
	if f.shift {
		if o.DateShiftDays, err = dateShifts(s, recs); err != nil {
			return err
		}
	}
	res, err := export.Run(ctx, o)
	if err != nil {
		return err
	}
	inputs := s.Hash(s.Path(study.IndexDir, archive.IndexFile), s.Path(study.DrawDir, draw.DrawFile),
		s.Path(study.ConsensusDir, merge.RatingsFile), s.Path(study.ConsensusDir, merge.ConsensusFile), s.Path(study.CandidatesDir))
	if err := s.Record(study.Entry{Version: Version, Command: "export", Argv: g.argv, Inputs: inputs, Outputs: s.Hash(res.Dir),
		Notes: map[string]any{"format": f.format, "events": res.Events, "ratings": res.Ratings, "epochs": res.Epochs, "moved_aside": res.MovedAside}}); err != nil {
		return err
	}
	fmt.Fprintf(g.stdout, "Exported %d events, %d ratings and %d recordings as %s to %s (%d files; columns explained in data-dictionary.md).\n",
		res.Events, res.Ratings, res.Recordings, f.format, res.Dir, len(res.Files))
	return nil
}

// missingOr names the missing table when its file is absent (hints.go adds the
// command that makes it); any other read error (a damaged file) is reported as it
// is, not as a missing step.
func missingOr(err error, table string) error {
	if errors.Is(err, fs.ErrNotExist) {
		return &export.MissingStepError{Table: table}
	}
	return err
}

// dateShifts returns each subject's offset in days, making new ones (uniform in
// −1095…−365 days, from the operating system's random source) for subjects that have none
// and saving them in the study.
func dateShifts(s *study.Study, recs []archive.Recording) (map[string]int, error) {
	path := s.Path(dateShiftFile)
	shifts := map[string]int{}
	// Only a file that is not there yet starts afresh: new offsets over old ones would
	// make two exports of one study disagree on dates.
	b, err := os.ReadFile(path)
	switch {
	case err == nil:
		if err := json.Unmarshal(b, &shifts); err != nil {
			return nil, fmt.Errorf("%s: %w (the offsets are not made again; restore the file from a backup)", path, err)
		}
	case !errors.Is(err, fs.ErrNotExist):
		return nil, fmt.Errorf("reading the date offsets: %w (they are not made again)", err)
	}
	var subjects []string
	for _, r := range recs {
		subjects = append(subjects, r.SubjectKey)
	}
	sort.Strings(subjects)
	changed := false
	for _, k := range subjects {
		if _, ok := shifts[k]; ok {
			continue
		}
		n, err := rand.Int(rand.Reader, big.NewInt(731))
		if err != nil {
			return nil, err
		}
		shifts[k] = -365 - int(n.Int64())
		changed = true
	}
	if changed {
		b, _ := json.MarshalIndent(shifts, "", "  ")
		if err := atomicfile.WriteBytes(path, append(b, '\n'), 0o600); err != nil {
			return nil, err
		}
	}
	return shifts, nil
}
