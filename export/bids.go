package export

import (
	"encoding/json"
	"fmt"
	"io"
	"path"
	"path/filepath"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/quorate-eeg/quorate/internal/atomicfile"
	"github.com/quorate-eeg/quorate/sampling/archive"
	"github.com/quorate-eeg/quorate/sampling/edf"
)

// The BIDS layout (BIDS specification v1.9.0; EEG: Pernet et al. 2019, Scientific Data
// 6:103). The export is a derivative dataset: it holds labels and tables derived from
// the recordings, not the recordings themselves, and a raw BIDS dataset must hold its
// data files (BIDS specification, "Dataset description": DatasetType; derivatives
// require GeneratedBy).
const (
	BIDSVersion = "1.9.0"
	BIDSTask    = "clinical"
)

// File names the BIDS specification fixes at the top of a dataset ("Modality agnostic
// files").
const (
	DatasetDescriptionFile = "dataset_description.json"
	ParticipantsFile       = "participants.tsv"
	ParticipantsJSON       = "participants.json"
)

// BIDSLabel makes a BIDS label from a subject key: labels may hold only letters and
// digits (BIDS specification, "Common principles": entity labels are alphanumeric).
func BIDSLabel(subjectKey string) string {
	s := strings.TrimPrefix(subjectKey, "sub-")
	var b strings.Builder
	for _, r := range s {
		if r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' {
			b.WriteRune(r)
		}
	}
	return b.String()
}

// bidsEventColumns are the events.tsv columns: onset and duration first, as the
// specification requires, then trial_type, then the events table without onset_s and
// kind (which onset and trial_type carry).
func bidsEventTable() Table {
	t := Table{Name: "bids-events", File: "sub-<label>/eeg/sub-<label>_task-" + BIDSTask + "_run-<n>_events.tsv",
		Description: "BIDS events file of one recording: one row per drawn event in it, ordered by onset."}
	t.Columns = []Column{
		{Name: "onset", Type: "float64", Unit: "s", Description: bidsEventExtra["onset"].desc},
		{Name: "duration", Type: "float64", Nullable: true, Unit: "s", Description: bidsEventExtra["duration"].desc},
		{Name: "trial_type", Type: "string", Description: bidsEventExtra["trial_type"].desc, Levels: bidsEventExtra["trial_type"].levels},
	}
	for _, c := range describe("", "", "", reflect.TypeFor[EventRow](), eventDocs).Columns {
		if c.Name != "onset_s" && c.Name != "kind" {
			t.Columns = append(t.Columns, c)
		}
	}
	return t
}

func bidsChannelTable() Table {
	t := Table{Name: "bids-channels", File: "sub-<label>/eeg/sub-<label>_task-" + BIDSTask + "_run-<n>_channels.tsv",
		Description: "BIDS channels file of one recording."}
	for _, n := range []string{"name", "type", "units", "sampling_frequency", "status"} {
		d := bidsChannelDocs[n]
		typ := "string"
		if n == "sampling_frequency" {
			typ = "float64"
		}
		t.Columns = append(t.Columns, Column{Name: n, Type: typ, Nullable: n != "name" && n != "type",
			Unit: d.unit, Description: d.desc, Levels: d.levels})
	}
	return t
}

func bidsParticipantTable() Table {
	t := Table{Name: "bids-participants", File: ParticipantsFile, Description: "One row per subject with drawn events."}
	for _, n := range []string{"participant_id", "subject_key"} {
		t.Columns = append(t.Columns, Column{Name: n, Type: "string", Description: bidsParticipantDocs[n].desc})
	}
	return t
}

// BIDSTables documents the tab-separated tables of the BIDS export.
func BIDSTables(epochs bool) []Table {
	ts := []Table{bidsEventTable(), bidsChannelTable(), bidsParticipantTable()}
	if epochs {
		ts = append(ts, epochTable())
	}
	return ts
}

var oneLine = strings.NewReplacer("\t", " ", "\n", " ", "\r", " ")

// tsvCell keeps a value on one line of one cell: BIDS TSV has no quoting.
func tsvCell(s string) string {
	if s == "" {
		return "n/a"
	}
	if strings.ContainsAny(s, "\t\n\r") {
		return oneLine.Replace(s)
	}
	return s
}

func writeTSV(w io.Writer, header []string, rows [][]string) error {
	var b strings.Builder
	b.WriteString(strings.Join(header, "\t"))
	b.WriteByte('\n')
	for _, r := range rows {
		for i, c := range r {
			if i > 0 {
				b.WriteByte('\t')
			}
			b.WriteString(tsvCell(c))
		}
		b.WriteByte('\n')
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// bidsRun names one recording in the BIDS tree.
type bidsRun struct {
	rec   *archive.Recording
	label string
	run   int
}

func (b bidsRun) stem() string {
	return fmt.Sprintf("sub-%s/eeg/sub-%s_task-%s_run-%d", b.label, b.label, BIDSTask, b.run)
}

// bidsRuns numbers each subject's recordings 1, 2, … in order of start time (then id),
// counting every indexed recording so that a run number does not depend on the draw.
func bidsRuns(recs []archive.Recording) map[string]bidsRun {
	by := map[string][]*archive.Recording{}
	for i := range recs {
		by[recs[i].SubjectKey] = append(by[recs[i].SubjectKey], &recs[i])
	}
	out := map[string]bidsRun{}
	for key, rs := range by {
		sort.Slice(rs, func(i, j int) bool {
			if !rs[i].StartTime.Equal(rs[j].StartTime) {
				return rs[i].StartTime.Before(rs[j].StartTime)
			}
			return rs[i].RecordingID < rs[j].RecordingID
		})
		for i, r := range rs {
			out[r.RecordingID] = bidsRun{rec: r, label: BIDSLabel(key), run: i + 1}
		}
	}
	return out
}

// writeBIDS writes the BIDS tree under dir and returns the files written (relative,
// slash-separated).
func writeBIDS(dir string, o *Options, events []EventRow) ([]string, error) {
	var files []string
	put := func(rel string, fn func(io.Writer) error) error {
		files = append(files, rel)
		return atomicfile.Write(filepath.Join(dir, filepath.FromSlash(rel)), 0o644, fn)
	}
	putJSON := func(rel string, v any) error {
		return put(rel, func(w io.Writer) error {
			enc := json.NewEncoder(w)
			enc.SetIndent("", "  ")
			return enc.Encode(v)
		})
	}
	desc := map[string]any{
		"Name":        "quorate reference set of candidate interictal epileptiform discharges",
		"BIDSVersion": BIDSVersion,
		"DatasetType": "derivative",
		"GeneratedBy": []map[string]string{{"Name": "quorate",
			"Description": "Expert-panel labels, detector features and design weights of drawn sharp transients."}},
	}
	if err := putJSON(DatasetDescriptionFile, desc); err != nil {
		return nil, err
	}
	if err := put(".bidsignore", func(w io.Writer) error {
		_, err := io.WriteString(w, DictionaryMD+"\n"+DictionaryJSON+"\n"+EpochsFile+"\n")
		return err
	}); err != nil {
		return nil, err
	}
	et := bidsEventTable()
	sidecar := map[string]map[string]any{}
	for _, c := range et.Columns {
		m := map[string]any{"LongName": strings.ReplaceAll(c.Name, "_", " "), "Description": c.Description}
		if c.Unit != "" {
			m["Units"] = c.Unit
		}
		if len(c.Levels) > 0 {
			m["Levels"] = c.Levels
		}
		sidecar[c.Name] = m
	}
	// One sidecar at the top applies to every run (BIDS inheritance principle).
	if err := putJSON("task-"+BIDSTask+"_events.json", sidecar); err != nil {
		return nil, err
	}

	runs := bidsRuns(o.Recordings)
	byRec := map[string][]*EventRow{}
	for i := range events {
		byRec[events[i].RecordingID] = append(byRec[events[i].RecordingID], &events[i])
	}
	recIDs := make([]string, 0, len(byRec))
	for id := range byRec {
		recIDs = append(recIDs, id)
	}
	sort.Strings(recIDs)
	subjects := map[string]string{}
	fs := fieldsOf(reflect.TypeFor[EventRow]())
	for _, id := range recIDs {
		br := runs[id]
		subjects[br.label] = br.rec.SubjectKey
		evs := byRec[id]
		sort.SliceStable(evs, func(i, j int) bool { return evs[i].OnsetS < evs[j].OnsetS })
		header := make([]string, len(et.Columns))
		for i, c := range et.Columns {
			header[i] = c.Name
		}
		rows := make([][]string, len(evs))
		for i, e := range evs {
			dur := "0" // an impulse at the peak
			if e.Kind == "control" {
				dur = ""
			}
			row := []string{strconv.FormatFloat(e.OnsetS, 'g', -1, 64), dur, e.Kind}
			v := reflect.ValueOf(e).Elem()
			for _, f := range fs {
				if f.name != "onset_s" && f.name != "kind" {
					row = append(row, bidsCells.cell(v.Field(f.index)))
				}
			}
			rows[i] = row
		}
		if err := put(br.stem()+"_events.tsv", func(w io.Writer) error { return writeTSV(w, header, rows) }); err != nil {
			return nil, err
		}
		chans := bidsChannels(o, br.rec)
		if err := put(br.stem()+"_channels.tsv", func(w io.Writer) error {
			return writeTSV(w, []string{"name", "type", "units", "sampling_frequency", "status"}, chans)
		}); err != nil {
			return nil, err
		}
	}
	labels := make([]string, 0, len(subjects))
	for l := range subjects {
		labels = append(labels, l)
	}
	sort.Strings(labels)
	var prows [][]string
	for _, l := range labels {
		prows = append(prows, []string{"sub-" + l, subjects[l]})
	}
	if err := put(ParticipantsFile, func(w io.Writer) error {
		return writeTSV(w, []string{"participant_id", "subject_key"}, prows)
	}); err != nil {
		return nil, err
	}
	pj := map[string]map[string]string{}
	for _, c := range bidsParticipantTable().Columns {
		pj[c.Name] = map[string]string{"Description": c.Description}
	}
	if err := putJSON(ParticipantsJSON, pj); err != nil {
		return nil, err
	}
	sort.Strings(files)
	return files, nil
}

// bidsTypes maps channel kinds to BIDS EEG channel types.
var bidsTypes = map[edf.ChannelKind]string{edf.EEG: "EEG", edf.ECG: "ECG", edf.EOG: "EOG", edf.EMG: "EMG", edf.Photic: "TRIG"}

// bidsChannels lists a recording's channels from its header when the archive is at
// hand, otherwise its indexed EEG channels with unknown units. Status is not assessed
// here, so it is n/a.
func bidsChannels(o *Options, rec *archive.Recording) [][]string {
	if int(rec.Root) >= 0 && int(rec.Root) < len(o.ArchiveRoots) {
		if r, err := edf.Open(filepath.Join(o.ArchiveRoots[rec.Root], filepath.FromSlash(path.Clean(rec.Path)))); err == nil {
			defer r.Close()
			h := r.Header()
			var rows [][]string
			terms := h.TermSignals()
			for i := range h.Signals {
				s := &h.Signals[i]
				if s.IsAnnotation() {
					continue
				}
				typ, ok := bidsTypes[s.Kind]
				if !ok {
					typ = "MISC"
				}
				if slices.Contains(terms, i) {
					typ = "EEG" // a bipolar derivation of scalp electrodes
				}
				rows = append(rows, []string{s.Name, typ, s.PhysDim,
					strconv.FormatFloat(s.SampleRate(h.RecordDuration), 'g', -1, 64), ""})
			}
			return rows
		}
	}
	rate := ""
	if len(rec.SampleRatesHz) == 1 {
		rate = strconv.FormatFloat(rec.SampleRatesHz[0], 'g', -1, 64)
	}
	rows := make([][]string, len(rec.EEGChannels))
	for i, c := range rec.EEGChannels {
		rows[i] = []string{c, "EEG", "", rate, ""}
	}
	return rows
}
