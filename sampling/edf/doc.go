// Package edf reads and writes the EDF family of recording files: EDF, its
// EDF+ extension, and the 24-bit BDF variant.
//
// The fixed and per-signal header layout, the data-record layout and the
// digital-to-physical mapping follow Kemp B, Värri A, Rosa AC, Nielsen KD,
// Gade J (1992), "A simple format for exchange of digitized polygraphic
// recordings", Electroencephalogr Clin Neurophysiol 82:391–393.
// Continuous (EDF+C) and discontinuous (EDF+D) recordings, the
// "EDF Annotations" signal and its Time-stamped Annotation Lists (TALs)
// follow Kemp B, Olivan J (2003), "European data format 'plus' (EDF+), an
// EDF alike standard format for the exchange of physiological data",
// Clin Neurophysiol 114:1755–1761. BDF files (first header byte 0xFF,
// "BIOSEMI", 24-bit little-endian two's-complement samples) follow the BDF
// format description; BDF+ is BDF with the EDF+ reserved-field markers and
// annotation signal.
//
// A Reader keeps at most one data record in memory: a recording of any
// length can be read record by record, or in windows of one signal with
// ReadSignal, which touches only the records (and only the bytes of that
// signal) the window covers. Inspect makes one streaming pass over a file
// and returns what an archive index needs.
//
// Truncated files are errors: if a file holds fewer complete data records
// than its header announces, NewReader and Inspect return a *FieldError for
// the "number of data records" field rather than guessing a usable count.
// The one exception is the header value -1, which the EDF specification
// reserves for recordings still in progress; the count is then taken from
// the file size and a warning is added to Header.Warnings.
package edf
