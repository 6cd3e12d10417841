// Package progress shows a progress bar on long work, only when a person is watching:
// never when quiet is asked for and never when standard error is not a terminal (CI logs, pipes).
package progress

import (
	"io"
	"os"

	"github.com/schollz/progressbar/v3"
)

// Bar counts finished units of work. The zero-cost Silent bar does nothing.
type Bar interface {
	Add(n int)
	Finish()
}

// Silent is a Bar that shows nothing.
type Silent struct{}

func (Silent) Add(int) {}
func (Silent) Finish() {}

// New returns a bar for total units described by desc, or Silent when quiet is set or
// standard error is not a terminal.
func New(total int, desc string, quiet bool) Bar {
	return NewTo(os.Stderr, total, desc, quiet)
}

// NewTo returns a bar drawn on w, or Silent when quiet is set or w is not a terminal
// (a buffer in a test, a pipe, a file).
func NewTo(w io.Writer, total int, desc string, quiet bool) Bar {
	f, ok := w.(*os.File)
	if quiet || total <= 0 || !ok || !isTerminal(f) {
		return Silent{}
	}
	return &bar{progressbar.NewOptions(total,
		progressbar.OptionSetWriter(f),
		progressbar.OptionSetDescription(desc),
		progressbar.OptionShowCount(),
		progressbar.OptionSetPredictTime(true),
		progressbar.OptionClearOnFinish(),
		progressbar.OptionThrottle(100_000_000),
	)}
}

type bar struct{ b *progressbar.ProgressBar }

func (b *bar) Add(n int) { b.b.Add(n) }
func (b *bar) Finish()   { b.b.Finish() }

func isTerminal(f *os.File) bool {
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}
