package main

import (
	"path"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/export/report"
	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

// pipeline is the study's stages in the order a study runs them, each with the inputs
// its outputs are built from. A command refuses to work while a stage before it is
// stale (its inputs changed after it ran), naming the command that rebuilds it.
var pipeline = []study.Stage{
	{Name: "scan", Refresh: "quorate scan"},
	{Name: "detect", Inputs: []string{path.Join(study.IndexDir, archive.IndexFile)}, Refresh: "quorate detect"},
	{Name: "import-events", Inputs: []string{path.Join(study.IndexDir, archive.IndexFile)}, Refresh: "quorate import-events FILE"},
	{Name: "draw", Inputs: []string{study.CandidatesDir, path.Join(study.IndexDir, archive.IndexFile)},
		Outputs: []string{path.Join(study.DrawDir, draw.DrawFile), path.Join(study.DrawDir, draw.DesignFile)}, Refresh: "quorate draw --replace"},
	{Name: "packets", Inputs: []string{path.Join(study.DrawDir, draw.DrawFile)},
		Outputs: []string{path.Join(study.PacketsDir, packet.KeyFile), path.Join(study.PacketsDir, packet.ManifestFile)},
		Refresh: "quorate packets (after draw --top-up: packets for the new events only) or quorate packets --replace (after a new draw)"},
	{Name: "merge", Inputs: []string{path.Join(study.DrawDir, draw.DrawFile), path.Join(study.PacketsDir, packet.KeyFile), path.Join(study.PacketsDir, packet.ManifestFile)},
		Outputs: []string{path.Join(study.ConsensusDir, merge.RatingsFile), path.Join(study.ConsensusDir, merge.ConsensusFile)},
		Refresh: "quorate merge with the returns of the current packets"},
	{Name: "tune", Inputs: []string{path.Join(study.ConsensusDir, merge.ConsensusFile), path.Join(study.DrawDir, draw.DrawFile),
		path.Join(study.IndexDir, archive.IndexFile), study.CandidatesDir},
		Outputs: []string{path.Join(study.TuningDir, report.PointFile), path.Join(study.TuningDir, report.SweepFile)}, Refresh: "quorate tune"},
	{Name: "export"},
}

// Commands that write into the study take its lock; those that build on earlier
// stages also check that those stages are of one generation (unless --force).
var (
	locking = map[string]bool{"scan": true, "detect": true, "import-events": true, "draw": true, "packets": true,
		"merge": true, "status": true, "tune": true, "export": true}
	checking = map[string]bool{"detect": true, "import-events": true, "draw": true, "packets": true, "merge": true,
		"tune": true, "export": true}
)

// guard wraps the RunE of every locking command: take the study's lock for the whole
// run, refuse stale inputs, then run. A study that cannot be opened is left to the
// command, which says why.
func guard(g *globals, c *cobra.Command) {
	run := c.RunE
	if run == nil || !locking[c.Name()] {
		return
	}
	c.RunE = func(cmd *cobra.Command, args []string) error {
		s, err := g.openStudy()
		if err != nil {
			return run(cmd, args)
		}
		// Shards of detect write disjoint folders and run side by side on a cluster.
		if sh, _ := cmd.Flags().GetString("shard"); c.Name() != "detect" || sh == "" {
			unlock, err := s.Lock(g.argv)
			if err != nil {
				return err
			}
			defer unlock()
		}
		if sh, _ := cmd.Flags().GetString("shard"); sh == "" {
			// Under the lock no other writer is at work: what a killed one left goes.
			if gone, _ := atomicfile.RemoveLeftovers(s.Dir); len(gone) > 0 {
				g.note(c.Name(), "removed %d temporary file(s) of an interrupted run", len(gone))
			}
		}
		if checking[c.Name()] && !g.force {
			if err := s.CheckFresh(c.Name()); err != nil {
				return err
			}
		}
		return run(cmd, args)
	}
}
