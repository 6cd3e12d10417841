package archive

import (
	"encoding/csv"
	"fmt"
	"io"
	"os"
	"strconv"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// File names inside the index folder.
const (
	IndexFile    = "recordings.parquet"
	ProblemsFile = "problems.csv"
)

// WriteIndex writes the recordings table atomically.
func WriteIndex(path string, recs []Recording) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		pw := parquet.NewGenericWriter[Recording](w, parquet.Compression(&zstd.Codec{}))
		if _, err := pw.Write(recs); err != nil {
			return err
		}
		return pw.Close()
	})
}

// ReadIndex reads a recordings table written by WriteIndex.
func ReadIndex(path string) ([]Recording, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, err
	}
	r := parquet.NewGenericReader[Recording](f)
	defer r.Close()
	_ = st
	out := make([]Recording, r.NumRows())
	n, err := r.Read(out)
	if err != nil && err != io.EOF {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return out[:n], nil
}

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
