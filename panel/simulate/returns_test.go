package simulate

import (
	"fmt"
	"testing"

	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/panel/returns"
)

// The simulated files must pass the same checks a real rater's file passes.
func TestReturnsParse(t *testing.T) {
	secret := []byte("another study secret of 32 bytes")
	m := &packet.Manifest{Format: packet.ManifestFormat, Version: 1, Study: "st-sim"}
	var key []packet.KeyRow
	for r, rater := range []string{"fictional-rater-a", "fictional-rater-b"} {
		pid := fmt.Sprintf("P-%s-%08x", rater, r)
		var codes []string
		for e := 0; e < 6; e++ {
			code := fmt.Sprintf("Q%d%dXYZ", r, e)
			codes = append(codes, code)
			key = append(key, packet.KeyRow{Packet: pid, Rater: rater, Item: code, EventID: fmt.Sprintf("ev-%d", e%5), Duplicate: e == 5})
		}
		m.Packets = append(m.Packets, packet.ManifestEntry{Packet: pid, Rater: rater, Items: codes, Check: packet.CheckValue(secret, m.Study, pid, rater, codes)})
	}
	files, err := Returns(m, key, Panel(2), func(id string) (Truth, bool) {
		return Truth{IED: id == "ev-0", Meets: [6]bool{true, true, true, true, true, true}}, id == "ev-0"
	}, 4)
	if err != nil {
		t.Fatal(err)
	}
	for name, b := range files {
		ret, err := returns.Parse(name, b, m)
		if err != nil {
			t.Fatalf("%s refused: %v", name, err)
		}
		if len(ret.Answers) != 6 || len(ret.Unrated) != 0 {
			t.Errorf("%s: %d answers, %d unrated", name, len(ret.Answers), len(ret.Unrated))
		}
	}
}
