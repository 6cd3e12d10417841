// Package export writes a study's reference set for research: the drawn events with
// their features, automatic criterion decisions, panel votes and reference labels; the
// long-form ratings; the de-identified recordings; optionally the raw EEG epochs around
// each event — as Parquet, CSV or a BIDS-EEG derivative (Pernet et al. 2019, Scientific
// Data 6:103), each with a data dictionary that explains every column.
//
// The package only writes values it is given; the command layer reads the study's
// tables and passes them in. Nothing that identifies a patient or names an archive file
// is written: subjects appear by subject key, recordings by recording id, and dates are
// either shifted per subject by the caller's offsets or reduced to the year.
package export

import "github.com/quorate-eeg/quorate/internal/caution"

// Caution is printed at the top of every data dictionary: the labels are a research
// reference set, not a diagnosis.
const Caution = caution.Text
