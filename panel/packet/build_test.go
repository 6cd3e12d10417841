package packet

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
)

func testOptions(dir string, raters ...string) Options {
	return Options{StudyID: "STUDY-T", Secret: testSecret, Raters: raters, Seed: 2017, OutDir: filepath.Join(dir, "packets")}
}

// files returns every regular file under dir, relative path → content.
func files(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		out[rel] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func TestNoLeak(t *testing.T) {
	dir := t.TempDir()
	items := SynthItems(20, 2, 64, 1)
	res, err := Build(context.Background(), items, testOptions(dir, "alice", "bob"))
	if err != nil {
		t.Fatal(err)
	}
	needles := slices.Clone(LeakStrings)
	for _, it := range items {
		needles = append(needles, it.EventID)
	}
	searched := 0
	for name, b := range files(t, dir) {
		if name == filepath.Join("packets", KeyFile) {
			continue // the coordinator's key is meant to hold them
		}
		searched++
		low := bytes.ToLower(b)
		for _, s := range needles {
			if bytes.Contains(low, bytes.ToLower([]byte(s))) {
				t.Errorf("%s contains %q", name, s)
			}
		}
		// The search must be able to find something: each packet file names its packet.
		if strings.Contains(name, "alice") && !bytes.Contains(b, []byte(res.Packets[0].Packet)) {
			t.Errorf("%s does not contain its packet id; the search is not looking at the right bytes", name)
		}
	}
	if searched != 5 { // 2 × (review.html, sheet.csv) + manifest.json
		t.Errorf("searched %d files, want 5", searched)
	}
	// The key, and only the key, maps codes back to events and provenance.
	key, err := ReadKey(filepath.Join(dir, "packets", KeyFile))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(key[0].Source, LeakStrings[0]) || !strings.HasPrefix(key[0].EventID, "EVT-") {
		t.Errorf("key row lacks provenance: %+v", key[0])
	}
	// The source column is one plain JSON object a spreadsheet or jq can read.
	var src map[string]string
	if err := json.Unmarshal([]byte(key[0].Source), &src); err != nil || src["subject"] != LeakStrings[0] || src["score"] != LeakStrings[6] {
		t.Errorf("source %q: %v", key[0].Source, err)
	}
	// The page's data blob holds only the documented fields.
	d := pageBlob(t, res.Packets[0].Page)
	allowed := []string{"code", "rate", "n", "eventAt", "from", "to", "cond", "scale", "traces", "map"}
	for _, it := range d["items"].([]any) {
		for k := range it.(map[string]any) {
			if !slices.Contains(allowed, k) {
				t.Errorf("page item carries field %q", k)
			}
		}
	}
}

var blobRE = regexp.MustCompile(`(?s)<script type="application/json" id="packet-data">(.*?)</script>`)

func pageBlob(t *testing.T, path string) map[string]any {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	m := blobRE.FindSubmatch(b)
	if m == nil {
		t.Fatal("no data blob in page")
	}
	var d map[string]any
	if err := json.Unmarshal(m[1], &d); err != nil {
		t.Fatal(err)
	}
	return d
}

func TestBuildDeterministic(t *testing.T) {
	items := SynthItems(30, 2, 64, 3)
	a, b := t.TempDir(), t.TempDir()
	if _, err := Build(context.Background(), items, testOptions(a, "alice", "bob", "carol")); err != nil {
		t.Fatal(err)
	}
	if _, err := Build(context.Background(), items, testOptions(b, "alice", "bob", "carol")); err != nil {
		t.Fatal(err)
	}
	fa, fb := files(t, a), files(t, b)
	if len(fa) != 8 || len(fa) != len(fb) {
		t.Fatalf("%d and %d files, want 8", len(fa), len(fb))
	}
	for name, x := range fa {
		if !bytes.Equal(x, fb[name]) {
			t.Errorf("%s differs between two builds with the same seed", name)
		}
	}
	c := t.TempDir()
	opt := testOptions(c, "alice", "bob", "carol")
	opt.Seed++
	if _, err := Build(context.Background(), items, opt); err != nil {
		t.Fatal(err)
	}
	if bytes.Equal(fa[filepath.Join("packets", ManifestFile)], files(t, c)[filepath.Join("packets", ManifestFile)]) {
		t.Error("another seed gave the same manifest")
	}
}

func TestBuildOrdersAndKey(t *testing.T) {
	dir := t.TempDir()
	items := SynthItems(40, 1, 64, 5)
	res, err := Build(context.Background(), items, testOptions(dir, "alice", "bob"))
	if err != nil {
		t.Fatal(err)
	}
	orders := map[string][]string{}
	dups := map[string]int{}
	for _, k := range res.Key {
		orders[k.Rater] = append(orders[k.Rater], k.EventID)
		if k.Duplicate {
			dups[k.Rater]++
		}
		if int(k.Position) != len(orders[k.Rater]) {
			t.Fatalf("position %d out of sequence", k.Position)
		}
	}
	if slices.Equal(orders["alice"], orders["bob"]) {
		t.Error("two raters got the same order")
	}
	for r, o := range orders {
		if len(o) != 44 || dups[r] != 4 { // 10 % of 40
			t.Errorf("%s: %d slots with %d duplicates, want 44 with 4", r, len(o), dups[r])
		}
	}
	// Manifest, sheet and key agree; the check value recomputes.
	for i, e := range res.Manifest.Packets {
		if e.Check != CheckValue(testSecret, "STUDY-T", e.Packet, e.Rater, e.Items) {
			t.Errorf("%s: check value does not recompute", e.Packet)
		}
		b, err := os.ReadFile(res.Packets[i].Sheet)
		if err != nil {
			t.Fatal(err)
		}
		cr := csv.NewReader(bytes.NewReader(b))
		cr.Comment = '#' // the allowed values above the header
		rows, err := cr.ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		if !slices.Equal(rows[0], SheetColumns) || len(rows) != len(e.Items)+1 {
			t.Fatalf("sheet header %v, %d rows", rows[0], len(rows))
		}
		seen := map[string]bool{}
		for k, row := range rows[1:] {
			if row[0] != e.Packet || row[1] != e.Check || row[2] != e.Rater || row[3] != e.Items[k] || seen[row[3]] {
				t.Fatalf("sheet row %d = %v", k+2, row)
			}
			seen[row[3]] = true
		}
	}
	m, err := ReadManifest(filepath.Join(dir, "packets", ManifestFile))
	if err != nil || len(m.Packets) != 2 || m.Study != "STUDY-T" {
		t.Fatalf("manifest %+v, %v", m, err)
	}
}

func TestBuildRefusesBadInput(t *testing.T) {
	dir := t.TempDir()
	items := SynthItems(3, 1, 32, 1)
	many := make([]string, MaxRaters+1)
	for i := range many {
		many[i] = "r" + strings.Repeat("x", i%30) + string(rune('a'+i%26)) + string(rune('a'+i/26))
	}
	cases := []struct {
		name  string
		items []Item
		opt   func(*Options)
		field string
	}{
		{"no items", nil, nil, "items"},
		{"dot rater", items, func(o *Options) { o.Raters = []string{".hidden"} }, "Raters"},
		{"slash rater", items, func(o *Options) { o.Raters = []string{"a/b"} }, "Raters"},
		{"dotdot rater", items, func(o *Options) { o.Raters = []string{".."} }, "Raters"},
		{"space rater", items, func(o *Options) { o.Raters = []string{"dr who"} }, "Raters"},
		{"long rater", items, func(o *Options) { o.Raters = []string{strings.Repeat("a", 41)} }, "Raters"},
		{"empty rater", items, func(o *Options) { o.Raters = []string{""} }, "Raters"},
		{"same rater", items, func(o *Options) { o.Raters = []string{"Ann", "ann"} }, "Raters"},
		{"too many raters", items, func(o *Options) { o.Raters = many }, "Raters"},
		{"short secret", items, func(o *Options) { o.Secret = []byte("short") }, "Secret"},
		{"no study", items, func(o *Options) { o.StudyID = "" }, "StudyID"},
		{"share", items, func(o *Options) { o.DuplicateShare = 0.6 }, "DuplicateShare"},
		{"montage index", items, func(o *Options) { o.Montages = []Montage{{"x", []Derivation{{"bad", 99, nil}}}} }, "Montages[0].Derivations[0]"},
	}
	for _, c := range cases {
		opt := testOptions(dir, "alice")
		if c.opt != nil {
			c.opt(&opt)
		}
		_, err := Build(context.Background(), c.items, opt)
		var ie *InputError
		if !errors.As(err, &ie) || ie.Field != c.field {
			t.Errorf("%s: err %v, want InputError on %s", c.name, err, c.field)
		}
	}
	bad := SynthItems(2, 1, 32, 1)
	bad[1].Samples[3][5] = float32(0) / float32(zero())
	_, err := Build(context.Background(), bad, testOptions(dir, "alice"))
	var ie *InputError
	if !errors.As(err, &ie) || ie.Item != 1 || ie.Field != "Samples[3][5]" {
		t.Errorf("NaN sample: err %v", err)
	}
	if _, err := os.Stat(filepath.Join(dir, "packets", "alice")); err == nil {
		t.Error("a refused build wrote a packet")
	}
}

func zero() float64 { return 0 }

func TestBuildExistingFolder(t *testing.T) {
	dir := t.TempDir()
	items := SynthItems(3, 1, 32, 1)
	opt := testOptions(dir, "alice")
	if _, err := Build(context.Background(), items, opt); err != nil {
		t.Fatal(err)
	}
	first, _ := os.ReadFile(filepath.Join(opt.OutDir, "alice", PageFile))
	var ee *ExistsError
	if _, err := Build(context.Background(), items, opt); !errors.As(err, &ee) {
		t.Fatalf("second build: %v, want ExistsError", err)
	}
	opt.Replace = true
	for n := 1; n <= 2; n++ {
		if _, err := Build(context.Background(), items, opt); err != nil {
			t.Fatal(err)
		}
	}
	kept, err := os.ReadFile(filepath.Join(opt.OutDir, "alice.replaced-1", PageFile))
	if err != nil || !bytes.Equal(kept, first) {
		t.Errorf("old packet not kept at alice.replaced-1: %v", err)
	}
	for _, p := range []string{"alice.replaced-2", "key.parquet.replaced-1", "key.parquet.replaced-2", "manifest.json.replaced-2", "alice/review.html"} {
		if _, err := os.Stat(filepath.Join(opt.OutDir, p)); err != nil {
			t.Errorf("missing %s: %v", p, err)
		}
	}
}

// A packet grows linearly with its items, so 30 items (21 channels, 16 s at
// 256 Hz: 10 s rated and 3 s of context either side, as excerpt cuts them)
// stand for 300: at most 110 kB per item keeps a 300-event packet (330
// items with duplicates) under 37 MB.
func TestPacketSize300(t *testing.T) {
	items := SynthItems(30, 16, 256, 11)
	res, err := Build(context.Background(), items, testOptions(t.TempDir(), "alice"))
	if err != nil {
		t.Fatal(err)
	}
	per := float64(res.Packets[0].PageBytes) / float64(len(res.Manifest.Packets[0].Items))
	t.Logf("%.1f kB per item: a 300-event packet (330 items) ≈ %.1f MB", per/1e3, per*330/1e6)
	if per > 110e3 {
		t.Errorf("%.0f bytes per item, want at most 110 kB", per)
	}
}

// A cancelled context stops Build before it touches the packets folder: with
// Replace, the earlier packets are not moved aside and nothing is written.
func TestBuildHonoursCancel(t *testing.T) {
	dir := t.TempDir()
	items := SynthItems(3, 1, 32, 1)
	opt := testOptions(dir, "alice")
	opt.Items = items
	if _, err := Run(context.Background(), opt); err != nil {
		t.Fatal(err)
	}
	before := files(t, opt.OutDir)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	opt.Replace = true
	if _, err := Run(ctx, opt); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled build: %v, want context.Canceled", err)
	}
	after := files(t, opt.OutDir)
	if len(after) != len(before) {
		t.Fatalf("cancelled build changed the folder: %d files, were %d", len(after), len(before))
	}
	for p, b := range before {
		if !bytes.Equal(after[p], b) {
			t.Errorf("%s changed by a cancelled build", p)
		}
	}
	if _, err := Build(ctx, items, testOptions(t.TempDir(), "bob")); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled first build: %v, want context.Canceled", err)
	}
}
