package archive

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"strings"
)

// SubjectKey keys the patient identification field with the study secret
// (HMAC-SHA-256, RFC 2104) and keeps 16 hexadecimal digits: enough to keep a few million
// patients apart, short enough to read. Runs of spaces and letter case are folded first
// so that the same patient written by two machines gets one key.
func SubjectKey(secret []byte, patientID string) string {
	m := hmac.New(sha256.New, secret)
	m.Write([]byte(strings.ToUpper(strings.Join(strings.Fields(patientID), " "))))
	return "sub-" + hex.EncodeToString(m.Sum(nil))[:16]
}
