package simulate

import (
	"encoding/json"
	"fmt"
	"math/rand/v2"
	"sort"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// Returns fills every packet of the manifest as its rater would, through the rater's
// profile (profiles are matched to packets in manifest order), and returns the files the
// review page would save, keyed by "<packet id>.json". truth gives each event's truth;
// events it does not know are background: no criterion met, not an IED.
func Returns(m *packet.Manifest, key []packet.KeyRow, profiles []Profile, truth func(eventID string) (Truth, bool), seed uint64) (map[string][]byte, error) {
	if len(profiles) < len(m.Packets) {
		return nil, fmt.Errorf("simulate: %d profiles for %d packets", len(profiles), len(m.Packets))
	}
	type kk struct{ packet, item string }
	byCode := make(map[kk]packet.KeyRow, len(key))
	for _, k := range key {
		byCode[kk{k.Packet, k.Item}] = k
	}
	out := map[string][]byte{}
	for pi, p := range m.Packets {
		prof := profiles[pi]
		rng := rand.New(rand.NewPCG(seed, uint64(pi)+1))
		rows := make([]packet.KeyRow, 0, len(p.Items))
		for _, code := range p.Items {
			k, ok := byCode[kk{p.Packet, code}]
			if !ok {
				return nil, fmt.Errorf("simulate: item %s of packet %s is not in the key", code, p.Packet)
			}
			rows = append(rows, k)
		}
		// First showings before second ones, so a duplicate can repeat the first answer.
		order := make([]int, len(rows))
		for i := range order {
			order[i] = i
		}
		sort.SliceStable(order, func(a, b int) bool { return !rows[order[a]].Duplicate && rows[order[b]].Duplicate })
		first := map[string]Answers{}
		answers := make([]map[string]any, len(rows))
		for _, i := range order {
			k := rows[i]
			t, _ := truth(k.EventID)
			var a Answers
			if f, ok := first[k.EventID]; ok && k.Duplicate {
				a = prof.Again(f, t, rng)
			} else {
				a = prof.Answer(t, rng)
				first[k.EventID] = a
			}
			answers[i] = answerJSON(k.Item, a)
		}
		b, err := json.MarshalIndent(map[string]any{"format": "quorate-return", "version": 1, "study": m.Study,
			"packet": p.Packet, "rater": p.Rater, "check": p.Check, "answers": answers}, "", " ")
		if err != nil {
			return nil, err
		}
		out[p.Packet+".json"] = b
	}
	return out, nil
}

func answerJSON(item string, a Answers) map[string]any {
	pa := func(b bool) string {
		if b {
			return "present"
		}
		return "absent"
	}
	v := "not-epileptiform"
	if a.Epileptiform {
		v = "epileptiform"
	}
	return map[string]any{"item": item, "c1": pa(a.Criteria[0]), "c2": pa(a.Criteria[1]), "c3": pa(a.Criteria[2]),
		"c4": pa(a.Criteria[3]), "c5": pa(a.Criteria[4]), "c6": pa(a.Criteria[5]), "verdict": v,
		"confidence": a.Confidence, "comment": ""}
}
