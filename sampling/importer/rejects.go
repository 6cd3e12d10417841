package importer

import (
	"encoding/csv"
	"io"
	"strconv"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// writeRejects writes the rejection list as RFC 4180 CSV, atomically; a header line
// alone says nothing was rejected.
func writeRejects(path string, rs []Rejection) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		cw := csv.NewWriter(w)
		cw.Write([]string{"file", "line", "field", "value", "want"})
		for _, r := range rs {
			cw.Write([]string{r.File, strconv.Itoa(r.Line), r.Field, r.Value, r.Want})
		}
		cw.Flush()
		return cw.Error()
	})
}
