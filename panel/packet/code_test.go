package packet

import (
	"strings"
	"testing"
)

var testSecret = []byte("0123456789abcdef-test-secret")

// Expected values from testdata/hmac_ref.py (run with /usr/bin/python3) (Python hmac + hashlib, RFC 2104
// with SHA-256 of FIPS 180-4).
func TestCodesAgainstPythonHMAC(t *testing.T) {
	if got, want := CheckValue(testSecret, "STUDY-1", "P-alice-00000000", "alice", []string{"K7QX2M", "22ABCD", "ZZ9999"}), "f1607b4d95c8e93e073a855d94ee7c7e"; got != want {
		t.Errorf("CheckValue = %s, want %s", got, want)
	}
	if got, want := PacketID(testSecret, "STUDY-1", "alice", 42, []string{"ev-b", "ev-a"}), "P-alice-69f4155c"; got != want {
		t.Errorf("PacketID = %s, want %s", got, want)
	}
	if got, want := ItemCode(testSecret, "P-alice-00000000", "ev-a", 1, 0), "SQSYW2"; got != want {
		t.Errorf("ItemCode = %s, want %s", got, want)
	}
}

func TestCheckValueBindsEveryField(t *testing.T) {
	codes := []string{"AAAAAA", "BBBBBB"}
	base := CheckValue(testSecret, "S", "P-r-1", "r", codes)
	if CheckValue(testSecret, "S", "P-r-1", "r", []string{"BBBBBB", "AAAAAA"}) != base {
		t.Error("check value depends on code order; it should use the sorted set")
	}
	for name, v := range map[string]string{
		"study":  CheckValue(testSecret, "T", "P-r-1", "r", codes),
		"packet": CheckValue(testSecret, "S", "P-r-2", "r", codes),
		"rater":  CheckValue(testSecret, "S", "P-r-1", "q", codes),
		"codes":  CheckValue(testSecret, "S", "P-r-1", "r", codes[:1]),
		"secret": CheckValue([]byte("another-secret-of-16"), "S", "P-r-1", "r", codes),
		// NUL separators keep shifted boundaries apart.
		"shift": CheckValue(testSecret, "SP", "-r-1", "r", codes),
	} {
		if v == base {
			t.Errorf("changing %s left the check value unchanged", name)
		}
	}
	if len(base) != 32 {
		t.Errorf("check value length %d, want 32", len(base))
	}
}

func TestItemCodeAlphabet(t *testing.T) {
	for i := range 200 {
		c := ItemCode(testSecret, "P-x-1", string(rune('a'+i%26))+strings.Repeat("z", i), i%2, 0)
		if len(c) != CodeLen {
			t.Fatalf("code %q has length %d", c, len(c))
		}
		for _, r := range c {
			if !strings.ContainsRune(CodeAlphabet, r) || strings.ContainsRune("01EILO", r) {
				t.Fatalf("code %q uses %q", c, r)
			}
		}
	}
}
