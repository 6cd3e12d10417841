package archive

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/internal/parquetfile"
)

// File names inside the index folder.
const (
	IndexFile    = "recordings.parquet"
	ProblemsFile = "problems.csv"
)

// WriteIndex writes the recordings table atomically.
func WriteIndex(path string, recs []Recording) error { return parquetfile.Write(path, recs, 0o644) }

// ReadIndex reads a recordings table written by WriteIndex.
func ReadIndex(path string) ([]Recording, error) { return parquetfile.Read[Recording](path) }

// WriteProblems writes problems.csv (RFC 4180) atomically.
func WriteProblems(path string, ps []Problem) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write([]string{"file", "field", "byte_offset", "reason"})
		for _, p := range ps {
			off := ""
			if p.Offset >= 0 {
				off = strconv.FormatInt(p.Offset, 10)
			}
			cw.Write([]string{p.File, p.Field, off, p.Reason})
		}
		cw.Flush()
		return cw.Error()
	})
}
