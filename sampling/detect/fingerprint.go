package detect

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// settingsDir holds, per recording, the fingerprint of the settings its candidates were
// detected with. A dot folder, so that Parquet engines reading candidates/ as one data
// set pass it by.
const settingsDir = ".settings"

// fingerprint names every setting that changes a recording's candidates (not the
// workers or the shard): a recording detected under another fingerprint is detected
// again rather than resumed.
func (s *settings) fingerprint() string {
	keys := make([]string, 0, len(s.cut))
	for k := range s.cut {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	h := sha256.New()
	fmt.Fprintf(h, "montage=%v band=%v notch=%v thr=%v back=%v merge=%v window=%v\n",
		s.kind, s.band, s.notch, s.thr, s.backS, s.mergeS, s.windowS)
	for _, k := range keys {
		fmt.Fprintf(h, "%s=%v\n", k, s.cut[k])
	}
	return hex.EncodeToString(h.Sum(nil))
}

func settingsPath(outDir string, shard int, recordingID string) string {
	return filepath.Join(outDir, "shard="+strconv.Itoa(shard), settingsDir, recordingID)
}

// current reports whether a recording's candidates exist and were detected with the
// settings of fingerprint fp; exists reports the table alone.
func current(outDir string, shard int, recordingID, fp string) (ok, exists bool) {
	if _, err := os.Stat(OutputPath(outDir, shard, recordingID)); err != nil {
		return false, false
	}
	b, err := os.ReadFile(settingsPath(outDir, shard, recordingID))
	return err == nil && string(b) == fp+"\n", true
}

func writeFingerprint(outDir string, shard int, recordingID, fp string) error {
	p := settingsPath(outDir, shard, recordingID)
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		return err
	}
	return atomicfile.WriteBytes(p, []byte(fp+"\n"), 0o644)
}
