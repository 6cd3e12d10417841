package draw

import "github.com/quorate-eeg/quorate/internal/parquetfile"

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
func WriteRows(path string, rows []Row) error { return parquetfile.Write(path, rows, 0o644) }

// ReadRows reads draw.parquet.
func ReadRows(path string) ([]Row, error) { return parquetfile.Read[Row](path) }
