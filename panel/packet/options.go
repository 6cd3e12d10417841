package packet

// Options configures Build.
type Options struct {
	// Items are the events to rate, each with its excerpt; Run passes them
	// to Build.
	Items []Item
	// StudyID names the study; it is shown in the page and returned by raters
	// so a return for another study is refused.
	StudyID string
	// Secret keys every code, packet id and check value (HMAC-SHA256). At
	// least 16 bytes; keep it on the coordinator side.
	Secret []byte
	// Raters are folder-safe names: [A-Za-z0-9._-], 1–40 characters, not
	// starting with a dot; at most MaxRaters, no two equal ignoring case.
	Raters []string
	// DuplicateShare is the share of items shown twice to each rater under
	// different codes, to measure intra-rater agreement. Zero means 0.10;
	// a negative value means no duplicates; at most 0.5.
	DuplicateShare float64
	// Seed drives the order and the choice of duplicates.
	Seed uint64
	// Montages offered in the page, the first shown first. Nil means
	// DefaultMontages of the items' electrodes.
	Montages []Montage
	// Resolution is the quantisation step of stored traces in µV; zero means
	// DefaultResolution. A larger step is used when an item's range needs it.
	Resolution float64
	// Sensitivity (µV/mm) and TimeBase (mm/s) the page opens with; zero
	// means 7 µV/mm and 30 mm/s.
	Sensitivity, TimeBase float64
	// Filters the page opens with; nil means DefaultFilters. The rater can
	// change them; the page states which are in force.
	Filters *Filters
	// Replace allows an existing packet folder, key or manifest to be moved
	// aside (to <name>.replaced-<n>) instead of refusing.
	Replace bool
	// OutDir is the packets folder.
	OutDir string
	// Phase is the draw phase the items belong to. 0 or 1: the first build
	// (Build). 2 or more: a later phase added to the packets in OutDir
	// (Extend), each rater's new packet in OutDir/<rater>/phase-<Phase>/.
	Phase int
}

const (
	// MaxRaters bounds a build; a panel larger than this is more likely a
	// mistake than a design.
	MaxRaters = 50
	// DefaultDuplicateShare is the share of hidden duplicates per packet.
	DefaultDuplicateShare = 0.10
	// DefaultResolution is the trace quantisation step in µV: about one CSS
	// pixel at 1 µV/mm, the most sensitive setting the page offers, and
	// 1/28 mm at the default 7 µV/mm, so steps never show; coarser steps
	// would, finer ones only grow the packet. // common practice
	DefaultResolution = 0.25
	// DefaultSensitivity in µV/mm and DefaultTimeBase in mm/s. // common practice
	DefaultSensitivity = 7
	DefaultTimeBase    = 30
)

func (o Options) duplicateShare() float64 {
	switch {
	case o.DuplicateShare == 0:
		return DefaultDuplicateShare
	case o.DuplicateShare < 0:
		return 0
	}
	return o.DuplicateShare
}

func orDefault(v, d float64) float64 {
	if v == 0 {
		return d
	}
	return v
}

// Filters are the page's display filters, applied in the browser forward
// and backward (zero phase). A zero frequency means that filter is off.
type Filters struct {
	LowHz   float64 // low-frequency filter (high-pass) cut-off, Hz
	HighHz  float64 // high-frequency filter (low-pass) cut-off, Hz
	NotchHz float64 // notch at the mains frequency: 50, 60 or 0
}

// DefaultFilters are 0.5–70 Hz with a 50 Hz notch. // common practice
var DefaultFilters = Filters{LowHz: 0.5, HighHz: 70, NotchHz: 50}

func (o Options) filters() Filters {
	if o.Filters == nil {
		return DefaultFilters
	}
	return *o.Filters
}
