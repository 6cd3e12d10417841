package parquetfile_test

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/internal/parquetfile"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

// readers are every Parquet table of a study, read as its row type.
var readers = []func(string) error{
	parquetfile.Check[archive.Recording],
	parquetfile.Check[candidate.Row],
	parquetfile.Check[draw.Row],
	parquetfile.Check[packet.KeyRow],
	parquetfile.Check[consensus.Rating],
	parquetfile.Check[consensus.Event],
	parquetfile.Check[report.SweepRow],
}

// FuzzReadTables feeds bytes (seeded with a small file of each table) to every table
// reader: a damaged file or one of another table is an error, never a panic.
func FuzzReadTables(f *testing.F) {
	dir := f.TempDir()
	p := filepath.Join(dir, "seed.parquet")
	seeds := []func() error{
		func() error {
			return archive.WriteIndex(p, []archive.Recording{{RecordingID: "rec-1", EEGChannels: []string{"Fp1"}, SampleRatesHz: []float64{256}, Warnings: []string{}}})
		},
		func() error { return candidate.Write(p, []candidate.Row{{EventID: "ev-1", OnsetS: 1.5}}) },
		func() error { return draw.WriteRows(p, []draw.Row{{EventID: "ev-1", Pi: 0.5, Weight: 2}}) },
	}
	for _, write := range seeds {
		if err := write(); err != nil {
			f.Fatal(err)
		}
		b, _ := os.ReadFile(p)
		f.Add(b, uint8(0))
	}
	f.Fuzz(func(t *testing.T, b []byte, which uint8) {
		q := filepath.Join(t.TempDir(), "t.parquet")
		if err := os.WriteFile(q, b, 0o644); err != nil {
			t.Fatal(err)
		}
		readers[int(which)%len(readers)](q)
	})
}
