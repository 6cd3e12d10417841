package merge

import (
	"context"
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
)

// BenchmarkMerge7x2000 merges 7 raters' returns of 2,000 items each (10 % hidden
// duplicates among them) and computes every statistic with 2,000 bootstrap replicates.
func BenchmarkMerge7x2000(b *testing.B) {
	const raters, items = 7, 2000
	m := &packet.Manifest{Format: packet.ManifestFormat, Version: 1, Study: "st-bench"}
	var key []packet.KeyRow
	in := b.TempDir()
	var files []string
	rng := rand.New(rand.NewPCG(1, 2))
	subjectOf := map[string]string{}
	for r := 0; r < raters; r++ {
		rater := fmt.Sprintf("rater-%d", r)
		pid := fmt.Sprintf("P-%s-%08x", rater, r)
		codes := make([]string, items)
		var answers []map[string]any
		for i := range codes {
			codes[i] = fmt.Sprintf("C%d%05d", r, i)
			ev := fmt.Sprintf("ev-%05d", i%1800)
			subjectOf[ev] = fmt.Sprintf("sub-%03d", i%1800/20)
			key = append(key, packet.KeyRow{Packet: pid, Rater: rater, Item: codes[i], EventID: ev, Duplicate: i >= 1800})
			a := map[string]any{"item": codes[i], "verdict": "not-epileptiform", "confidence": nil, "comment": ""}
			for c := 1; c <= 6; c++ {
				v := "absent"
				if rng.IntN(3) == 0 {
					v = "present"
				}
				a[fmt.Sprintf("c%d", c)] = v
			}
			if rng.IntN(4) == 0 {
				a["verdict"] = "epileptiform"
			}
			answers = append(answers, a)
		}
		m.Packets = append(m.Packets, packet.ManifestEntry{Packet: pid, Rater: rater, Items: codes,
			Check: packet.CheckValue(secret, m.Study, pid, rater, codes)})
		body, _ := json.Marshal(map[string]any{"format": "quorate-return", "version": 1, "study": m.Study,
			"packet": pid, "rater": rater, "check": m.Packets[r].Check, "answers": answers})
		p := filepath.Join(in, pid+".json")
		os.WriteFile(p, body, 0o644)
		files = append(files, p)
	}
	b.ResetTimer()
	for range b.N {
		b.StopTimer()
		study := b.TempDir()
		o := Options{Files: files, Manifest: m, Key: key, ReturnsDir: filepath.Join(study, "returns"),
			ConsensusDir: filepath.Join(study, "consensus"), SubjectOf: subjectOf, Quorum: 2, Tie: consensus.TieAbsent,
			Bootstrap: 2000, Seed: 1, Level: 0.95}
		os.MkdirAll(o.ReturnsDir, 0o755)
		b.StartTimer()
		res, err := Run(context.Background(), o)
		if err != nil || res.Events != 1800 {
			b.Fatalf("%v, %d events", err, res.Events)
		}
	}
}
