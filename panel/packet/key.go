package packet

import (
	"encoding/json"

	"github.com/quorate-eeg/quorate/internal/parquetfile"
)

// KeyRow is one row of key.parquet: which event hides behind an item code.
type KeyRow struct {
	Packet    string `parquet:"packet"`
	Rater     string `parquet:"rater"`
	Item      string `parquet:"item"`
	EventID   string `parquet:"event_id"`
	Duplicate bool   `parquet:"duplicate"` // the second copy of a hidden duplicate
	Position  int32  `parquet:"position"`  // 1-based place in the rater's order
	Source    string `parquet:"source"`    // Item.Source as a JSON object of strings, keys sorted
}

// ReadKey reads a key written by Build.
func ReadKey(path string) ([]KeyRow, error) {
	return parquetfile.Read[KeyRow](path)
}

func writeKey(path string, rows []KeyRow) error {
	return parquetfile.Write(path, rows, 0o600) // the coordinator's eyes only
}

// sourceJSON encodes provenance as one JSON object of strings
// ({"recording":"…","subject":"…"}); encoding/json sorts map keys, so the
// key is reproducible.
func sourceJSON(src map[string]string) string {
	if len(src) == 0 {
		return ""
	}
	b, _ := json.Marshal(src) // strings always encode
	return string(b)
}
