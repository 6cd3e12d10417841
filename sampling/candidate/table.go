package candidate

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"

	"github.com/parquet-go/parquet-go"
	"github.com/parquet-go/parquet-go/compress/zstd"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/internal/parquetfile"
)

// ErrNoCandidates reports a candidate folder that is missing or holds no table.
var ErrNoCandidates = errors.New("no candidate events")

// Write writes rows to path as Parquet, atomically.
func Write(path string, rows []Row) error {
	return atomicfile.Write(path, 0o644, func(w io.Writer) error {
		pw := parquet.NewGenericWriter[Row](w, parquet.Compression(&zstd.Codec{}), parquet.PageBufferSize(1<<20))
		for i := 0; i < len(rows); i += 65536 {
			end := min(i+65536, len(rows))
			if _, err := pw.Write(rows[i:end]); err != nil {
				return err
			}
		}
		return pw.Close()
	})
}

// Read reads one Parquet file of rows. A damaged file or one of another table is an
// error naming the file (parquetfile.FileError).
func Read(path string) ([]Row, error) { return parquetfile.Read[Row](path) }

// ReadDir reads every *.parquet file under dir (recursively, so shard folders such as
// shard=0/ are included) as one table, ordered by recording and onset.
func ReadDir(dir string) ([]Row, error) {
	var files []string
	err := filepath.WalkDir(dir, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() && filepath.Ext(p) == ".parquet" && filepath.Base(p)[0] != '.' {
			files = append(files, p)
		}
		return nil
	})
	if errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("%s: %w", dir, ErrNoCandidates)
	}
	if err != nil {
		return nil, err
	}
	if len(files) == 0 {
		return nil, fmt.Errorf("%s: %w", dir, ErrNoCandidates)
	}
	sort.Strings(files)
	var all []Row
	for _, f := range files {
		rows, err := Read(f)
		if err != nil {
			return nil, err
		}
		all = append(all, rows...)
	}
	sort.SliceStable(all, func(i, j int) bool {
		if all[i].RecordingID != all[j].RecordingID {
			return all[i].RecordingID < all[j].RecordingID
		}
		if all[i].OnsetS != all[j].OnsetS {
			return all[i].OnsetS < all[j].OnsetS
		}
		return all[i].EventID < all[j].EventID
	})
	return all, nil
}
