package main

import (
	"context"
	"fmt"
	"math"
	"path/filepath"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/detect"
	"github.com/quorate-eeg/quorate/sampling/edf"
	"github.com/quorate-eeg/quorate/sampling/importer"
)

type importFlags struct {
	kind, mapping, pattern, source, recording string
	bidsMap                                   map[string]string
	caseSensitive, replace                    bool
}

func newImportEventsCmd(g *globals) *cobra.Command {
	f := &importFlags{}
	cmd := &cobra.Command{
		Use:   "import-events FILE...",
		Short: "Import a detector's events and measure the same six criterion features for them",
		Long: `import-events brings in the events of a team's own detector so that the panel, the tuner
and the export treat them like built-in candidates. Inputs:

  --kind csv|tsv     a table; --map names its columns: recording (recording id, archive path
                     or file name), onset (seconds from the start, or clock time with
                     onset-format=clock), and optionally channel and score
  --kind bids        BIDS events.tsv files (onset, duration, trial_type); --recording or
                     --bids-recording sub-01=REC ties them to recordings; --pattern selects
                     trial types
  --kind edf-annotations
                     annotations of the archive's EDF+ recordings whose text matches --pattern
                     (no FILE needed)

The same features are computed for every imported event; rows that match no recording or
fall outside it are listed with the reason in candidates/import=SOURCE/rejected.csv.`,
		Example: `  quorate --study /studies/ied-2027 import-events spikes.csv --kind csv --source ward-detector --map recording=file,onset=time,score=prob,onset-format=clock
  quorate --study /studies/ied-2027 import-events --kind edf-annotations --pattern 'spike|sharp' --source technologist-marks`,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			return runImport(cmd.Context(), g, s, f, args)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.kind, "kind", "csv", "csv | tsv | bids | edf-annotations")
	fl.StringVar(&f.mapping, "map", "", "column mapping: recording=COL,onset=COL[,channel=COL][,score=COL][,onset-format=seconds|clock]")
	fl.StringVar(&f.pattern, "pattern", "", "regular expression selecting BIDS trial types or EDF+ annotation texts")
	fl.BoolVar(&f.caseSensitive, "case-sensitive", false, "match --pattern with letter case")
	fl.StringVar(&f.source, "source", "", "name of the detector (lower-case letters, digits, '.', '_', '-')")
	fl.StringVar(&f.recording, "recording", "", "the recording every row of a single file belongs to")
	fl.StringToStringVar(&f.bidsMap, "bids-recording", nil, "BIDS entities to recording, e.g. sub-01=rec-3f2a…")
	fl.BoolVar(&f.replace, "replace", false, "replace an earlier import of the same source")
	cmd.MarkFlagRequired("source")
	return cmd
}

func runImport(ctx context.Context, g *globals, s *study.Study, f *importFlags, files []string) error {
	var m importer.Mapping
	if f.mapping != "" {
		var err error
		if m, err = importer.ParseMapping(f.mapping); err != nil {
			return usageError{err}
		}
	}
	indexPath := s.Path(study.IndexDir, archive.IndexFile)
	recs, err := readIndex(s)
	if err != nil {
		return fmt.Errorf("no archive index yet (run quorate scan first): %w", err)
	}
	c := s.Config
	roots := c.Archive.Roots
	notch := c.Signal.NotchHz
	if notch == 0 {
		notch = -1
	}
	opts := detect.Options{Montage: c.Signal.Montage, Bandpass: c.Signal.Bandpass, NotchHz: notch,
		ThresholdMAD: c.Detect.ThresholdMAD, BackgroundS: c.Detect.BackgroundS, MergeMS: c.Detect.MergeWindowMS,
		Source: "import:" + f.source}
	measure := func(rec archive.Recording, onsets []float64) ([]candidate.Row, []string, error) {
		rd, err := edf.Open(filepath.Join(roots[rec.Root], filepath.FromSlash(rec.Path)))
		if err != nil {
			return nil, nil, err
		}
		defer rd.Close()
		o := opts
		o.Recordings = []archive.Recording{rec}
		rows, notes, err := detect.MeasureAt(rd, onsets, o)
		if err != nil {
			return nil, notes, err
		}
		return alignRows(onsets, rows), notes, nil
	}
	res, err := importer.Run(ctx, importer.Options{Files: files, Kind: f.kind, Mapping: m, Pattern: f.pattern,
		CaseSensitive: f.caseSensitive, Recording: f.recording, BIDSRecordings: f.bidsMap, Source: f.source,
		Recordings: recs, Roots: roots, Measure: measure, OutDir: s.Path(study.CandidatesDir), Replace: f.replace})
	if err != nil {
		return err
	}
	for _, n := range res.Notes {
		g.warn("import-events", "%s", n)
	}
	for _, r := range res.Rejected {
		if r.Field == "recording" {
			g.warn("import-events", "%s", recordingHint)
			break
		}
	}
	if err := s.Record(study.Entry{Version: Version, Command: "import-events", Argv: g.argv,
		Inputs: append(s.Hash(files...), s.Hash(indexPath)...), Outputs: s.Hash(res.Dir),
		Notes: map[string]any{"source": res.Source, "read": res.Read, "kept": res.Kept, "merged": res.Merged, "rejected": len(res.Rejected)}}); err != nil {
		return err
	}
	fmt.Fprintf(g.stdout, "Imported %d of %d events from %s (%d merged as duplicates, %d rejected: see %s).\n",
		res.Kept, res.Read, res.Source, res.Merged, len(res.Rejected), res.Rejects)
	if res.Kept == 0 {
		g.warn("import-events", "no event was kept")
		return g.finish(1 + len(res.Rejected))
	}
	return g.finish(len(res.Rejected) + len(res.Notes))
}

// alignRows returns one row per onset: the measured row whose peak lies within the
// search span of that onset, or, where the measurement found none (an onset in an EDF+D
// gap), a row at the onset with every feature unmeasured (NaN) and no criterion met.
func alignRows(onsets []float64, rows []candidate.Row) []candidate.Row {
	out := make([]candidate.Row, len(onsets))
	j := 0
	for i, t := range onsets {
		if j < len(rows) && math.Abs(rows[j].OnsetS-t) <= 0.1+1e-6 {
			out[i] = rows[j]
			j++
			continue
		}
		nan := math.NaN()
		out[i] = candidate.Row{OnsetS: t, C1DurationMS: nan, C1Sharpness: nan, C2DurationLogRatio: nan, C2BackgroundMS: nan,
			C3Asymmetry: nan, C3RiseMS: nan, C3FallMS: nan, C4SlowWaveRatio: nan, C5Disruption: nan, C6DipoleGOF: nan,
			C6DipoleX: nan, C6DipoleY: nan, C6DipoleZ: nan, AmplitudeUV: nan, Score: nan, State: "unknown"}
	}
	return out
}
