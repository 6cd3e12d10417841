package importer

import (
	"fmt"
	"path"
	"strings"

	"github.com/quorate-eeg/quorate/sampling/archive"
)

// resolver ties recording keys, as teams write them, to indexed recordings.
type resolver struct {
	recs   []archive.Recording
	byID   map[string]int
	byPath map[string][]int
	byBase map[string][]int // lower-case base name
	byStem map[string][]int // lower-case base name without extension
	byBIDS map[string][]int // BIDS entities of the base name
}

func newResolver(recs []archive.Recording) *resolver {
	r := &resolver{recs: recs, byID: map[string]int{}, byPath: map[string][]int{},
		byBase: map[string][]int{}, byStem: map[string][]int{}, byBIDS: map[string][]int{}}
	for i, rec := range recs {
		r.byID[rec.RecordingID] = i
		p := cleanKey(rec.Path)
		r.byPath[p] = append(r.byPath[p], i)
		b := strings.ToLower(path.Base(p))
		r.byBase[b] = append(r.byBase[b], i)
		s := strings.TrimSuffix(b, path.Ext(b))
		r.byStem[s] = append(r.byStem[s], i)
		if es := bidsEntities(path.Base(p)); len(es) > 0 {
			k := entityString(es)
			r.byBIDS[k] = append(r.byBIDS[k], i)
		}
	}
	return r
}

// cleanKey writes a path with forward slashes and without a leading "./".
func cleanKey(p string) string {
	p = strings.ReplaceAll(strings.TrimSpace(p), `\`, "/")
	return strings.TrimPrefix(path.Clean(p), "./")
}

// find resolves a key, trying in order: the recording_id; the archive-relative path; the
// key's file name against the recordings' file names (case ignored); the same without
// extensions. The first step that matches anything decides: one recording is the
// answer, several are refused as ambiguous. want is empty on success, else what a
// valid key would have been.
func (r *resolver) find(key string) (int, string) {
	key = strings.TrimSpace(key)
	if key == "" {
		return -1, "a recording: a recording_id, an archive-relative path or a file name (the cell is empty)"
	}
	if i, ok := r.byID[key]; ok {
		return i, ""
	}
	p := cleanKey(key)
	b := strings.ToLower(path.Base(p))
	steps := []struct {
		by   string
		hits []int
	}{
		{"archive-relative path", r.byPath[p]},
		{"file name", r.byBase[b]},
		{"file name without extension", r.byStem[strings.TrimSuffix(b, path.Ext(b))]},
	}
	for _, s := range steps {
		switch len(s.hits) {
		case 0:
			continue
		case 1:
			return s.hits[0], ""
		default:
			return -1, fmt.Sprintf("a key naming one recording; by %s it names %s: use the recording_id", s.by, r.ids(s.hits))
		}
	}
	return -1, "a recording_id, archive-relative path or file name of an indexed recording"
}

// findBIDS resolves a BIDS events file to the recording whose file name carries the
// same entities (sub-01_task-rest_events.tsv → sub-01_task-rest_eeg.edf).
func (r *resolver) findBIDS(file string) (int, string) {
	es := bidsEntities(file)
	if len(es) == 0 {
		return -1, "a BIDS file name (sub-<label>_…_events.tsv), a recording column, a recording given for the file or a BIDS mapping"
	}
	k := entityString(es)
	switch hits := r.byBIDS[k]; len(hits) {
	case 0:
		return -1, fmt.Sprintf("an indexed recording named %s_<suffix>.<ext>, a recording column, a recording given for the file or a BIDS mapping for %s", k, k)
	case 1:
		return hits[0], ""
	default:
		return -1, fmt.Sprintf("one recording for %s; it names %s: give a recording for the file or a BIDS mapping", k, r.ids(hits))
	}
}

func (r *resolver) ids(hits []int) string {
	s := make([]string, len(hits))
	for i, h := range hits {
		s[i] = r.recs[h].RecordingID
	}
	return strings.Join(s, ", ")
}
