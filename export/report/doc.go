// Package report writes what the tuner found: every evaluated point
// (sweep.parquet), the chosen operating point (operating-point.json), and a
// self-contained report for the neurophysiologists who will use it
// (report.html with inline SVG figures, and report.md). It computes nothing
// new: every number comes from a tuning.Result and, optionally, the panel's
// consensus.Agreement.
package report

import "github.com/quorate-eeg/quorate/internal/caution"

// Caution is printed near the top of both reports.
const Caution = caution.Text
