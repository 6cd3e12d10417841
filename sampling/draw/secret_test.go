package draw

import (
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"testing"
)

// Two studies of one archive differ only in their secret, which keys the
// subject keys (HMAC-SHA-256, RFC 2104). With the same seed they must draw
// the same events: the draw depends on the candidates and the seed alone.
func TestDrawDoesNotDependOnSecret(t *testing.T) {
	keyed := func(secret string) *Frame {
		f := fixture()
		for i, s := range f.Subject {
			m := hmac.New(sha256.New, []byte(secret))
			m.Write([]byte(s))
			f.Subject[i] = "sub-" + hex.EncodeToString(m.Sum(nil))[:16]
		}
		return f
	}
	// The per-subject cap is what makes subject order matter: thinning walks the subjects.
	d := Design{Strata: []StratumSpec{{Column: "score", Bins: 2}, {Column: "region"}},
		Alloc: Allocation{Method: Neyman, N: 9, SDColumn: "score"}, Cap: 2, Seed: 42}
	ids := func(secret string) string {
		res, err := Draw(keyed(secret), d)
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, u := range res.Drawn {
			out = append(out, u.EventID)
		}
		b, _ := json.Marshal(out)
		return string(b)
	}
	a := ids("first study's secret")
	for _, s := range []string{"second study's secret", "a third one", "x"} {
		if b := ids(s); b != a {
			t.Errorf("secret %q draws %s, first secret %s", s, b, a)
		}
	}
}
