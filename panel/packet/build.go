package packet

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
)

// Result describes what Build wrote.
type Result struct {
	Manifest Manifest
	Key      []KeyRow
	Packets  []Written
}

// Written is one rater's packet on disk.
type Written struct {
	Rater, Packet string
	Dir           string // OutDir/<rater>
	Page, Sheet   string // paths of review.html and sheet.csv
	PageBytes     int64
}

// Run is the packets stage's entry point: Build(ctx, o.Items, o), or
// Extend(ctx, o.Items, o) when o.Phase is 2 or more.
func Run(ctx context.Context, o Options) (*Result, error) {
	if o.Phase >= 2 {
		return Extend(ctx, o.Items, o)
	}
	return Build(ctx, o.Items, o)
}

// Build writes, under opt.OutDir, one folder per rater holding review.html
// and sheet.csv, plus key.parquet and manifest.json for the coordinator.
// The output depends only on items and opt: equal inputs give equal bytes.
//
// Build checks ctx before it touches OutDir, before each item is encoded and
// before each rater's packet, and returns ctx's error as soon as it is done.
// A Build stopped after it began writing leaves the rater folders written
// so far but no key.parquet or manifest.json (both are written last), so
// the stopped build is never taken for a whole one.
func Build(ctx context.Context, items []Item, opt Options) (*Result, error) {
	if err := validate(items, opt); err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	enc, pm, eventIDs, err := encodeItems(ctx, items, opt)
	if err != nil {
		return nil, err
	}

	// Earlier outputs are moved aside only once the items are encoded, so a
	// stop during encoding leaves them where they were.
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if err := prepareOut(opt); err != nil {
		return nil, err
	}
	out := &Result{Manifest: Manifest{Format: ManifestFormat, Version: 1, Study: opt.StudyID}}
	for r, rater := range opt.Raters {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		pid := PacketID(opt.Secret, opt.StudyID, rater, opt.Seed, eventIDs)
		// One stream per rater, so adding a rater leaves the others' orders alone.
		rng := rand.New(rand.NewPCG(opt.Seed, uint64(r)+1))
		// Codes are unique within a packet.
		err := buildPacket(out, opt, rater, pid, items, enc, pm, filepath.Join(opt.OutDir, rater), rng, map[string]bool{}, 0)
		if err != nil {
			return nil, err
		}
	}
	if err := writeKey(filepath.Join(opt.OutDir, KeyFile), out.Key); err != nil {
		return nil, err
	}
	mb, err := json.MarshalIndent(out.Manifest, "", "  ")
	if err != nil {
		return nil, err
	}
	if err := atomicfile.WriteBytes(filepath.Join(opt.OutDir, ManifestFile), append(mb, '\n'), 0o644); err != nil {
		return nil, err
	}
	return out, nil
}

// encodeItems packs the traces and maps (the same for every rater) and the
// montages of the page.
func encodeItems(ctx context.Context, items []Item, opt Options) ([]pageItem, []pageMontage, []string, error) {
	montages := opt.Montages
	if montages == nil {
		montages = DefaultMontages(items[0].Electrodes)
	}
	// Traces are the same for every rater: encode once.
	res := orDefault(opt.Resolution, DefaultResolution)
	enc := make([]pageItem, len(items))
	eventIDs := make([]string, len(items))
	for i, it := range items {
		if err := ctx.Err(); err != nil {
			return nil, nil, nil, err
		}
		eventIDs[i] = it.EventID
		t := encodeTraces(it.Samples, res)
		from, to := it.RatedFrom, it.RatedTo
		if from == 0 && to == 0 {
			to = float64(len(it.Samples[0])) / it.Rate
		}
		enc[i] = pageItem{Rate: it.Rate, N: len(it.Samples[0]), EventAt: it.EventAt, From: from, To: to, Cond: it.Conditioning, Scale: t.Scale, Traces: t.Data}
		if it.Map.Size > 0 {
			s, v := encodeMap(it.Map.Values)
			pm := &pageMap{Size: it.Map.Size, Scale: s, Values: v, Electrodes: []pageMapElec{}}
			for _, e := range it.Map.Electrodes {
				pm.Electrodes = append(pm.Electrodes, pageMapElec{e.Name, e.X, e.Y})
			}
			enc[i].Map = pm
		}
	}
	pm := make([]pageMontage, len(montages))
	for i, m := range montages {
		pm[i].Name = m.Name
		for _, d := range m.Derivations {
			minus := d.Minus
			if minus == nil {
				minus = []int{}
			}
			pm[i].Derivations = append(pm[i].Derivations, pageDeriv{d.Label, d.Plus, minus})
		}
	}

	return enc, pm, eventIDs, nil
}

// buildPacket writes one rater's packet (review.html and sheet.csv in dir)
// and adds its key rows, manifest entry and Written record to out. Codes
// already in seen are stepped past, and the new codes are added to seen.
func buildPacket(out *Result, opt Options, rater, pid string, items []Item, enc []pageItem, pm []pageMontage,
	dir string, rng *rand.Rand, seen map[string]bool, phase int) error {
	order := drawOrder(len(items), opt.duplicateShare(), rng)
	codes := make([]string, len(order))
	d := pageData{
		Format: PageFormat, Version: 1, Study: opt.StudyID, Packet: pid, Rater: rater,
		Sensitivity: orDefault(opt.Sensitivity, DefaultSensitivity),
		TimeBase:    orDefault(opt.TimeBase, DefaultTimeBase),
		Electrodes:  items[0].Electrodes, Montages: pm, Events: len(items),
	}
	f := opt.filters()
	d.Filters = pageFilters{f.LowHz, f.HighHz, f.NotchHz}
	for k, s := range order {
		var c string
		for attempt := 0; ; attempt++ {
			c = ItemCode(opt.Secret, pid, items[s.item].EventID, s.copy, attempt)
			if !seen[c] {
				break
			}
		}
		seen[c] = true
		codes[k] = c
		pi := enc[s.item]
		pi.Code = c
		d.Items = append(d.Items, pi)
		out.Key = append(out.Key, KeyRow{
			Packet: pid, Rater: rater, Item: c, EventID: items[s.item].EventID,
			Duplicate: s.copy == 1, Position: int32(k + 1), Source: sourceJSON(items[s.item].Source),
		})
	}
	check := CheckValue(opt.Secret, opt.StudyID, pid, rater, codes)
	d.Check = check
	html, err := page(&d)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	w := Written{Rater: rater, Packet: pid, Dir: dir, Page: filepath.Join(dir, PageFile), Sheet: filepath.Join(dir, SheetFile), PageBytes: int64(len(html))}
	if err := atomicfile.WriteBytes(w.Page, html, 0o644); err != nil {
		return err
	}
	if err := atomicfile.WriteBytes(w.Sheet, sheet(pid, check, rater, codes), 0o644); err != nil {
		return err
	}
	out.Packets = append(out.Packets, w)
	out.Manifest.Packets = append(out.Manifest.Packets, ManifestEntry{Packet: pid, Rater: rater, Check: check, Items: codes, Phase: phase})
	return nil
}

// prepareOut refuses, or with Replace moves aside, every output that exists.
func prepareOut(opt Options) error {
	if err := os.MkdirAll(opt.OutDir, 0o755); err != nil {
		return err
	}
	names := append([]string{KeyFile, ManifestFile}, opt.Raters...)
	var existing []string
	for _, n := range names {
		p := filepath.Join(opt.OutDir, n)
		if _, err := os.Lstat(p); err == nil {
			existing = append(existing, p)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return err
		}
	}
	if len(existing) > 0 && !opt.Replace {
		return &ExistsError{Path: existing[0]}
	}
	for _, p := range existing {
		if err := moveAside(p); err != nil {
			return err
		}
	}
	return nil
}

// moveAside renames p to the first free p.replaced-<n>, n from 1, keeping it.
func moveAside(p string) error {
	for n := 1; ; n++ {
		dst := fmt.Sprintf("%s.replaced-%d", p, n)
		if _, err := os.Lstat(dst); errors.Is(err, fs.ErrNotExist) {
			return os.Rename(p, dst)
		}
	}
}

func validate(items []Item, opt Options) error {
	optErr := func(field, reason string) error { return &InputError{Item: -1, Field: field, Reason: reason} }
	switch {
	case len(items) == 0:
		return optErr("items", "no items")
	case opt.StudyID == "" || len(opt.StudyID) > 64 || strings.ContainsFunc(opt.StudyID, func(r rune) bool { return r < ' ' || r == 0x7f }):
		return optErr("StudyID", "want 1–64 printable characters")
	case len(opt.Secret) < 16:
		return optErr("Secret", "want at least 16 bytes")
	case len(opt.Raters) == 0:
		return optErr("Raters", "no raters")
	case len(opt.Raters) > MaxRaters:
		return optErr("Raters", fmt.Sprintf("%d raters, at most %d", len(opt.Raters), MaxRaters))
	case opt.DuplicateShare > 0.5 || math.IsNaN(opt.DuplicateShare):
		return optErr("DuplicateShare", "want at most 0.5")
	case opt.Resolution < 0 || opt.Sensitivity < 0 || opt.TimeBase < 0:
		return optErr("Resolution/Sensitivity/TimeBase", "must not be negative")
	case opt.Filters != nil && (opt.Filters.LowHz < 0 || opt.Filters.HighHz < 0 || (opt.Filters.HighHz > 0 && opt.Filters.HighHz <= opt.Filters.LowHz) ||
		(opt.Filters.NotchHz != 0 && opt.Filters.NotchHz != 50 && opt.Filters.NotchHz != 60)):
		return optErr("Filters", "want low ≥ 0, high 0 (off) or above low, notch 0, 50 or 60 Hz")
	case opt.OutDir == "":
		return optErr("OutDir", "empty")
	}
	seen := map[string]bool{}
	for _, r := range opt.Raters {
		if !SafeName(r) {
			return optErr("Raters", fmt.Sprintf("%q is not a safe folder name ([A-Za-z0-9._-], 1–40 characters, not starting with a dot)", r))
		}
		if strings.HasPrefix(strings.ToLower(r), KeyFile) || strings.HasPrefix(strings.ToLower(r), ManifestFile) {
			return optErr("Raters", fmt.Sprintf("%q clashes with a coordinator file", r))
		}
		if seen[strings.ToLower(r)] {
			return optErr("Raters", fmt.Sprintf("%q given twice (names are compared ignoring case)", r))
		}
		seen[strings.ToLower(r)] = true
	}
	ids := map[string]bool{}
	nel := len(items[0].Electrodes)
	for i, it := range items {
		e := func(field, reason string) error { return &InputError{Item: i, Field: field, Reason: reason} }
		switch {
		case it.EventID == "":
			return e("EventID", "empty")
		case ids[it.EventID]:
			return e("EventID", fmt.Sprintf("%q given twice", it.EventID))
		case !(it.Rate > 0) || math.IsInf(it.Rate, 0):
			return e("Rate", "want a positive rate")
		case len(it.Electrodes) == 0:
			return e("Electrodes", "none")
		case !equalStrings(it.Electrodes, items[0].Electrodes):
			return e("Electrodes", "differ from item 0; every item must share one list")
		case len(it.Samples) != len(it.Electrodes):
			return e("Samples", fmt.Sprintf("%d traces for %d electrodes", len(it.Samples), len(it.Electrodes)))
		case len(it.Samples[0]) == 0:
			return e("Samples", "empty traces")
		case !(it.EventAt >= 0) || it.EventAt > float64(len(it.Samples[0]))/it.Rate:
			return e("EventAt", "outside the window")
		case it.RatedFrom < 0 || it.RatedTo < it.RatedFrom || it.RatedTo > float64(len(it.Samples[0]))/it.Rate+1e-9 || math.IsNaN(it.RatedFrom+it.RatedTo):
			return e("RatedFrom/RatedTo", "want 0 ≤ RatedFrom ≤ RatedTo ≤ the excerpt's duration")
		case it.Map.Size < 0 || len(it.Map.Values) != it.Map.Size*it.Map.Size:
			return e("Map", fmt.Sprintf("%d values for a %d×%d grid", len(it.Map.Values), it.Map.Size, it.Map.Size))
		}
		ids[it.EventID] = true
		for c, ch := range it.Samples {
			if len(ch) != len(it.Samples[0]) {
				return e(fmt.Sprintf("Samples[%d]", c), "length differs from Samples[0]")
			}
			for k, v := range ch {
				if math.IsNaN(float64(v)) || math.IsInf(float64(v), 0) {
					return e(fmt.Sprintf("Samples[%d][%d]", c, k), "not finite")
				}
			}
		}
	}
	for mi, m := range opt.Montages {
		for di, d := range m.Derivations {
			for _, x := range append([]int{d.Plus}, d.Minus...) {
				if x < 0 || x >= nel {
					return optErr(fmt.Sprintf("Montages[%d].Derivations[%d]", mi, di), fmt.Sprintf("electrode index %d outside 0..%d", x, nel-1))
				}
			}
		}
	}
	return nil
}

// SafeName reports whether s is usable as a rater folder name on every
// common file system: [A-Za-z0-9._-], 1–40 characters, not starting with a dot.
func SafeName(s string) bool {
	if len(s) == 0 || len(s) > 40 || s[0] == '.' {
		return false
	}
	for _, r := range s {
		ok := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '.' || r == '_' || r == '-'
		if !ok {
			return false
		}
	}
	return true
}

func equalStrings(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}
