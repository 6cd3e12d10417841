package consensus

import (
	"testing"

	"github.com/quorate-eeg/quorate/panel/returns"
)

// The verdict column speaks the returns' words (FORMAT.md of package returns), so a
// reader of consensus.parquet finds "epileptiform" where the rater wrote it.
func TestVerdictWordsAreTheReturnsWords(t *testing.T) {
	if Present.VerdictString() != string(returns.Epileptiform) || Absent.VerdictString() != string(returns.NotEpileptiform) {
		t.Errorf("verdict words %q, %q; returns say %q, %q", Present.VerdictString(), Absent.VerdictString(),
			returns.Epileptiform, returns.NotEpileptiform)
	}
	for _, d := range []Decision{Absent, Present, Undetermined, NoQuorum} {
		if got, ok := ParseVerdict(d.VerdictString()); !ok || got != d {
			t.Errorf("ParseVerdict(%q) = %v, %v; want %v", d.VerdictString(), got, ok, d)
		}
	}
	// Tables of an older release held the criteria's words in the verdict column.
	for s, want := range map[string]Decision{"present": Present, "absent": Absent} {
		if got, ok := ParseVerdict(s); !ok || got != want {
			t.Errorf("ParseVerdict(%q) = %v, %v; want %v", s, got, ok, want)
		}
	}
	for _, s := range []string{"", "cannot-judge", "yes", "Epileptiform"} {
		if _, ok := ParseVerdict(s); ok {
			t.Errorf("ParseVerdict(%q) accepted", s)
		}
	}
}
