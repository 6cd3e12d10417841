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

// Write writes the four report files into dir, each atomically. agr may be
// nil when no agreement summary is at hand.
func Write(dir string, res *tuning.Result, agr *consensus.Agreement, meta Meta) error {
	if res == nil {
		return fmt.Errorf("report: no tuning result")
	}
	if err := atomicfile.Write(filepath.Join(dir, SweepFile), 0o644, func(w io.Writer) error {
		return writeSweep(w, SweepRows(res))
	}); err != nil {
		return err
	}
	op, err := json.MarshalIndent(NewOperatingPoint(res, meta), "", "  ")
	if err != nil {
		return err
	}
	if err := atomicfile.WriteBytes(filepath.Join(dir, PointFile), append(op, '\n'), 0o644); err != nil {
		return err
	}
	var h bytes.Buffer
	if err := writeHTML(&h, res, agr, meta); err != nil {
		return err
	}
	if err := atomicfile.WriteBytes(filepath.Join(dir, HTMLFile), h.Bytes(), 0o644); err != nil {
		return err
	}
	var md bytes.Buffer
	writeMarkdown(&md, res, agr, meta)
	return atomicfile.WriteBytes(filepath.Join(dir, MarkdownFile), md.Bytes(), 0o644)
}
