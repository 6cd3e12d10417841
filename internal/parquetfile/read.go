package parquetfile

import (
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/parquet-go/parquet-go"
)

// ErrDamaged marks a file that is not a readable Parquet file: a torn footer, a
// truncated page, bytes that are not Parquet at all.
var ErrDamaged = errors.New("damaged Parquet file")

// ErrSchema marks a Parquet file that is whole but holds another table than the one
// asked for (a column missing or of another type).
var ErrSchema = errors.New("Parquet file of another table")

// FileError reports a Parquet file that cannot be read as the table asked for. Err is
// ErrDamaged or ErrSchema, wrapped with the detail.
type FileError struct {
	Path   string
	Detail string
	Err    error
}

func (e *FileError) Error() string { return fmt.Sprintf("%s: %v: %s", e.Path, e.Err, e.Detail) }
func (e *FileError) Unwrap() error { return e.Err }

// Read reads every row of path. A damaged file or one of another schema is a
// *FileError naming the file; parquet-go panics on some damaged pages, and such a panic
// is turned into that error rather than ending the program.
func Read[T any](path string) (out []T, err error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, err
	}
	defer func() {
		if p := recover(); p != nil {
			out, err = nil, &FileError{Path: path, Detail: fmt.Sprint(p), Err: ErrDamaged}
		}
	}()
	if err := footerFits(f, st.Size()); err != nil {
		return nil, &FileError{Path: path, Detail: err.Error(), Err: ErrDamaged}
	}
	pf, err := parquet.OpenFile(f, st.Size())
	if err != nil {
		return nil, &FileError{Path: path, Detail: err.Error(), Err: ErrDamaged}
	}
	if err := Conforms(pf.Schema(), parquet.SchemaOf(new(T))); err != nil {
		return nil, &FileError{Path: path, Detail: err.Error(), Err: ErrSchema}
	}
	total := pf.NumRows()
	if total < 0 || total > MaxRows {
		return nil, &FileError{Path: path, Detail: fmt.Sprintf("footer claims %d rows; a study table holds 0 to %d", total, MaxRows), Err: ErrDamaged}
	}
	r := parquet.NewGenericReader[T](pf)
	defer r.Close()
	// Rows are read in chunks rather than into one slice of the footer's count, so
	// a damaged footer cannot make Read allocate for rows the file does not hold.
	buf := make([]T, min(total, readChunk))
	for int64(len(out)) < total {
		n, err := r.Read(buf[:min(int64(len(buf)), total-int64(len(out)))])
		out = append(out, buf[:n]...)
		if err == io.EOF || (err == nil && n == 0) {
			break
		}
		if err != nil {
			return nil, &FileError{Path: path, Detail: err.Error(), Err: ErrDamaged}
		}
	}
	if int64(len(out)) != total {
		return nil, &FileError{Path: path, Detail: fmt.Sprintf("%d of %d rows readable", len(out), total), Err: ErrDamaged}
	}
	if out == nil {
		out = []T{}
	}
	return out, nil
}

// footerFits checks the file's tail before parquet-go reads it: a Parquet
// file is "PAR1", the column chunks, the footer, the footer's length (4
// bytes, little-endian) and "PAR1" (Apache Parquet format specification,
// file format). parquet-go allocates the footer's claimed length before it
// reads, so a damaged 100-byte file claiming a 4 GB footer once made Read
// allocate 400 MB (and a fuzzing worker die); a length that does not fit in
// the file is damage.
func footerFits(f io.ReaderAt, size int64) error {
	if size < 12 {
		return fmt.Errorf("%d bytes: shorter than a Parquet file's magic numbers and footer length", size)
	}
	var tail [8]byte
	if _, err := f.ReadAt(tail[:], size-8); err != nil {
		return err
	}
	if n := int64(binary.LittleEndian.Uint32(tail[:4])); n > size-12 {
		return fmt.Errorf("footer claims %d bytes in a file of %d", n, size)
	}
	return nil
}

// MaxRows bounds the rows a table may claim: far above any study's (a year of
// continuous EEG at 20 candidates a minute is about 10.5 million), far below what
// would exhaust memory. A footer claiming more is damage.
const MaxRows = 100_000_000

// readChunk is how many rows Read decodes at a time.
const readChunk = 4096

// Check reads path as a table of T and throws the rows away: the footer, the schema and
// every page are checked.
func Check[T any](path string) error {
	_, err := Read[T](path)
	return err
}

// Conforms reports whether every leaf column of want is in got with the same physical
// kind and repetition. Extra columns in got are allowed.
func Conforms(got, want *parquet.Schema) error {
	var bad []string
	for _, p := range want.Columns() {
		w, _ := want.Lookup(p...)
		g, ok := got.Lookup(p...)
		name := strings.Join(p, ".")
		if !ok {
			bad = append(bad, "no column "+name)
			continue
		}
		if gk, wk := g.Node.Type().Kind(), w.Node.Type().Kind(); gk != wk {
			bad = append(bad, fmt.Sprintf("column %s is %v, want %v", name, gk, wk))
		}
		if g.MaxRepetitionLevel != w.MaxRepetitionLevel {
			bad = append(bad, fmt.Sprintf("column %s repetition %d, want %d", name, g.MaxRepetitionLevel, w.MaxRepetitionLevel))
		}
	}
	if len(bad) > 0 {
		if len(bad) > 5 {
			bad = append(bad[:5], fmt.Sprintf("and %d more", len(bad)-5))
		}
		return errors.New(strings.Join(bad, "; "))
	}
	return nil
}
