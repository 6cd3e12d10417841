package edf

import (
	"fmt"
	"io"
	"slices"
)

// derivedCache holds the derivations of the last window ReadRecovered read,
// so that reading every recovered electrode of one window, as readers do
// channel by channel, reads each derivation once.
type derivedCache struct {
	start int64
	n     int
	got   int
	err   error
	sig   []int       // signals held, ascending
	x     [][]float32 // their samples, physical units
}

// ReadRecovered decodes len(dst) consecutive samples, in µV, of recovered
// electrode k (Header.Recovered) starting at sample index start, counted as
// in ReadSignal. It returns the number of samples decoded and io.EOF if the
// window runs past the last record.
func (r *Reader) ReadRecovered(k int, start int64, dst []float32) (int, error) {
	if k < 0 || k >= len(r.h.Recovered) {
		return 0, fmt.Errorf("edf: %s: no recovered electrode %d", r.name, k)
	}
	c := &r.derived
	if c.sig == nil || c.start != start || c.n != len(dst) {
		if err := r.fillDerived(start, len(dst)); err != nil && err != io.EOF {
			return 0, err
		}
	}
	clear(dst)
	for _, t := range r.h.Recovered[k].Terms {
		j, _ := slices.BinarySearch(c.sig, t.Signal)
		w := float32(t.Weight)
		for i, v := range c.x[j][:c.got] {
			dst[i] += w * v
		}
	}
	return c.got, c.err
}

func (r *Reader) fillDerived(start int64, n int) error {
	c := &r.derived
	if c.sig == nil {
		c.sig = r.h.TermSignals()
		c.x = make([][]float32, len(c.sig))
	}
	c.start, c.n, c.got, c.err = start, n, n, nil
	for j, s := range c.sig {
		if cap(c.x[j]) < n {
			c.x[j] = make([]float32, n)
		}
		c.x[j] = c.x[j][:n]
		got, err := r.ReadSignal(s, start, c.x[j])
		c.got = min(c.got, got)
		if err != nil {
			if err != io.EOF {
				c.sig, c.x = nil, nil // read again next time
				return err
			}
			c.err = err
		}
	}
	return c.err
}

// RecoverRecord writes recovered electrode k of one decoded data record
// into dst (µV): rec is ReadRecord's destination, with an entry for every
// signal of the electrode's terms (TermSignals).
func (h *Header) RecoverRecord(k int, rec [][]float32, dst []float32) {
	clear(dst)
	for _, t := range h.Recovered[k].Terms {
		w := float32(t.Weight)
		for i, v := range rec[t.Signal][:len(dst)] {
			dst[i] += w * v
		}
	}
}

// TermSignals returns the signals the recovered electrodes are read from,
// ascending.
func (h *Header) TermSignals() []int {
	var out []int
	for _, e := range h.Recovered {
		for _, t := range e.Terms {
			if !slices.Contains(out, t.Signal) {
				out = append(out, t.Signal)
			}
		}
	}
	slices.Sort(out)
	return out
}

// RecoveredRate is the sampling rate of the recovered electrodes, Hz, and
// their samples per data record; 0, 0 when there are none.
func (h *Header) RecoveredRate() (hz float64, perRecord int) {
	if len(h.Recovered) == 0 {
		return 0, 0
	}
	s := h.Signals[h.Recovered[0].Terms[0].Signal]
	return s.SampleRate(h.RecordDuration), s.SamplesPerRecord
}
