package returns

// Presence is a rater's judgement of one criterion.
type Presence string

// Verdict is a rater's overall judgement of an item.
type Verdict string

const (
	Present Presence = "present"
	Absent  Presence = "absent"

	Epileptiform    Verdict = "epileptiform"
	NotEpileptiform Verdict = "not-epileptiform"
)

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
	// (absent from the file or left entirely blank), in packet order.
	Unrated []string
}

// Answer is one rated item. Criteria[k] is criterion k+1 of Kane et al. (2017).
type Answer struct {
	Item       string
	Criteria   [6]Presence
	Verdict    Verdict
	Confidence int // 1–5; 0 when not given
	Comment    string
}
