package packet

import (
	"fmt"
	"math"
	"math/rand/v2"
)

// Electrodes1020 are the 21 electrodes of the 10-20 system with the 10-10
// names T7/T8/P7/P8 (Jasper 1958; ACNS Guideline 2, Acharya et al. 2016; from memory).
var Electrodes1020 = []string{"Fp1", "Fp2", "F7", "F3", "Fz", "F4", "F8", "A1", "T7", "C3", "Cz", "C4", "T8", "A2", "P7", "P3", "Pz", "P4", "P8", "O1", "O2"}

// Leaky strings planted in Source; none may reach a packet.
var LeakStrings = []string{"Wilhelmina Quackenbush", "1961-03-04", "2019-07-21", "14:32:07", "qb_rec_0042.edf", "/archive/neuro/qb", "0.87314", "stratum-high-score"}

// SynthItems returns n items of synthetic EEG: AR(1) background (~20 µV),
// a posterior 10 Hz rhythm, and at the window centre a left temporal spike
// with an after-going slow wave; maps are a smooth two-pole field.
func SynthItems(n, seconds int, rate float64, seed uint64) []Item {
	rng := rand.New(rand.NewPCG(seed, 99))
	ns := int(float64(seconds) * rate)
	pos := map[string][2]float64{
		"Fp1": {-0.31, 0.95}, "Fp2": {0.31, 0.95}, "F7": {-0.81, 0.59}, "F3": {-0.4, 0.5}, "Fz": {0, 0.45},
		"F4": {0.4, 0.5}, "F8": {0.81, 0.59}, "T7": {-0.98, 0}, "C3": {-0.45, 0}, "Cz": {0, 0}, "C4": {0.45, 0},
		"T8": {0.98, 0}, "P7": {-0.81, -0.59}, "P3": {-0.4, -0.5}, "Pz": {0, -0.45}, "P4": {0.4, -0.5},
		"P8": {0.81, -0.59}, "O1": {-0.31, -0.95}, "O2": {0.31, -0.95},
	}
	field := func(x, y float64) float64 {
		return -100*math.Exp(-((x+0.7)*(x+0.7)+(y-0.2)*(y-0.2))/0.15) + 45*math.Exp(-((x-0.4)*(x-0.4)+(y+0.3)*(y+0.3))/0.3)
	}
	items := make([]Item, n)
	for i := range items {
		it := Item{
			EventID: fmt.Sprintf("EVT-%04d-qb", i),
			Source: map[string]string{
				"subject": LeakStrings[0], "birth": LeakStrings[1], "recorded": LeakStrings[2] + "T" + LeakStrings[3],
				"file": LeakStrings[5] + "/" + LeakStrings[4], "score": LeakStrings[6], "stratum": LeakStrings[7],
			},
			Rate: rate, Electrodes: Electrodes1020, EventAt: float64(seconds) / 2,
		}
		it.Samples = make([][]float32, len(Electrodes1020))
		for c, name := range Electrodes1020 {
			p := pos[name]
			x := make([]float32, ns)
			var ar float64
			for j := range ns {
				t := float64(j) / rate
				ar = 0.95*ar + 6.2*rng.NormFloat64()
				v := ar
				if p[1] < -0.3 {
					v += 12 * math.Sin(2*math.Pi*10*t)
				}
				dt := t - it.EventAt
				v += field(p[0], p[1]) * (math.Exp(-dt*dt/(2*0.012*0.012)) - 0.35*math.Exp(-(dt-0.12)*(dt-0.12)/(2*0.06*0.06)))
				x[j] = float32(v)
			}
			it.Samples[c] = x
		}
		const size = 32
		it.Map.Size = size
		it.Map.Values = make([]float32, size*size)
		for r := range size {
			for c := range size {
				x, y := -1+2*(float64(c)+0.5)/size, 1-2*(float64(r)+0.5)/size
				v := float32(math.NaN())
				if x*x+y*y <= 1 {
					v = float32(field(x, y))
				}
				it.Map.Values[r*size+c] = v
			}
		}
		for _, name := range Electrodes1020 {
			if p, ok := pos[name]; ok {
				it.Map.Electrodes = append(it.Map.Electrodes, MapElectrode{name, p[0], p[1]})
			}
		}
		items[i] = it
	}
	return items
}
