package merge

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/internal/parquetfile"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

// File names.
const (
	LedgerFile    = "ledger.jsonl"
	RatingsFile   = "ratings.parquet"
	ConsensusFile = "consensus.parquet"
	AgreementJSON = "agreement.json"
	AgreementMD   = "agreement.md"
	InputsFile    = "inputs.json" // the return hashes a consensus was built from
)

// Options configure a merge.
type Options struct {
	Files        []string
	Manifest     *packet.Manifest
	Key          []packet.KeyRow
	ReturnsDir   string
	ConsensusDir string
	SubjectOf    map[string]string // event → subject key, for subject-resampling intervals
	Quorum       int
	Tie          consensus.TiePolicy
	Bootstrap    int
	Seed         uint64
	Level        float64
	Now          func() time.Time
}

// Result says what a merge did.
type Result struct {
	Accepted   []Entry
	Duplicates []string // files already stored whose items already count
	Restored   []Entry  // files already stored whose items count again
	Superseded []Entry  // earlier returns none of whose items count any more
	Rejected   []error  // one *returns.Error (or other error) per rejected file
	Owed       []Owed   // per merged return, the items it leaves partly filled in
	Events     int
	Agreement  *consensus.Agreement

	writeErr error // storing a return failed: nothing more is written
}

// Owed lists the items of one return that were partly filled in and have
// no earlier answer that counts: the rater still owes them.
type Owed struct {
	File, Packet, Rater string
	Items               []string
}

// RejectedError is returned when some files were refused; the accepted ones were merged.
type RejectedError struct{ Errs []error }

func (e *RejectedError) Error() string {
	msgs := make([]string, len(e.Errs))
	for i, err := range e.Errs {
		msgs[i] = err.Error()
	}
	return fmt.Sprintf("%d file(s) refused, nothing of them was merged:\n%s", len(e.Errs), strings.Join(msgs, "\n"))
}

// Unwrap gives each refused file's error, for errors.Is and errors.As.
func (e *RejectedError) Unwrap() []error { return e.Errs }

// ErrNoManifest is returned when there are no packets to check returns against.
var ErrNoManifest = errors.New("no packet manifest: returns cannot be checked")

// Run merges the files at item level and rebuilds the consensus: a return
// counts for the items it gives a value for, and a later return replaces an
// earlier one only there.
func Run(ctx context.Context, o Options) (*Result, error) {
	if o.Now == nil {
		o.Now = time.Now
	}
	if o.Manifest == nil {
		return nil, ErrNoManifest
	}
	// Cancellation is honoured before anything is stored: once returns are
	// being stored, the ledger must be written for them.
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	ledgerPath := filepath.Join(o.ReturnsDir, LedgerFile)
	ledger, err := ReadLedger(ledgerPath)
	if err != nil {
		return nil, err
	}
	fillItems(o.ReturnsDir, o.Manifest, ledger)
	stored := map[string]bool{}
	for _, e := range ledger {
		stored[e.SHA256] = true
	}
	before := Counting(ledger)
	res := &Result{}
	var add []Entry
	var refused []Refusal
	for _, f := range o.Files {
		data, err := readReturn(f)
		if err == nil {
			var ret *returns.Return
			ret, err = returns.Parse(f, data, o.Manifest)
			if err == nil {
				add = accept(o, res, add, before, stored, f, data, ret)
				continue
			}
		}
		res.Rejected = append(res.Rejected, err)
		if errors.Is(err, fs.ErrNotExist) {
			continue // a mistyped name: said now, but no file was handed in to log
		}
		refused = append(refused, Refusal{Time: o.Now().UTC(), Original: filepath.Base(f), Reason: err.Error()})
	}
	if err := appendRefused(filepath.Join(o.ReturnsDir, RefusedFile), refused); err != nil {
		return nil, err
	}
	if res.writeErr != nil {
		return nil, res.writeErr
	}
	if len(add) > 0 {
		if err := appendLedger(ledgerPath, add); err != nil {
			return nil, err
		}
		ledger = append(ledger, add...)
	}
	after := Counting(ledger)
	res.Superseded = superseded(ledger, before, after)
	// A partly filled item whose earlier answer still counts is not owed.
	kept := res.Owed[:0]
	for _, o := range res.Owed {
		o.Items = slices.DeleteFunc(slices.Clone(o.Items), func(it string) bool { _, ok := after[ItemKey{o.Packet, it}]; return ok })
		if len(o.Items) > 0 {
			kept = append(kept, o)
		}
	}
	res.Owed = kept
	// The consensus is rebuilt only when what counts has changed (or it was never built
	// from it), so a merge that accepts nothing changes nothing.
	want := countingHashes(after, func(e Entry) string { return e.SHA256 })
	if len(after) > 0 && (len(add) > 0 || !builtFrom(o.ConsensusDir, want)) {
		if err := rebuild(o, ledger, res); err != nil {
			return nil, err
		}
	}
	if len(res.Rejected) > 0 {
		return res, &RejectedError{res.Rejected}
	}
	return res, nil
}

// readReturn reads a handed-in file, refusing one larger than any return
// before reading it whole.
func readReturn(f string) ([]byte, error) {
	st, err := os.Stat(f)
	if err != nil {
		return nil, err
	}
	if st.Size() > returns.MaxSize {
		return nil, &returns.Error{File: f, Problems: []returns.Problem{{Got: fmt.Sprintf("%d bytes", st.Size()),
			Want: fmt.Sprintf("at most %d bytes (a return of one packet)", returns.MaxSize)}}}
	}
	return os.ReadFile(f)
}

// accept stores a checked return (create-only, read-only, named by its
// SHA-256) and appends its ledger entry to add. A file already stored gets a
// new entry only when some of its items no longer count from it, so that
// handing it in again restores them.
func accept(o Options, res *Result, add []Entry, counting map[ItemKey]Entry, stored map[string]bool, f string, data []byte, ret *returns.Return) []Entry {
	sum := sha256.Sum256(data)
	h := hex.EncodeToString(sum[:])
	items := make([]string, len(ret.Answers))
	for i, a := range ret.Answers {
		items[i] = a.Item
	}
	e := Entry{Time: o.Now().UTC(), Original: filepath.Base(f), SHA256: h, Stored: h + "." + ret.Kind, Kind: ret.Kind,
		Packet: ret.Packet, Rater: ret.Rater, Answered: len(ret.Answers), Unrated: len(ret.Unrated),
		Items: items, Incomplete: ret.Incomplete}
	if len(ret.Incomplete) > 0 {
		res.Owed = append(res.Owed, Owed{File: filepath.Base(f), Packet: ret.Packet, Rater: ret.Rater, Items: ret.Incomplete})
	}
	if stored[h] {
		for _, prev := range add {
			if prev.SHA256 == h {
				res.Duplicates = append(res.Duplicates, f)
				return add
			}
		}
		restores := false
		for _, it := range items {
			restores = restores || counting[ItemKey{ret.Packet, it}].SHA256 != h
		}
		if !restores {
			res.Duplicates = append(res.Duplicates, f)
			return add
		}
		e.Remerge = true
		res.Restored = append(res.Restored, e)
		return append(add, e)
	}
	if err := atomicfile.Create(filepath.Join(o.ReturnsDir, e.Stored), data, 0o444); err != nil && !errors.Is(err, os.ErrExist) {
		if res.writeErr == nil {
			res.writeErr = err
		}
		return add
	}
	stored[h] = true
	res.Accepted = append(res.Accepted, e)
	return append(add, e)
}

// superseded lists the returns that counted for some item before and count
// for none now.
func superseded(ledger []Entry, before, after map[ItemKey]Entry) []Entry {
	now := map[string]bool{}
	for _, e := range after {
		now[e.SHA256] = true
	}
	var out []Entry
	seen := map[string]bool{}
	for _, e := range before {
		if !now[e.SHA256] && !seen[e.SHA256] {
			seen[e.SHA256] = true
			out = append(out, e)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Stored < out[j].Stored })
	return out
}

// rebuild recomputes the consensus from the ledger: every stored return is
// re-hashed against its name, re-checked, and each item takes the answer of
// the last return that gives it one.
func rebuild(o Options, ledger []Entry, res *Result) error {
	key := make(map[ItemKey]packet.KeyRow, len(o.Key))
	for _, k := range o.Key {
		key[ItemKey{k.Packet, k.Item}] = k
	}
	type counted struct {
		ret  *returns.Return
		a    returns.Answer
		hash string
	}
	best := map[ItemKey]counted{}
	parsed := map[string]*returns.Return{}
	for _, e := range ledger {
		ret, ok := parsed[e.SHA256]
		if !ok {
			data, err := readStored(o.ReturnsDir, e)
			if err != nil {
				return err
			}
			if ret, err = returns.Parse(e.Original, data, o.Manifest); err != nil {
				return fmt.Errorf("stored return %s no longer passes the checks: %w", e.Stored, err)
			}
			parsed[e.SHA256] = ret
		}
		for _, a := range ret.Answers {
			best[ItemKey{ret.Packet, a.Item}] = counted{ret, a, e.SHA256}
		}
	}
	var ratings []consensus.Rating
	for ik, c := range best {
		k, ok := key[ik]
		if !ok {
			return fmt.Errorf("return %s: item %s of packet %s is not in the packet key", c.ret.File, ik.Item, ik.Packet)
		}
		ratings = append(ratings, ratingOf(c.ret, c.a, k, c.hash))
	}
	sort.Slice(ratings, func(i, j int) bool {
		a, b := ratings[i], ratings[j]
		if a.EventID != b.EventID {
			return a.EventID < b.EventID
		}
		if a.Rater != b.Rater {
			return a.Rater < b.Rater
		}
		if a.Duplicate != b.Duplicate {
			return !a.Duplicate
		}
		return a.ItemCode < b.ItemCode
	})
	hashes := countingHashes(best, func(c counted) string { return c.hash })
	events := consensus.Build(ratings, o.Quorum, o.Tie)
	res.Events = len(events)
	agr, ds, err := consensus.Measure(ratings, o.SubjectOf, o.Bootstrap, o.Seed, o.Level)
	if err == nil {
		for i := range events {
			if p, ok := ds[events[i].EventID]; ok {
				events[i].DSProbability = p
			}
		}
		res.Agreement = agr
	}
	dir := o.ConsensusDir
	if err := writeParquet(filepath.Join(dir, RatingsFile), ratings); err != nil {
		return err
	}
	if err := writeParquet(filepath.Join(dir, ConsensusFile), events); err != nil {
		return err
	}
	if agr != nil {
		b, err := json.MarshalIndent(agr, "", "  ")
		if err != nil {
			return err
		}
		if err := atomicfile.WriteBytes(filepath.Join(dir, AgreementJSON), append(b, '\n'), 0o644); err != nil {
			return err
		}
		if err := atomicfile.Write(filepath.Join(dir, AgreementMD), 0o644, agr.WriteMarkdown); err != nil {
			return err
		}
	}
	b, _ := json.MarshalIndent(map[string]any{"returns": hashes}, "", "  ")
	return atomicfile.WriteBytes(filepath.Join(dir, InputsFile), append(b, '\n'), 0o644)
}

// builtFrom reports whether the consensus in dir was built from exactly the
// returns (sorted SHA-256s) that count.
func builtFrom(dir string, want []string) bool {
	b, err := os.ReadFile(filepath.Join(dir, InputsFile))
	if err != nil {
		return false
	}
	var in struct{ Returns []string }
	if json.Unmarshal(b, &in) != nil {
		return false
	}
	sort.Strings(in.Returns)
	return slices.Equal(want, in.Returns)
}

func ratingOf(ret *returns.Return, a returns.Answer, k packet.KeyRow, hash string) consensus.Rating {
	crit := [6]*bool{}
	for c, p := range a.Criteria {
		switch p {
		case returns.Present:
			crit[c] = ptr(true)
		case returns.Absent:
			crit[c] = ptr(false)
		}
	}
	var verdict *bool
	switch a.Verdict {
	case returns.Epileptiform:
		verdict = ptr(true)
	case returns.NotEpileptiform:
		verdict = ptr(false)
	}
	return consensus.Rating{EventID: k.EventID, Rater: ret.Rater, Packet: ret.Packet, ItemCode: a.Item,
		C1: crit[0], C2: crit[1], C3: crit[2], C4: crit[3], C5: crit[4], C6: crit[5], Epileptiform: verdict,
		Confidence: int32(a.Confidence), Comment: a.Comment, Duplicate: k.Duplicate, ReturnSHA256: hash}
}

func ptr[T any](v T) *T { return &v }

func writeParquet[T any](path string, rows []T) error { return parquetfile.Write(path, rows, 0o644) }

// ReadRatings reads ratings.parquet.
func ReadRatings(path string) ([]consensus.Rating, error) {
	return parquetfile.Read[consensus.Rating](path)
}

// ReadConsensus reads consensus.parquet.
func ReadConsensus(path string) ([]consensus.Event, error) {
	return parquetfile.Read[consensus.Event](path)
}
