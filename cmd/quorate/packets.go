package main

import (
	"context"
	"fmt"
	"os"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/quorate-eeg/quorate/cmd/quorate/internal/study"
	"github.com/quorate-eeg/quorate/panel/excerpt"
	"github.com/quorate-eeg/quorate/panel/packet"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/draw"
)

type packetsFlags struct {
	raters    string
	ratersSet bool // --raters was given (not study.yaml's panel.raters)
	seed      uint64
	replace   bool
	duplicate float64
	window    float64
}

func newPacketsCmd(g *globals) *cobra.Command {
	f := &packetsFlags{}
	cmd := &cobra.Command{
		Use:   "packets",
		Short: "Build one blinded rating packet per rater from the draw",
		Long: `packets builds, under packets/, one folder per rater with review.html (a self-contained
page that works offline, opened from disk) and sheet.csv (the same items for raters who
prefer a spreadsheet), plus key.parquet and manifest.json for the coordinator only.

Each rater sees the drawn events in an independent random order under opaque item codes;
no patient, recording, file name, date, time of day, detector score, feature, stratum or
other rater's answer reaches a packet. A share of items appears twice under different
codes, to measure each rater's agreement with themself. Each packet carries a check value
keyed with the study secret so that returns can be matched and tampering detected.

--raters takes a number (fictional names rater-1 … rater-N) or a list of folder-safe names.

After draw --top-up, packets (without --replace) builds one more packet per rater for the
events of the new phase only, in packets/<rater>/phase-N/, and appends them to key.parquet
and manifest.json; the earlier packets and every answer returned for them stay. A later
phase goes to the same panel (by default the raters of the existing packets). --replace
rebuilds every packet under new packet ids instead: answers to the old packets no longer
count, so use it after a new draw, not after a top-up.`,
		Example: `  quorate --study /studies/ied-2027 packets --raters amara,bjorn,chidi,dana,emeka,farah,goran
  quorate --study /studies/ied-2027 packets --raters 5 --replace
  quorate --study /studies/ied-2027 draw --top-up 100 --adaptive && quorate --study /studies/ied-2027 packets`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			s, err := g.openStudy()
			if err != nil {
				return err
			}
			c := s.Config
			set := cmd.Flags().Changed
			f.ratersSet = set("raters")
			if !f.ratersSet {
				f.raters = strings.Join(c.Panel.Raters, ",")
			}
			if !set("seed") {
				f.seed = c.Seed
			}
			if !set("duplicate-share") {
				f.duplicate = c.Panel.DuplicateShare
			}
			if !set("window") {
				f.window = c.Panel.WindowS
			}
			return runPackets(cmd.Context(), g, s, f)
		},
	}
	fl := cmd.Flags()
	fl.StringVar(&f.raters, "raters", "", "number of raters, or their names separated by commas (default: study.yaml panel.raters)")
	fl.Uint64Var(&f.seed, "seed", 0, "random seed of orders and codes (default: study.yaml seed)")
	fl.BoolVar(&f.replace, "replace", false, "rebuild existing packets, keeping the old folders beside the new")
	fl.Float64Var(&f.duplicate, "duplicate-share", 0, "share of items shown twice (default: study.yaml)")
	fl.Float64Var(&f.window, "window", 0, "seconds shown around each event (default: study.yaml)")
	return cmd
}

// parseRaters reads "5" or "ana,ben,cas".
func parseRaters(s string) ([]string, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return nil, fmt.Errorf("no raters: give --raters N or --raters name,name,… (or panel.raters in study.yaml)")
	}
	if n, err := strconv.Atoi(s); err == nil {
		if n < 1 || n > packet.MaxRaters {
			return nil, fmt.Errorf("--raters: got %d, want 1 to %d", n, packet.MaxRaters)
		}
		out := make([]string, n)
		for i := range out {
			out[i] = fmt.Sprintf("rater-%d", i+1)
		}
		return out, nil
	}
	var out []string
	for _, name := range strings.Split(s, ",") {
		name = strings.TrimSpace(name)
		if !packet.SafeName(name) {
			return nil, fmt.Errorf("--raters: %q is not a safe folder name (letters, digits, '.', '_' and '-', 1–40 characters, not starting with '.')", name)
		}
		out = append(out, name)
	}
	return out, nil
}

func runPackets(ctx context.Context, g *globals, s *study.Study, f *packetsFlags) error {
	drawPath := s.Path(study.DrawDir, draw.DrawFile)
	rows, err := draw.ReadRows(drawPath)
	if err != nil {
		return fmt.Errorf("no draw yet (run quorate draw first): %w", err)
	}
	// Packets already out and no --replace: a later phase of the draw gets packets of its own.
	manPath := s.Path(study.PacketsDir, packet.ManifestFile)
	var phase int
	if _, err := os.Stat(manPath); err == nil && !f.replace {
		var panel []string
		if rows, phase, panel, err = laterPhase(s, rows); err != nil {
			return err
		}
		if !f.ratersSet {
			f.raters = strings.Join(panel, ",")
		}
	}
	raters, err := parseRaters(f.raters)
	if err != nil {
		return usageError{err}
	}
	indexPath := s.Path(study.IndexDir, archive.IndexFile)
	recs, err := readIndex(s)
	if err != nil {
		return err
	}
	secret, err := s.Secret()
	if err != nil {
		return err
	}
	c := s.Config
	items, warns, err := excerpt.Cut(ctx, excerpt.Options{Rows: rows, Recordings: recs, Roots: c.Archive.Roots, WindowS: f.window,
		Bandpass: c.Signal.Bandpass, NotchHz: c.Signal.NotchHz, Progress: g.progress})
	if err != nil {
		return err
	}
	for _, w := range warns {
		g.warn("packets", "%s", w)
	}
	// The page opens with study.yaml's montage and filters; raters may change them.
	filters := packet.Filters{LowHz: c.Signal.Bandpass[0], HighHz: c.Signal.Bandpass[1], NotchHz: c.Signal.NotchHz}
	res, err := packet.Run(ctx, packet.Options{Items: items, StudyID: c.Study.ID, Secret: secret, Raters: raters,
		DuplicateShare: f.duplicate, Seed: f.seed, Replace: f.replace, OutDir: s.Path(study.PacketsDir), Phase: phase,
		Montages: packet.FirstMontage(packet.DefaultMontages(items[0].Electrodes), c.Signal.Montage), Filters: &filters})
	if err != nil {
		return err
	}
	seed := f.seed
	notes := map[string]any{"raters": raters, "events": len(items), "items_per_packet": len(res.Manifest.Packets[len(res.Manifest.Packets)-1].Items)}
	if phase >= 2 {
		notes["phase"], notes["packets_in_all"] = phase, len(res.Manifest.Packets)
	}
	if err := s.Record(study.Entry{Version: Version, Command: "packets", Argv: g.argv, Seed: &seed,
		Inputs: s.Hash(drawPath, indexPath), Outputs: s.Hash(s.Path(study.PacketsDir)), Notes: notes}); err != nil {
		return err
	}
	// The same three counts as status prints: events, items (showings) and hidden duplicates.
	perPacket := map[string][2]int{}
	for _, k := range res.Key {
		c := perPacket[k.Packet]
		c[0]++
		if k.Duplicate {
			c[1]++
		}
		perPacket[k.Packet] = c
	}
	if phase >= 2 {
		fmt.Fprintf(g.stdout, "Added %d packets for the %d events of draw phase %d that no packet showed, %d items in all (hidden duplicates included);\n"+
			"the %d earlier packets and their answers are kept (%d packets in all):\n",
			len(res.Packets), len(items), phase, len(res.Key), len(res.Manifest.Packets)-len(res.Packets), len(res.Manifest.Packets))
	} else {
		fmt.Fprintf(g.stdout, "Built %d packets of %d events, %d items in all (hidden duplicates included):\n", len(res.Packets), len(items), len(res.Key))
	}
	for _, p := range res.Packets {
		c := perPacket[p.Packet]
		fmt.Fprintf(g.stdout, "  %-16s %d items (%d hidden duplicates): %s (%.1f MB) and %s\n", p.Rater, c[0], c[1], p.Page, float64(p.PageBytes)/1e6, p.Sheet)
	}
	if phase >= 2 {
		fmt.Fprintf(g.stdout, "Keep %s and manifest.json to yourself; send each rater their %s folder (the new events only).\n",
			s.Path(study.PacketsDir, packet.KeyFile), packet.PhaseDir(phase))
	} else {
		fmt.Fprintf(g.stdout, "Keep %s and manifest.json to yourself; send each rater their folder.\n", s.Path(study.PacketsDir, packet.KeyFile))
	}
	return g.finish(len(warns))
}

// laterPhase returns the draw rows no packet shows yet and the draw phase they
// belong to, when they are a later phase than every row the packets show: the
// events a draw --top-up added. It refuses when there are none, when the packets
// show events the draw no longer holds (the draw was replaced), or when the new
// rows are not of a later phase. panel is the raters of the existing packets, who
// rate a later phase unless --raters names others (which Extend refuses).
func laterPhase(s *study.Study, rows []draw.Row) (fresh []draw.Row, phase int, panel []string, err error) {
	manPath, keyPath := s.Path(study.PacketsDir, packet.ManifestFile), s.Path(study.PacketsDir, packet.KeyFile)
	m, err := packet.ReadManifest(manPath)
	if err != nil {
		return nil, 0, nil, err
	}
	key, err := packet.ReadKey(keyPath)
	if err != nil {
		return nil, 0, nil, err
	}
	covered := packet.Covered(m, key)
	inDraw := make(map[string]bool, len(rows))
	lastCovered := int32(0)
	for _, r := range rows {
		inDraw[r.EventID] = true
		if covered[r.EventID] {
			lastCovered = max(lastCovered, r.Phase)
		} else {
			fresh = append(fresh, r)
		}
	}
	gone := 0
	for id := range covered {
		if !inDraw[id] {
			gone++
		}
	}
	if gone > 0 {
		return nil, 0, nil, fmt.Errorf("the packets in %s show %d event(s) that %s no longer holds (was the draw replaced?); "+
			"run quorate packets --replace to rebuild every packet (the old ones are kept beside the new, but their answers will not count)",
			s.Path(study.PacketsDir), gone, s.Path(study.DrawDir, draw.DrawFile))
	}
	if len(fresh) == 0 {
		return nil, 0, nil, fmt.Errorf("%s already exists and its %d packets show every event of the draw; "+
			"to add events run quorate draw --top-up N first, or add --replace to rebuild every packet", manPath, len(m.Packets))
	}
	last := int32(0)
	for _, r := range fresh {
		if r.Phase <= lastCovered {
			return nil, 0, nil, fmt.Errorf("%s holds %d event(s) no packet shows, among them %s of phase %d, but the packets already show phase %d: "+
				"only a later phase (quorate draw --top-up N) gets packets of its own; add --replace to rebuild every packet",
				s.Path(study.DrawDir, draw.DrawFile), len(fresh), r.EventID, r.Phase, lastCovered)
		}
		last = max(last, r.Phase)
	}
	return fresh, int(last), m.Raters(), nil
}
