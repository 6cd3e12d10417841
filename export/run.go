package export

import (
	"context"
	"io"
	"path/filepath"
	"slices"
	"sort"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/montage"
)

// Run writes the export described by o into o.To. It checks everything it can before
// touching the folder, so a refused export leaves no trace.
func Run(ctx context.Context, o Options) (*Result, error) {
	if !slices.Contains(Formats, o.Format) {
		return nil, &formatError{Got: o.Format, Allowed: Formats}
	}
	if o.To == "" {
		return nil, &optionError{Option: "to", Value: "", Want: "an export folder"}
	}
	if o.EpochWindowS == 0 {
		o.EpochWindowS = DefaultEpochWindowS
	}
	if o.EpochMontage == "" {
		o.EpochMontage = DefaultEpochMontage
	}
	kind, err := montage.ParseKind(o.EpochMontage)
	if err != nil {
		return nil, &optionError{Option: "epoch montage", Value: o.EpochMontage,
			Want: "referential, common-average, longitudinal-bipolar or transverse-bipolar"}
	}
	if !(o.EpochWindowS > 0) {
		return nil, &optionError{Option: "epoch window", Value: formatFloat(o.EpochWindowS), Want: "a positive number of seconds"}
	}
	switch {
	case len(o.Recordings) == 0:
		return nil, &MissingStepError{Table: InputIndex}
	case len(o.Draw) == 0:
		return nil, &MissingStepError{Table: InputDraw}
	case len(o.Consensus) == 0:
		return nil, &MissingStepError{Table: InputConsensus}
	}
	events, err := buildEvents(&o)
	if err != nil {
		return nil, err
	}
	ratings := buildRatings(&o)
	recordings, err := buildRecordings(&o)
	if err != nil {
		return nil, err
	}

	res := &Result{Dir: filepath.Clean(o.To), Events: len(events), Ratings: len(ratings), Recordings: len(recordings)}
	st, err := stage(res.Dir, o.Replace, o.Protect)
	if err != nil {
		return nil, err
	}
	if err := write(ctx, &o, st.tmp, kind, events, ratings, recordings, res); err != nil {
		st.abort()
		return nil, err
	}
	if res.MovedAside, err = st.commit(o.Format); err != nil {
		return nil, err
	}
	return res, nil
}

// write writes every file of the export into dir.
func write(ctx context.Context, o *Options, dir string, kind montage.Kind, events []EventRow, ratings []RatingRow, recordings []RecordingRow, res *Result) (err error) {
	put := func(name string, fn func(io.Writer) error) error {
		res.Files = append(res.Files, name)
		return atomicfile.Write(filepath.Join(dir, name), 0o644, fn)
	}

	dict := &Dictionary{Format: o.Format, Missing: map[string]string{"parquet": "null", "csv": "empty cell", "bids": "n/a"}[o.Format], DatesShifted: o.ShiftDates}
	if o.OperatingPoint != nil {
		dict.OperatingPoint, dict.OperatingPointHeadline = o.OperatingPoint.Rule, o.OperatingPoint.Headline
	}
	switch o.Format {
	case "parquet":
		dict.Tables = Tables("parquet", o.Epochs)
		err = firstErr(
			func() error {
				return put(EventsFile+".parquet", func(w io.Writer) error { return writeParquet(w, events) })
			},
			func() error {
				return put(RatingsFile+".parquet", func(w io.Writer) error { return writeParquet(w, ratings) })
			},
			func() error {
				return put(RecordingsFile+".parquet", func(w io.Writer) error { return writeParquet(w, recordings) })
			})
	case "csv":
		dict.Tables = Tables("csv", o.Epochs)
		err = firstErr(
			func() error { return put(EventsFile+".csv", func(w io.Writer) error { return writeCSV(w, events) }) },
			func() error { return put(RatingsFile+".csv", func(w io.Writer) error { return writeCSV(w, ratings) }) },
			func() error {
				return put(RecordingsFile+".csv", func(w io.Writer) error { return writeCSV(w, recordings) })
			})
	case "bids":
		dict.Tables = BIDSTables(o.Epochs)
		var files []string
		files, err = writeBIDS(dir, o, events)
		res.Files = append(res.Files, files...)
	}
	if err != nil {
		return err
	}
	if o.Epochs {
		dict.EpochWindowS, dict.EpochMontage = o.EpochWindowS, kind.String()
		byRec := slices.Clone(events)
		sort.SliceStable(byRec, func(i, j int) bool { return byRec[i].RecordingID < byRec[j].RecordingID })
		bar := progress.Bar(progress.Silent{})
		if o.Progress != nil {
			bar = o.Progress(len(byRec), "epochs")
		}
		var st epochStats
		err = put(EpochsFile, func(w io.Writer) error {
			var err error
			st, err = writeEpochs(ctx, w, o, kind, byRec, bar)
			return err
		})
		bar.Finish()
		if err != nil {
			return err
		}
		res.Epochs, res.Padded = st.rows, st.padded
	}
	if err := put(DictionaryMD, func(w io.Writer) error { return writeDictionaryMD(w, dict) }); err != nil {
		return err
	}
	if err := put(DictionaryJSON, func(w io.Writer) error { return writeSchemaJSON(w, dict) }); err != nil {
		return err
	}
	sort.Strings(res.Files)
	return nil
}

func firstErr(fns ...func() error) error {
	for _, f := range fns {
		if err := f(); err != nil {
			return err
		}
	}
	return nil
}
