package packet

import (
	"bytes"
	"compress/gzip"
	"encoding/base64"
	"io"
	"math"
	"testing"
)

// decodeTraces undoes encodeTraces with the standard library's gzip
// (RFC 1952) reader, mirroring the page's decoder.
func decodeTraces(t testing.TB, e encodedTraces, nch, n int) [][]float64 {
	z, err := base64.StdEncoding.DecodeString(e.Data)
	if err != nil {
		t.Fatal(err)
	}
	zr, err := gzip.NewReader(bytes.NewReader(z))
	if err != nil {
		t.Fatal(err)
	}
	b, err := io.ReadAll(zr)
	if err != nil {
		t.Fatal(err)
	}
	out := make([][]float64, nch)
	k := 0
	for c := range out {
		var prev uint16
		out[c] = make([]float64, n)
		for j := range n {
			z := uint16(b[k])
			k++
			if z == 255 {
				z = uint16(b[k]) | uint16(b[k+1])<<8
				k += 2
			}
			prev += z>>1 ^ -(z & 1) // undo zigzag, then the wrapping sum
			out[c][j] = float64(int16(prev)) * e.Scale
		}
	}
	if k != len(b) {
		t.Fatalf("%d bytes left over", len(b)-k)
	}
	return out
}

// Rounding to a step q errs by at most q/2 (closed form); the wrap-around
// differences must lose nothing even for full-scale jumps.
func TestEncodeTracesRoundTrip(t *testing.T) {
	n := 1280
	x := [][]float32{make([]float32, n), make([]float32, n), make([]float32, n)}
	for j := range n {
		x[0][j] = float32(80 * math.Sin(2*math.Pi*10*float64(j)/128))
		x[1][j] = float32(3000 * math.Copysign(1, math.Sin(float64(j)))) // ±full-scale square wave
		x[2][j] = 0.04 * float32(j%7)
	}
	for _, res := range []float64{0.1, 0.5} {
		e := encodeTraces(x, res)
		if want := max(res, 3000.0/32767); e.Scale != want {
			t.Fatalf("scale %g, want %g", e.Scale, want)
		}
		y := decodeTraces(t, e, 3, n)
		for c := range x {
			for j := range n {
				if d := math.Abs(float64(x[c][j]) - y[c][j]); d > e.Scale/2+1e-6 {
					t.Fatalf("res %g ch %d sample %d: error %g > scale/2 = %g", res, c, j, d, e.Scale/2)
				}
			}
		}
	}
	// Deterministic bytes: gzip header carries no time or name.
	if encodeTraces(x, 0.1).Data != encodeTraces(x, 0.1).Data {
		t.Error("encoding is not deterministic")
	}
}

func TestEncodeMapMissing(t *testing.T) {
	v := []float32{float32(math.NaN()), -40, 0, 25.5}
	scale, data := encodeMap(v)
	if scale != 40.0/32000 {
		t.Fatalf("scale %g", scale)
	}
	z, _ := base64.StdEncoding.DecodeString(data)
	zr, err := gzip.NewReader(bytes.NewReader(z))
	if err != nil {
		t.Fatal(err)
	}
	b, _ := io.ReadAll(zr)
	q := func(i int) int16 { return int16(uint16(b[2*i]) | uint16(b[2*i+1])<<8) }
	if q(0) != math.MinInt16 || q(1) != -32000 || q(2) != 0 || math.Abs(float64(q(3))*scale-25.5) > scale/2 {
		t.Errorf("decoded %d %d %d %d", q(0), q(1), q(2), q(3))
	}
}
