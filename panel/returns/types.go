package returns

// Presence is a rater's judgement of one criterion.
type Presence string

// Verdict is a rater's overall judgement of an item.
type Verdict string

const (
	Present Presence = "present"
	Absent  Presence = "absent"
	// CannotJudge is an abstention: the rater saw the item but could not
	// judge the criterion (artefact-obscured, too little context). It
	// completes the item but counts toward no majority or quorum.
	CannotJudge Presence = "cannot-judge"

	Epileptiform    Verdict = "epileptiform"
	NotEpileptiform Verdict = "not-epileptiform"
	// VerdictCannotJudge is the abstention for the verdict.
	VerdictCannotJudge Verdict = "cannot-judge"
)

// MaxSize is the largest return Parse (and merge) accept, in bytes: a
// packet of a few hundred items with long comments stays far below it.
const MaxSize = 20 << 20

// Return is one checked return of one packet.
type Return struct {
	File    string
	Kind    string // "json" or "csv"
	Study   string
	Packet  string
	Rater   string
	Check   string
	Answers []Answer // rated items, in the order of the file
	// Unrated lists the packet's item codes that carry no answer yet
	// (absent from the file, left blank, or only partly filled in), in
	// packet order: the items the rater still owes.
	Unrated []string
	// Incomplete lists, in packet order, the owed items that were partly
	// filled in (some criterion or the verdict missing). They are not
	// merged and do not stop the complete ones from merging.
	Incomplete []string
}

// Answer is one rated item. Criteria[k] is criterion k+1 of Kane et al. (2017).
type Answer struct {
	Item       string
	Criteria   [6]Presence
	Verdict    Verdict
	Confidence int // 1–5; 0 when not given
	Comment    string
}
