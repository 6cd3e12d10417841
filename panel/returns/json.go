package returns

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"slices"
	"strings"
)

var (
	topFields    = []string{"format", "version", "study", "packet", "rater", "check", "answers"}
	answerFields = []string{"item", "c1", "c2", "c3", "c4", "c5", "c6", "verdict", "confidence", "comment"}
)

// readJSON extracts a JSON return. Values are taken as written: the page
// writes canonical ones, so nothing is lower-cased or aliased here.
func readJSON(data []byte, add func(int, string, string, string)) (h head, out []raw) {
	if k := duplicateKey(data); k != "" {
		add(0, k, "the key given twice", "each key once in its object")
		return h, nil
	}
	dec := json.NewDecoder(bytes.NewReader(data))
	dec.UseNumber()
	var top map[string]json.RawMessage
	if err := dec.Decode(&top); err != nil {
		add(lineOf(data, err), "(json)", err.Error(), "a valid JSON object")
		return h, nil
	}
	if _, err := dec.Token(); !errors.Is(err, io.EOF) {
		add(0, "(json)", "more data after the object", "a single JSON object")
	}
	for k := range top {
		if !slices.Contains(topFields, k) {
			add(0, k, "an unknown field", listed(topFields))
		}
	}
	for _, k := range topFields {
		if _, ok := top[k]; !ok {
			add(0, k, "nothing", "the field "+k)
		}
	}
	str := func(path string, m map[string]json.RawMessage, k string, row int) string {
		v, ok := m[k]
		if !ok {
			return ""
		}
		var s *string
		if err := json.Unmarshal(v, &s); err != nil {
			add(row, path+k, string(v), "a string")
			return ""
		}
		if s == nil {
			return ""
		}
		return *s
	}
	if f := str("", top, "format", 0); f != Format {
		add(0, "format", f, fmt.Sprintf("%q", Format))
	}
	if v, ok := top["version"]; ok && string(v) != "1" {
		add(0, "version", string(v), "1")
	}
	_, h.studyGiven = top["study"]
	h.study = str("", top, "study", 0)
	h.packet = str("", top, "packet", 0)
	if _, ok := top["packet"]; ok && h.packet == "" {
		add(0, "packet", "", "the packet id printed in the packet")
	}
	h.rater = str("", top, "rater", 0)
	h.check = str("", top, "check", 0)
	var list []json.RawMessage
	if v, ok := top["answers"]; ok {
		if err := json.Unmarshal(v, &list); err != nil {
			add(0, "answers", abbrev(string(v)), "an array of answers")
		}
	}
	for i, v := range list {
		p := fmt.Sprintf("answers[%d].", i)
		row := i + 1
		var m map[string]json.RawMessage
		if err := json.Unmarshal(v, &m); err != nil || m == nil {
			add(row, strings.TrimSuffix(p, "."), abbrev(string(v)), "an answer object")
			continue
		}
		for k := range m {
			if !slices.Contains(answerFields, k) {
				add(row, p+k, "an unknown field", listed(answerFields))
			}
		}
		a := raw{row: row, path: p, itemPath: p + "item", bad: map[string]bool{}}
		get := func(k string) string {
			v, ok := m[k]
			if !ok {
				return ""
			}
			var s *string
			if err := json.Unmarshal(v, &s); err != nil {
				add(row, p+k, abbrev(string(v)), "a string")
				a.bad[k] = true // reported here; not again as a value
				return ""
			}
			if s == nil {
				return ""
			}
			return *s
		}
		a.item = get("item")
		for k := range a.crit {
			a.crit[k] = get(fmt.Sprintf("c%d", k+1))
		}
		a.verdict = get("verdict")
		a.comment = get("comment")
		if c, ok := m["confidence"]; ok && string(c) != "null" {
			var n json.Number
			// json.Number also takes a quoted number; the format wants a bare one.
			if err := json.Unmarshal(c, &n); err != nil || c[0] == '"' {
				add(row, p+"confidence", abbrev(string(c)), "a number 1–5 or null")
				a.bad["confidence"] = true
			} else {
				a.conf = n.String()
			}
		}
		out = append(out, a)
	}
	return h, out
}

func lineOf(data []byte, err error) int {
	var se *json.SyntaxError
	if errors.As(err, &se) && se.Offset <= int64(len(data)) {
		return 1 + bytes.Count(data[:se.Offset], []byte{'\n'})
	}
	return 0
}

func abbrev(s string) string {
	if len(s) > 60 {
		return s[:60] + "…"
	}
	return s
}
