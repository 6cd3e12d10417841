package returns

import (
	"bytes"
	"encoding/csv"
	"slices"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// sheetAs writes the sheet as sent out with two rows filled, the way a
// spreadsheet saves it: separator, line ends, signature and leading comment
// lines as given.
func sheetAs(t *testing.T, comma rune, crlf, bom bool, comments []string, row0, row1 map[string]string) []byte {
	t.Helper()
	cr := csv.NewReader(bytes.NewReader(fixture.sheet))
	cr.Comment = '#'
	rows, err := cr.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if bom {
		buf.Write([]byte{0xEF, 0xBB, 0xBF})
	}
	for _, c := range comments {
		buf.WriteString(c)
		buf.WriteString(map[bool]string{true: "\r\n", false: "\n"}[crlf])
	}
	w := csv.NewWriter(&buf)
	w.Comma, w.UseCRLF = comma, crlf
	for i, row := range rows {
		fill := map[int]map[string]string{1: row0, 2: row1}[i]
		for j, h := range rows[0] {
			if v, ok := fill[h]; ok {
				row[j] = v
			}
		}
		w.Write(row)
	}
	w.Flush()
	return buf.Bytes()
}

// resaved renders the sheet's own comment lines as a spreadsheet saves them
// after reading them as one cell each: padded with empty cells to the
// header's width, and quoted where the cell holds the separator.
func resaved(comma rune, lines ...string) []string {
	var out []string
	for _, l := range lines {
		var buf bytes.Buffer
		w := csv.NewWriter(&buf)
		w.Comma = comma
		w.Write(append([]string{"# " + l}, make([]string, len(packet.SheetColumns)-1)...))
		w.Flush()
		out = append(out, strings.TrimRight(buf.String(), "\n"))
	}
	return out
}

func cells(crit, verdict string) map[string]string {
	m := map[string]string{"verdict": verdict}
	for k := 1; k <= 6; k++ {
		m["c"+string(rune('0'+k))] = crit
	}
	return m
}

// Every row of FORMAT.md's table "Accepted spreadsheet variants" is one case
// here. The separators and line ends are those of RFC 4180 and of CSV as
// spreadsheets save it in locales with a decimal comma (common practice).
func TestSheetVariants(t *testing.T) {
	P, A, CJ := Present, Absent, CannotJudge
	std := []string{"# c1 to c6: present / absent / cannot-judge"}
	cases := []struct {
		name   string
		data   []byte
		c0, c1 Presence
		v0, v1 Verdict
	}{
		{"comma, CRLF (as sent out)", sheetAs(t, ',', true, false, nil, cells("present", "epileptiform"), cells("absent", "not-epileptiform")), P, A, Epileptiform, NotEpileptiform},
		{"comma, LF", sheetAs(t, ',', false, false, nil, cells("p", "e"), cells("a", "n")), P, A, Epileptiform, NotEpileptiform},
		{"semicolon, BOM, CRLF", sheetAs(t, ';', true, true, nil, cells("Present", "Epileptiform"), cells("ABSENT", "Not epileptiform")), P, A, Epileptiform, NotEpileptiform},
		{"semicolon, LF", sheetAs(t, ';', false, false, nil, cells("yes", "e"), cells("no", "ne")), P, A, Epileptiform, NotEpileptiform},
		{"tab, CRLF", sheetAs(t, '\t', true, false, nil, cells("y", "e"), cells("n", "n")), P, A, Epileptiform, NotEpileptiform},
		{"comma, BOM, LF", sheetAs(t, ',', false, true, nil, cells("1", "e"), cells("0", "n")), P, A, Epileptiform, NotEpileptiform},
		{"header comment lines kept", sheetAs(t, ',', true, false, std, cells("p", "e"), cells("a", "n")), P, A, Epileptiform, NotEpileptiform},
		{"header comment lines, semicolon, BOM", sheetAs(t, ';', true, true, std, cells("p", "e"), cells("a", "n")), P, A, Epileptiform, NotEpileptiform},
		{"header comment lines re-saved by a spreadsheet, semicolon, BOM", sheetAs(t, ';', true, true, resaved(';', packet.SheetHelp...), cells("yes", "e"), cells("no", "n")), P, A, Epileptiform, NotEpileptiform},
		{"header comment lines re-saved, one quoted", sheetAs(t, ';', true, true, resaved(';', "a note; with the separator", "another"), cells("Y", "E"), cells("N", "NE")), P, A, Epileptiform, NotEpileptiform},
		{"cannot judge (hyphen, space)", sheetAs(t, ',', true, false, nil, cells("cannot-judge", "cannot judge"), cells("Cannot Judge", "cannot-judge")), CJ, CJ, VerdictCannotJudge, VerdictCannotJudge},
		{"cannot judge (cj, ?)", sheetAs(t, ';', true, true, nil, cells("cj", "?"), cells("?", "CJ")), CJ, CJ, VerdictCannotJudge, VerdictCannotJudge},
	}
	for _, c := range cases {
		r, err := Parse("sheet.csv", c.data, fixture.m)
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if len(r.Answers) != 2 || r.Answers[0].Criteria[3] != c.c0 || r.Answers[1].Criteria[5] != c.c1 ||
			r.Answers[0].Verdict != c.v0 || r.Answers[1].Verdict != c.v1 || len(r.Unrated) != len(alice().Items)-2 {
			t.Errorf("%s: got %+v", c.name, r)
		}
	}
	// "yes" is no verdict: "no" would then be ambiguous with "not judged".
	if _, err := Parse("sheet.csv", sheetAs(t, ',', true, false, nil, cells("p", "yes"), nil), fixture.m); err == nil {
		t.Error(`verdict "yes" accepted`)
	}
}

// Kane et al. (2017) ask six criteria and a verdict of every item; an item
// with some of them missing is owed, and the others merge without it.
func TestHalfRatedItemIsOwed(t *testing.T) {
	e := alice()
	m := validJSON()
	m["answers"] = append(m["answers"].([]any),
		jsonAnswer{e.Items[3], "present", "present", "present", "present", "present", "present", "epileptiform", nil, ""},
		jsonAnswer{Item: e.Items[4], C1: "present", C2: "absent"}) // half-rated
	r, err := Parse("a.json", encode(t, m), fixture.m)
	if err != nil {
		t.Fatal(err)
	}
	got := []string{}
	for _, a := range r.Answers {
		got = append(got, a.Item)
	}
	if !slices.Equal(got, []string{e.Items[0], e.Items[1], e.Items[3]}) {
		t.Errorf("merged %v", got)
	}
	if !slices.Equal(r.Incomplete, []string{e.Items[4]}) || !slices.Contains(r.Unrated, e.Items[4]) {
		t.Errorf("incomplete %v, unrated %v", r.Incomplete, r.Unrated)
	}
}

// A rater reads item codes, not array indices.
func TestProblemNamesItemCode(t *testing.T) {
	m := validJSON()
	m["answers"] = reencode(t, m["answers"])
	ans(m, 1)["c4"] = "maybe"
	_, err := Parse("a.json", encode(t, m), fixture.m)
	if err == nil {
		t.Fatal("accepted")
	}
	msg := err.Error()
	if !strings.Contains(msg, "item "+alice().Items[1]+": c4:") || strings.Contains(msg, "answers[") {
		t.Errorf("message %q", msg)
	}
	sheet := sheetAs(t, ',', true, false, nil, cells("maybe", "e"), nil)
	_, err = Parse("sheet.csv", sheet, fixture.m)
	if err == nil || !strings.Contains(err.Error(), "item "+alice().Items[0]+" (row 2): c1:") {
		t.Errorf("sheet message %v", err)
	}
}

// RFC 8259 §4: names within an object should be unique; a repeated one is
// refused and named.
func TestDuplicateKeyRefused(t *testing.T) {
	valid := string(encode(t, validJSON()))
	cases := map[string]string{
		"answers[1].c2": strings.Replace(valid, `"c2":"absent"`, `"c2":"absent","c2":"present"`, 1),
		"check":         strings.Replace(valid, `"check":`, `"check":"x","check":`, 1),
	}
	for want, data := range cases {
		ps := problems(t, mustFail(Parse("a.json", []byte(data), fixture.m)))
		if len(ps) != 1 || ps[0].Field != want {
			t.Errorf("%s: %v", want, ps)
		}
	}
	if k := duplicateKey([]byte(valid)); k != "" {
		t.Errorf("valid return: %q", k)
	}
}

func TestSizeCap(t *testing.T) {
	big := append(encode(t, validJSON()), bytes.Repeat([]byte(" "), MaxSize)...)
	ps := problems(t, mustFail(Parse("big.json", big, fixture.m)))
	if len(ps) != 1 || !strings.Contains(ps[0].Want, "at most") {
		t.Errorf("%v", ps)
	}
}

// The sheet sent out lists the allowed values in its comment lines, and every value it
// lists is accepted, each meaning what the line says.
func TestSheetListsAcceptedValues(t *testing.T) {
	for _, l := range packet.SheetHelp {
		// No separator or quote in a comment line, so a spreadsheet keeps
		// each in one cell, unquoted, whatever separator it saves with.
		if strings.ContainsAny(l, ",;\t\"") {
			t.Errorf("comment line %q holds a separator or quote", l)
		}
		if !bytes.Contains(fixture.sheet, []byte("# "+l+"\r\n")) {
			t.Errorf("sheet.csv lacks the comment line %q", l)
		}
	}
	crit := map[string]Presence{"present": Present, "p": Present, "yes": Present, "y": Present, "1": Present,
		"absent": Absent, "a": Absent, "no": Absent, "n": Absent, "0": Absent, "cannot-judge": CannotJudge, "cj": CannotJudge, "?": CannotJudge}
	verd := map[string]Verdict{"epileptiform": Epileptiform, "e": Epileptiform, "not-epileptiform": NotEpileptiform,
		"ne": NotEpileptiform, "n": NotEpileptiform, "cannot-judge": VerdictCannotJudge, "cj": VerdictCannotJudge, "?": VerdictCannotJudge}
	listed := func(line, v string) bool {
		for _, w := range strings.FieldsFunc(line, func(r rune) bool { return r == ' ' || r == '(' || r == ')' || r == '/' || r == ':' }) {
			if w == v {
				return true
			}
		}
		return false
	}
	for v, want := range crit {
		if !listed(packet.SheetHelp[0], v) {
			t.Errorf("criterion value %q not listed in %q", v, packet.SheetHelp[0])
		}
		r, err := Parse("sheet.csv", sheetAs(t, ',', true, false, nil, cells(v, "e"), nil), fixture.m)
		if err != nil || r.Answers[0].Criteria[0] != want {
			t.Errorf("criterion value %q: %v, want %s", v, err, want)
		}
	}
	for v, want := range verd {
		if !listed(packet.SheetHelp[1], v) {
			t.Errorf("verdict value %q not listed in %q", v, packet.SheetHelp[1])
		}
		r, err := Parse("sheet.csv", sheetAs(t, ',', true, false, nil, cells("p", v), nil), fixture.m)
		if err != nil || r.Answers[0].Verdict != want {
			t.Errorf("verdict value %q: %v, want %s", v, err, want)
		}
	}
}
