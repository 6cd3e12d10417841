package export

import "testing"

// The exported verdict is in the returns' words; a consensus table of an older release
// (present/absent in its verdict column) exports in the same words, with the same
// panel reference.
func TestExportVerdictWords(t *testing.T) {
	for in, want := range map[string]struct {
		word string
		ref  *bool
	}{
		"epileptiform": {"epileptiform", ptr(true)}, "present": {"epileptiform", ptr(true)},
		"not-epileptiform": {"not-epileptiform", ptr(false)}, "absent": {"not-epileptiform", ptr(false)},
		"undetermined": {"undetermined", nil}, "no-quorum": {"no-quorum", nil},
	} {
		w, ref := verdict(in)
		if w == nil || *w != want.word || (ref == nil) != (want.ref == nil) || ref != nil && *ref != *want.ref {
			t.Errorf("verdict(%q) = %v, %v; want %q, %v", in, w, ref, want.word, want.ref)
		}
	}
	if w, ref := verdict(""); w != nil || ref != nil {
		t.Errorf("verdict(\"\") = %v, %v; want nulls", w, ref)
	}
}
