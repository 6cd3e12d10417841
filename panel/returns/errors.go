package returns

import (
	"fmt"
	"strings"
)

// Error lists every problem found in one returned file.
type Error struct {
	File     string
	Problems []Problem
}

// Problem is one thing wrong in a return. Row is the 1-based line of a CSV
// record (the header is row 1) or the 1-based index of a JSON answer; 0
// means the whole file. Field names the column, or a JSON path such as
// "answers[3].c2".
type Problem struct {
	Item  string // the item code the problem concerns, when known
	Row   int
	Field string
	Got   string
	Want  string
}

func (p Problem) String() string {
	var b strings.Builder
	field := p.Field
	switch {
	case p.Item != "" && strings.HasPrefix(field, "answers["):
		// A JSON answer's index means nothing to a rater; its item code does.
		fmt.Fprintf(&b, "item %s: ", p.Item)
		field = field[strings.IndexByte(field, '.')+1:]
	case p.Item != "":
		fmt.Fprintf(&b, "item %s (row %d): ", p.Item, p.Row)
	case p.Row > 0:
		fmt.Fprintf(&b, "row %d: ", p.Row)
	}
	if field != "" {
		fmt.Fprintf(&b, "%s: ", field)
	}
	fmt.Fprintf(&b, "got %q, want %s", p.Got, p.Want)
	return b.String()
}

func (e *Error) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "returns: %s: %d problem(s)", e.File, len(e.Problems))
	for i, p := range e.Problems {
		if i == 20 {
			fmt.Fprintf(&b, "\n\t… and %d more", len(e.Problems)-i)
			break
		}
		b.WriteString("\n\t")
		b.WriteString(p.String())
	}
	return b.String()
}
