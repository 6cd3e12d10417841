package parquetfile

import (
	"os"
	"path/filepath"
	"testing"
	"time"
)

type row struct {
	ID    string    `parquet:"id,dict"`
	X     float64   `parquet:"x"`
	Tags  []string  `parquet:"tags,list"`
	At    time.Time `parquet:"at,timestamp(millisecond)"`
	Maybe *bool     `parquet:"maybe,optional"`
}

func TestRoundTripAcrossRowGroups(t *testing.T) {
	p := filepath.Join(t.TempDir(), "t.parquet")
	yes := true
	rows := make([]row, rowGroup+5)
	for i := range rows {
		rows[i] = row{ID: string(rune('a' + i%26)), X: float64(i) / 3, Tags: []string{"x"}, At: time.UnixMilli(int64(i)).UTC()}
		if i%2 == 0 {
			rows[i].Maybe = &yes
		}
	}
	if err := Write(p, rows, 0o640); err != nil {
		t.Fatal(err)
	}
	st, _ := os.Stat(p)
	if st.Mode().Perm() != 0o640 {
		t.Errorf("mode %v", st.Mode().Perm())
	}
	back, err := Read[row](p)
	if err != nil || len(back) != len(rows) {
		t.Fatalf("read back %d rows: %v", len(back), err)
	}
	for _, i := range []int{0, 1, rowGroup, len(rows) - 1} {
		b, r := back[i], rows[i]
		if b.ID != r.ID || b.X != r.X || !b.At.Equal(r.At) || (b.Maybe == nil) != (r.Maybe == nil) || len(b.Tags) != 1 {
			t.Errorf("row %d: %+v, want %+v", i, b, r)
		}
	}
}
