package synth

// Kind is the signal type of a channel.
type Kind int

const (
	EEG Kind = iota
	ECG
	EOG
)

func (k Kind) String() string {
	switch k {
	case EEG:
		return "eeg"
	case ECG:
		return "ecg"
	case EOG:
		return "eog"
	}
	return "unknown"
}

// State is a vigilance state of the subject.
type State string

const (
	Awake  State = "awake"
	Drowsy State = "drowsy"
)

// StateSpan is a half-open interval [Start, End) in seconds spent in State.
type StateSpan struct {
	State      State
	Start, End float64
}

// Recording is a whole synthetic recording held in memory.
type Recording struct {
	Labels []string
	Kinds  []Kind
	Rate   float64
	Data   [][]float32 // [channel][sample], µV
	Truth  []Event     // ordered by Onset
	States []StateSpan
}
