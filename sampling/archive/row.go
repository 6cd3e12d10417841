package archive

import "time"

// Recording is one row of index/recordings.parquet.
type Recording struct {
	RecordingID      string    `parquet:"recording_id,dict"`
	SubjectKey       string    `parquet:"subject_key,dict"`
	Root             int32     `parquet:"root"`
	Path             string    `parquet:"path"`
	Format           string    `parquet:"format,dict"`
	StartTime        time.Time `parquet:"start_time,timestamp(millisecond)"`
	DurationS        float64   `parquet:"duration_s"`
	RecordCount      int64     `parquet:"record_count"`
	RecordDurationS  float64   `parquet:"record_duration_s"`
	EEGChannels      []string  `parquet:"eeg_channels,list"`
	SampleRatesHz    []float64 `parquet:"sample_rates_hz,list"`
	AnnotationCount  int64     `parquet:"annotation_count"`
	Discontinuities  int64     `parquet:"discontinuities"`
	Warnings         []string  `parquet:"warnings,list"`
	SizeBytes        int64     `parquet:"size_bytes"`
	ModifiedUnixNano int64     `parquet:"modified_unix_nano"`
}

// Problem is one row of index/problems.csv: a file that could not be indexed, or a
// duplicate of another.
type Problem struct {
	File   string // as found under its root
	Field  string // header field or part at fault, empty when not applicable
	Offset int64  // byte offset, -1 when not applicable
	Reason string
}
