package importer

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
)

// maxTableBytes bounds an imported events table, which is read whole: ten million
// events of a hundred bytes each fit.
var maxTableBytes = 1 << 30

// table is a delimited file read whole: the header and each row with its line.
type table struct {
	file   string
	header []string
	rows   []tableRow
}

type tableRow struct {
	line   int
	fields []string
}

// sniffDelimiter picks, among comma, tab and semicolon, the one that occurs most often
// outside double quotes in the header line; ties go to tab, then comma, then semicolon
// (common practice). Zero means none occurs: the header is a single column.
func sniffDelimiter(header []byte) rune {
	var nTab, nComma, nSemi int
	quoted := false
	for _, c := range header {
		switch c {
		case '"':
			quoted = !quoted
		case '\t':
			if !quoted {
				nTab++
			}
		case ',':
			if !quoted {
				nComma++
			}
		case ';':
			if !quoted {
				nSemi++
			}
		}
	}
	switch {
	case nTab == 0 && nComma == 0 && nSemi == 0:
		return 0
	case nTab >= nComma && nTab >= nSemi:
		return '\t'
	case nComma >= nSemi:
		return ','
	}
	return ';'
}

// readTable reads a delimited file with a header line. Quoting follows RFC 4180 (a
// field in double quotes may hold the delimiter, line breaks and doubled quotes), read
// leniently so a stray quote inside an unquoted field is kept as text. delim 0 sniffs
// the delimiter from the header line. Fields are trimmed of surrounding spaces; a
// byte-order mark before the header is dropped.
func readTable(r io.Reader, file string, delim rune) (*table, error) {
	data, err := io.ReadAll(io.LimitReader(r, int64(maxTableBytes)+1))
	if err != nil {
		return nil, &readError{File: file, Err: err}
	}
	if len(data) > maxTableBytes {
		return nil, &readError{File: file, Err: fmt.Errorf("more than %d bytes: split the table, or import one detector run at a time", maxTableBytes)}
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if delim == 0 {
		first, _, _ := bytes.Cut(data, []byte("\n"))
		if delim = sniffDelimiter(first); delim == 0 {
			delim = ','
		}
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = delim
	cr.LazyQuotes = true
	cr.FieldsPerRecord = -1
	t := &table{file: file}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			var pe *csv.ParseError
			line := 0
			if errors.As(err, &pe) {
				line, err = pe.StartLine, pe.Err
			}
			return nil, &readError{File: file, Line: line, Err: err}
		}
		line, _ := cr.FieldPos(0)
		for i := range rec {
			rec[i] = strings.TrimSpace(rec[i])
		}
		if t.header == nil {
			t.header = rec
			continue
		}
		t.rows = append(t.rows, tableRow{line: line, fields: rec})
	}
	if t.header == nil {
		return nil, &readError{File: file, Err: errors.New("empty file: want a header line")}
	}
	return t, nil
}

// column finds a header cell by name, ignoring case; -1 when absent. A name that occurs
// twice is a *columnError, since either could be meant.
func (t *table) column(name string) (int, error) {
	at := -1
	for i, h := range t.header {
		if strings.EqualFold(h, strings.TrimSpace(name)) {
			if at >= 0 {
				return -1, &columnError{File: t.file, Column: name,
					Want: fmt.Sprintf("one column of that name, found columns %d and %d", at+1, i+1)}
			}
			at = i
		}
	}
	return at, nil
}

// need is column for a column the caller cannot do without.
func (t *table) need(name, role string) (int, error) {
	i, err := t.column(name)
	if err == nil && i < 0 {
		err = &columnError{File: t.file, Column: name,
			Want: fmt.Sprintf("a %s column; the header has %s", role, strings.Join(quoteAll(t.header), ", "))}
	}
	return i, err
}

// optional is column for a column used when present; named says the user asked for it
// by name, which makes it required.
func (t *table) optional(name, def, role string) (int, error) {
	if name != "" {
		return t.need(name, role)
	}
	return t.column(def)
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, x := range s {
		out[i] = fmt.Sprintf("%q", x)
	}
	return out
}

// isNA reports a missing value: empty, or BIDS's "n/a".
func isNA(s string) bool { return s == "" || strings.EqualFold(s, "n/a") }
