package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/internal/parquetfile"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/candidate"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

// finding is one thing check found: damaged (a file that is not what it should be),
// stale (outputs of another generation than their inputs), exposed (a private file
// others may read) or leftover (a temporary file of a command that was killed).
type finding struct {
	Kind   string // damaged, stale, exposed, leftover
	What   string // the file or stage
	Detail string
}

func newCheckCmd(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:   "check",
		Short: "Check the study folder: returns, ledger, Parquet files, generations, private files",
		Long: `check is the study-level check to run before a report goes out. It reads every
artefact and changes nothing:

  - each stored return under returns/ against the SHA-256 it is named by;
  - the ledger against the stored returns (every entry's file present and whole, every
    stored file in the ledger);
  - every Parquet file's footer, schema and pages; the JSON files (manifest, design,
    operating point, agreement, generations) parse;
  - each stage's generation: outputs built from inputs that have changed since;
  - the study secret and the archive paths readable by the owner only, and no archive
    path left in index/recordings.parquet;
  - temporary files (.NAME.tmp-N) of a command that was killed before it finished
    (kill -9, a power cut); the next writing command removes them.

Exit status 1 when anything is damaged or exposed; stale stages and leftover temporary
files are listed and count as warnings (exit 3 with --strict).`,
		Example: `  quorate --study /studies/ied-2027 check`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			fs := checkStudy(s)
			stale := 0
			for _, f := range fs {
				fmt.Fprintf(g.stdout, "%-8s %s: %s\n", f.Kind, f.What, f.Detail)
				if f.Kind == "stale" || f.Kind == "leftover" {
					stale++
				}
			}
			if n := len(fs) - stale; n > 0 {
				return fmt.Errorf("%d damaged or exposed file(s) in %s", n, s.Dir)
			}
			if len(fs) == 0 {
				fmt.Fprintf(g.stdout, "The study in %s is whole and of one generation.\n", s.Dir)
			}
			return g.finish(stale)
		},
	}
}

// checkStudy runs every check of quorate check, in a fixed order.
func checkStudy(s *study.Study) []finding {
	var out []finding
	add := func(kind, what, detail string) { out = append(out, finding{kind, what, detail}) }
	rel := func(p string) string {
		if r, err := filepath.Rel(s.Dir, p); err == nil {
			return filepath.ToSlash(r)
		}
		return p
	}
	out = append(out, checkReturns(s, rel)...)
	out = append(out, checkTables(s, rel)...)
	for _, j := range []struct {
		path string
		read func(string) error
	}{
		{s.Path(study.PacketsDir, packet.ManifestFile), func(p string) error { _, err := packet.ReadManifest(p); return err }},
		{s.Path(study.TuningDir, report.PointFile), func(p string) error { _, err := report.ReadOperatingPoint(p); return err }},
		{s.Path(study.DrawDir, draw.DesignFile), validJSON},
		{s.Path(study.ConsensusDir, merge.AgreementJSON), validJSON},
		{s.Path(study.GenerationsFile), validJSON},
	} {
		if _, err := os.Stat(j.path); errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err := j.read(j.path); err != nil {
			add("damaged", rel(j.path), err.Error())
		}
	}
	stale, err := s.Stale("")
	if err != nil {
		add("damaged", study.GenerationsFile, err.Error())
	}
	for _, e := range stale {
		add("stale", e.Stage, e.Error())
	}
	if recs, err := archive.ReadIndex(s.Path(study.IndexDir, archive.IndexFile)); err == nil {
		for _, r := range recs {
			if r.Path != "" {
				add("exposed", rel(s.Path(study.IndexDir, archive.IndexFile)), "keeps archive paths, which may carry names; run quorate scan to move them to "+study.PathsFile)
				break
			}
		}
	}
	out = append(out, checkLeftovers(s, rel)...)
	for _, p := range []string{study.SecretFile, study.PathsFile} {
		st, err := os.Stat(s.Path(p))
		switch {
		case errors.Is(err, fs.ErrNotExist) && p == study.PathsFile:
		case err != nil:
			add("damaged", p, err.Error())
		case st.Mode().Perm()&0o077 != 0:
			add("exposed", p, fmt.Sprintf("mode %v: others may read it; run chmod 600 %s", st.Mode().Perm(), s.Path(p)))
		}
	}
	return out
}

func validJSON(p string) error {
	b, err := os.ReadFile(p)
	if err != nil {
		return err
	}
	if !json.Valid(b) {
		return errors.New("not valid JSON")
	}
	return nil
}

// checkReturns re-hashes every stored return and holds the ledger against them. The
// ledger is read through panel/merge, whatever its format.
func checkReturns(s *study.Study, rel func(string) string) []finding {
	var out []finding
	dir := s.Path(study.ReturnsDir)
	led, err := merge.ReadLedger(filepath.Join(dir, merge.LedgerFile))
	if err != nil {
		return []finding{{"damaged", rel(filepath.Join(dir, merge.LedgerFile)), err.Error()}}
	}
	// The log of refused files lives beside the stored returns; it is read, not hashed.
	if _, err := merge.ReadRefused(filepath.Join(dir, merge.RefusedFile)); err != nil {
		out = append(out, finding{"damaged", rel(filepath.Join(dir, merge.RefusedFile)), err.Error()})
	}
	entries, err := os.ReadDir(dir)
	if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return []finding{{"damaged", rel(dir), err.Error()}}
	}
	onDisk := map[string]bool{}
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || name == merge.LedgerFile || name == merge.RefusedFile || strings.HasPrefix(name, ".") {
			continue
		}
		onDisk[name] = true
		hs, err := s.HashAll(filepath.Join(dir, name))
		want, _, _ := strings.Cut(name, ".")
		switch {
		case err != nil || len(hs) != 1:
			out = append(out, finding{"damaged", rel(filepath.Join(dir, name)), fmt.Sprint("cannot read it: ", err)})
		case hs[0].SHA256 != want:
			sum := hs[0].SHA256
			out = append(out, finding{"damaged", rel(filepath.Join(dir, name)),
				"its content's SHA-256 is " + sum[:12] + "…, not the one it is named by: the stored return was changed"})
		}
	}
	inLedger := map[string]bool{}
	for i, e := range led {
		inLedger[e.Stored] = true
		if !onDisk[e.Stored] {
			out = append(out, finding{"damaged", rel(filepath.Join(dir, merge.LedgerFile)),
				fmt.Sprintf("entry %d names %s, which is not in returns/", i+1, e.Stored)})
		} else if !strings.HasPrefix(e.Stored, e.SHA256) {
			out = append(out, finding{"damaged", rel(filepath.Join(dir, merge.LedgerFile)),
				fmt.Sprintf("entry %d: stored name %s does not match its SHA-256", i+1, e.Stored)})
		}
	}
	var extra []string
	for name := range onDisk {
		if !inLedger[name] {
			extra = append(extra, name)
		}
	}
	sort.Strings(extra)
	for _, name := range extra {
		out = append(out, finding{"damaged", rel(filepath.Join(dir, name)), "stored return not in the ledger"})
	}
	return out
}

// checkTables reads every Parquet table of the study as its row type: footer, schema
// and pages.
func checkTables(s *study.Study, rel func(string) string) []finding {
	var out []finding
	check := func(p string, fn func(string) error) {
		if _, err := os.Stat(p); errors.Is(err, fs.ErrNotExist) {
			return
		}
		if err := fn(p); err != nil {
			out = append(out, finding{"damaged", rel(p), err.Error()})
		}
	}
	check(s.Path(study.IndexDir, archive.IndexFile), parquetfile.Check[archive.Recording])
	filepath.WalkDir(s.Path(study.CandidatesDir), func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && filepath.Ext(p) == ".parquet" && !strings.HasPrefix(d.Name(), ".") {
			check(p, parquetfile.Check[candidate.Row])
		}
		return nil
	})
	drawn, _ := filepath.Glob(s.Path(study.DrawDir, "draw*.parquet"))
	for _, p := range drawn {
		check(p, parquetfile.Check[draw.Row])
	}
	check(s.Path(study.PacketsDir, packet.KeyFile), parquetfile.Check[packet.KeyRow])
	check(s.Path(study.ConsensusDir, merge.RatingsFile), parquetfile.Check[consensus.Rating])
	check(s.Path(study.ConsensusDir, merge.ConsensusFile), parquetfile.Check[consensus.Event])
	check(s.Path(study.TuningDir, report.SweepFile), parquetfile.Check[report.SweepRow])
	return out
}

// checkLeftovers lists the temporary files and folders of writers that were killed
// before their rename (atomicfile.Leftovers). check takes no lock, so a writer at work
// on the study shows its own temporary files here too.
func checkLeftovers(s *study.Study, rel func(string) string) []finding {
	ls, err := atomicfile.Leftovers(s.Dir)
	if err != nil {
		return []finding{{"damaged", rel(s.Dir), err.Error()}}
	}
	var out []finding
	for _, l := range ls {
		detail := "temporary file of a command stopped before it finished (or at work now); the next writing command removes it"
		if l.Restores != "" {
			detail = fmt.Sprintf("%s as it was before a command stopped while replacing it; the next writing command puts it back", rel(l.Restores))
		}
		out = append(out, finding{"leftover", rel(l.Path), detail})
	}
	return out
}
