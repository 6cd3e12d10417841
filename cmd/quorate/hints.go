package main

import (
	"errors"
	"fmt"

	"github.com/quorate-eeg/quorate/export"
	"github.com/quorate-eeg/quorate/panel/excerpt"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
	"github.com/quorate-eeg/quorate/sampling/importer"
	"github.com/quorate-eeg/quorate/tuning"
)

// Domain errors name the missing input in the domain's words; the commands that make
// that input and the flags that change the outcome are named here, in one place.

// sentinelHints gives, for each domain sentinel, what the user can do about it.
var sentinelHints = []struct {
	err  error
	hint string
}{
	{candidate.ErrNoCandidates, "run quorate detect or quorate import-events first"},
	{draw.ErrDrawExists, "use --top-up N to add events or --replace to start over (the old draw is kept beside the new one)"},
	{draw.ErrNoDraw, "run a first draw without --top-up"},
	{archive.ErrNoRoots, "add them to study.yaml (archive.roots) or pass --archive"},
	{merge.ErrNoManifest, "run quorate packets first"},
	{tuning.ErrNoEvents, "run quorate merge first"},
	{tuning.ErrNoReference, "run quorate merge first, or choose another --reference"},
	{export.ErrNotEmpty, "choose another --to, or add --replace (the old folder is moved aside, not deleted)"},
}

// stepOf is the command that makes each table an export needs.
var stepOf = map[string]string{
	export.InputIndex:     "quorate scan",
	export.InputDraw:      "quorate draw",
	export.InputRatings:   "quorate merge",
	export.InputConsensus: "quorate merge",
}

// tuneFlagOf is the tune flag that sets each tuning.Options field an InputError names.
var tuneFlagOf = map[string]string{"Folds": "--folds", "Method": "--method", "Bootstrap": "--bootstrap"}

// hintFor is the command-layer advice for err, or "" when there is none.
func hintFor(err error) string {
	for _, h := range sentinelHints {
		if errors.Is(err, h.err) {
			return h.hint
		}
	}
	var (
		option   *tuning.InputError
		missing  *export.MissingStepError
		packets  *packet.ExistsError
		imported *importer.ExistsError
		gone     *excerpt.MissingError
	)
	switch {
	case errors.As(err, &option) && option.Index < 0 && tuneFlagOf[option.Field] != "":
		return "change " + tuneFlagOf[option.Field]
	case errors.As(err, &missing) && stepOf[missing.Table] != "":
		return "run " + stepOf[missing.Table] + " first"
	case errors.As(err, &packets):
		return "add --replace to move the earlier packets aside (they are kept)"
	case errors.As(err, &imported):
		return "add --replace to overwrite it"
	case errors.As(err, &gone):
		return "run quorate scan, or restore them"
	}
	return ""
}

// hintError is a domain error with the command layer's advice after it.
type hintError struct {
	err  error
	hint string
}

func (e hintError) Error() string { return fmt.Sprintf("%v; %s", e.err, e.hint) }
func (e hintError) Unwrap() error { return e.err }

// withHint adds the command-layer advice to err, when there is some.
func withHint(err error) error {
	if err == nil {
		return nil
	}
	if h := hintFor(err); h != "" {
		return hintError{err, h}
	}
	return err
}

// recordingHint is the advice for imported rows that could not be tied to a recording.
const recordingHint = "give --recording for a file without a recording column, or --bids-recording ENTITIES=RECORDING"
