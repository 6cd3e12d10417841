package returns

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"slices"
	"strings"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// requiredColumns must be in a sheet; confidence and comment may be dropped.
var requiredColumns = []string{"packet", "check", "rater", "item", "c1", "c2", "c3", "c4", "c5", "c6", "verdict"}

// Spreadsheet users type answers by hand, so cells are trimmed, compared
// ignoring case, and these short forms are accepted (FORMAT.md lists them).
// For a criterion yes/no say whether it is present; for the verdict "yes"
// is deliberately not accepted, since "n"/"no" must then mean
// not-epileptiform and a bare "y"/"yes" reads too easily as "yes, judged".
var (
	cannotJudgeAlias = map[string]string{"cannot-judge": "cannot-judge", "cannot judge": "cannot-judge", "cj": "cannot-judge", "?": "cannot-judge"}
	presenceAlias    = withAlias(map[string]string{"present": "present", "p": "present", "yes": "present", "y": "present", "1": "present",
		"absent": "absent", "a": "absent", "no": "absent", "n": "absent", "0": "absent"}, cannotJudgeAlias)
	verdictAlias = withAlias(map[string]string{"epileptiform": "epileptiform", "e": "epileptiform",
		"not-epileptiform": "not-epileptiform", "not epileptiform": "not-epileptiform", "n": "not-epileptiform", "ne": "not-epileptiform"}, cannotJudgeAlias)
)

func withAlias(m, more map[string]string) map[string]string {
	for k, v := range more {
		m[k] = v
	}
	return m
}

// sniffSeparator picks the field separator of a sheet from its header line
// (the first line that is neither blank nor a comment line): the most
// frequent of comma, semicolon and tab outside quotes. Spreadsheets in
// locales with a decimal comma save CSV with semicolons; exported tables
// often use tabs.
func sniffSeparator(data []byte) rune {
	for line := range bytes.Lines(data) {
		if commentLine(line) || len(bytes.TrimSpace(line)) == 0 {
			continue
		}
		n := map[rune]int{}
		quoted := false
		for _, c := range string(line) {
			switch {
			case c == '"':
				quoted = !quoted
			case !quoted && (c == ',' || c == ';' || c == '\t'):
				n[c]++
			}
		}
		best := ','
		for _, c := range []rune{';', '\t'} {
			if n[c] > n[best] {
				best = c
			}
		}
		return best
	}
	return ','
}

// readCSV extracts a filled sheet (RFC 4180; encoding/csv). Columns are
// matched by header name in any order; the packet, check and rater repeated
// on each row must agree across rows.
func readCSV(data []byte, add func(int, string, string, string)) (h head, out []raw) {
	r := csv.NewReader(bytes.NewReader(data))
	r.FieldsPerRecord = -1
	r.Comma = sniffSeparator(data)
	r.Comment = '#' // the sheet's header lines listing the allowed values
	var col map[string]int
	var header []string
	firstRow := map[string]int{}
	for errs := 0; errs < 50; {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		var pe *csv.ParseError
		if errors.As(err, &pe) {
			add(pe.StartLine, fmt.Sprintf("column %d", pe.Column), pe.Err.Error(), "well-formed CSV (RFC 4180)")
			errs++
			continue
		} else if err != nil {
			add(0, "(csv)", err.Error(), "well-formed CSV")
			return h, out
		}
		line, _ := r.FieldPos(0)
		if commentRecord(rec) {
			continue // a comment line as a spreadsheet saves it: quoted, padded with empty cells
		}
		if col == nil {
			header = rec
			col = readHeader(rec, line, add)
			if col == nil {
				return h, nil
			}
			continue
		}
		if blankRecord(rec) {
			continue // spreadsheets append empty rows
		}
		if len(rec) != len(header) {
			add(line, "", fmt.Sprintf("%d fields", len(rec)), fmt.Sprintf("%d fields, as in the header", len(header)))
			continue
		}
		cell := func(name string) string {
			if i, ok := col[name]; ok {
				return strings.TrimSpace(rec[i])
			}
			return ""
		}
		for _, f := range []struct {
			name string
			dst  *string
		}{{"packet", &h.packet}, {"check", &h.check}, {"rater", &h.rater}} {
			v := cell(f.name)
			switch {
			case firstRow[f.name] == 0:
				*f.dst, firstRow[f.name] = v, line
			case v != *f.dst:
				add(line, f.name, v, fmt.Sprintf("%q as on row %d: one sheet per packet", *f.dst, firstRow[f.name]))
			}
		}
		a := raw{row: line, itemPath: "item", item: strings.ToUpper(cell("item")), comment: cell("comment"), conf: cell("confidence")}
		for k := range a.crit {
			a.crit[k] = normalise(cell(fmt.Sprintf("c%d", k+1)), presenceAlias)
		}
		a.verdict = normalise(cell("verdict"), verdictAlias)
		out = append(out, a)
	}
	switch {
	case col == nil:
		add(1, "", "no header row", "the header "+strings.Join(packet.SheetColumns, ","))
	case len(firstRow) == 0:
		add(0, "", "a header and no rows", "one row per item code, as in the sheet sent out")
	case h.packet == "":
		add(firstRow["packet"], "packet", "", "the packet id printed in the sheet")
	}
	return h, out
}

func readHeader(rec []string, line int, add func(int, string, string, string)) map[string]int {
	col := map[string]int{}
	bad := false
	for i, name := range rec {
		n := strings.ToLower(strings.TrimSpace(name))
		switch {
		case !slices.Contains(packet.SheetColumns, n):
			add(line, fmt.Sprintf("column %d", i+1), name, "a known column, "+listed(packet.SheetColumns)+" (extra columns are refused so that no answer is silently dropped)")
			bad = true
		case hasKey(col, n):
			add(line, fmt.Sprintf("column %d", i+1), name, "each column once")
			bad = true
		default:
			col[n] = i
		}
	}
	for _, n := range requiredColumns {
		if !hasKey(col, n) {
			add(line, n, "no such column", "the column "+n)
			bad = true
		}
	}
	if bad {
		return nil
	}
	return col
}

func hasKey(m map[string]int, k string) bool {
	_, ok := m[k]
	return ok
}

// commentLine reports whether a line of the sheet is one of its comment
// lines: '#' first, after blanks and an opening quote (a spreadsheet quotes a
// cell that holds its separator).
func commentLine(line []byte) bool {
	l := bytes.TrimLeft(line, " \t")
	l = bytes.TrimPrefix(l, []byte(`"`))
	return bytes.HasPrefix(l, []byte("#"))
}

// commentRecord reports whether a record is a comment line that a
// spreadsheet re-saved: its first cell starts with '#' and every other cell
// is empty. (Unquoted '#' lines never reach here: the reader skips them.)
func commentRecord(rec []string) bool {
	return len(rec) > 0 && strings.HasPrefix(strings.TrimSpace(rec[0]), "#") && blankRecord(rec[1:])
}

func blankRecord(rec []string) bool {
	for _, c := range rec {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

// normalise maps a hand-typed cell to its canonical value; an unknown value
// is passed on unchanged so the checker reports it as typed.
func normalise(v string, alias map[string]string) string {
	if c, ok := alias[strings.ToLower(v)]; ok {
		return c
	}
	return v
}
