package tuning

import (
	"context"
	"errors"
	"testing"
)

// Negative folds were once clamped silently; cross-validation needs at least two.
func TestRunRefusesBadFolds(t *testing.T) {
	for _, o := range []Options{{Folds: -3}, {Folds: 1}} {
		_, err := Run(context.Background(), o)
		var ie *InputError
		if !errors.As(err, &ie) || ie.Field != "Folds" {
			t.Errorf("%+v: %v, want an InputError on Folds", o, err)
		}
	}
}
