package synth

// Event kinds. IED kinds are Spike and SharpWave; the rest are look-alikes.
const (
	Spike     = "spike"      // IED, main phase 20 to <70 ms
	SharpWave = "sharp-wave" // IED, main phase 70 to 200 ms
	Muscle    = "muscle"     // muscle burst, per-channel independent
	Blink     = "blink"      // eye blink, frontal, smooth
	Pop       = "pop"        // single-electrode pop, no field
	Wicket    = "wicket"     // symmetric sharp alpha-band fragment, no slow wave
	Vertex    = "vertex"     // vertex sharp transient of drowsiness
)

// Criterion indexes into Event.Meets, following the numbering of the IFCN
// criteria in Kane et al. (2017).
const (
	C1Spiky      = iota // di- or triphasic wave with sharp or spiky morphology
	C2Duration          // duration different from the ongoing background
	C3Asymmetry         // waveform asymmetry: rise faster than fall
	C4SlowWave          // followed by an associated after-going slow wave
	C5Disruption        // background disrupted around the discharge
	C6Field             // field suggesting a cerebral dipolar source
)

// Event is one row of the truth table.
type Event struct {
	ID    string
	Kind  string
	IsIED bool
	Onset float64 // time of the main peak, s from recording start
	Start float64 // first sample touched by the event (waveform or attenuation), s
	End   float64 // last sample touched, s; Start <= Onset <= End
	// PeakElectrode is the EEG electrode with the largest absolute
	// deflection at Onset; Polarity is the sign of that deflection.
	PeakElectrode string
	Polarity      int
	Meets         [6]bool // which IFCN criteria the event was built to meet
	// Unclear marks the criteria whose label the construction does not
	// settle: Meets holds the generator's best call, but the event was
	// built neither to meet nor to fail them with a margin (GENERATOR.md,
	// "Unclear labels"). A feature's separation is judged on the others.
	Unclear [6]bool
	// C2DurationMs and BackgroundHalfMs are what criterion 2 compared: the
	// event's main-phase length and the half-period of the dominant
	// background rhythm at its peak electrode and state, ms.
	C2DurationMs     float64
	BackgroundHalfMs float64
	Amplitude        float64 // |peak| at PeakElectrode, µV
	// Duration is the main-phase length base to base in ms for sharp
	// transients (spike, sharp wave, vertex, wicket); the burst length for
	// muscle and blink; the decay time constant for a pop.
	Duration float64
	// Rise is the base-to-peak time of the main phase in ms; for a muscle
	// burst, the time from burst start to its largest potential.
	Rise     float64
	SlowWave float64 // after-going slow wave length, ms; 0 if none
	// Attenuation is the relative depth (0..1) of post-event background
	// attenuation at the peak electrode; AttenuationMs its length.
	Attenuation   float64
	AttenuationMs float64
	SNR           float64 // Amplitude / Config.BackgroundRMS
	// DipolePos (unit-sphere coordinates) and DipoleMoment (unit vector)
	// of the generating source; zero for events without a cerebral source.
	DipolePos    [3]float64
	DipoleMoment [3]float64
	Orientation  string // "radial", "tangential", "oblique" or ""

	// Shape parameters not worth a truth-table column.
	overshoot float64   // relative amplitude of the phase after the main phase
	slowAmp   float64   // relative amplitude of the slow wave
	waves     []float64 // relative amplitudes of successive wicket waves
	phaseMs   float64   // main phase of a muscle burst's largest potential, ms
}

// MetCount returns how many criteria the event was built to meet.
func (e Event) MetCount() int {
	n := 0
	for _, m := range e.Meets {
		if m {
			n++
		}
	}
	return n
}
