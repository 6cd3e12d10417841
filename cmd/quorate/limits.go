package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"github.com/quorate-eeg/quorate/panel/returns"
	"io/fs"
	"os"

	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/packet"
)

// readAgreement reads the agreement summary the report quotes: absent is nil (the
// report goes without it), unreadable or unparsable is an error, never dropped.
func readAgreement(path string) (*consensus.Agreement, error) {
	b, err := os.ReadFile(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	agr := &consensus.Agreement{}
	if err := json.Unmarshal(b, agr); err != nil {
		return nil, fmt.Errorf("%s: %w (run quorate merge again to rebuild it)", path, err)
	}
	return agr, nil
}

// maxReturnBytes bounds a returned file: a packet's answers take kilobytes, and a file
// of hundreds of megabytes is not a return (it would be stored for good, and read
// whole). The bound is the parser's own.
const maxReturnBytes = returns.MaxSize

// checkSizes refuses files larger than limit bytes before any is read.
func checkSizes(files []string, limit int64) error {
	for _, f := range files {
		st, err := os.Stat(f)
		if err != nil {
			continue // the merge reports it with the file's other problems
		}
		if st.Size() > limit {
			return fmt.Errorf("%s: %d bytes, more than the %d a return may have; nothing was merged", f, st.Size(), limit)
		}
	}
	return nil
}

// checkQuorum refuses a quorum no event can reach: more answers than the panel has
// raters, which would leave every event without a decision.
func checkQuorum(quorum int, m *packet.Manifest) error {
	raters := map[string]bool{}
	for _, p := range m.Packets {
		raters[p.Rater] = true
	}
	if quorum > len(raters) {
		return fmt.Errorf("study.yaml: panel.quorum is %d but the packets go to %d raters: no event could reach a decision; lower the quorum", quorum, len(raters))
	}
	return nil
}
