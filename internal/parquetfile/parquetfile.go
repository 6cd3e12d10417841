// Package parquetfile writes and reads whole Parquet tables of one row type, the way
// every table of a study is kept: zstd-compressed, column types from the row struct's
// parquet tags, written atomically so a reader never meets half a table.
package parquetfile

import (
	"io"
	"os"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// rowGroup bounds the rows buffered per write; parquet-go starts a new row group when
// its buffers fill.
const rowGroup = 1 << 16

// Write writes rows to path with permissions perm, replacing it atomically.
func Write[T any](path string, rows []T, perm os.FileMode) error {
	return atomicfile.Write(path, perm, func(w io.Writer) error {
		pw := parquet.NewGenericWriter[T](w, parquet.Compression(&zstd.Codec{}))
		for i := 0; i < len(rows); i += rowGroup {
			if _, err := pw.Write(rows[i:min(i+rowGroup, len(rows))]); err != nil {
				return err
			}
		}
		return pw.Close()
	})
}
