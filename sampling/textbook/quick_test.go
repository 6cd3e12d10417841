package textbook

import "testing"

func TestQuick(t *testing.T) {
	rec, err := Generate(Config{Seed: 1, IEDRate: 6, LookalikeRate: 10})
	if err != nil {
		t.Fatal(err)
	}
	kinds := map[string]int{}
	for _, e := range rec.Truth {
		kinds[e.Kind]++
	}
	t.Log(kinds, rec.States, len(rec.Truth))
	for _, e := range rec.Truth[:10] {
		t.Logf("%+v", e)
	}
}
