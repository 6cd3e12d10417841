package edf

import (
	"encoding/binary"
	"math"
	"math/rand/v2"
	"testing"
)

// TestDecodeInt16 checks against encoding/binary's little-endian reading
// and the two's-complement int16 conversion of the Go specification.
func TestDecodeInt16(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	src := make([]byte, 2*1003)
	for i := range src {
		src[i] = byte(rng.UintN(256))
	}
	copy(src, []byte{0x00, 0x80, 0xff, 0x7f, 0xff, 0xff}) // −32768, 32767, −1
	dst := make([]float32, 1003)
	DecodeInt16(dst, src, 0.5, -3)
	for i := range dst {
		want := float32(int16(binary.LittleEndian.Uint16(src[2*i:])))*0.5 - 3
		if dst[i] != want {
			t.Fatalf("sample %d: %v, want %v", i, dst[i], want)
		}
	}
	if dst[0] != -32768*0.5-3 || dst[1] != 32767*0.5-3 || dst[2] != -3.5 {
		t.Errorf("extremes %v", dst[:3])
	}
}

// TestDecodeInt24 checks the extremes of 24-bit two's complement (BDF
// format description: 3-byte little-endian signed samples).
func TestDecodeInt24(t *testing.T) {
	src := []byte{
		0x00, 0x00, 0x80, // −8388608
		0xff, 0xff, 0x7f, // 8388607
		0xff, 0xff, 0xff, // −1
		0x01, 0x00, 0x00, // 1
		0x00, 0x01, 0x00, // 256
	}
	want := []float32{-8388608, 8388607, -1, 1, 256}
	dst := make([]float32, 5)
	DecodeInt24(dst, src, 1, 0)
	for i := range want {
		if dst[i] != want[i] {
			t.Errorf("sample %d: %v, want %v", i, dst[i], want[i])
		}
	}
	raw := make([]int32, 5)
	decodeRaw(raw, src, 3)
	back := make([]byte, 15)
	encodeRaw(back, raw, 3)
	if string(back) != string(src) {
		t.Errorf("encode(decode) = % x", back)
	}
}

// TestGainOffset checks the mapping of Kemp et al. (1992): digital minimum
// and maximum map onto physical minimum and maximum, linearly.
func TestGainOffset(t *testing.T) {
	for _, s := range []Signal{
		{PhysMin: -3276.8, PhysMax: 3276.7, DigMin: -32768, DigMax: 32767},
		{PhysMin: -500, PhysMax: 500, DigMin: -2048, DigMax: 2047},
		{PhysMin: 100, PhysMax: -100, DigMin: 0, DigMax: 1000}, // inverted polarity
		{PhysMin: -262144, PhysMax: 262143.96875, DigMin: -8388608, DigMax: 8388607},
	} {
		g, o := s.Gain(), s.Offset()
		lo, hi := float64(s.DigMin)*g+o, float64(s.DigMax)*g+o
		if math.Abs(lo-s.PhysMin) > 1e-9*math.Abs(s.PhysMin) || math.Abs(hi-s.PhysMax) > 1e-9*math.Abs(s.PhysMax) {
			t.Errorf("%+v: maps to [%v, %v]", s, lo, hi)
		}
		mid := float64(s.DigMin+s.DigMax) / 2
		if got, want := mid*g+o, (s.PhysMin+s.PhysMax)/2; math.Abs(got-want) > 1e-9*math.Max(1, math.Abs(want)) {
			t.Errorf("%+v: midpoint %v, want %v", s, got, want)
		}
	}
}
