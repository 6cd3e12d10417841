package jsonx

import (
	"encoding/json"
	"math"
	"testing"
)

func TestFloatNullRoundTrip(t *testing.T) {
	b, err := json.Marshal([]Float{1.5, Float(math.NaN()), Float(math.Inf(1))})
	if err != nil || string(b) != "[1.5,null,null]" {
		t.Fatalf("marshal: %s, %v", b, err)
	}
	var back []Float
	if err := json.Unmarshal(b, &back); err != nil || back[0] != 1.5 || !math.IsNaN(float64(back[1])) {
		t.Fatalf("unmarshal: %v, %v", back, err)
	}
}
