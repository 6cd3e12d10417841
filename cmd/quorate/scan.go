package main

import (
	"context"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/internal/progress"
	"github.com/quorate-eeg/quorate/sampling/archive"
)

func newScanCmd(g *globals) *cobra.Command {
	var roots []string
	cmd := &cobra.Command{
		Use:   "scan",
		Short: "Index the archive's EDF, EDF+ and BDF recordings",
		Long: `scan walks the archive roots recursively, recognising EDF, EDF+ and BDF recordings by
content, and writes index/recordings.parquet (one row per recording) and
index/problems.csv (every file that could not be indexed, with the field, byte offset and
reason). The archive is only read. Unchanged files are not read again on a later scan.`,
		Example: `  quorate --study /studies/ied-2027 scan
  quorate --study /studies/ied-2027 --workers 8 --strict scan --archive /mnt/eeg-archive/2026`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			return runScan(cmd.Context(), g, s, roots)
		},
	}
	cmd.Flags().StringArrayVar(&roots, "archive", nil, "archive root to scan instead of study.yaml's (repeatable)")
	return cmd
}

func runScan(ctx context.Context, g *globals, s *study.Study, roots []string) error {
	secret, err := s.Secret()
	if err != nil {
		return err
	}
	if len(roots) == 0 {
		roots = s.Config.Archive.Roots
	}
	res, err := archive.Run(ctx, archive.Options{
		Roots: roots, Secret: secret, IndexDir: s.Path(study.IndexDir), PathsFile: s.Path(study.PathsFile), Workers: g.workers,
		Progress: g.progress,
	})
	if err != nil {
		return err
	}
	if err := s.Record(study.Entry{Version: Version, Command: "scan", Argv: g.argv,
		Outputs: s.Hash(s.Path(study.IndexDir, archive.IndexFile), s.Path(study.IndexDir, archive.ProblemsFile)),
		Notes:   map[string]any{"roots": roots, "recordings": len(res.Recordings), "problems": len(res.Problems), "reused": res.Reused}}); err != nil {
		return err
	}
	hours := 0.0
	for _, r := range res.Recordings {
		hours += r.DurationS / 3600
	}
	fmt.Fprintf(g.stdout, "Indexed %d recordings (%.1f h; %d unchanged since the last scan); %d problem(s) in %s.\n",
		len(res.Recordings), hours, res.Reused, len(res.Problems), s.Path(study.IndexDir, archive.ProblemsFile))
	return g.finish(res.Warnings)
}

// readIndex reads the archive index with each recording's archive path joined back
// from the study's private paths file, for the stages that read the archive.
func readIndex(s *study.Study) ([]archive.Recording, error) {
	recs, err := archive.ReadIndex(s.Path(study.IndexDir, archive.IndexFile))
	if err != nil {
		return nil, err
	}
	return archive.AttachPaths(recs, s.Path(study.PathsFile))
}

// progress makes a bar unless --quiet is set or standard error is not a terminal.
func (g *globals) progress(total int, desc string) progress.Bar {
	return progress.NewTo(g.errOut(), total, desc, g.quiet)
}
