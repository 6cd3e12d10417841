package export

import (
	"encoding/csv"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"
)

// cellFormat says how a table is spelled as text: the missing-value mark and how
// list elements are joined.
type cellFormat struct {
	missing string
	listSep string
	// quoteFormulas prefixes text that a spreadsheet would run as a formula
	// (FormulaSafe).
	quoteFormulas bool
}

var (
	csvCells  = cellFormat{missing: "", listSep: ";", quoteFormulas: true}
	bidsCells = cellFormat{missing: "n/a", listSep: ";", quoteFormulas: true}
)

// FormulaSafe returns text that a spreadsheet shows as text: a cell beginning with
// = + - @, a tab or a carriage return is prefixed with a single quote, as the OWASP
// guidance on CSV injection advises (owasp.org, "CSV Injection"). Only text columns
// pass through it; numbers (a negative onset) are written as they are.
func FormulaSafe(s string) string {
	if s != "" && strings.ContainsRune("=+-@\t\r", rune(s[0])) {
		return "'" + s
	}
	return s
}

// cell formats one value. Numbers use the shortest decimal that reads back to the same
// value, with a dot (strconv 'g', −1); NaN is missing.
func (cf cellFormat) cell(v reflect.Value) string {
	if v.Kind() == reflect.Pointer {
		if v.IsNil() {
			return cf.missing
		}
		v = v.Elem()
	}
	if v.Type() == timeType {
		return v.Interface().(interface{ Format(string) string }).Format("2006-01-02")
	}
	switch v.Kind() {
	case reflect.String:
		if cf.quoteFormulas {
			return FormulaSafe(v.String())
		}
		return v.String()
	case reflect.Bool:
		return strconv.FormatBool(v.Bool())
	case reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64, reflect.Int:
		return strconv.FormatInt(v.Int(), 10)
	case reflect.Float32, reflect.Float64:
		f := v.Float()
		if math.IsNaN(f) {
			return cf.missing
		}
		return strconv.FormatFloat(f, 'g', -1, v.Type().Bits())
	case reflect.Slice:
		parts := make([]string, v.Len())
		for i := range parts {
			parts[i] = cf.cell(v.Index(i))
		}
		return strings.Join(parts, cf.listSep)
	}
	panic("export: no text form for " + v.Type().String())
}

// writeCSV writes rows (a slice of a row struct) as RFC 4180 CSV with a header row.
func writeCSV(w io.Writer, rows any) error {
	rv := reflect.ValueOf(rows)
	fs := fieldsOf(rv.Type().Elem())
	cw := csv.NewWriter(w)
	rec := make([]string, len(fs))
	for i, f := range fs {
		rec[i] = f.name
	}
	if err := cw.Write(rec); err != nil {
		return err
	}
	for r := range rv.Len() {
		row := rv.Index(r)
		for i, f := range fs {
			rec[i] = csvCells.cell(row.Field(f.index))
		}
		if err := cw.Write(rec); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
