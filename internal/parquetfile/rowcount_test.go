package parquetfile

import (
	"encoding/binary"
	"errors"
	"os"
	"runtime"
	"strings"
	"testing"

	"github.com/parquet-go/parquet-go/encoding/thrift"
	"github.com/parquet-go/parquet-go/format"
)

// withFooterRows returns the file b with its footer's row count (FileMetaData
// field 3, Apache Parquet format specification, parquet.thrift) set to n, the rest of
// the footer re-encoded as it was: a file whose pages are whole but whose footer lies.
func withFooterRows(t *testing.T, b []byte, n int64) []byte {
	t.Helper()
	// The file ends with the footer, its length (4 bytes, little-endian) and "PAR1".
	size := int(binary.LittleEndian.Uint32(b[len(b)-8:]))
	start := len(b) - 8 - size
	var md format.FileMetaData
	if err := thrift.Unmarshal(new(thrift.CompactProtocol), b[start:len(b)-8], &md); err != nil {
		t.Fatal(err)
	}
	md.NumRows = n
	footer, err := thrift.Marshal(new(thrift.CompactProtocol), &md)
	if err != nil {
		t.Fatal(err)
	}
	out := append([]byte{}, b[:start]...)
	out = append(out, footer...)
	out = binary.LittleEndian.AppendUint32(out, uint32(len(footer)))
	return append(out, "PAR1"...)
}

// A footer that claims more rows than a study table can hold (MaxRows) is refused as
// damage before any row is read; one that claims more rows than its pages hold, but
// few, is refused after reading them. The unpatched footer reads back, so the patch
// itself is not what fails.
func TestReadFooterRowCount(t *testing.T) {
	p, b := written(t)
	for _, c := range []struct {
		name string
		rows int64
		want string
	}{
		{"as written", 300, ""},
		{"more than a table holds", MaxRows + 1, "footer claims"},
		{"negative", -1, "-1"}, // parquet-go refuses it when opening
		{"more than the pages hold", 301, "of 301 rows readable"},
	} {
		if err := os.WriteFile(p, withFooterRows(t, b, c.rows), 0o644); err != nil {
			t.Fatal(err)
		}
		got, err := Read[row](p)
		switch {
		case c.want == "" && (err != nil || len(got) != 300):
			t.Errorf("%s: %d rows, %v", c.name, len(got), err)
		case c.want != "" && (!errors.Is(err, ErrDamaged) || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), p)):
			t.Errorf("%s: got %v, want ErrDamaged naming the file and %q", c.name, err, c.want)
		}
	}
}

// A footer length (the 4 bytes before the closing "PAR1", Apache Parquet
// format specification) larger than the file is refused as damage before
// parquet-go, which allocates the claimed length first, reads it: a 4 GB
// claim once made Read allocate hundreds of megabytes for a small file.
func TestReadFooterLength(t *testing.T) {
	p, b := written(t)
	for _, n := range []uint32{uint32(len(b)), 1 << 31, 0xffffffff} {
		c := append([]byte{}, b...)
		binary.LittleEndian.PutUint32(c[len(c)-8:], n)
		if err := os.WriteFile(p, c, 0o644); err != nil {
			t.Fatal(err)
		}
		var m0, m1 runtime.MemStats
		runtime.ReadMemStats(&m0)
		_, err := Read[row](p)
		runtime.ReadMemStats(&m1)
		if !errors.Is(err, ErrDamaged) || !strings.Contains(err.Error(), "footer claims") {
			t.Errorf("footer length %d: %v, want ErrDamaged naming the footer", n, err)
		}
		if a := m1.TotalAlloc - m0.TotalAlloc; a > 16<<20 {
			t.Errorf("footer length %d: %d MB allocated", n, a>>20)
		}
	}
	if err := os.WriteFile(p, []byte("PAR1"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Read[row](p); !errors.Is(err, ErrDamaged) {
		t.Errorf("4-byte file: %v", err)
	}
}
