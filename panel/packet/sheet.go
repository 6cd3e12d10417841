package packet

import (
	"bytes"
	"encoding/csv"
)

// SheetColumns are the columns of sheet.csv, in the order Build writes them.
// The returns parser accepts them in any order.
var SheetColumns = []string{"packet", "check", "rater", "item", "c1", "c2", "c3", "c4", "c5", "c6", "verdict", "confidence", "comment"}

// SheetHelp are the comment lines above the sheet's header: the allowed
// values (returns/FORMAT.md has the full list).
var SheetHelp = []string{
	"c1 to c6: present (p / yes / y / 1) or absent (a / no / n / 0) or cannot-judge (cj / ?)",
	"verdict: epileptiform (e) or not-epileptiform (ne / n) or cannot-judge (cj / ?)",
	"confidence: 1 to 5 or empty. An item partly filled in stays owed: fill every criterion and the verdict.",
}

// sheet renders sheet.csv: one row per item code in the rater's order, the
// packet id, check value and rater repeated on each row so that sorting or
// filtering in a spreadsheet never separates a row from its packet.
func sheet(packetID, check, rater string, codes []string) []byte {
	var buf bytes.Buffer
	// Comment lines the returns parser skips; no commas or semicolons, so a
	// spreadsheet keeps each in one cell whatever separator it saves with.
	for _, l := range SheetHelp {
		buf.WriteString("# " + l + "\r\n")
	}
	w := csv.NewWriter(&buf)
	w.UseCRLF = true // RFC 4180 §2
	w.Write(SheetColumns)
	for _, c := range codes {
		row := make([]string, len(SheetColumns))
		row[0], row[1], row[2], row[3] = packetID, check, rater, c
		w.Write(row)
	}
	w.Flush()
	return buf.Bytes()
}
