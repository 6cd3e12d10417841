package montage

import (
	"errors"
	"strings"
	"testing"
)

// An unknown montage name matches ErrInput and names the kinds expected.
func TestErrInputSentinel(t *testing.T) {
	_, err := ParseKind("laplacian")
	if !errors.Is(err, ErrInput) || !strings.Contains(err.Error(), "laplacian") || !strings.Contains(err.Error(), "common-average") {
		t.Errorf("ParseKind: %v, want an error matching ErrInput naming the input and the kinds", err)
	}
}
