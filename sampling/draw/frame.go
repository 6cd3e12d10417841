package draw

import (
	"slices"
	"sort"
	"strings"
)

// Frame is the population of candidate events, column-oriented so that
// 10^6 rows cost a few slices rather than 10^6 maps. Every column must have
// len(ID) entries. The caller fills it from candidates.parquet or any other
// source; a name present in both Num and Cat is used as categorical.
type Frame struct {
	ID        []string
	Subject   []string
	Recording []string // may be nil
	Num       map[string][]float64
	Cat       map[string][]string
}

// Len returns the number of rows.
func (f *Frame) Len() int { return len(f.ID) }

// Columns returns the sorted names of the numeric and categorical columns.
func (f *Frame) Columns() []string {
	var c []string
	for k := range f.Num {
		c = append(c, k)
	}
	for k := range f.Cat {
		c = append(c, k)
	}
	sort.Strings(c)
	return slices.Compact(c)
}

// Validate checks column lengths and the uniqueness of IDs.
func (f *Frame) Validate() error {
	_, err := f.sortedRows()
	return err
}

// sortedRows checks the frame and returns the row indices in ID order,
// which makes every later step independent of the input row order.
func (f *Frame) sortedRows() ([]int, error) {
	n := len(f.ID)
	if len(f.Subject) != n {
		return nil, &lengthError{Column: "subject", Got: len(f.Subject), Want: n}
	}
	if f.Recording != nil && len(f.Recording) != n {
		return nil, &lengthError{Column: "recording", Got: len(f.Recording), Want: n}
	}
	for _, k := range f.Columns() {
		if c, ok := f.Num[k]; ok && len(c) != n {
			return nil, &lengthError{Column: k, Got: len(c), Want: n}
		}
		if c, ok := f.Cat[k]; ok && len(c) != n {
			return nil, &lengthError{Column: k, Got: len(c), Want: n}
		}
	}
	// Sorting (ID, row) pairs rather than row indices keeps the string
	// headers next to each other: about twice as fast on 10^6 rows.
	type key struct {
		id  string
		row int
	}
	keys := make([]key, n)
	for i, id := range f.ID {
		keys[i] = key{id, i}
	}
	slices.SortFunc(keys, func(a, b key) int {
		if c := strings.Compare(a.id, b.id); c != 0 {
			return c
		}
		return a.row - b.row
	})
	rows := make([]int, n)
	for i, k := range keys {
		rows[i] = k.row
		if i > 0 && k.id == keys[i-1].id {
			return nil, &duplicateIDError{ID: k.id, Row: k.row, Other: keys[i-1].row}
		}
	}
	return rows, nil
}

func (f *Frame) recording(i int) string {
	if f.Recording == nil {
		return ""
	}
	return f.Recording[i]
}
