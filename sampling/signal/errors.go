package signal

import "fmt"

// DesignError reports an invalid filter design parameter.
type DesignError struct {
	Field string  // parameter name, e.g. "order", "edges[1]", "q"
	Value float64 // offending value
	Msg   string  // why it is invalid
}

func (e *DesignError) Error() string {
	return fmt.Sprintf("signal: design: %s = %g: %s", e.Field, e.Value, e.Msg)
}

// ShortSignalError reports a signal too short for forward–backward
// filtering: the odd reflection needs more samples than the padding.
type ShortSignalError struct {
	N   int // samples supplied
	Pad int // reflection length at each end; N must exceed it
}

func (e *ShortSignalError) Error() string {
	return fmt.Sprintf("signal: %d samples, need more than %d for edge padding", e.N, e.Pad)
}

// WindowError reports a failed windowed read, with the channel and the
// requested sample range [Start, End).
type WindowError struct {
	Channel    int
	Start, End int64
	Err        error
}

func (e *WindowError) Error() string {
	return fmt.Sprintf("signal: channel %d samples [%d,%d): %v", e.Channel, e.Start, e.End, e.Err)
}

func (e *WindowError) Unwrap() error { return e.Err }

// ShapeError reports a chunk pushed to a Stream with the wrong number of
// channels (Channel = −1, counts of channels) or a channel whose length
// differs from channel 0's (counts of samples).
type ShapeError struct {
	Channel   int
	Got, Want int
}

func (e *ShapeError) Error() string {
	if e.Channel < 0 {
		return fmt.Sprintf("signal: chunk has %d channels, want %d", e.Got, e.Want)
	}
	return fmt.Sprintf("signal: chunk channel %d has %d samples, channel 0 has %d", e.Channel, e.Got, e.Want)
}
