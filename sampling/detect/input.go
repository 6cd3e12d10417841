package detect

import (
	"github.com/quorate-eeg/quorate/sampling/signal"
)

// Input is one contiguous stretch of a multichannel recording at one sampling
// rate: a whole EDF/EDF+C recording, one EDF+D segment, or any streaming source
// (a generator, a test fixture). Detect reads it window by window through Src,
// never all at once.
type Input struct {
	RecordingID string
	SubjectKey  string
	Labels      []string     // normalised 10-10 names, one per channel of Src
	PhysRange   [][2]float64 // physical [min, max] per channel; nil skips the saturation check
	Rate        float64      // samples per second
	Len         int64        // samples per channel
	Src         signal.Source
	StartS      float64 // time of sample 0, seconds from the recording start
	FirstSample int64   // index of sample 0 in the recording, for event ids
	// States are the vigilance spans the recording's annotations give,
	// seconds from the recording start (nil when it gives none): each row's
	// State, and the stretch whose spectrum criterion 2 reads.
	States []StateSpan
	// SplitMap says the channels' potentials are relative to more than one
	// mean (electrodes recovered from bipolar derivations in groups no
	// derivation links, edf.Recovered): a voltage map across the groups
	// is not a field, so criterion 6 is not measured.
	SplitMap bool
}
