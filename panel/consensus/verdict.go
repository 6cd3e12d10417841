package consensus

// The verdict column of consensus.parquet is written in the words a rater uses for
// the verdict in a return (FORMAT.md of package returns): the panel decided an event
// is "epileptiform" or "not-epileptiform"; "undetermined" (a tie under that policy)
// and "no-quorum" are as for the criteria. The criteria columns keep "present" and
// "absent", the returns' words for a criterion.
const (
	VerdictEpileptiform    = "epileptiform"
	VerdictNotEpileptiform = "not-epileptiform"
)

// VerdictString is the verdict column's word for the panel's decision on the verdict.
func (d Decision) VerdictString() string {
	switch d {
	case Present:
		return VerdictEpileptiform
	case Absent:
		return VerdictNotEpileptiform
	}
	return d.String()
}

// ParseVerdict reads the verdict column: epileptiform is Present, not-epileptiform
// Absent, and undetermined and no-quorum as written. Consensus tables written before
// the column used the returns' words held "present" and "absent" there; they read the
// same. ok is false for any other string.
func ParseVerdict(s string) (d Decision, ok bool) {
	switch s {
	case VerdictEpileptiform, "present":
		return Present, true
	case VerdictNotEpileptiform, "absent":
		return Absent, true
	case "undetermined":
		return Undetermined, true
	case "no-quorum":
		return NoQuorum, true
	}
	return 0, false
}
