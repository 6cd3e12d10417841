package returns

import (
	"bytes"
	"crypto/subtle"
	"fmt"
	"strings"
	"unicode/utf8"

	"github.com/quorate-eeg/quorate/panel/packet"
)

// Format is the format tag of a JSON return.
const Format = "quorate-return"

// raw is one answer before checking, as strings; set[k] tells whether
// field k was given at all (a JSON null or an empty cell is not).
type raw struct {
	row      int
	path     string // JSON path prefix ("answers[3].") or "" for CSV
	item     string
	crit     [6]string
	verdict  string
	conf     string
	comment  string
	itemPath string
	bad      map[string]bool // fields already reported as malformed
}

// head is what a return says about itself.
type head struct {
	study, packet, rater, check string
	studyGiven                  bool
}

// Parse reads one returned file, JSON (first non-blank byte '{') or CSV,
// and checks it against the manifest m. It returns either a Return or an
// *Error listing every problem found; a file that only partly answers its
// packet is fine, an answer that is only partly filled in is not.
func Parse(name string, data []byte, m *packet.Manifest) (*Return, error) {
	e := &Error{File: name}
	add := func(row int, field, got, want string) {
		e.Problems = append(e.Problems, Problem{Row: row, Field: field, Got: got, Want: want})
	}
	if m == nil {
		add(0, "", "no manifest", "the manifest.json written with the packets")
		return nil, e
	}
	switch {
	case len(bytes.TrimSpace(data)) == 0:
		add(0, "", "an empty file", "a JSON return saved by the review page or a filled sheet.csv")
		return nil, e
	case bytes.HasPrefix(data, []byte{0xFE, 0xFF}) || bytes.HasPrefix(data, []byte{0xFF, 0xFE}):
		add(0, "encoding", "UTF-16 (byte-order mark)", "UTF-8 without a byte-order mark (in a spreadsheet choose \"CSV UTF-8\" or plain CSV)")
		return nil, e
	case len(data) > MaxSize:
		add(0, "", fmt.Sprintf("%d bytes", len(data)), fmt.Sprintf("at most %d bytes (a return of one packet)", MaxSize))
		return nil, e
	case bytes.HasPrefix(data, []byte{0xEF, 0xBB, 0xBF}):
		// Spreadsheets save "CSV UTF-8" with the signature (Unicode §23.8); it carries no data.
		data = data[3:]
	}
	if len(bytes.TrimSpace(data)) == 0 {
		add(0, "", "nothing but a byte-order mark", "a JSON return saved by the review page or a filled sheet.csv")
		return nil, e
	}
	if !utf8.Valid(data) {
		line := 1 + bytes.Count(data[:firstInvalid(data)], []byte{'\n'})
		add(line, "encoding", "bytes that are not UTF-8", "UTF-8 text (re-save the sheet as CSV UTF-8)")
		return nil, e
	}
	var (
		h       head
		answers []raw
		kind    string
	)
	if t := bytes.TrimLeft(data, " \t\r\n"); t[0] == '{' {
		kind = "json"
		h, answers = readJSON(data, add)
	} else {
		kind = "csv"
		h, answers = readCSV(data, add)
	}
	r := check(name, kind, h, answers, m, add)
	nameItems(e.Problems, answers)
	if len(e.Problems) > 0 {
		return nil, e
	}
	return r, nil
}

// nameItems gives each problem of an answer the item code it concerns, so
// that a rater reads "item G28ZJY" rather than a row or an array index.
func nameItems(ps []Problem, answers []raw) {
	byRow := make(map[int]string, len(answers))
	for _, a := range answers {
		if a.item != "" {
			byRow[a.row] = a.item
		}
	}
	for i := range ps {
		if ps[i].Row > 0 && ps[i].Item == "" && !strings.HasSuffix(ps[i].Field, "item") {
			ps[i].Item = byRow[ps[i].Row]
		}
	}
}

func firstInvalid(b []byte) int {
	for i := 0; i < len(b); {
		r, n := utf8.DecodeRune(b[i:])
		if r == utf8.RuneError && n <= 1 {
			return i
		}
		i += n
	}
	return len(b)
}

// check validates what readJSON or readCSV extracted against the manifest.
func check(name, kind string, h head, answers []raw, m *packet.Manifest, add func(int, string, string, string)) *Return {
	r := &Return{File: name, Kind: kind, Study: m.Study, Packet: h.packet, Rater: h.rater, Check: h.check}
	if h.studyGiven && h.study != m.Study {
		add(0, "study", h.study, fmt.Sprintf("%q: this return belongs to another study", m.Study))
	}
	entry, known := m.Lookup(h.packet)
	switch {
	case h.packet == "":
		// Reported by the reader, which knows whether the field or the rows are missing.
	case !known:
		add(0, "packet", h.packet, fmt.Sprintf("a packet of study %q", m.Study))
	default:
		if h.rater != entry.Rater {
			add(0, "rater", h.rater, fmt.Sprintf("%q, the rater of packet %s", entry.Rater, entry.Packet))
		}
		// Constant time, so response timing tells nothing about how much of a
		// guessed value was right; the wanted value is never echoed.
		if subtle.ConstantTimeCompare([]byte(h.check), []byte(entry.Check)) != 1 {
			add(0, "check", h.check, "the check value printed in the packet (the file was altered or belongs to another packet)")
		}
	}
	var codes map[string]bool
	if known {
		codes = make(map[string]bool, len(entry.Items))
		for _, c := range entry.Items {
			codes[c] = true
		}
	}
	first := map[string]int{}
	answered, incomplete := map[string]bool{}, map[string]bool{}
	for _, a := range answers {
		ok := true
		switch {
		case a.item == "" && a.bad["item"]:
			ok = false
		case a.item == "":
			add(a.row, a.itemPath, "", "an item code")
			ok = false
		case codes != nil && !codes[a.item]:
			add(a.row, a.itemPath, a.item, "an item code of packet "+h.packet)
			ok = false
		case first[a.item] != 0:
			add(a.row, a.itemPath, a.item, fmt.Sprintf("each item once (already at row %d)", first[a.item]))
			ok = false
		}
		if a.item != "" && first[a.item] == 0 {
			first[a.item] = a.row
		}
		touched := a.verdict != "" || a.conf != "" || a.comment != "" || len(a.bad) > 0
		for _, c := range a.crit {
			touched = touched || c != ""
		}
		if !touched {
			continue // left blank: not rated yet
		}
		ans := Answer{Item: a.item, Comment: a.comment}
		missing := false
		for k, c := range a.crit {
			f := fmt.Sprintf("%sc%d", a.path, k+1)
			switch Presence(c) {
			case Present, Absent, CannotJudge:
				ans.Criteria[k] = Presence(c)
			case "":
				// A half-rated item is owed, not wrong: it stays out of the
				// merge and the complete items merge without it.
				missing = missing || !a.bad[fmt.Sprintf("c%d", k+1)]
			default:
				add(a.row, f, c, "present, absent or cannot-judge")
				ok = false
			}
		}
		switch Verdict(a.verdict) {
		case Epileptiform, NotEpileptiform, VerdictCannotJudge:
			ans.Verdict = Verdict(a.verdict)
		case "":
			missing = missing || !a.bad["verdict"]
		default:
			add(a.row, a.path+"verdict", a.verdict, "epileptiform, not-epileptiform or cannot-judge")
			ok = false
		}
		if a.conf != "" {
			if len(a.conf) == 1 && a.conf[0] >= '1' && a.conf[0] <= '5' {
				ans.Confidence = int(a.conf[0] - '0')
			} else {
				add(a.row, a.path+"confidence", a.conf, "1, 2, 3, 4, 5 or empty")
				ok = false
			}
		}
		if len(a.comment) > 2000 {
			add(a.row, a.path+"comment", a.comment[:40]+"…", "at most 2000 bytes")
			ok = false
		}
		if ok && missing && a.item != "" {
			incomplete[a.item] = true
			continue
		}
		if ok {
			answered[a.item] = true
			r.Answers = append(r.Answers, ans)
		}
	}
	if known {
		for _, c := range entry.Items {
			if !answered[c] {
				r.Unrated = append(r.Unrated, c)
			}
			if incomplete[c] {
				r.Incomplete = append(r.Incomplete, c)
			}
		}
	}
	return r
}

// listed formats names for a Want.
func listed(names []string) string {
	return "one of " + strings.Join(names, ", ")
}
