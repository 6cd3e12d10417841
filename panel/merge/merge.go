package merge

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
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
	Duplicates []string // files already stored (same content)
	Superseded []Entry  // earlier returns that no longer count
	Rejected   []error  // one *returns.Error (or other error) per rejected file
	Events     int
	Agreement  *consensus.Agreement
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

// Run merges the files and rebuilds the consensus.
func Run(o Options) (*Result, error) {
	if o.Now == nil {
		o.Now = time.Now
	}
	if o.Manifest == nil {
		return nil, errors.New("no packets yet: run quorate packets first")
	}
	ledgerPath := filepath.Join(o.ReturnsDir, LedgerFile)
	ledger, err := ReadLedger(ledgerPath)
	if err != nil {
		return nil, err
	}
	stored := map[string]bool{}
	for _, e := range ledger {
		stored[e.SHA256] = true
	}
	before := Counting(ledger)
	res := &Result{}
	var add []Entry
	for _, f := range o.Files {
		data, err := os.ReadFile(f)
		if err != nil {
			res.Rejected = append(res.Rejected, err)
			continue
		}
		ret, err := returns.Parse(f, data, o.Manifest)
		if err != nil {
			res.Rejected = append(res.Rejected, err)
			continue
		}
		sum := sha256.Sum256(data)
		h := hex.EncodeToString(sum[:])
		if stored[h] {
			res.Duplicates = append(res.Duplicates, f)
			continue
		}
		name := h + "." + ret.Kind
		if err := atomicfile.Create(filepath.Join(o.ReturnsDir, name), data, 0o444); err != nil && !errors.Is(err, os.ErrExist) {
			return nil, err
		}
		stored[h] = true
		e := Entry{Time: o.Now().UTC(), Original: filepath.Base(f), SHA256: h, Stored: name, Kind: ret.Kind,
			Packet: ret.Packet, Rater: ret.Rater, Answered: len(ret.Answers), Unrated: len(ret.Unrated)}
		add = append(add, e)
	}
	if len(add) > 0 {
		if err := appendLedger(ledgerPath, add); err != nil {
			return nil, err
		}
		ledger = append(ledger, add...)
	}
	res.Accepted = add
	after := Counting(ledger)
	for p, e := range before {
		if after[p].SHA256 != e.SHA256 {
			res.Superseded = append(res.Superseded, e)
		}
	}
	// The consensus is rebuilt only when what counts has changed (or it was never built
	// from it), so a merge that accepts nothing changes nothing.
	if len(after) > 0 && (len(add) > 0 || !builtFrom(o.ConsensusDir, after)) {
		if err := rebuild(o, after, res); err != nil {
			return nil, err
		}
	}
	if len(res.Rejected) > 0 {
		return res, &RejectedError{res.Rejected}
	}
	return res, nil
}

// rebuild recomputes the consensus from the returns that count.
func rebuild(o Options, counting map[string]Entry, res *Result) error {
	type codeKey struct{ packet, item string }
	key := make(map[codeKey]packet.KeyRow, len(o.Key))
	for _, k := range o.Key {
		key[codeKey{k.Packet, k.Item}] = k
	}
	packets := make([]string, 0, len(counting))
	for p := range counting {
		packets = append(packets, p)
	}
	sort.Strings(packets)
	var ratings []consensus.Rating
	var hashes []string
	for _, p := range packets {
		e := counting[p]
		hashes = append(hashes, e.SHA256)
		data, err := os.ReadFile(filepath.Join(o.ReturnsDir, e.Stored))
		if err != nil {
			return fmt.Errorf("stored return %s: %w", e.Stored, err)
		}
		ret, err := returns.Parse(e.Original, data, o.Manifest)
		if err != nil {
			return fmt.Errorf("stored return %s no longer parses: %w", e.Stored, err)
		}
		for _, a := range ret.Answers {
			k, ok := key[codeKey{ret.Packet, a.Item}]
			if !ok {
				return fmt.Errorf("return %s: item %s of packet %s is not in key.parquet", e.Original, a.Item, ret.Packet)
			}
			ratings = append(ratings, ratingOf(ret, a, k, e.SHA256))
		}
	}
	sort.SliceStable(ratings, func(i, j int) bool {
		if ratings[i].EventID != ratings[j].EventID {
			return ratings[i].EventID < ratings[j].EventID
		}
		if ratings[i].Rater != ratings[j].Rater {
			return ratings[i].Rater < ratings[j].Rater
		}
		return !ratings[i].Duplicate && ratings[j].Duplicate
	})
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

// builtFrom reports whether the consensus in dir was built from exactly the returns
// that count.
func builtFrom(dir string, counting map[string]Entry) bool {
	b, err := os.ReadFile(filepath.Join(dir, InputsFile))
	if err != nil {
		return false
	}
	var in struct{ Returns []string }
	if json.Unmarshal(b, &in) != nil {
		return false
	}
	want := make([]string, 0, len(counting))
	for _, e := range counting {
		want = append(want, e.SHA256)
	}
	sort.Strings(want)
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
