// Package jsonx holds JSON helpers for report files: numbers that may be undefined (a
// kappa with one category, an interval with no finite replicate) are written as null,
// which JSON allows, instead of NaN, which it does not.
package jsonx

import (
	"math"
	"strconv"
)

// Float is a float64 that marshals NaN and ±Inf as null.
type Float float64

// MarshalJSON implements json.Marshaler.
func (f Float) MarshalJSON() ([]byte, error) {
	v := float64(f)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return []byte("null"), nil
	}
	return strconv.AppendFloat(nil, v, 'g', -1, 64), nil
}

// UnmarshalJSON reads a number, or null as NaN.
func (f *Float) UnmarshalJSON(b []byte) error {
	if string(b) == "null" {
		*f = Float(math.NaN())
		return nil
	}
	v, err := strconv.ParseFloat(string(b), 64)
	*f = Float(v)
	return err
}
