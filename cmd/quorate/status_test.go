package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/simulate"
)

// packets and status count events, items and hidden duplicates alike; status lists the
// item codes each rater owes (a blank item, a half-rated one), the refused file with
// its reason naming the item, and leaves a packet whose only return is blank "out".
func TestStatusCountsOwedAndRefused(t *testing.T) {
	st := demoStudy(t)
	clearReturns(t, st)
	old, err := packet.ReadManifest(filepath.Join(st, study.PacketsDir, "manifest.json"))
	if err != nil {
		t.Fatal(err)
	}
	var raters []string
	for _, p := range old.Packets {
		raters = append(raters, p.Rater)
	}
	out, err := run(t, "--study", st, "packets", "--replace", "--raters", strings.Join(raters, ","))
	if err != nil && !isWarnings(err) {
		t.Fatal("packets:", err)
	}
	built := regexp.MustCompile(`Built (\d+) packets of (\d+) events, (\d+) items in all`).FindStringSubmatch(out)
	if built == nil {
		t.Fatalf("packets output lacks its counts:\n%s", out)
	}
	m, err := packet.ReadManifest(filepath.Join(st, study.PacketsDir, "manifest.json"))
	if err != nil {
		t.Fatal(err)
	}
	key, err := packet.ReadKey(filepath.Join(st, study.PacketsDir, "key.parquet"))
	if err != nil {
		t.Fatal(err)
	}
	dups, events := 0, map[string]bool{}
	for _, k := range key {
		events[k.EventID] = true
		if k.Duplicate {
			dups++
		}
	}
	if fmt.Sprint(len(events)) != built[2] || fmt.Sprint(len(key)) != built[3] || dups == 0 {
		t.Fatalf("packets says %s events and %s items; the key holds %d events, %d items, %d duplicates", built[2], built[3], len(events), len(key), dups)
	}
	files, err := simulate.Returns(m, key, simulate.Panel(len(m.Packets)), func(string) (simulate.Truth, bool) { return simulate.Truth{}, false }, 1)
	if err != nil {
		t.Fatal(err)
	}
	p0, p1, p2 := m.Packets[0], m.Packets[1], m.Packets[2]
	edit := func(p packet.ManifestEntry, change func(answers []map[string]any)) string {
		var r map[string]any
		if err := json.Unmarshal(files[p.Packet+".json"], &r); err != nil {
			t.Fatal(err)
		}
		var as []map[string]any
		b, _ := json.Marshal(r["answers"])
		json.Unmarshal(b, &as)
		change(as)
		r["answers"] = as
		b, _ = json.Marshal(r)
		path := filepath.Join(t.TempDir(), p.Packet+".json")
		os.WriteFile(path, b, 0o644)
		return path
	}
	blank := func(a map[string]any) {
		for _, k := range []string{"c1", "c2", "c3", "c4", "c5", "c6", "verdict", "comment"} {
			a[k] = ""
		}
		a["confidence"] = nil
	}
	var blankCode, halfCode string
	f0 := edit(p0, func(as []map[string]any) {
		blank(as[1])
		as[2]["c2"], as[2]["verdict"] = "", ""
		blankCode, halfCode = as[1]["item"].(string), as[2]["item"].(string)
	})
	var badCode string
	f1 := edit(p1, func(as []map[string]any) { as[0]["c4"], badCode = "maybe", as[0]["item"].(string) })
	f2 := edit(p2, func(as []map[string]any) {
		for _, a := range as {
			blank(a)
		}
	})
	out, err = run(t, "--study", st, "merge", f0)
	if err != nil || !strings.Contains(out, halfCode) {
		t.Fatalf("merge of a return with a half-rated item: %v\n%s", err, out)
	}
	if _, err := run(t, "--study", st, "merge", f1); err == nil || !strings.Contains(err.Error(), "item "+badCode) {
		t.Errorf("merge of a return with \"maybe\": %v, want a refusal naming item %s", err, badCode)
	}
	out, err = run(t, "--study", st, "merge", f2)
	if err != nil && !isWarnings(err) {
		t.Logf("merge of a blank return: %v", err)
	}
	if !strings.Contains(out, "Merged 0 return(s)") || !strings.Contains(out, "no item rated; nothing merged") {
		t.Errorf("merge of a blank return says:\n%s", out)
	}
	out, err = run(t, "--study", st, "status")
	if err != nil {
		t.Fatal("status:", err)
	}
	head := fmt.Sprintf("%s packets, %s items (%d of them hidden duplicates) showing %s events; %d items owed.",
		built[1], built[3], dups, built[2], len(key)-(len(p0.Items)-2))
	for _, want := range []string{
		head,
		fmt.Sprintf("%s owes in %s: %s %s", p0.Rater, p0.Packet, blankCode, halfCode),
		"  of which partly rated: " + halfCode,
		"Refused " + p1.Packet + ".json",
		"item " + badCode + ": c4",
		p2.Rater + " handed in 1 file(s) for " + p2.Packet + " that rated no item completely: not counted as returns",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("status lacks %q:\n%s", want, out)
		}
	}
	for _, p := range []packet.ManifestEntry{p1, p2} {
		if !regexp.MustCompile(`(?m)^` + regexp.QuoteMeta(p.Packet) + `\s+` + regexp.QuoteMeta(p.Rater) + `\s+1\s+out\s+\d+\s+\d+\s+0\s+0\s`).MatchString(out) {
			t.Errorf("packet %s (refused or blank return) not listed as out:\n%s", p.Packet, out)
		}
	}
}
