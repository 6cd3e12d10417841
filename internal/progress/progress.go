// Package progress shows a progress bar on long work, only when a person is watching:
// never with --quiet and never when standard error is not a terminal (CI logs, pipes).
package progress

import (
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
	if quiet || total <= 0 || !isTerminal(os.Stderr) {
		return Silent{}
	}
	return &bar{progressbar.NewOptions(total,
		progressbar.OptionSetWriter(os.Stderr),
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
