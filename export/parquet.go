package export

import (
	"io"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"
)

// rowGroupRows caps a row group. Analytic engines read a row group as a unit of work
// and prefer them large (tens to hundreds of MB); our tables are narrow enough that a
// million rows stays within that. // common practice
const rowGroupRows = 1 << 20

// writeParquet writes rows with zstd compression, dictionary-encoded string columns
// (the dict tags of the row struct) and nullable columns where values may be missing.
func writeParquet[T any](w io.Writer, rows []T) error {
	pw := parquet.NewGenericWriter[T](w,
		parquet.Compression(&zstd.Codec{}),
		parquet.MaxRowsPerRowGroup(rowGroupRows),
		parquet.PageBufferSize(1<<20),
		parquet.CreatedBy("quorate", "", ""))
	for i := 0; i < len(rows); i += 65536 {
		if _, err := pw.Write(rows[i:min(i+65536, len(rows))]); err != nil {
			return err
		}
	}
	return pw.Close()
}
