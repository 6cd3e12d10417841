package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/consensus"
	"github.com/quorate-eeg/quorate/panel/merge"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

func newMergeCmd(g *globals) *cobra.Command {
	var seed uint64
	cmd := &cobra.Command{
		Use:   "merge FILE...",
		Short: "Merge raters' returns into the consensus and the agreement report",
		Long: `merge checks each returned file (the review page's JSON or the filled sheet.csv) against
the packets: packet id and check value, rater, every item code and every value. Accepted
files are stored unchanged under returns/, named by their SHA-256 and read-only. Returns
merge item by item: each item counts from the last return that gives it a value, so a blank
or partial return never erases counted answers, and handing in an earlier file again makes
its items count again. Items only partly filled in are not merged; they stay owed and are
listed by item code. A refused file is reported with every problem (in returns/refused.jsonl
too) and changes nothing. Stored returns are re-hashed before the consensus is rebuilt.

It then rebuilds consensus/ratings.parquet, consensus/consensus.parquet (votes and
majority per criterion, criteria present, the panel's verdict, the Dawid–Skene
probability), consensus/agreement.json and consensus/agreement.md.`,
		Example: `  quorate --study /studies/ied-2027 merge ~/Downloads/P-rater-a-3f9c01d2.json inbox/rater-b/sheet.csv`,
		Args:    cobra.MinimumNArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			if !cmd.Flags().Changed("seed") {
				seed = s.Config.Seed
			}
			return runMerge(cmd.Context(), g, s, args, seed)
		},
	}
	cmd.Flags().Uint64Var(&seed, "seed", 0, "seed of the bootstrap intervals (default: study.yaml seed)")
	return cmd
}

func runMerge(ctx context.Context, g *globals, s *study.Study, files []string, seed uint64) error {
	m, err := packet.ReadManifest(s.Path(study.PacketsDir, packet.ManifestFile))
	if err != nil {
		return fmt.Errorf("no packets yet (run quorate packets first): %w", err)
	}
	if err := checkQuorum(s.Config.Panel.Quorum, m); err != nil {
		return err
	}
	if err := checkSizes(files, maxReturnBytes); err != nil {
		return err
	}
	if m.Study != s.Config.Study.ID {
		return fmt.Errorf("%s belongs to study %s, not to this study (%s)", s.Path(study.PacketsDir, packet.ManifestFile), m.Study, s.Config.Study.ID)
	}
	key, err := packet.ReadKey(s.Path(study.PacketsDir, packet.KeyFile))
	if err != nil {
		return err
	}
	rows, err := draw.ReadRows(s.Path(study.DrawDir, draw.DrawFile))
	if err != nil {
		return err
	}
	subjectOf := make(map[string]string, len(rows))
	for _, r := range rows {
		subjectOf[r.EventID] = r.SubjectKey
	}
	tie, err := consensus.ParseTiePolicy(s.Config.Panel.Tie)
	if err != nil {
		return err
	}
	res, err := merge.Run(ctx, merge.Options{Files: files, Manifest: m, Key: key,
		ReturnsDir: s.Path(study.ReturnsDir), ConsensusDir: s.Path(study.ConsensusDir), SubjectOf: subjectOf,
		Quorum: s.Config.Panel.Quorum, Tie: tie, Bootstrap: s.Config.Tuning.Bootstrap, Seed: seed, Level: 0.95})
	var rej *merge.RejectedError
	var stored *merge.StoredError
	switch {
	case errors.As(err, &stored):
		return fmt.Errorf("%w\n(quorate status lists every changed file)", err)
	case err != nil && !errors.As(err, &rej):
		return err
	}
	for _, e := range res.Superseded {
		g.note("merge", "return %s of %s (packet %s) no longer counts for any item: later returns replaced its answers", e.Stored, e.Rater, e.Packet)
	}
	notes := map[string]any{"accepted": len(res.Accepted), "already_stored": len(res.Duplicates), "refused": len(res.Rejected), "events": res.Events}
	var counting []string
	for _, e := range res.Accepted {
		counting = append(counting, e.Packet+"="+e.Stored)
	}
	notes["now_counting"] = counting
	var superseded []string
	for _, e := range res.Superseded {
		superseded = append(superseded, e.Packet+"="+e.Stored)
	}
	notes["superseded"] = superseded
	var restored, owed []string
	for _, e := range res.Restored {
		restored = append(restored, e.Packet+"="+e.Stored)
	}
	for _, o := range res.Owed {
		owed = append(owed, o.Items...)
	}
	notes["restored"], notes["incomplete_items"] = restored, owed
	seedCopy := seed
	if rerr := s.Record(study.Entry{Version: Version, Command: "merge", Argv: g.argv, Seed: &seedCopy,
		Inputs:  s.Hash(files...),
		Outputs: s.Hash(s.Path(study.ConsensusDir)), Notes: notes, KeepGeneration: res.Events == 0}); rerr != nil {
		return rerr
	}
	// A file that rates no item completely (a sheet sent back untouched) is
	// stored but is no return: it is said apart.
	var rated []merge.Entry
	for _, e := range res.Accepted {
		if len(e.Items) > 0 {
			rated = append(rated, e)
		}
	}
	if res.Events > 0 {
		fmt.Fprintf(g.stdout, "Merged %d return(s) (%d already stored and counting, %d restored, %d no longer counting); consensus on %d events in %s.\n",
			len(rated), len(res.Duplicates), len(res.Restored), len(res.Superseded), res.Events, s.Path(study.ConsensusDir))
	} else {
		fmt.Fprintf(g.stdout, "Merged %d return(s) (%d already stored and counting); the consensus is unchanged.\n", len(rated), len(res.Duplicates))
	}
	for _, e := range res.Accepted {
		if len(e.Items) == 0 && len(e.Incomplete) == 0 {
			fmt.Fprintf(g.stdout, "  %s (%s, %s): no item rated; nothing merged, every item still owed\n", e.Original, e.Packet, e.Rater)
		}
	}
	for _, o := range res.Owed {
		fmt.Fprintf(g.stdout, "  %s (%s, %s): %d item(s) only partly rated, not merged and still owed: %s\n",
			o.File, o.Packet, o.Rater, len(o.Items), strings.Join(o.Items, " "))
	}
	if res.Agreement != nil {
		for _, q := range res.Agreement.Questions {
			fmt.Fprintf(g.stdout, "  %-8s Fleiss' kappa %s\n", q.Question, kappaText(q.Fleiss, q.FleissBand))
		}
	}
	if rej != nil {
		return rej
	}
	return nil
}

func newStatusCmd(g *globals) *cobra.Command {
	return &cobra.Command{
		Use:     "status",
		Short:   "Show which packets are out, returned or superseded, and what each rater owes",
		Example: `  quorate --study /studies/ied-2027 status`,
		Args:    cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			st, err := studyStatus(s)
			if err != nil {
				return err
			}
			if err := s.Record(study.Entry{Version: Version, Command: "status", Argv: g.argv,
				Inputs: s.Hash(s.Path(study.PacketsDir, packet.ManifestFile), s.Path(study.ReturnsDir, merge.LedgerFile)),
				Notes:  map[string]any{"consensus_up_to_date": st.ConsensusUpToDate, "owed": st.Owed, "refused": len(st.Refused), "damaged": len(st.Damaged)}}); err != nil {
				return err
			}
			writeStatus(g.stdout, st)
			return nil
		},
	}
}

func writeStatus(w io.Writer, st merge.Status) {
	fmt.Fprintf(w, "%d packets, %d items (%d of them hidden duplicates) showing %d events; %d items owed.\n",
		len(st.Packets), st.Items, st.Duplicates, st.Events, st.Owed)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "packet\trater\tphase\tstate\titems\towes\treturns\tsuperseded\t")
	for _, p := range st.Packets {
		fmt.Fprintf(tw, "%s\t%s\t%d\t%s\t%d\t%d\t%d\t%d\t\n", p.Packet, p.Rater, p.Phase, p.State, p.Items, p.Owes, p.Returns, p.Superseded)
	}
	tw.Flush()
	for _, p := range st.Packets {
		if p.Owes > 0 && p.Owes < p.Items {
			fmt.Fprintf(w, "%s owes in %s: %s\n", p.Rater, p.Packet, strings.Join(p.OwedItems, " "))
		}
		if len(p.Incomplete) > 0 {
			fmt.Fprintf(w, "  of which partly rated: %s\n", strings.Join(p.Incomplete, " "))
		}
		if p.Empty > 0 {
			fmt.Fprintf(w, "%s handed in %d file(s) for %s that rated no item completely: not counted as returns\n", p.Rater, p.Empty, p.Packet)
		}
	}
	for _, r := range st.Refused {
		fmt.Fprintf(w, "Refused %s (%s): %s\n", r.Original, r.Time.Format("2006-01-02 15:04"), strings.ReplaceAll(r.Reason, "\n", "\n  "))
	}
	for _, d := range st.Damaged {
		fmt.Fprintf(w, "Damaged: %s\n", d)
	}
	switch {
	case st.ConsensusUpToDate:
		fmt.Fprintln(w, "The consensus is up to date with the returns.")
	case len(st.Damaged) > 0:
		fmt.Fprintf(w, "The consensus cannot be trusted: %s; restore them from a backup.\n", st.Reason)
	default:
		fmt.Fprintf(w, "The consensus is not up to date: %s; run quorate merge.\n", st.Reason)
	}
}

// panelReadiness gathers what tune must say about the panel's work; a study
// whose status cannot be read gives no warnings rather than no tuning.
func panelReadiness(s *study.Study, evs []consensus.Event, agr *consensus.Agreement) merge.Readiness {
	st, err := studyStatus(s)
	if err != nil {
		return merge.Readiness{VerdictKappa: math.NaN(), Quorum: s.Config.Panel.Quorum}
	}
	return merge.PanelReadiness(st, evs, agr, s.Config.Panel.Quorum)
}

// studyStatus reads the packets, the key, the returns and the consensus inputs.
func studyStatus(s *study.Study) (merge.Status, error) {
	m, err := packet.ReadManifest(s.Path(study.PacketsDir, packet.ManifestFile))
	if err != nil {
		return merge.Status{}, fmt.Errorf("no packets yet (run quorate packets first): %w", err)
	}
	key, err := packet.ReadKey(s.Path(study.PacketsDir, packet.KeyFile))
	if err != nil {
		return merge.Status{}, err
	}
	return merge.GetStatus(m, key, s.Path(study.ReturnsDir), s.Path(study.ConsensusDir))
}
