package packet

import (
	"errors"
	"fmt"
)

// InputError reports a Build input that cannot be used. Item is the index of
// the offending item, or -1 when the problem is in Options.
type InputError struct {
	Item   int
	Field  string
	Reason string
}

func (e *InputError) Error() string {
	if e.Item < 0 {
		return fmt.Sprintf("packet: option %s: %s", e.Field, e.Reason)
	}
	return fmt.Sprintf("packet: item %d: %s: %s", e.Item, e.Field, e.Reason)
}

// ErrInput is matched by errors.Is on a InputError.
var ErrInput = errors.New("packet: unusable input")

// Unwrap gives ErrInput.
func (e *InputError) Unwrap() error { return ErrInput }

// ExistsError reports an output that already exists and Replace was not set.
type ExistsError struct {
	Path string
}

func (e *ExistsError) Error() string {
	return fmt.Sprintf("packet: %s already exists", e.Path)
}

// ErrExists is matched by errors.Is on a ExistsError.
var ErrExists = errors.New("packet: output exists")

// Unwrap gives ErrExists.
func (e *ExistsError) Unwrap() error { return ErrExists }
