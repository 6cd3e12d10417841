package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"path/filepath"
	"time"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/tuning"
)

// Meta is what the report says about where its numbers came from.
type Meta struct {
	StudyID     string
	InputHashes map[string]string // input file → SHA-256
	Version     string
	Generated   time.Time
}

// File names written by Write.
const (
	SweepFile    = "sweep.parquet"
	PointFile    = "operating-point.json"
	HTMLFile     = "report.html"
	MarkdownFile = "report.md"
)

// Write writes the four report files into dir as one: they are written into a
// temporary folder that then replaces dir (atomicfile.WriteDir), so that a reader
// never finds a new operating point beside an old report, even after kill -9. agr
// may be nil when no agreement summary is at hand.
func Write(dir string, res *tuning.Result, agr *consensus.Agreement, meta Meta) error {
	if res == nil {
		return fmt.Errorf("report: no tuning result")
	}
	op, err := json.MarshalIndent(NewOperatingPoint(res, meta), "", "  ")
	if err != nil {
		return err
	}
	var h bytes.Buffer
	if err := writeHTML(&h, res, agr, meta); err != nil {
		return err
	}
	var md bytes.Buffer
	writeMarkdown(&md, res, agr, meta)
	return atomicfile.WriteDir(dir, func(tmp string) error {
		if err := atomicfile.Write(filepath.Join(tmp, SweepFile), 0o644, func(w io.Writer) error {
			return writeSweep(w, SweepRows(res))
		}); err != nil {
			return err
		}
		for name, b := range map[string][]byte{PointFile: append(op, '\n'), HTMLFile: h.Bytes(), MarkdownFile: md.Bytes()} {
			if err := atomicfile.WriteBytes(filepath.Join(tmp, name), b, 0o644); err != nil {
				return err
			}
		}
		return nil
	})
}
