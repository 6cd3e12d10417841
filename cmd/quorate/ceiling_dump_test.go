package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// TestCeilingDump writes, for each kept demo of a coverage study
// (QUORATE_CEILING_DIR/seedN), into QUORATE_CEILING_OUT (default the same
// folder) one CSV of every candidate's six criterion
// features, detector score and the generator's truth, for the ceiling
// analysis of the automatic rule (testdata/ceiling.py).
//
//	QUORATE_CEILING_DIR=/tmp/cov QUORATE_CEILING_SEEDS=101-125 go test ./cmd/quorate -run TestCeilingDump
func TestCeilingDump(t *testing.T) {
	dir := os.Getenv("QUORATE_CEILING_DIR")
	if dir == "" {
		t.Skip("set QUORATE_CEILING_DIR to a coverage-study folder")
	}
	out := os.Getenv("QUORATE_CEILING_OUT")
	if out == "" {
		out = dir
	}
	a, b, _ := strings.Cut(os.Getenv("QUORATE_CEILING_SEEDS"), "-")
	from, _ := strconv.Atoi(a)
	to, _ := strconv.Atoi(b)
	for seed := from; seed <= to; seed++ {
		_, cands, truth := demoOutcome(t, filepath.Join(dir, "seed"+strconv.Itoa(seed)))
		var sb strings.Builder
		sb.WriteString("subject,c1,c2,c3,c4,c5,c6,score,ied\n")
		for _, c := range cands {
			f := c.Features()
			fmt.Fprintf(&sb, "%s,%g,%g,%g,%g,%g,%g,%g,%d\n", c.SubjectKey, f[0], f[1], f[2], f[3], f[4], f[5], c.Score, b2i(truth[c.EventID].IsIED))
		}
		if err := os.WriteFile(filepath.Join(out, "seed"+strconv.Itoa(seed)+".csv"), []byte(sb.String()), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}
