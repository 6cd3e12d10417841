package consensus

import "fmt"

// Decision is the panel's decision on one question for one event.
type Decision int8

const (
	Absent Decision = iota
	Present
	Undetermined // a tie under the "undetermined" policy
	NoQuorum     // fewer answers than the quorum
)

func (d Decision) String() string {
	switch d {
	case Absent:
		return "absent"
	case Present:
		return "present"
	case Undetermined:
		return "undetermined"
	case NoQuorum:
		return "no-quorum"
	}
	return fmt.Sprintf("Decision(%d)", int8(d))
}

// TiePolicy says what a tied vote counts as.
type TiePolicy int8

const (
	TieAbsent TiePolicy = iota
	TiePresent
	TieUndetermined
)

// ParseTiePolicy reads "absent", "present" or "undetermined".
func ParseTiePolicy(s string) (TiePolicy, error) {
	switch s {
	case "absent":
		return TieAbsent, nil
	case "present":
		return TiePresent, nil
	case "undetermined":
		return TieUndetermined, nil
	}
	return 0, fmt.Errorf("tie policy: got %q, want absent, present or undetermined", s)
}

// Majority decides from present and absent votes: present when present > absent, absent
// when absent > present (a strict majority of those who answered), the tie policy on a
// tie, and NoQuorum when present+absent < quorum.
func Majority(present, absent, quorum int, tie TiePolicy) Decision {
	if present+absent < max(quorum, 1) {
		return NoQuorum
	}
	switch {
	case present > absent:
		return Present
	case absent > present:
		return Absent
	}
	switch tie {
	case TiePresent:
		return Present
	case TieUndetermined:
		return Undetermined
	}
	return Absent
}
