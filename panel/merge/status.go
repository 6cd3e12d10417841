package merge

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// PacketStatus is where one rater's packet stands.
type PacketStatus struct {
	Packet     string   `json:"packet"`
	Rater      string   `json:"rater"`
	Phase      int      `json:"phase"` // the draw phase it shows: 1, or packet.ManifestEntry.Phase
	State      string   `json:"state"` // out, partly returned, returned
	Items      int      `json:"items"`
	Owes       int      `json:"owes"`       // items with no counted answer
	OwedItems  []string `json:"owed_items"` // their codes, in packet order
	Incomplete []string `json:"incomplete"` // owed items some return filled in only partly
	Returns    int      `json:"returns"`    // distinct files merged for it that gave some item a value
	Superseded int      `json:"superseded"` // of which count for no item any more
	Empty      int      `json:"empty"`      // files handed in that gave no item a value (blank, or only partly filled items): no return
}

// Status is the state of the panel's work. Items counts every showing
// (hidden duplicates included); Events the distinct events behind them.
type Status struct {
	Packets           []PacketStatus `json:"packets"`
	Items             int            `json:"items"`
	Duplicates        int            `json:"duplicates"`
	Events            int            `json:"events"`
	Owed              int            `json:"owed"`
	Refused           []Refusal      `json:"refused"` // refused files not accepted since
	Damaged           []string       `json:"damaged"` // stored returns that fail their SHA-256
	ConsensusUpToDate bool           `json:"consensus_up_to_date"`
	Reason            string         `json:"reason,omitempty"`
}

// GetStatus compares the manifest, the key, the ledger, the stored returns
// and the consensus inputs. A return that gives no item a value (a blank
// sheet) leaves its packet "out".
func GetStatus(m *packet.Manifest, key []packet.KeyRow, returnsDir, consensusDir string) (Status, error) {
	var st Status
	ledger, err := ReadLedger(filepath.Join(returnsDir, LedgerFile))
	if err != nil {
		return st, err
	}
	refused, err := ReadRefused(filepath.Join(returnsDir, RefusedFile))
	if err != nil {
		return st, err
	}
	fillItems(returnsDir, m, ledger)
	counting := Counting(ledger)
	now := map[string]bool{}
	for _, e := range counting {
		now[e.SHA256] = true
	}
	files := map[string]map[string]bool{} // packet → stored files that gave items
	empty := map[string]map[string]bool{} // packet → stored files that gave none
	partly := map[ItemKey]bool{}
	for _, e := range ledger {
		if files[e.Packet] == nil {
			files[e.Packet], empty[e.Packet] = map[string]bool{}, map[string]bool{}
		}
		if len(e.Items) > 0 || e.Answered > 0 {
			files[e.Packet][e.SHA256] = true
		} else {
			empty[e.Packet][e.SHA256] = true
		}
		for _, it := range e.Incomplete {
			partly[ItemKey{e.Packet, it}] = true
		}
	}
	for _, p := range m.Packets {
		ps := PacketStatus{Packet: p.Packet, Rater: p.Rater, Phase: max(p.Phase, 1), Items: len(p.Items), Returns: len(files[p.Packet]),
			OwedItems: []string{}, Incomplete: []string{}}
		for h := range files[p.Packet] {
			if !now[h] {
				ps.Superseded++
			}
		}
		for h := range empty[p.Packet] {
			if !files[p.Packet][h] {
				ps.Empty++
			}
		}
		for _, it := range p.Items {
			k := ItemKey{p.Packet, it}
			if _, ok := counting[k]; ok {
				continue
			}
			ps.OwedItems = append(ps.OwedItems, it)
			if partly[k] {
				ps.Incomplete = append(ps.Incomplete, it)
			}
		}
		ps.Owes = len(ps.OwedItems)
		switch {
		case ps.Owes == ps.Items:
			ps.State = "out"
		case ps.Owes > 0:
			ps.State = "partly returned"
		default:
			ps.State = "returned"
		}
		st.Items += ps.Items
		st.Owed += ps.Owes
		st.Packets = append(st.Packets, ps)
	}
	events := map[string]bool{}
	for _, k := range key {
		events[k.EventID] = true
		if k.Duplicate {
			st.Duplicates++
		}
	}
	st.Events = len(events)
	for _, r := range refused {
		// A file refused and later accepted under the same name was mended.
		if !acceptedAfter(ledger, r) {
			st.Refused = append(st.Refused, r)
		}
	}
	for _, err := range VerifyStored(returnsDir, ledger) {
		st.Damaged = append(st.Damaged, err.Error())
	}
	want := countingHashes(counting, func(e Entry) string { return e.SHA256 })
	var in struct{ Returns []string }
	b, err := os.ReadFile(filepath.Join(consensusDir, InputsFile))
	switch {
	case len(st.Damaged) > 0:
		st.Reason = fmt.Sprintf("%d stored return(s) changed or missing", len(st.Damaged))
	case len(want) == 0:
		st.Reason = "no answers merged yet"
	case err != nil:
		st.Reason = "no consensus built yet"
	case json.Unmarshal(b, &in) != nil:
		st.Reason = InputsFile + " is unreadable"
	default:
		slices.Sort(in.Returns)
		st.ConsensusUpToDate = slices.Equal(in.Returns, want)
		if !st.ConsensusUpToDate {
			st.Reason = "the consensus was built from other returns than those that now count"
		}
	}
	return st, nil
}

func acceptedAfter(ledger []Entry, r Refusal) bool {
	for _, e := range ledger {
		if e.Original == r.Original && e.Time.After(r.Time) {
			return true
		}
	}
	return false
}
