package accuracy

import (
	"errors"
	"strings"
	"testing"
)

// An unreadable policy matches ErrPolicy and names the input and what was expected.
func TestErrPolicySentinel(t *testing.T) {
	_, err := ParsePolicy("min-specificity=two")
	if !errors.Is(err, ErrPolicy) || !strings.Contains(err.Error(), "min-specificity=two") {
		t.Errorf("ParsePolicy: %v, want an error matching ErrPolicy naming the input", err)
	}
}
