package packet

// Item is one event as a rater sees it. Nothing in it but the traces, the map
// and the event time reaches a packet; EventID and Source go only to the key.
type Item struct {
	// EventID identifies the event for the coordinator. It is written to the
	// key and never into a packet, so it may carry anything.
	EventID string
	// Source is coordinator-only provenance (subject, recording, detector
	// score, stratum…). It is copied to the key as JSON, never into a packet.
	Source map[string]string

	// Rate is the sampling rate of Samples in samples per second.
	Rate float64
	// Electrodes are the 10-10 names of the referential traces in Samples.
	// Every item of a build must share the same list, because montages index
	// into it.
	Electrodes []string
	// Samples holds one trace per electrode in µV, all the same length: the
	// rated window (10 s by default) centred on the event, with context on
	// either side. They should be as recorded (at most the mean removed and,
	// above 512 Hz, a stated decimation): the page filters them itself, with
	// controls, so the rater sees and sets the filters in force.
	Samples [][]float32
	// EventAt is the event time in seconds from the start of Samples.
	EventAt float64
	// RatedFrom and RatedTo bound the rated window in seconds from the start
	// of Samples; the rest is context, shown shaded. Both zero mean all of
	// Samples is rated.
	RatedFrom, RatedTo float64
	// Conditioning says in words what was done to Samples before packing
	// (for example "as recorded at 256 Hz, mean removed"); the page shows it.
	Conditioning string
	// Map is the voltage map at the event peak; a zero Size means none.
	Map VoltageMap
}

// VoltageMap is a scalp voltage map seen from above, nose up.
type VoltageMap struct {
	// Size is the number of rows and of columns of the grid.
	Size int
	// Values holds Size×Size µV values row by row, row 0 at the front (nose)
	// and column 0 at the left ear. NaN marks points outside the head.
	Values []float32
	// Electrodes are marker positions in the same frame, X from -1 (left
	// edge of the grid) to 1 (right edge), Y from -1 (back) to 1 (front).
	Electrodes []MapElectrode
}

// MapElectrode is an electrode marker drawn on a voltage map.
type MapElectrode struct {
	Name string
	X, Y float64
}

// Montage is a named list of derivations computed in the page from the
// referential traces.
type Montage struct {
	Name        string
	Derivations []Derivation
}

// Derivation is one displayed channel: electrode Plus minus the mean of the
// electrodes in Minus (none: referential; all: common average; one: bipolar).
// Indices refer to Item.Electrodes.
type Derivation struct {
	Label string
	Plus  int
	Minus []int
}
