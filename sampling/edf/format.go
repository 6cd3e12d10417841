package edf

// Format is a member of the EDF family.
type Format int

const (
	EDF      Format = iota // EDF (Kemp et al. 1992)
	EDFPlusC               // EDF+ continuous (Kemp & Olivan 2003)
	EDFPlusD               // EDF+ discontinuous
	BDF                    // BDF, 24-bit samples
	BDFPlusC               // BDF+ continuous
	BDFPlusD               // BDF+ discontinuous
)

var formatNames = [...]string{"EDF", "EDF+C", "EDF+D", "BDF", "BDF+C", "BDF+D"}

func (f Format) String() string {
	if f < 0 || int(f) >= len(formatNames) {
		return "Format(?)"
	}
	return formatNames[f]
}

// Is24Bit reports whether samples take three bytes (BDF family).
func (f Format) Is24Bit() bool { return f >= BDF }

// IsPlus reports whether the format carries EDF+ annotations and time keeping.
func (f Format) IsPlus() bool { return f != EDF && f != BDF }

// IsDiscontinuous reports whether data records may be separated by gaps.
func (f Format) IsDiscontinuous() bool { return f == EDFPlusD || f == BDFPlusD }

// sampleBytes is the width of one stored sample.
func (f Format) sampleBytes() int {
	if f.Is24Bit() {
		return 3
	}
	return 2
}
