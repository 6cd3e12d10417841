package packet

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math/rand/v2"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// PhaseDir is the folder, inside a rater's folder, of the packet Extend
// builds for draw phase n (n ≥ 2): "phase-<n>". The first build's packet
// stays at the top of the rater's folder.
func PhaseDir(n int) string { return "phase-" + strconv.Itoa(n) }

// ErrNoPackets is returned by Extend when OutDir holds no key and manifest
// to extend.
var ErrNoPackets = errors.New("packet: no packets to extend")

// Covered returns the events the packets of m show: the event ids of the key
// rows whose packet m lists. Rows of a packet m does not list (left by an
// Extend stopped between writing the key and the manifest) do not count.
func Covered(m *Manifest, key []KeyRow) map[string]bool {
	listed := make(map[string]bool, len(m.Packets))
	for _, p := range m.Packets {
		listed[p.Packet] = true
	}
	out := map[string]bool{}
	for _, k := range key {
		if listed[k.Packet] {
			out[k.EventID] = true
		}
	}
	return out
}

// Raters returns the raters of m's packets in the order of their first packet.
func (m *Manifest) Raters() []string {
	var out []string
	for _, p := range m.Packets {
		if !slices.Contains(out, p.Rater) {
			out = append(out, p.Rater)
		}
	}
	return out
}

// Extend adds one packet per rater for items, the events a later phase of
// the draw added (a two-phase design: Särndal, Swensson & Wretman 1992,
// Model Assisted Survey Sampling, ch. 9), to the packets already in
// opt.OutDir, leaving every earlier packet, key row and manifest entry as it
// was, so answers already returned for them keep counting.
//
// opt.Phase (≥ 2) names the phase; rater R's new packet is written to
// OutDir/R/phase-<Phase>/ (review.html and sheet.csv). Its packet id is
// PacketID over the new events only, so it differs from every earlier id;
// its order and hidden duplicates are drawn among the new events from a
// stream of its own (seed, phase, rater). Codes are unique across all
// packets, old and new: a code already used anywhere is stepped past as a
// collision within one packet is. opt.Raters must be the raters of the
// existing packets (any order; the manifest's order is used), because a
// later phase is rated by the same panel; no item may be an event an
// existing packet shows. opt.Replace is ignored.
//
// The key is rewritten with the earlier rows first, unchanged, and the new
// rows after; the manifest likewise with the new entries appended. Both are
// written last and atomically (key first): a stopped Extend leaves the
// earlier packets valid, and running it again rebuilds the same new packets.
// Result.Key and Result.Packets hold the new rows and packets only;
// Result.Manifest is the whole manifest as written.
func Extend(ctx context.Context, items []Item, opt Options) (*Result, error) {
	if err := validate(items, opt); err != nil {
		return nil, err
	}
	if opt.Phase < 2 {
		return nil, &InputError{Item: -1, Field: "Phase", Reason: fmt.Sprintf("%d; a later phase is 2 or more", opt.Phase)}
	}
	keyPath, manPath := filepath.Join(opt.OutDir, KeyFile), filepath.Join(opt.OutDir, ManifestFile)
	m, err := ReadManifest(manPath)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("%w: %s is missing", ErrNoPackets, manPath)
	}
	if err != nil {
		return nil, err
	}
	key, err := ReadKey(keyPath)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, fmt.Errorf("%w: %s is missing", ErrNoPackets, keyPath)
	}
	if err != nil {
		return nil, err
	}
	if m.Study != opt.StudyID {
		return nil, fmt.Errorf("packet: %s belongs to study %q, not %q", manPath, m.Study, opt.StudyID)
	}
	raters := m.Raters()
	if a, b := slices.Sorted(slices.Values(raters)), slices.Sorted(slices.Values(opt.Raters)); !slices.Equal(a, b) {
		return nil, &InputError{Item: -1, Field: "Raters", Reason: fmt.Sprintf("the packets in %s go to %s; a later phase goes to the same panel (got %s)",
			opt.OutDir, strings.Join(raters, ", "), strings.Join(opt.Raters, ", "))}
	}
	// Keep only the rows of listed packets: others are an interrupted Extend's.
	listed := map[string]bool{}
	for _, p := range m.Packets {
		listed[p.Packet] = true
		if p.Phase == opt.Phase {
			return nil, &InputError{Item: -1, Field: "Phase", Reason: fmt.Sprintf("packet %s already covers phase %d", p.Packet, p.Phase)}
		}
	}
	kept := key[:0:0]
	seen := map[string]bool{}
	for _, k := range key {
		if listed[k.Packet] {
			kept = append(kept, k)
			seen[k.Item] = true
		}
	}
	covered := Covered(m, kept)
	for i, it := range items {
		if covered[it.EventID] {
			return nil, &InputError{Item: i, Field: "EventID", Reason: fmt.Sprintf("%q is already in a packet of %s", it.EventID, opt.OutDir)}
		}
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	enc, pm, eventIDs, err := encodeItems(ctx, items, opt)
	if err != nil {
		return nil, err
	}
	out := &Result{Manifest: *m}
	out.Manifest.Packets = slices.Clone(m.Packets)
	for r, rater := range raters {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		pid := PacketID(opt.Secret, opt.StudyID, rater, opt.Seed, eventIDs)
		if listed[pid] {
			return nil, fmt.Errorf("packet: the new packet id %s of %s is already in %s; build with another seed", pid, rater, manPath)
		}
		// A stream per phase and rater, apart from the first build's streams (phase 0).
		rng := rand.New(rand.NewPCG(opt.Seed, uint64(opt.Phase)<<32|uint64(r)+1))
		dir := filepath.Join(opt.OutDir, rater, PhaseDir(opt.Phase))
		if err := buildPacket(out, opt, rater, pid, items, enc, pm, dir, rng, seen, opt.Phase); err != nil {
			return nil, err
		}
	}
	if err := writeKey(keyPath, append(slices.Clone(kept), out.Key...)); err != nil {
		return nil, err
	}
	mb, err := json.MarshalIndent(out.Manifest, "", "  ")
	if err != nil {
		return nil, err
	}
	if err := atomicfile.WriteBytes(manPath, append(mb, '\n'), 0o644); err != nil {
		return nil, err
	}
	return out, nil
}
