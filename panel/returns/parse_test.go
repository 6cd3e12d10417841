package returns

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// fixture builds a small study once per test binary.
var fixture struct {
	m     *packet.Manifest
	sheet []byte // alice's sheet.csv as sent out
}

func TestMain(m *testing.M) {
	dir, err := os.MkdirTemp("", "returns-test")
	if err != nil {
		panic(err)
	}
	items := make([]packet.Item, 8)
	for i := range items {
		items[i] = packet.Item{EventID: "ev" + string(rune('a'+i)), Rate: 32, Electrodes: []string{"Fp1", "Fp2"},
			Samples: [][]float32{make([]float32, 64), make([]float32, 64)}, EventAt: 1}
	}
	res, err := packet.Build(context.Background(), items, packet.Options{StudyID: "STUDY-R", Secret: []byte("returns-test-secret-16+"), Raters: []string{"alice", "bob"}, Seed: 3, OutDir: filepath.Join(dir, "packets")})
	if err != nil {
		panic(err)
	}
	fixture.m = &res.Manifest
	if fixture.sheet, err = os.ReadFile(res.Packets[0].Sheet); err != nil {
		panic(err)
	}
	code := m.Run()
	os.RemoveAll(dir)
	os.Exit(code)
}

func alice() *packet.ManifestEntry { e, _ := fixture.m.Lookup(fixture.m.Packets[0].Packet); return e }

type jsonAnswer struct {
	Item       string `json:"item"`
	C1         string `json:"c1"`
	C2         string `json:"c2"`
	C3         string `json:"c3"`
	C4         string `json:"c4"`
	C5         string `json:"c5"`
	C6         string `json:"c6"`
	Verdict    string `json:"verdict"`
	Confidence *int   `json:"confidence"`
	Comment    string `json:"comment"`
}

func validJSON() map[string]any {
	e := alice()
	four := 4
	return map[string]any{
		"format": "quorate-return", "version": 1, "study": "STUDY-R", "packet": e.Packet, "rater": e.Rater, "check": e.Check,
		"answers": []any{
			jsonAnswer{e.Items[0], "present", "present", "absent", "present", "absent", "present", "epileptiform", &four, "clear"},
			jsonAnswer{e.Items[1], "absent", "absent", "absent", "absent", "absent", "absent", "not-epileptiform", nil, ""},
			jsonAnswer{Item: e.Items[2]}, // left blank: not rated yet
		},
	}
}

func encode(t testing.TB, v any) []byte {
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

func TestParseJSON(t *testing.T) {
	r, err := Parse("a.json", encode(t, validJSON()), fixture.m)
	if err != nil {
		t.Fatal(err)
	}
	e := alice()
	P, A := Present, Absent
	want := []Answer{
		{e.Items[0], [6]Presence{P, P, A, P, A, P}, Epileptiform, 4, "clear"},
		{e.Items[1], [6]Presence{A, A, A, A, A, A}, NotEpileptiform, 0, ""},
	}
	if r.Kind != "json" || r.Packet != e.Packet || !slices.Equal(r.Answers, want) {
		t.Errorf("got %+v", r)
	}
	if !slices.Equal(r.Unrated, e.Items[2:]) {
		t.Errorf("unrated %v, want %v", r.Unrated, e.Items[2:])
	}
}

// fillSheet fills the sheet as sent out, through encoding/csv, the way a
// spreadsheet would: cells per row keyed by column name.
func fillSheet(t testing.TB, fill map[int]map[string]string, order []string) []byte {
	cr := csv.NewReader(bytes.NewReader(fixture.sheet))
	cr.Comment = '#'
	rows, err := cr.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	idx := map[string]int{}
	for i, h := range rows[0] {
		idx[h] = i
	}
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	w.Write(order)
	for r, row := range rows[1:] {
		out := make([]string, len(order))
		for i, h := range order {
			if j, ok := idx[h]; ok {
				out[i] = row[j]
			}
			if v, ok := fill[r][h]; ok {
				out[i] = v
			}
		}
		w.Write(out)
	}
	w.Flush()
	return buf.Bytes()
}

func TestParseCSV(t *testing.T) {
	order := []string{"Comment", "item", "c6", "c5", "c4", "c3", "c2", "c1", "VERDICT", "confidence", "rater", "check", "packet"}
	lower := make([]string, len(order))
	for i, h := range order {
		lower[i] = strings.ToLower(h)
	}
	// RFC 4180 §2 rules 6–7: a quoted field may hold commas, line breaks and doubled quotes.
	comment := "spiky, \"sharp\"\nthen slow"
	data := fillSheet(t, map[int]map[string]string{
		0: {"c1": "P", "c2": " present ", "c3": "a", "c4": "Absent", "c5": "p", "c6": "PRESENT", "verdict": "E", "confidence": "5", "comment": comment},
		1: {"c1": "a", "c2": "a", "c3": "a", "c4": "a", "c5": "a", "c6": "a", "verdict": "Not epileptiform"},
	}, lower)
	// Write the header in the mixed case of `order`, and add a blank trailing row.
	data = append([]byte(strings.Join(order, ",")), data[bytes.IndexByte(data, '\n'):]...)
	data = append(data, ",,,,,,,,,,,,\r\n"...)
	r, err := Parse("sheet.csv", data, fixture.m)
	if err != nil {
		t.Fatal(err)
	}
	e := alice()
	P, A := Present, Absent
	want := []Answer{
		{e.Items[0], [6]Presence{P, P, A, A, P, P}, Epileptiform, 5, comment},
		{e.Items[1], [6]Presence{A, A, A, A, A, A}, NotEpileptiform, 0, ""},
	}
	if r.Kind != "csv" || !slices.Equal(r.Answers, want) || len(r.Unrated) != len(e.Items)-2 {
		t.Errorf("got %+v", r)
	}
	// The sheet as sent out, untouched, is a valid return with nothing rated.
	r, err = Parse("sheet.csv", fixture.sheet, fixture.m)
	if err != nil || len(r.Answers) != 0 || len(r.Unrated) != len(e.Items) {
		t.Errorf("blank sheet: %+v, %v", r, err)
	}
}

func problems(t *testing.T, err error) []Problem {
	t.Helper()
	var e *Error
	if !errors.As(err, &e) {
		t.Fatalf("err %v, want *Error", err)
	}
	return e.Problems
}

func has(ps []Problem, row int, field string) bool {
	return slices.ContainsFunc(ps, func(p Problem) bool { return p.Row == row && p.Field == field })
}

func TestParseJSONProblems(t *testing.T) {
	e := alice()
	bob := fixture.m.Packets[1]
	cases := []struct {
		name   string
		edit   func(m map[string]any)
		row    int
		field  string
		single bool
	}{
		{"other study", func(m map[string]any) { m["study"] = "STUDY-X" }, 0, "study", true},
		{"unknown packet", func(m map[string]any) { m["packet"] = "P-alice-00000000" }, 0, "packet", true},
		{"wrong check", func(m map[string]any) { m["check"] = strings.Repeat("0", 32) }, 0, "check", true},
		{"other packet's check", func(m map[string]any) { m["check"] = bob.Check }, 0, "check", true},
		{"wrong rater", func(m map[string]any) { m["rater"] = "bob" }, 0, "rater", true},
		{"format", func(m map[string]any) { m["format"] = "other" }, 0, "format", true},
		{"version", func(m map[string]any) { m["version"] = 2 }, 0, "version", true},
		{"unknown top field", func(m map[string]any) { m["subject"] = "x" }, 0, "subject", true},
		{"missing check", func(m map[string]any) { delete(m, "check") }, 0, "check", false},
		{"item of another packet", func(m map[string]any) { ans(m, 0)["item"] = bob.Items[0] }, 1, "answers[0].item", true},
		{"item twice", func(m map[string]any) { ans(m, 1)["item"] = e.Items[0] }, 2, "answers[1].item", true},
		{"bad value", func(m map[string]any) { ans(m, 0)["c4"] = "maybe" }, 1, "answers[0].c4", true},
		{"confidence range", func(m map[string]any) { ans(m, 0)["confidence"] = 6 }, 1, "answers[0].confidence", true},
		{"confidence type", func(m map[string]any) { ans(m, 0)["confidence"] = "4" }, 1, "answers[0].confidence", true},
		{"value type", func(m map[string]any) { ans(m, 0)["c1"] = true }, 1, "answers[0].c1", true},
		{"alias in JSON", func(m map[string]any) { ans(m, 0)["c1"] = "yes" }, 1, "answers[0].c1", true},
		{"unknown answer field", func(m map[string]any) { ans(m, 0)["score"] = 0.9 }, 1, "answers[0].score", true},
	}
	for _, c := range cases {
		m := validJSON()
		m["answers"] = reencode(t, m["answers"])
		c.edit(m)
		_, err := Parse("a.json", encode(t, m), fixture.m)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		ps := problems(t, err)
		if !has(ps, c.row, c.field) || (c.single && len(ps) != 1) {
			t.Errorf("%s: problems %v, want one at row %d field %s", c.name, ps, c.row, c.field)
		}
	}
}

func ans(m map[string]any, i int) map[string]any { return m["answers"].([]any)[i].(map[string]any) }

func reencode(t *testing.T, v any) any {
	var out any
	if err := json.Unmarshal(encode(t, v), &out); err != nil {
		t.Fatal(err)
	}
	return out
}

func TestParseCSVProblems(t *testing.T) {
	bob := fixture.m.Packets[1]
	cols := packet.SheetColumns
	cases := []struct {
		name  string
		fill  map[int]map[string]string
		cols  []string
		row   int
		field string
	}{
		{"wrong check on a row", map[int]map[string]string{3: {"check": strings.Repeat("f", 32)}}, cols, 5, "check"},
		{"wrong check everywhere", allRows(map[string]string{"check": strings.Repeat("f", 32)}), cols, 0, "check"},
		{"wrong rater", allRows(map[string]string{"rater": "bob"}), cols, 0, "rater"},
		{"foreign item", map[int]map[string]string{1: {"item": bob.Items[0]}}, cols, 3, "item"},
		{"item twice", map[int]map[string]string{1: {"item": alice().Items[0]}}, cols, 3, "item"},
		{"bad criterion", map[int]map[string]string{0: full("c3", "maybe")}, cols, 2, "c3"},
		{"bad verdict", map[int]map[string]string{0: full("verdict", "spike")}, cols, 2, "verdict"},
		{"bad confidence", map[int]map[string]string{0: full("confidence", "high")}, cols, 2, "confidence"},
		{"unknown column", nil, append(slices.Clone(cols), "score"), 1, "column 14"},
		{"missing column", nil, slices.DeleteFunc(slices.Clone(cols), func(s string) bool { return s == "c4" }), 1, "c4"},
		{"duplicate column", nil, append(slices.Clone(cols), "c1"), 1, "column 14"},
	}
	for _, c := range cases {
		_, err := Parse("sheet.csv", fillSheet(t, c.fill, c.cols), fixture.m)
		if err == nil {
			t.Errorf("%s: accepted", c.name)
			continue
		}
		ps := problems(t, err)
		if !has(ps, c.row, c.field) {
			t.Errorf("%s: problems %v, want one at row %d field %s", c.name, ps, c.row, c.field)
		}
	}
}

func allRows(cells map[string]string) map[int]map[string]string {
	out := map[int]map[string]string{}
	for i := range 20 {
		out[i] = cells
	}
	return out
}

func full(field, value string) map[string]string {
	m := map[string]string{"c1": "p", "c2": "p", "c3": "p", "c4": "p", "c5": "p", "c6": "p", "verdict": "e"}
	m[field] = value
	return m
}

// Every problem in a file is reported in one go, each at its own row.
func TestParseCollectsEveryProblem(t *testing.T) {
	data := fillSheet(t, map[int]map[string]string{
		0: full("c1", "perhaps"),
		2: {"verdict": "n"},
		4: full("confidence", "9"),
	}, packet.SheetColumns)
	data = append(data, "x,y\r\n"...)
	ps := problems(t, mustFail(Parse("sheet.csv", data, fixture.m)))
	n := len(alice().Items)
	for _, want := range []struct {
		row   int
		field string
	}{{2, "c1"}, {6, "confidence"}, {n + 2, ""}} {
		if !has(ps, want.row, want.field) {
			t.Errorf("missing problem at row %d field %q in %v", want.row, want.field, ps)
		}
	}
	if len(ps) != 3 {
		t.Errorf("%d problems, want 3 (the half-rated row 4 is owed, not wrong): %v", len(ps), ps)
	}
}

func mustFail(_ *Return, err error) error { return err }

// Byte-order marks and encodings other than UTF-8 are refused with the
// reason; the Unicode Standard (§23.8) names EF BB BF the UTF-8 signature and
// FE FF / FF FE the UTF-16 ones.
func TestParseEncoding(t *testing.T) {
	valid := encode(t, validJSON())
	cases := []struct {
		name string
		data []byte
		row  int
	}{
		{"empty", nil, 0},
		{"blank", []byte(" \r\n\t"), 0},
		{"utf-16le bom", append([]byte{0xFF, 0xFE}, 'p', 0, 'a', 0), 0},
		{"latin-1", append(bytes.Replace(slices.Clone(fixture.sheet), []byte("\r\n"), []byte("\r\n"), 1), "\xe9t\xe9\r\n"...), bytes.Count(fixture.sheet, []byte("\n")) + 1},
		{"json latin-1", bytes.Replace(valid, []byte(`"clear"`), []byte("\"cl\xe9ar\""), 1), 1},
	}
	for _, c := range cases {
		ps := problems(t, mustFail(Parse(c.name, c.data, fixture.m)))
		if len(ps) != 1 || ps[0].Row != c.row {
			t.Errorf("%s: %v", c.name, ps)
		}
	}
	// The UTF-8 signature carries no data (Unicode §23.8) and is dropped.
	if _, err := Parse("bom", append([]byte{0xEF, 0xBB, 0xBF}, valid...), fixture.m); err != nil {
		t.Errorf("bom + valid JSON: %v", err)
	}
}

// A refusal never tells the caller the right check value.
func TestParseDoesNotEchoCheck(t *testing.T) {
	m := validJSON()
	m["check"] = alice().Check[:31] + "x"
	_, err := Parse("a.json", encode(t, m), fixture.m)
	if err == nil || strings.Contains(err.Error(), alice().Check) {
		t.Errorf("err %v", err)
	}
}
