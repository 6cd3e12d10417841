package archive

import (
	"context"
	"fmt"
	"path/filepath"
	"testing"
)

// BenchmarkScan1000 indexes 1,000 small EDF+ recordings from scratch: headers,
// annotations and the content hash, with two workers.
func BenchmarkScan1000(b *testing.B) {
	arch := b.TempDir()
	for i := 0; i < 1000; i++ {
		writeEDF(b, filepath.Join(arch, fmt.Sprintf("w%02d", i%20), fmt.Sprintf("r%04d.edf", i)), fmt.Sprintf("P%04d X X X", i), 10, float32(i))
	}
	b.ResetTimer()
	for range b.N {
		idx := b.TempDir()
		res, err := Run(context.Background(), Options{Roots: []string{arch}, Secret: secret, IndexDir: idx, Workers: 2})
		if err != nil || len(res.Recordings) != 1000 {
			b.Fatalf("%v, %d recordings", err, len(res.Recordings))
		}
	}
}
