package signal

// Stream filters a multichannel recording forward and backward as it
// arrives in chunks (for example EDF data records), in bounded memory. It
// holds back the last margin samples, which still depend on input not yet
// seen, and releases filtered samples in runs of at least block once they
// have margin samples of future input behind them; each run is filtered
// with margin samples of context on both sides, as Conditioner does, so
// the released samples match whole-signal forward–backward filtering
// within the tolerance used to choose margin. The delay from input to
// output is at most margin + block samples; Flush releases the rest using
// the true end of the recording. Larger blocks cost less: each run filters
// block + 2·margin samples to release block.
//
// A Stream is not safe for concurrent use.
type Stream struct {
	zp      *ZeroPhase
	margin  int // context kept on each side
	block   int
	buf     [][]float32 // per channel, samples from base to total
	base    int64
	emitted int64
	total   int64
	scratch []float32
}

// NewStream returns a Stream over channels channels with the given
// margin (see Margin) and minimum release size block, both in samples.
func NewStream(sos SOS, channels, margin, block int) (*Stream, error) {
	if channels < 1 {
		return nil, &designError{Field: "channels", Value: float64(channels), Msg: "must be positive"}
	}
	if margin < 0 {
		return nil, &designError{Field: "margin", Value: float64(margin), Msg: "must not be negative"}
	}
	zp := NewZeroPhase(sos)
	// at least one sample more than the padding on each side, so every
	// filtered run can be reflected
	return &Stream{
		zp:     zp,
		margin: max(margin, zp.Pad()+1),
		block:  max(block, zp.Pad()+1, 1),
		buf:    make([][]float32, channels),
	}, nil
}

// Emitted returns how many samples per channel have been released.
func (s *Stream) Emitted() int64 { return s.emitted }

// Push appends chunk (one equal-length slice per channel) and returns the
// filtered samples released by it, one slice per channel starting at
// sample Emitted() as it was before the call; the slices are empty when
// nothing is released yet.
func (s *Stream) Push(chunk [][]float32) ([][]float32, error) {
	if len(chunk) != len(s.buf) {
		return nil, &shapeError{Channel: -1, Got: len(chunk), Want: len(s.buf)}
	}
	for c := range chunk {
		if len(chunk[c]) != len(chunk[0]) {
			return nil, &shapeError{Channel: c, Got: len(chunk[c]), Want: len(chunk[0])}
		}
	}
	for c := range chunk {
		s.buf[c] = append(s.buf[c], chunk[c]...)
	}
	s.total += int64(len(chunk[0]))
	end := s.total - int64(s.margin)
	if end-s.emitted < int64(s.block) {
		return make([][]float32, len(s.buf)), nil
	}
	return s.release(end)
}

// Flush releases everything not yet released, filtering up to the true
// end of the recording. It returns a *shortSignalError if the whole
// recording is no longer than the edge padding.
func (s *Stream) Flush() ([][]float32, error) {
	if s.total <= int64(s.zp.Pad()) {
		return nil, &shortSignalError{N: int(s.total), Pad: s.zp.Pad()}
	}
	return s.release(s.total)
}

// release filters [emitted−margin, total) per channel, returns
// [emitted, end) and drops buffered samples no longer needed as context.
func (s *Stream) release(end int64) ([][]float32, error) {
	lo := max(s.emitted-int64(s.margin), 0)
	out := make([][]float32, len(s.buf))
	for c, b := range s.buf {
		w := b[lo-s.base:]
		if cap(s.scratch) < len(w) {
			s.scratch = make([]float32, len(w))
		}
		x := s.scratch[:len(w)]
		copy(x, w)
		if err := s.zp.Apply32(x); err != nil {
			return nil, &windowError{Channel: c, Start: s.emitted, End: end, Err: err}
		}
		out[c] = append([]float32(nil), x[s.emitted-lo:end-lo]...)
	}
	s.emitted = end
	keep := max(end-int64(s.margin), 0)
	for c, b := range s.buf {
		s.buf[c] = append(b[:0], b[keep-s.base:]...)
	}
	s.base = keep
	return out, nil
}
