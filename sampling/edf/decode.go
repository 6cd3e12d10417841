package edf

// DecodeInt16 converts little-endian two's-complement 16-bit EDF samples in
// src to physical values dst[i] = dig·gain + offset, for
// i < min(len(dst), len(src)/2). With gain = Signal.Gain() and
// offset = Signal.Offset() this is the mapping of Kemp et al. (1992):
// phys = (dig − digMin)·(physMax − physMin)/(digMax − digMin) + physMin.
func DecodeInt16(dst []float32, src []byte, gain, offset float32) {
	n := len(src) / 2
	if len(dst) < n {
		n = len(dst)
	}
	dst = dst[:n]
	src = src[:2*n]
	i := 0
	// Four samples per step lets the compiler drop bounds checks and keeps
	// the conversions independent.
	for ; i+4 <= n; i += 4 {
		s := src[2*i : 2*i+8 : 2*i+8]
		d := dst[i : i+4 : i+4]
		d[0] = float32(int16(uint16(s[0])|uint16(s[1])<<8))*gain + offset
		d[1] = float32(int16(uint16(s[2])|uint16(s[3])<<8))*gain + offset
		d[2] = float32(int16(uint16(s[4])|uint16(s[5])<<8))*gain + offset
		d[3] = float32(int16(uint16(s[6])|uint16(s[7])<<8))*gain + offset
	}
	for ; i < n; i++ {
		dst[i] = float32(int16(uint16(src[2*i])|uint16(src[2*i+1])<<8))*gain + offset
	}
}

// DecodeInt24 converts little-endian two's-complement 24-bit BDF samples in
// src to physical values dst[i] = dig·gain + offset, for
// i < min(len(dst), len(src)/3). Every 24-bit integer is exact in float32.
func DecodeInt24(dst []float32, src []byte, gain, offset float32) {
	n := len(src) / 3
	if len(dst) < n {
		n = len(dst)
	}
	dst = dst[:n]
	src = src[:3*n]
	for i := range dst {
		s := src[3*i : 3*i+3 : 3*i+3]
		// Shift the sign bit into bit 31, then arithmetic-shift back.
		v := int32(uint32(s[0])<<8|uint32(s[1])<<16|uint32(s[2])<<24) >> 8
		dst[i] = float32(v)*gain + offset
	}
}

// decodeRaw converts stored samples to digital integers.
func decodeRaw(dst []int32, src []byte, width int) {
	if width == 2 {
		for i := range dst {
			dst[i] = int32(int16(uint16(src[2*i]) | uint16(src[2*i+1])<<8))
		}
		return
	}
	for i := range dst {
		dst[i] = int32(uint32(src[3*i])<<8|uint32(src[3*i+1])<<16|uint32(src[3*i+2])<<24) >> 8
	}
}

// encodeRaw stores digital integers as little-endian two's complement.
func encodeRaw(dst []byte, src []int32, width int) {
	for i, v := range src {
		dst[width*i] = byte(v)
		dst[width*i+1] = byte(v >> 8)
		if width == 3 {
			dst[width*i+2] = byte(v >> 16)
		}
	}
}
