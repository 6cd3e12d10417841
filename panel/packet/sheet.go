package packet

import (
	"bytes"
	"encoding/csv"
)

// SheetColumns are the columns of sheet.csv, in the order Build writes them.
// The returns parser accepts them in any order.
var SheetColumns = []string{"packet", "check", "rater", "item", "c1", "c2", "c3", "c4", "c5", "c6", "verdict", "confidence", "comment"}

// sheet renders sheet.csv: one row per item code in the rater's order, the
// packet id, check value and rater repeated on each row so that sorting or
// filtering in a spreadsheet never separates a row from its packet.
func sheet(packetID, check, rater string, codes []string) []byte {
	var buf bytes.Buffer
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
