package packet

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// A later phase adds one packet per rater for the new events only: every
// earlier key row, manifest entry and packet file stays as it was, codes are
// unique across all packets, and the same inputs give the same bytes.
func TestExtendKeepsEarlierPackets(t *testing.T) {
	items := SynthItems(32, 2, 64, 3)
	phase1, phase2 := items[:20], items[20:]
	build := func(dir string) (*Result, map[string][]byte, map[string][]byte) {
		if _, err := Build(context.Background(), phase1, testOptions(dir, "alice", "bob")); err != nil {
			t.Fatal(err)
		}
		before := files(t, dir)
		o := testOptions(dir, "bob", "alice") // any order: the manifest's is used
		o.Phase = 2
		res, err := Run(context.Background(), Options{Items: phase2, StudyID: o.StudyID, Secret: o.Secret, Raters: o.Raters,
			Seed: o.Seed, OutDir: o.OutDir, Phase: 2})
		if err != nil {
			t.Fatal(err)
		}
		return res, before, files(t, dir)
	}
	dir := t.TempDir()
	res, before, after := build(dir)
	out := filepath.Join(dir, "packets")

	// Earlier packet files are untouched; the new ones are in phase-2/.
	for name, b := range before {
		if name == filepath.Join("packets", KeyFile) || name == filepath.Join("packets", ManifestFile) {
			continue
		}
		if !bytes.Equal(after[name], b) {
			t.Errorf("%s changed", name)
		}
	}
	for _, r := range []string{"alice", "bob"} {
		for _, f := range []string{PageFile, SheetFile} {
			if _, ok := after[filepath.Join("packets", r, "phase-2", f)]; !ok {
				t.Errorf("no %s/phase-2/%s", r, f)
			}
		}
	}

	// Key: the earlier rows first and unchanged, then the new ones.
	d1 := t.TempDir() // the first build alone
	if _, err := Build(context.Background(), phase1, testOptions(d1, "alice", "bob")); err != nil {
		t.Fatal(err)
	}
	m1, err := ReadManifest(filepath.Join(d1, "packets", ManifestFile))
	if err != nil {
		t.Fatal(err)
	}
	key1, err := ReadKey(filepath.Join(d1, "packets", KeyFile))
	if err != nil {
		t.Fatal(err)
	}
	key, err := ReadKey(filepath.Join(out, KeyFile))
	if err != nil {
		t.Fatal(err)
	}
	m, err := ReadManifest(filepath.Join(out, ManifestFile))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(m.Packets[:len(m1.Packets)], m1.Packets) {
		t.Error("the earlier manifest entries changed")
	}
	if len(m.Packets) != 4 || m.Packets[2].Rater != "alice" || m.Packets[3].Rater != "bob" || m.Packets[2].Phase != 2 || m.Packets[3].Phase != 2 {
		t.Fatalf("manifest packets %+v, want alice and bob's phase-1 packets then their phase-2 packets in that order", m.Packets)
	}
	n1 := len(key1)
	if !reflect.DeepEqual(key[:n1], key1) {
		t.Error("the earlier key rows changed")
	}
	if len(key) != n1+len(res.Key) || !reflect.DeepEqual(key[n1:], res.Key) {
		t.Fatalf("key holds %d rows, want %d earlier then the %d new", len(key), n1, len(res.Key))
	}
	old := map[string]bool{}
	for _, k := range key[:n1] {
		old[k.Packet] = true
		if k.EventID >= phase2[0].EventID {
			t.Errorf("earlier row %+v shows a phase-2 event", k)
		}
	}
	codes := map[string]bool{}
	newEvents := map[string]bool{}
	dups := map[string]int{}
	for i, k := range key {
		if codes[k.Item] {
			t.Errorf("code %s used twice", k.Item)
		}
		codes[k.Item] = true
		if i >= n1 {
			if old[k.Packet] {
				t.Errorf("new row %+v reuses an earlier packet id", k)
			}
			if k.EventID < phase2[0].EventID {
				t.Errorf("new row %+v shows a phase-1 event", k)
			}
			newEvents[k.EventID] = true
			if k.Duplicate {
				dups[k.Rater]++
			}
		}
	}
	// round(0.10 × 12) = 1 hidden duplicate per new packet (Options.DuplicateShare).
	if len(newEvents) != len(phase2) || dups["alice"] != 1 || dups["bob"] != 1 {
		t.Errorf("new packets show %d events with duplicates %v, want %d events and 1 duplicate each", len(newEvents), dups, len(phase2))
	}
	if got := Covered(m, key); len(got) != len(items) {
		t.Errorf("Covered: %d events, want %d", len(got), len(items))
	}

	// Determinism: a second study folder gets the same bytes.
	_, _, again := build(t.TempDir())
	if len(again) != len(after) {
		t.Fatalf("%d files, then %d", len(after), len(again))
	}
	for name, b := range after {
		if !bytes.Equal(again[name], b) {
			t.Errorf("%s differs between two equal builds", name)
		}
	}

	// Refusals: another panel, an event already in a packet, the same phase twice.
	for _, c := range []struct {
		name   string
		items  []Item
		raters []string
		phase  int
		want   string
	}{
		{"another panel", items[20:22], []string{"alice", "carol"}, 3, "same panel"},
		{"covered event", items[19:21], []string{"alice", "bob"}, 3, "already in a packet"},
		{"phase twice", SynthItems(40, 2, 64, 3)[32:34], []string{"alice", "bob"}, 2, "already covers phase 2"},
		{"phase one", SynthItems(40, 2, 64, 3)[32:34], []string{"alice", "bob"}, 1, "later phase"},
	} {
		o := testOptions(dir, c.raters...)
		o.Phase = c.phase
		_, err := Extend(context.Background(), c.items, o)
		if !errors.Is(err, ErrInput) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want an input error saying %q", c.name, err, c.want)
		}
	}
	o := testOptions(t.TempDir(), "alice")
	o.Phase = 2
	if _, err := Extend(context.Background(), phase2, o); !errors.Is(err, ErrNoPackets) {
		t.Errorf("Extend with no packets: %v, want ErrNoPackets", err)
	}
}

// An Extend stopped after it wrote the key but before the manifest leaves key
// rows of packets the manifest does not list; they are not taken for covered
// events, and running Extend again writes exactly what one whole run writes.
func TestExtendAfterInterruptedExtend(t *testing.T) {
	items := SynthItems(26, 2, 64, 4)
	dir := t.TempDir()
	if _, err := Build(context.Background(), items[:20], testOptions(dir, "alice", "bob")); err != nil {
		t.Fatal(err)
	}
	manPath := filepath.Join(dir, "packets", ManifestFile)
	oldManifest, err := os.ReadFile(manPath)
	if err != nil {
		t.Fatal(err)
	}
	o := testOptions(dir, "alice", "bob")
	o.Phase = 2
	if _, err := Extend(context.Background(), items[20:], o); err != nil {
		t.Fatal(err)
	}
	whole := files(t, dir)
	// The stop: the new key is written, the manifest is still the old one.
	if err := os.WriteFile(manPath, oldManifest, 0o644); err != nil {
		t.Fatal(err)
	}
	m, _ := ReadManifest(manPath)
	key, _ := ReadKey(filepath.Join(dir, "packets", KeyFile))
	if got := Covered(m, key); len(got) != 20 {
		t.Fatalf("Covered after the stop: %d events, want the 20 of the listed packets", len(got))
	}
	if _, err := Extend(context.Background(), items[20:], o); err != nil {
		t.Fatal("Extend again:", err)
	}
	again := files(t, dir)
	if len(again) != len(whole) {
		t.Fatalf("%d files after the rerun, want %d", len(again), len(whole))
	}
	for name, b := range whole {
		if !bytes.Equal(again[name], b) {
			t.Errorf("%s differs from a whole run's", name)
		}
	}
}
