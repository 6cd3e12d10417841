package packet

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/binary"
	"encoding/hex"
	"slices"
	"strconv"
)

// CodeAlphabet holds the characters of item codes: digits and capitals
// without 0/O, 1/I/L, which are easily confused when read or typed, and
// without E, so that a spreadsheet never reads a code such as 2345E6 as a
// number in scientific notation and writes it back changed.
const CodeAlphabet = "23456789ABCDFGHJKMNPQRSTUVWXYZ"

// CodeLen is the length of an item code: 30⁶ ≈ 7.3·10⁸ codes.
const CodeLen = 6

// mac returns HMAC-SHA256(secret, parts joined by NUL). NUL separators keep
// ("ab","c") and ("a","bc") apart.
func mac(secret []byte, parts ...string) []byte {
	h := hmac.New(sha256.New, secret)
	for i, p := range parts {
		if i > 0 {
			h.Write([]byte{0})
		}
		h.Write([]byte(p))
	}
	return h.Sum(nil)
}

// PacketID returns "P-<rater>-<8 hex>", the hex from
// HMAC-SHA256(secret, "packet"‖study‖rater‖seed‖sorted event ids). A rebuild
// with other items or another seed gets another id, so answers autosaved in
// a rater's browser for an old packet are never mixed into a new one.
func PacketID(secret []byte, study, rater string, seed uint64, eventIDs []string) string {
	ids := slices.Clone(eventIDs)
	slices.Sort(ids)
	parts := append([]string{"packet", study, rater, strconv.FormatUint(seed, 10)}, ids...)
	return "P-" + rater + "-" + hex.EncodeToString(mac(secret, parts...)[:4])
}

// ItemCode returns the code of copy (0 or 1) of an event in a packet:
// HMAC-SHA256(secret, "item"‖packetID‖eventID‖copy‖attempt), its first 8
// bytes read big-endian and written in base 30 over CodeAlphabet. attempt is
// raised only to step past a collision inside one packet.
func ItemCode(secret []byte, packetID, eventID string, copy, attempt int) string {
	sum := mac(secret, "item", packetID, eventID, strconv.Itoa(copy), strconv.Itoa(attempt))
	v := binary.BigEndian.Uint64(sum[:8])
	b := make([]byte, CodeLen)
	for i := range b {
		b[i] = CodeAlphabet[v%uint64(len(CodeAlphabet))]
		v /= uint64(len(CodeAlphabet))
	}
	return string(b)
}

// CheckValue returns the first 32 hex digits of
// HMAC-SHA256(secret, study‖packetID‖rater‖codes sorted), fields joined by
// NUL. It binds a return to its packet: a changed study, packet, rater or item
// set gives another value, and without the secret none can be forged.
func CheckValue(secret []byte, study, packetID, rater string, codes []string) string {
	c := slices.Clone(codes)
	slices.Sort(c)
	parts := append([]string{study, packetID, rater}, c...)
	return hex.EncodeToString(mac(secret, parts...))[:32]
}
