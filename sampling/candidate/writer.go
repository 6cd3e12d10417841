package candidate

import (
	"fmt"
	"os"
	"path/filepath"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"
)

// rowGroupRows bounds the rows a Writer buffers before it flushes a Parquet
// row group, so memory stays flat however many rows a recording yields.
const rowGroupRows = 8192

// Writer streams rows to a Parquet file as they are produced. Nothing appears
// at the path until Close succeeds: rows go to a hidden temporary file in the
// same folder, renamed into place by Close (atomic on POSIX file systems), so
// a reader or a resumed run never sees a partial table. Not safe for
// concurrent use.
type Writer struct {
	path string
	tmp  *os.File
	pw   *parquet.GenericWriter[Row]
	n    int64
	err  error
}

// WriteError reports a failure while streaming rows to Path, after Rows rows
// had been accepted.
type WriteError struct {
	Path string
	Rows int64
	Err  error
}

func (e *WriteError) Error() string {
	return fmt.Sprintf("candidate: writing %s after %d rows: %v", e.Path, e.Rows, e.Err)
}

func (e *WriteError) Unwrap() error { return e.Err }

// NewWriter starts a table at path, creating its folder if needed.
func NewWriter(path string) (*Writer, error) {
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		return nil, err
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return nil, err
	}
	pw := parquet.NewGenericWriter[Row](tmp, parquet.Compression(&zstd.Codec{}),
		parquet.PageBufferSize(64<<10), parquet.MaxRowsPerRowGroup(rowGroupRows))
	return &Writer{path: path, tmp: tmp, pw: pw}, nil
}

// Write appends rows. After a failure every later call returns the same error.
func (w *Writer) Write(rows []Row) error {
	if w.err != nil {
		return w.err
	}
	if _, err := w.pw.Write(rows); err != nil {
		w.fail(err)
		return w.err
	}
	w.n += int64(len(rows))
	return nil
}

// Rows returns how many rows have been written.
func (w *Writer) Rows() int64 { return w.n }

// Close finishes the table and renames it into place. On any error the
// temporary file is removed and nothing is left at the path.
func (w *Writer) Close() error {
	if w.err != nil {
		return w.err
	}
	for _, step := range []func() error{w.pw.Close, func() error { return w.tmp.Chmod(0o644) }, w.tmp.Sync, w.tmp.Close} {
		if err := step(); err != nil {
			w.fail(err)
			return w.err
		}
	}
	if err := os.Rename(w.tmp.Name(), w.path); err != nil {
		w.fail(err)
		return w.err
	}
	w.err = os.ErrClosed
	return nil
}

// Abort discards the table: the temporary file is removed and the path left
// untouched. Safe to call after Close, where it does nothing.
func (w *Writer) Abort() {
	if w.err == nil {
		w.fail(os.ErrClosed)
	}
}

func (w *Writer) fail(err error) {
	w.err = &WriteError{Path: w.path, Rows: w.n, Err: err}
	w.tmp.Close()
	os.Remove(w.tmp.Name())
}
