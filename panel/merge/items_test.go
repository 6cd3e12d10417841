package merge

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

func testOptions(t *testing.T) Options {
	m, key := fixture()
	study := t.TempDir()
	o := Options{Manifest: m, Key: key, ReturnsDir: filepath.Join(study, "returns"), ConsensusDir: filepath.Join(study, "consensus"),
		SubjectOf: map[string]string{"ev-0": "s1", "ev-1": "s1", "ev-2": "s2", "ev-3": "s2"}, Quorum: 2,
		Tie: consensus.TieAbsent, Bootstrap: 20, Seed: 1, Level: 0.95}
	os.MkdirAll(o.ReturnsDir, 0o755)
	os.MkdirAll(o.ConsensusDir, 0o755)
	return o
}

// editReturn rewrites answers of a return written by writeReturn.
func editReturn(t *testing.T, path string, edit func(as []map[string]any)) string {
	b, _ := os.ReadFile(path)
	var v map[string]any
	json.Unmarshal(b, &v)
	var as []map[string]any
	for _, a := range v["answers"].([]any) {
		as = append(as, a.(map[string]any))
	}
	edit(as)
	v["answers"] = as
	b, _ = json.Marshal(v)
	out := strings.TrimSuffix(path, ".json") + "-edited.json"
	if err := os.WriteFile(out, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return out
}

func ratingsOf(t *testing.T, o Options, rater string) map[string]string {
	rs, err := ReadRatings(filepath.Join(o.ConsensusDir, RatingsFile))
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{}
	for _, r := range rs {
		if r.Rater == rater {
			out[r.ItemCode] = r.ReturnSHA256
		}
	}
	return out
}

// Kane et al. (2017) ask six criteria and a verdict of every item: a return
// with three complete items and one half-rated merges the three, and the
// fourth stays owed, named by its item code.
func TestHalfRatedItemStaysOwed(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	f := editReturn(t, writeReturn(t, in, o.Manifest, 0, func(int) bool { return true }, ""), func(as []map[string]any) {
		as[3]["c2"], as[3]["verdict"] = "", nil // half-rated
		for k := range as[4] {
			if k != "item" {
				as[4][k] = nil // blank: not rated yet
			}
		}
	})
	o.Files = []string{f}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	items := o.Manifest.Packets[0].Items
	if got := ratingsOf(t, o, "ana"); len(got) != 3 {
		t.Errorf("%d ratings merged, want 3: %v", len(got), got)
	}
	if len(res.Owed) != 1 || !slices.Equal(res.Owed[0].Items, items[3:4]) {
		t.Errorf("owed %+v", res.Owed)
	}
	st, err := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if err != nil {
		t.Fatal(err)
	}
	p := st.Packets[0]
	if p.State != "partly returned" || !slices.Equal(p.OwedItems, items[3:]) || !slices.Equal(p.Incomplete, items[3:4]) {
		t.Errorf("status %+v", p)
	}
	// Counts agree: 3 packets × 5 items, one hidden duplicate each, 4 events.
	if st.Items != 15 || st.Duplicates != 3 || st.Events != 4 || st.Owed != 2+5+5 {
		t.Errorf("counts %+v", st)
	}
}

// A blank or partial return never erases counted answers; handing in the
// earlier full file again makes its items count again.
func TestItemLevelMerge(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	full := writeReturn(t, in, o.Manifest, 0, func(i int) bool { return i < 2 }, "")
	o.Files = []string{full}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	first := ratingsOf(t, o, "ana")
	blank := editReturn(t, full, func(as []map[string]any) {
		for _, a := range as {
			for k := range a {
				if k != "item" {
					a[k] = nil
				}
			}
		}
	})
	o.Files = []string{blank}
	res, err := Run(context.Background(), o)
	if err != nil || len(res.Superseded) != 0 {
		t.Fatalf("blank: %v %+v", err, res)
	}
	if got := ratingsOf(t, o, "ana"); len(got) != 5 || !mapsEqual(got, first) {
		t.Errorf("after a blank return: %v, want %v", got, first)
	}
	st, _ := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if st.Packets[0].State != "returned" || st.Packets[1].State != "out" {
		t.Errorf("status %+v", st.Packets[:2])
	}
	// One item changed later: only that item counts from the later file.
	one := editReturn(t, blank, func(as []map[string]any) {
		for k, v := range map[string]any{"c1": "absent", "c2": "absent", "c3": "absent", "c4": "absent", "c5": "absent", "c6": "cannot-judge", "verdict": "cannot-judge"} {
			as[0][k] = v
		}
	})
	o.Files = []string{one}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	got := ratingsOf(t, o, "ana")
	items := o.Manifest.Packets[0].Items
	if got[items[0]] == first[items[0]] || got[items[1]] != first[items[1]] {
		t.Errorf("after one changed item: %v", got)
	}
	// Re-merging the full file restores its answer for item 0.
	o.Files = []string{full}
	res, err = Run(context.Background(), o)
	if err != nil || len(res.Restored) != 1 || len(res.Superseded) != 1 {
		t.Fatalf("restore: %v %+v", err, res)
	}
	if got := ratingsOf(t, o, "ana"); !mapsEqual(got, first) {
		t.Errorf("after restore: %v, want %v", got, first)
	}
}

func mapsEqual(a, b map[string]string) bool {
	if len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if b[k] != v {
			return false
		}
	}
	return true
}

// A stored return edited after merge stored it no longer matches its
// SHA-256 name (FIPS 180-4): the rebuild refuses it and status says so.
func TestEditedStoredReturnRefused(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	o.Files = []string{writeReturn(t, in, o.Manifest, 0, func(int) bool { return true }, "")}
	res, err := Run(context.Background(), o)
	if err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(o.ReturnsDir, res.Accepted[0].Stored)
	os.Chmod(p, 0o644)
	b, _ := os.ReadFile(p)
	os.WriteFile(p, []byte(strings.Replace(string(b), `"present"`, `"absent"`, 1)), 0o444)
	st, _ := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if st.ConsensusUpToDate || len(st.Damaged) != 1 {
		t.Errorf("status %+v", st)
	}
	o.Files = []string{writeReturn(t, in, o.Manifest, 1, func(int) bool { return true }, "")}
	var se *StoredError
	if _, err := Run(context.Background(), o); err == nil || !asStored(err, &se) {
		t.Errorf("rebuild over an edited return: %v", err)
	}
}

func asStored(err error, se **StoredError) bool {
	e, ok := err.(*StoredError)
	*se = e
	return ok
}

// A refused file is listed by status with its reasons until a file of the
// same name is accepted.
// The first file ever handed in may be refused, before the returns folder
// exists: the refusal is still logged. A name that names no file is said,
// not logged.
func TestStatusListsRefused(t *testing.T) {
	o := testOptions(t)
	os.Remove(o.ReturnsDir)
	in := t.TempDir()
	bad := writeReturn(t, in, o.Manifest, 2, func(int) bool { return true }, strings.Repeat("0", 32))
	o.Files = []string{bad, filepath.Join(in, "no-such-file.json")}
	var rej *RejectedError
	if _, err := Run(context.Background(), o); !errors.As(err, &rej) || len(rej.Errs) != 2 {
		t.Fatalf("a wrong check value and a missing file: %v, want two refusals", err)
	}
	st, _ := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if len(st.Refused) != 1 || st.Refused[0].Original != filepath.Base(bad) || !strings.Contains(st.Refused[0].Reason, "check") {
		t.Errorf("refused %+v", st.Refused)
	}
}

// A blank return (the sheet sent back untouched) is no return: the packet
// stays "out". A file larger than any return is refused before it is read.
func TestBlankReturnAndSizeCap(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	blank := editReturn(t, writeReturn(t, in, o.Manifest, 0, func(int) bool { return true }, ""), func(as []map[string]any) {
		for _, a := range as {
			for k := range a {
				if k != "item" {
					a[k] = nil
				}
			}
		}
	})
	big := filepath.Join(in, "big.json")
	f, _ := os.Create(big)
	f.Truncate(returns.MaxSize + 1) // sparse: the size is there, the bytes are not
	f.Close()
	o.Files = []string{blank, big}
	res, err := Run(context.Background(), o)
	if err == nil || len(res.Rejected) != 1 || !strings.Contains(res.Rejected[0].Error(), "at most") {
		t.Fatalf("err %v", err)
	}
	st, _ := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if p := st.Packets[0]; p.State != "out" || p.Owes != 5 || p.Returns != 0 || p.Superseded != 0 || p.Empty != 1 {
		t.Errorf("blank return: %+v", st.Packets[0])
	}
}

// A ledger written before entries listed their items still counts item by
// item: the items are read back from the stored returns.
func TestLedgerWithoutItems(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	o.Files = []string{writeReturn(t, in, o.Manifest, 0, func(int) bool { return true }, "")}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	p := filepath.Join(o.ReturnsDir, LedgerFile)
	led := mustLedger(t, o)
	led[0].Items, led[0].Incomplete = nil, nil
	os.Remove(p)
	if err := appendLedger(p, led); err != nil {
		t.Fatal(err)
	}
	st, err := GetStatus(o.Manifest, o.Key, o.ReturnsDir, o.ConsensusDir)
	if err != nil || st.Packets[0].State != "returned" || !st.ConsensusUpToDate {
		t.Errorf("status %+v, %v", st, err)
	}
}

// A sheet handed in later with rows missing (a rater deleted the rows they had
// already answered on the page) once superseded the whole earlier return and
// dropped the missing rows' counted answers. Missing rows give no value, so the
// earlier answers of those items still count; the rows present replace theirs.
func TestSheetWithMissingRowsKeepsAnswers(t *testing.T) {
	o := testOptions(t)
	in := t.TempDir()
	o.Files = []string{writeReturn(t, in, o.Manifest, 0, func(i int) bool { return i < 2 }, "")}
	if _, err := Run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	first := ratingsOf(t, o, "ana")
	e := o.Manifest.Packets[0]
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	w.Write(packet.SheetColumns)
	// Only the last item's row is left, answered differently.
	last := e.Items[len(e.Items)-1]
	w.Write([]string{e.Packet, e.Check, e.Rater, last, "present", "present", "present", "present", "present", "present", "epileptiform", "", ""})
	w.Flush()
	sheet := filepath.Join(in, "sheet.csv")
	os.WriteFile(sheet, buf.Bytes(), 0o644)
	o.Files = []string{sheet}
	res, err := Run(context.Background(), o)
	if err != nil || len(res.Superseded) != 0 || len(res.Accepted) != 1 {
		t.Fatalf("sheet of one row: %v %+v", err, res)
	}
	got := ratingsOf(t, o, "ana")
	if len(got) != len(first) {
		t.Fatalf("after the sheet: %d rated items, want %d", len(got), len(first))
	}
	for _, it := range e.Items[:len(e.Items)-1] {
		if got[it] != first[it] {
			t.Errorf("item %s: %q after the sheet, want the earlier %q", it, got[it], first[it])
		}
	}
	if got[last] == first[last] {
		t.Errorf("item %s: the sheet's answer does not count (%q)", last, got[last])
	}
}
