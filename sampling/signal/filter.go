package signal

// block is the number of samples run through the whole cascade at a time,
// so a long signal is read from main memory once per pass rather than once per
// section (16 KiB of float64 stays in the level-1 cache).
const block = 2048

// Filter runs x through the cascade in place, starting from rest (zero
// state), in transposed direct form II:
//
//	y = b0·x + z1,  z1 ← b1·x − a1·y + z2,  z2 ← b2·x − a2·y
//
// (Oppenheim & Schafer 2010, §6.5, Fig. 6.27). Rows with a0 ≠ 1 are
// normalised first.
func (sos SOS) Filter(x []float64) {
	c := normalise(sos)
	z := make([][2]float64, len(c))
	forward(c, z, x)
}

// normalise returns a copy of sos with every a0 = 1.
func normalise(sos SOS) SOS {
	c := make(SOS, len(sos))
	for i, s := range sos {
		a0 := s[3]
		for j := range 6 {
			c[i][j] = s[j] / a0
		}
	}
	return c
}

// forward filters x in place from x[0] upward, carrying state z.
func forward(c SOS, z [][2]float64, x []float64) {
	for lo := 0; lo < len(x); lo += block {
		b := x[lo:min(lo+block, len(x))]
		i := 0
		for ; i+3 < len(c); i += 4 {
			quadUp((*[4][6]float64)(c[i:i+4]), (*[4][2]float64)(z[i:i+4]), b)
		}
		if i+3 == len(c) {
			tripleUp((*[3][6]float64)(c[i:i+3]), (*[3][2]float64)(z[i:i+3]), b)
			i += 3
		}
		for ; i+1 < len(c); i += 2 {
			pairUp((*[2][6]float64)(c[i:i+2]), (*[2][2]float64)(z[i:i+2]), b)
		}
		if i < len(c) {
			oneUp(&c[i], &z[i], b)
		}
	}
}

// backward filters x in place from the last sample down to x[0]: the
// time-reversed pass of forward–backward filtering, without copying.
func backward(c SOS, z [][2]float64, x []float64) {
	for hi := len(x); hi > 0; hi -= block {
		b := x[max(hi-block, 0):hi]
		i := 0
		for ; i+3 < len(c); i += 4 {
			quadDown((*[4][6]float64)(c[i:i+4]), (*[4][2]float64)(z[i:i+4]), b)
		}
		if i+3 == len(c) {
			tripleDown((*[3][6]float64)(c[i:i+3]), (*[3][2]float64)(z[i:i+3]), b)
			i += 3
		}
		for ; i+1 < len(c); i += 2 {
			pairDown((*[2][6]float64)(c[i:i+2]), (*[2][2]float64)(z[i:i+2]), b)
		}
		if i < len(c) {
			oneDown(&c[i], &z[i], b)
		}
	}
}
