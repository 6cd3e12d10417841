package draw

import (
	"errors"
	"strings"
	"testing"
)

// Unusable input matches ErrInput and keeps its detail (the field and offset).
func TestErrInputSentinel(t *testing.T) {
	_, err := ParseStrata("score:q0")
	if !errors.Is(err, ErrInput) || !strings.Contains(err.Error(), "score") {
		t.Errorf("ParseStrata(score:q0): %v, want an error matching ErrInput naming the field", err)
	}
	if errors.Is(err, ErrPhase) {
		t.Error("a strata error matches ErrPhase")
	}
}
