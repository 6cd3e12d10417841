package merge

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"sort"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// PacketStatus is where one rater's packet stands.
type PacketStatus struct {
	Packet     string `json:"packet"`
	Rater      string `json:"rater"`
	State      string `json:"state"` // out, partly returned, returned
	Items      int    `json:"items"`
	Owes       int    `json:"owes"`       // items the counting return leaves unrated
	Returns    int    `json:"returns"`    // returns merged for it
	Superseded int    `json:"superseded"` // of which no longer count
	Counting   string `json:"counting"`   // the stored file that counts
}

// Status is the state of the panel's work.
type Status struct {
	Packets           []PacketStatus `json:"packets"`
	ConsensusUpToDate bool           `json:"consensus_up_to_date"`
	Reason            string         `json:"reason,omitempty"`
}

// GetStatus compares the manifest, the ledger and the consensus inputs.
func GetStatus(m *packet.Manifest, ledger []Entry, consensusDir string) Status {
	var st Status
	counting := Counting(ledger)
	n := map[string]int{}
	for _, e := range ledger {
		n[e.Packet]++
	}
	var want []string
	for _, p := range m.Packets {
		ps := PacketStatus{Packet: p.Packet, Rater: p.Rater, Items: len(p.Items), Owes: len(p.Items), State: "out",
			Returns: n[p.Packet]}
		if e, ok := counting[p.Packet]; ok {
			ps.Owes, ps.Counting, ps.Superseded = e.Unrated, e.Stored, ps.Returns-1
			ps.State = "returned"
			if e.Unrated > 0 {
				ps.State = "partly returned"
			}
			want = append(want, e.SHA256)
		}
		st.Packets = append(st.Packets, ps)
	}
	sort.Strings(want)
	var in struct{ Returns []string }
	b, err := os.ReadFile(filepath.Join(consensusDir, InputsFile))
	switch {
	case len(want) == 0:
		st.Reason = "no returns merged yet"
	case err != nil:
		st.Reason = "no consensus yet: run quorate merge"
	case json.Unmarshal(b, &in) != nil:
		st.Reason = InputsFile + " is unreadable: run quorate merge again"
	default:
		sort.Strings(in.Returns)
		st.ConsensusUpToDate = slices.Equal(in.Returns, want)
		if !st.ConsensusUpToDate {
			st.Reason = "the consensus was built from other returns than those that now count: run quorate merge"
		}
	}
	return st
}
