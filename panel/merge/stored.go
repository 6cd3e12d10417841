package merge

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"

	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

// StoredError reports a stored return whose content no longer matches the
// SHA-256 it is named and ledgered by: it was edited after merge stored it.
type StoredError struct {
	Stored string // file name under the returns folder
	Want   string // the SHA-256 in the ledger
	Got    string // the SHA-256 of the content now; "" when unreadable
	Err    error  // the read error, if any
}

func (e *StoredError) Error() string {
	if e.Err != nil {
		return fmt.Sprintf("stored return %s: %v", e.Stored, e.Err)
	}
	return fmt.Sprintf("stored return %s was changed after it was stored (SHA-256 now %s…, ledger %s…): restore the original", e.Stored, e.Got[:12], e.Want[:12])
}

func (e *StoredError) Unwrap() error { return e.Err }

// readStored reads a stored return and checks it against its ledger hash.
func readStored(dir string, e Entry) ([]byte, error) {
	p := filepath.Join(dir, e.Stored)
	st, err := os.Stat(p)
	if err != nil {
		return nil, &StoredError{Stored: e.Stored, Want: e.SHA256, Err: err}
	}
	if st.Size() > returns.MaxSize {
		return nil, &StoredError{Stored: e.Stored, Want: e.SHA256, Got: "(larger than any return)"}
	}
	data, err := os.ReadFile(p)
	if err != nil {
		return nil, &StoredError{Stored: e.Stored, Want: e.SHA256, Err: err}
	}
	sum := sha256.Sum256(data)
	if got := hex.EncodeToString(sum[:]); got != e.SHA256 {
		return nil, &StoredError{Stored: e.Stored, Want: e.SHA256, Got: got}
	}
	return data, nil
}

// VerifyStored re-hashes every stored return of the ledger and returns one
// *StoredError per file that is missing, unreadable or changed.
func VerifyStored(dir string, ledger []Entry) []error {
	var errs []error
	seen := map[string]bool{}
	for _, e := range ledger {
		if seen[e.Stored] {
			continue
		}
		seen[e.Stored] = true
		if _, err := readStored(dir, e); err != nil {
			errs = append(errs, err)
		}
	}
	return errs
}

// fillItems gives ledger entries written before the ledger listed items
// (Items empty, Answered > 0) their items, read from the stored return, so
// that studies merged earlier count item by item too. A stored return that
// cannot be read is left as it is: rebuild and VerifyStored report it.
func fillItems(dir string, m *packet.Manifest, ledger []Entry) {
	for i, e := range ledger {
		if len(e.Items) > 0 || e.Answered == 0 {
			continue
		}
		data, err := readStored(dir, e)
		if err != nil {
			continue
		}
		ret, err := returns.Parse(e.Original, data, m)
		if err != nil {
			continue
		}
		for _, a := range ret.Answers {
			ledger[i].Items = append(ledger[i].Items, a.Item)
		}
		ledger[i].Incomplete = ret.Incomplete
	}
}
