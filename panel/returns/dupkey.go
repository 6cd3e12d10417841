package returns

import (
	"bytes"
	"encoding/json"
	"fmt"
)

// duplicateKey returns the path of the first key given twice in one JSON
// object, or "" when there is none or the text is not valid JSON (the
// decoder reports that). RFC 8259 §4 leaves the meaning of repeated names
// to the reader; encoding/json keeps the last, which would let a second
// "c2" silently replace the first, so a return with one is refused.
func duplicateKey(data []byte) string {
	dec := json.NewDecoder(bytes.NewReader(data))
	type frame struct {
		object bool
		path   string
		keys   map[string]bool
		index  int
		key    string // the key whose value comes next
	}
	var stack []*frame
	child := func() string {
		if len(stack) == 0 {
			return ""
		}
		f := stack[len(stack)-1]
		if f.object {
			return f.path + f.key
		}
		p := fmt.Sprintf("%s[%d]", f.path[:max(len(f.path)-1, 0)], f.index)
		f.index++
		return p
	}
	for {
		t, err := dec.Token()
		if err != nil {
			return ""
		}
		top := (*frame)(nil)
		if len(stack) > 0 {
			top = stack[len(stack)-1]
		}
		// A string in key position of an object is a key.
		if s, ok := t.(string); ok && top != nil && top.object && top.key == "" {
			if top.keys[s] {
				return top.path + s
			}
			top.keys[s] = true
			top.key = s
			continue
		}
		switch t {
		case json.Delim('{'):
			p := child()
			if p != "" {
				p += "."
			}
			stack = append(stack, &frame{object: true, path: p, keys: map[string]bool{}})
			continue
		case json.Delim('['):
			p := child()
			stack = append(stack, &frame{path: p + "."})
			continue
		case json.Delim('}'), json.Delim(']'):
			stack = stack[:len(stack)-1]
		default:
			child()
		}
		if len(stack) > 0 && stack[len(stack)-1].object {
			stack[len(stack)-1].key = ""
		}
		if len(stack) == 0 {
			return ""
		}
	}
}
