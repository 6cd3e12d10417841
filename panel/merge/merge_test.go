package merge

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

var secret = []byte("a study secret of 32 bytes......")

// fixture: three raters, four events, one hidden duplicate each.
func fixture() (*packet.Manifest, []packet.KeyRow) {
	m := &packet.Manifest{Format: packet.ManifestFormat, Version: 1, Study: "st-test"}
	var key []packet.KeyRow
	for r, rater := range []string{"ana", "ben", "cas"} {
		pid := "P-" + rater + "-0000000" + fmt.Sprint(r)
		var codes []string
		for e := 0; e < 5; e++ {
			code := fmt.Sprintf("%c%cQX%d%d", 'A'+r, 'K'+e, r, e)
			codes = append(codes, code)
			ev := fmt.Sprintf("ev-%d", e%4)
			key = append(key, packet.KeyRow{Packet: pid, Rater: rater, Item: code, EventID: ev, Duplicate: e == 4, Position: int32(e + 1)})
		}
		m.Packets = append(m.Packets, packet.ManifestEntry{Packet: pid, Rater: rater, Items: codes,
			Check: packet.CheckValue(secret, m.Study, pid, rater, codes)})
	}
	return m, key
}

type answer struct {
	Item       string `json:"item"`
	C1         string `json:"c1"`
	C2         string `json:"c2"`
	C3         string `json:"c3"`
	C4         string `json:"c4"`
	C5         string `json:"c5"`
	C6         string `json:"c6"`
	Verdict    string `json:"verdict"`
	Confidence *int   `json:"confidence"`
	Comment    string `json:"comment"`
}

func writeReturn(t *testing.T, dir string, m *packet.Manifest, p int, yes func(item int) bool, check string) string {
	e := m.Packets[p]
	if check == "" {
		check = e.Check
	}
	var as []answer
	for i, code := range e.Items {
		v, verdict := "absent", "not-epileptiform"
		if yes(i) {
			v, verdict = "present", "epileptiform"
		}
		as = append(as, answer{Item: code, C1: v, C2: v, C3: v, C4: v, C5: v, C6: "present", Verdict: verdict})
	}
	b, _ := json.Marshal(map[string]any{"format": "quorate-return", "version": 1, "study": m.Study,
		"packet": e.Packet, "rater": e.Rater, "check": check, "answers": as})
	path := filepath.Join(dir, fmt.Sprintf("%s-%d.json", e.Packet, time.Now().UnixNano()))
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestMergeStoresSupersedesAndRefuses(t *testing.T) {
	m, key := fixture()
	study := t.TempDir()
	in := t.TempDir()
	o := Options{Manifest: m, Key: key, ReturnsDir: filepath.Join(study, "returns"), ConsensusDir: filepath.Join(study, "consensus"),
		SubjectOf: map[string]string{"ev-0": "s1", "ev-1": "s1", "ev-2": "s2", "ev-3": "s2"}, Quorum: 2,
		Tie: consensus.TieAbsent, Bootstrap: 50, Seed: 1, Level: 0.95}
	os.MkdirAll(o.ReturnsDir, 0o755)
	// Items 0 and 1 (events 0, 1) present for everyone; item 4 is event 0 again.
	yes := func(i int) bool { return i <= 1 || i == 4 }
	f1 := writeReturn(t, in, m, 0, yes, "")
	f2 := writeReturn(t, in, m, 1, yes, "")
	bad := writeReturn(t, in, m, 2, yes, strings.Repeat("0", 32))
	o.Files = []string{f1, f2, bad}
	res, err := Run(context.Background(), o)
	var rej *RejectedError
	if !errors.As(err, &rej) || len(rej.Errs) != 1 {
		t.Fatalf("err = %v, want one refused file", err)
	}
	var re *returns.Error
	if !errors.As(rej.Errs[0], &re) {
		t.Fatalf("refusal %v is not a *returns.Error", rej.Errs[0])
	}
	if len(res.Accepted) != 2 {
		t.Fatalf("%d accepted, want 2", len(res.Accepted))
	}
	// Stored unchanged, read-only, named by content.
	for _, e := range res.Accepted {
		p := filepath.Join(o.ReturnsDir, e.Stored)
		st, err := os.Stat(p)
		if err != nil || st.Mode().Perm() != 0o444 || !strings.HasPrefix(e.Stored, e.SHA256) {
			t.Errorf("stored %s: %v mode %v", e.Stored, err, st.Mode())
		}
	}
	evs, err := ReadConsensus(filepath.Join(o.ConsensusDir, ConsensusFile))
	if err != nil || len(evs) != 4 {
		t.Fatalf("consensus: %v, %d events", err, len(evs))
	}
	if evs[0].Verdict != "epileptiform" || evs[0].VerdictYes != 2 || evs[2].Verdict != "not-epileptiform" {
		t.Errorf("consensus %+v", evs[0])
	}
	rs, _ := ReadRatings(filepath.Join(o.ConsensusDir, RatingsFile))
	if len(rs) != 10 {
		t.Errorf("%d ratings, want 10 (2 raters × 5 items)", len(rs))
	}
	st, _ := GetStatus(m, key, o.ReturnsDir, o.ConsensusDir)
	if !st.ConsensusUpToDate || st.Packets[2].State != "out" || st.Packets[0].State != "returned" {
		t.Errorf("status %+v", st)
	}

	// Merging the same file again stores nothing new.
	o.Files = []string{f1}
	res, err = Run(context.Background(), o)
	if err != nil || len(res.Duplicates) != 1 || len(res.Accepted) != 0 {
		t.Fatalf("re-merge: %v %+v", err, res)
	}
	// A later return from ana supersedes the first; both are kept.
	o.Files = []string{writeReturn(t, in, m, 0, func(int) bool { return false }, "")}
	res, err = Run(context.Background(), o)
	if err != nil || len(res.Superseded) != 1 {
		t.Fatalf("supersede: %v %+v", err, res)
	}
	led := mustLedger(t, o)
	if len(led) != 3 {
		t.Fatalf("ledger has %d entries, want 3", len(led))
	}
	for _, e := range led {
		if _, err := os.Stat(filepath.Join(o.ReturnsDir, e.Stored)); err != nil {
			t.Errorf("stored return %s lost: %v", e.Stored, err)
		}
	}
	evs, _ = ReadConsensus(filepath.Join(o.ConsensusDir, ConsensusFile))
	// ana now says no to everything, ben yes on event 0: a tie counts as absent.
	if evs[0].Verdict != "not-epileptiform" || evs[0].VerdictYes != 1 || evs[0].VerdictNo != 1 {
		t.Errorf("after supersede: %+v", evs[0])
	}
	st, _ = GetStatus(m, key, o.ReturnsDir, o.ConsensusDir)
	if st.Packets[0].Returns != 2 || st.Packets[0].Superseded != 1 {
		t.Errorf("status %+v", st.Packets[0])
	}
}

func mustLedger(t *testing.T, o Options) []Entry {
	l, err := ReadLedger(filepath.Join(o.ReturnsDir, LedgerFile))
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// A cancelled context stops a merge before any return is stored.
func TestRunCancelled(t *testing.T) {
	m, key := fixture()
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := Run(ctx, Options{Manifest: m, Key: key, ReturnsDir: filepath.Join(dir, "returns"), ConsensusDir: filepath.Join(dir, "consensus"), Quorum: 2})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err %v, want context.Canceled", err)
	}
	if _, err := os.Stat(filepath.Join(dir, "returns")); !os.IsNotExist(err) {
		t.Errorf("returns/ written under a cancelled context")
	}
}
