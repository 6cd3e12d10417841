package draw

import (
	"fmt"
	"io"
	"os"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// Row is one row of draw/draw.parquet: a drawn candidate or background control.
type Row struct {
	EventID     string  `parquet:"event_id"`
	Kind        string  `parquet:"kind,dict"` // candidate or control
	Stratum     string  `parquet:"stratum,dict"`
	SubjectKey  string  `parquet:"subject_key,dict"`
	RecordingID string  `parquet:"recording_id,dict"`
	OnsetS      float64 `parquet:"onset_s"` // event peak, or the middle of a control epoch
	Pi          float64 `parquet:"inclusion_probability"`
	Weight      float64 `parquet:"design_weight"`
	Phase       int32   `parquet:"phase"`
	Order       int32   `parquet:"draw_order"`
}

// WriteRows writes draw.parquet atomically.
func WriteRows(path string, rows []Row) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		pw := parquet.NewGenericWriter[Row](w, parquet.Compression(&zstd.Codec{}))
		if _, err := pw.Write(rows); err != nil {
			return err
		}
		return pw.Close()
	})
}

// ReadRows reads draw.parquet.
func ReadRows(path string) ([]Row, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	r := parquet.NewGenericReader[Row](f)
	defer r.Close()
	out := make([]Row, r.NumRows())
	n, err := r.Read(out)
	if err != nil && err != io.EOF {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return out[:n], nil
}
