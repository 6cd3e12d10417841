package tuning

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/quorate-eeg/quorate/panel/consensus"
)

// ReferenceFromPanel maps the panel's overall verdict (consensus.parquet's
// verdict column, read by consensus.ParseVerdict) to a reference:
// "epileptiform" is an IED (1), "not-epileptiform" is not (0), and a tie left
// undetermined or a missing quorum is unknown (−1).
func ReferenceFromPanel(verdict string) int8 {
	d, ok := consensus.ParseVerdict(verdict)
	switch {
	case ok && d == consensus.Present:
		return 1
	case ok && d == consensus.Absent:
		return 0
	}
	return -1
}

// ReferenceFromDS maps a Dawid–Skene posterior probability of an IED to a
// reference by the Bayes rule at ½ (Dawid & Skene 1979, Applied Statistics
// 28:20–28): above ½ is an IED, below is not, and exactly ½ or NaN (no fit)
// is unknown.
func ReferenceFromDS(p float64) int8 {
	switch {
	case math.IsNaN(p) || p == 0.5:
		return -1
	case p > 0.5:
		return 1
	}
	return 0
}

// ReadExternalReference reads a reference standard from a CSV file with a
// header and two columns: event_id,reference or subject_key,reference. A
// reference is 1/0, true/false or ied/not-ied (case-insensitive); an empty
// cell leaves the event unknown. Subject rows apply to every event of that
// subject. eventIDs lists the study's events and subjectOf maps each to its
// subject key. It returns the reference of every event the file names.
//
// Unreadable cells give a *ReferenceError with the row and field; ids that
// match no event (or subject) give an *unknownIDsError listing them.
func ReadExternalReference(path string, eventIDs []string, subjectOf map[string]string) (map[string]int8, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.Size() > MaxReferenceBytes {
		return nil, &ReferenceError{File: path, Field: "file", Msg: fmt.Sprintf("%d bytes, more than the %d a reference table may have", st.Size(), MaxReferenceBytes)}
	}
	r := csv.NewReader(io.LimitReader(f, MaxReferenceBytes))
	r.FieldsPerRecord = -1
	r.TrimLeadingSpace = true
	header, err := r.Read()
	if err != nil {
		return nil, csvError(path, err, "header")
	}
	if len(header) != 2 {
		msg := fmt.Sprintf("%d columns, want 2 separated by commas (event_id,reference or subject_key,reference)", len(header))
		if d := otherDelimiter(header); d != "" {
			msg += "; the header seems separated by " + d + ": save the table as comma-separated CSV"
		}
		return nil, &ReferenceError{File: path, Row: 1, Field: "header", Msg: msg}
	}
	key := strings.ToLower(strings.TrimSpace(strings.TrimPrefix(header[0], "\ufeff")))
	if key != "event_id" && key != "subject_key" {
		return nil, &ReferenceError{File: path, Row: 1, Field: header[0], Msg: `first column must be "event_id" or "subject_key"`}
	}
	if strings.ToLower(strings.TrimSpace(header[1])) != "reference" {
		return nil, &ReferenceError{File: path, Row: 1, Field: header[1], Msg: `second column must be "reference"`}
	}
	known := make(map[string][]string) // id in the key column → event ids
	for _, id := range eventIDs {
		k := id
		if key == "subject_key" {
			k = subjectOf[id]
		}
		known[k] = append(known[k], id)
	}
	out := make(map[string]int8)
	seen := make(map[string]int) // id → row it was given on
	var unknown []string
	for {
		rec, err := r.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(path, err, key)
		}
		row, _ := r.FieldPos(0)
		if len(rec) != 2 {
			return nil, &ReferenceError{File: path, Row: row, Field: key, Msg: fmt.Sprintf("%d fields, want 2", len(rec))}
		}
		id := strings.TrimSpace(rec[0])
		if id == "" {
			return nil, &ReferenceError{File: path, Row: row, Field: key, Msg: "empty id"}
		}
		if prev, dup := seen[id]; dup {
			return nil, &ReferenceError{File: path, Row: row, Field: key, Msg: "id " + id + " already given on row " + strconv.Itoa(prev)}
		}
		seen[id] = row
		v, ok := parseReference(rec[1])
		if !ok {
			return nil, &ReferenceError{File: path, Row: row, Field: "reference", Msg: `want 1/0, true/false or ied/not-ied, got "` + rec[1] + `"`}
		}
		evs, ok := known[id]
		if !ok {
			unknown = append(unknown, id)
			continue
		}
		for _, e := range evs {
			out[e] = v
		}
	}
	if len(unknown) > 0 {
		slices.Sort(unknown)
		return nil, &unknownIDsError{File: path, Column: key, IDs: unknown}
	}
	return out, nil
}

// MaxReferenceBytes bounds an external reference table: one row per event or subject
// is far below it, and a file far larger is not a reference table.
const MaxReferenceBytes = 64 << 20

// otherDelimiter names the separator a one-column header seems to use instead of a
// comma: spreadsheets in many locales save "CSV" with semicolons.
func otherDelimiter(header []string) string {
	if len(header) != 1 {
		return ""
	}
	switch {
	case strings.Contains(header[0], ";"):
		return "semicolons (;)"
	case strings.Contains(header[0], "\t"):
		return "tabs"
	}
	return ""
}

func parseReference(s string) (int8, bool) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "1", "true", "ied":
		return 1, true
	case "0", "false", "not-ied":
		return 0, true
	case "":
		return -1, true
	}
	return 0, false
}

func csvError(path string, err error, field string) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &ReferenceError{File: path, Row: pe.Line, Field: field, Msg: pe.Err.Error()}
	}
	return &ReferenceError{File: path, Field: field, Msg: err.Error()}
}
