package packet

import (
	"os"
	"path/filepath"
	"testing"
)

// FuzzReadManifest: any manifest.json gives a manifest of this format or an error
// naming the file; Lookup never panics on what is accepted.
func FuzzReadManifest(f *testing.F) {
	f.Add([]byte(`{"format":"quorate-manifest","version":1,"study":"st-1","packets":[{"packet":"P-a","rater":"a","check":"00","items":["23456A"]}]}`))
	f.Add([]byte(`{"format":"quorate-manifest","version":2}`))
	f.Add([]byte(`[]`))
	f.Fuzz(func(t *testing.T, b []byte) {
		p := filepath.Join(t.TempDir(), ManifestFile)
		if err := os.WriteFile(p, b, 0o644); err != nil {
			t.Fatal(err)
		}
		m, err := ReadManifest(p)
		if err != nil {
			return
		}
		if m.Format != ManifestFormat {
			t.Fatalf("format %q accepted", m.Format)
		}
		for _, e := range m.Packets {
			m.Lookup(e.Packet)
		}
	})
}
