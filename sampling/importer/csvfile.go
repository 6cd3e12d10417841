package importer

import (
	"fmt"
	"io"
)

// readCSV turns a CSV/TSV event file into events. single fixes every row to one
// recording (index into the recordings, -1 for none), in which case no recording
// column is needed. Row problems become rejections; header problems refuse the file.
func readCSV(r io.Reader, file string, delim rune, m Mapping, single int) ([]event, []Rejection, error) {
	t, err := readTable(r, file, delim)
	if err != nil {
		return nil, nil, err
	}
	onsetName := orDefault(m.Onset, "onset")
	onsetCol, err := t.need(onsetName, "onset")
	if err != nil {
		return nil, nil, err
	}
	recCol := -1
	if single < 0 || m.Recording != "" {
		if recCol, err = t.need(orDefault(m.Recording, "recording"), "recording"); err != nil {
			return nil, nil, err
		}
	}
	chanCol, err := t.optional(m.Channel, "channel", "channel")
	if err != nil {
		return nil, nil, err
	}
	scoreCol, err := t.optional(m.Score, "score", "score")
	if err != nil {
		return nil, nil, err
	}
	var evs []event
	var rej []Rejection
	for _, row := range t.rows {
		if len(row.fields) != len(t.header) {
			rej = append(rej, Rejection{File: file, Line: row.line, Field: "row", Value: fmt.Sprint(len(row.fields), " fields"),
				Want: fmt.Sprintf("%d fields, as in the header", len(t.header))})
			continue
		}
		ev := event{file: file, line: row.line, rec: single,
			onsetField: t.header[onsetCol], onset: cell(row.fields, onsetCol), format: m.OnsetFormat,
			channel: cell(row.fields, chanCol)}
		if isNA(ev.channel) {
			ev.channel = ""
		}
		if recCol >= 0 {
			ev.rec, ev.recField, ev.recKey = -1, t.header[recCol], cell(row.fields, recCol)
		}
		s, ok := parseScore(cell(row.fields, scoreCol))
		if !ok {
			rej = append(rej, Rejection{File: file, Line: row.line, Field: t.header[scoreCol], Value: cell(row.fields, scoreCol),
				Want: "a score: a decimal number (dot separator), empty or n/a"})
			continue
		}
		ev.score = s
		evs = append(evs, ev)
	}
	return evs, rej, nil
}

func orDefault(s, def string) string {
	if s == "" {
		return def
	}
	return s
}
