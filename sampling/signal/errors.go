package signal

import (
	"errors"
	"fmt"
)

// Sentinels of this package's errors, for errors.Is: every error it returns for
// unusable input matches one of them.
var (
	ErrInput = errors.New("signal: unusable input")
)

// designError reports an invalid filter design parameter.
type designError struct {
	Field string  // parameter name, e.g. "order", "edges[1]", "q"
	Value float64 // offending value
	Msg   string  // why it is invalid
}

func (e *designError) Error() string {
	return fmt.Sprintf("signal: design: %s = %g: %s", e.Field, e.Value, e.Msg)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *designError) Unwrap() error { return ErrInput }

// shortSignalError reports a signal too short for forward–backward
// filtering: the odd reflection needs more samples than the padding.
type shortSignalError struct {
	N   int // samples supplied
	Pad int // reflection length at each end; N must exceed it
}

func (e *shortSignalError) Error() string {
	return fmt.Sprintf("signal: %d samples, need more than %d for edge padding", e.N, e.Pad)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *shortSignalError) Unwrap() error { return ErrInput }

// windowError reports a failed windowed read, with the channel and the
// requested sample range [Start, End).
type windowError struct {
	Channel    int
	Start, End int64
	Err        error
}

func (e *windowError) Error() string {
	return fmt.Sprintf("signal: channel %d samples [%d,%d): %v", e.Channel, e.Start, e.End, e.Err)
}

// Is makes errors.Is(err, ErrInput) true.
func (e *windowError) Is(target error) bool { return target == ErrInput }

func (e *windowError) Unwrap() error { return e.Err }

// shapeError reports a chunk pushed to a Stream with the wrong number of
// channels (Channel = −1, counts of channels) or a channel whose length
// differs from channel 0's (counts of samples).
type shapeError struct {
	Channel   int
	Got, Want int
}

func (e *shapeError) Error() string {
	if e.Channel < 0 {
		return fmt.Sprintf("signal: chunk has %d channels, want %d", e.Got, e.Want)
	}
	return fmt.Sprintf("signal: chunk channel %d has %d samples, channel 0 has %d", e.Channel, e.Got, e.Want)
}

// Unwrap gives ErrInput, for errors.Is.
func (e *shapeError) Unwrap() error { return ErrInput }
