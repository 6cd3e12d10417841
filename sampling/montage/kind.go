package montage

import "fmt"

// Kind is a montage family.
type Kind int

const (
	// Referential shows each electrode against the recording reference.
	Referential Kind = iota
	// CommonAverage shows each electrode minus the mean of all good scalp
	// electrodes (Offner 1950, "The EEG as potential mapping: the value of
	// the average monopolar reference", Electroencephalogr Clin
	// Neurophysiol 2:213–214; from memory).
	CommonAverage
	// LongitudinalBipolar chains neighbouring electrodes front to back
	// ("double banana").
	LongitudinalBipolar
	// TransverseBipolar chains neighbouring electrodes left to right.
	TransverseBipolar
)

var kindNames = [...]string{"referential", "common-average", "longitudinal-bipolar", "transverse-bipolar"}

// String returns the name ParseKind accepts.
func (k Kind) String() string {
	if k >= 0 && int(k) < len(kindNames) {
		return kindNames[k]
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// ParseKind is the inverse of String.
func ParseKind(s string) (Kind, error) {
	for i, n := range kindNames {
		if s == n {
			return Kind(i), nil
		}
	}
	return 0, &kindError{Name: s}
}

// kindError reports an unknown montage name.
type kindError struct{ Name string }

func (e *kindError) Error() string {
	return fmt.Sprintf("montage: unknown kind %q (want one of %v)", e.Name, kindNames)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *kindError) Unwrap() error { return ErrInput }
