package merge

import (
	"sort"
	"time"
)

// Entry is one line of returns/ledger.jsonl: an accepted return file.
type Entry struct {
	Time     time.Time `json:"time"`
	Original string    `json:"original_name"` // the file name as handed to merge
	SHA256   string    `json:"sha256"`
	Stored   string    `json:"stored"` // file name under returns/
	Kind     string    `json:"kind"`   // json or csv
	Packet   string    `json:"packet"`
	Rater    string    `json:"rater"`
	Answered int       `json:"answered"`
	Unrated  int       `json:"unrated"`
	// Items are the item codes the return gives a value for; Incomplete
	// those it fills in only partly (owed, not merged). Remerge marks a
	// file already stored and handed to merge again, so that its items
	// count again.
	Items      []string `json:"items,omitempty"`
	Incomplete []string `json:"incomplete,omitempty"`
	Remerge    bool     `json:"remerge,omitempty"`
}

// ItemKey names one item of one packet.
type ItemKey struct{ Packet, Item string }

// ReadLedger reads the ledger; a missing ledger is an empty one.
func ReadLedger(path string) ([]Entry, error) { return readJSONL[Entry](path) }

func appendLedger(path string, es []Entry) error { return appendJSONL(path, es) }

// Counting returns, per item, the ledger entry that counts for it: the last
// one merged that gives the item a value. A blank or partly filled item gives
// none, so a later return never erases an answer that counts.
func Counting(ledger []Entry) map[ItemKey]Entry {
	m := map[ItemKey]Entry{}
	for _, e := range ledger {
		for _, it := range e.Items {
			m[ItemKey{e.Packet, it}] = e
		}
	}
	return m
}

// countingHashes returns the sorted distinct returns that count for some item.
func countingHashes[V any](c map[ItemKey]V, hash func(V) string) []string {
	seen := map[string]bool{}
	var out []string
	for _, v := range c {
		if h := hash(v); !seen[h] {
			seen[h] = true
			out = append(out, h)
		}
	}
	sort.Strings(out)
	return out
}
