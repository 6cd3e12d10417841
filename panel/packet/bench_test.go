package packet

import (
	"context"
	"fmt"
	"path/filepath"
	"testing"
)

// BenchmarkBuild500x7 builds 500 items (21 channels, 16 s at 256 Hz, as
// excerpt cuts them from a 256 Hz recording) for 7
// raters; the target is under 30 s per build.
func BenchmarkBuild500x7(b *testing.B) {
	items := SynthItems(500, 16, 256, 1)
	dir := b.TempDir()
	raters := []string{"r1", "r2", "r3", "r4", "r5", "r6", "r7"}
	var size int64
	n := 0
	for b.Loop() {
		opt := testOptions(filepath.Join(dir, fmt.Sprint(n)), raters...)
		n++
		res, err := Build(context.Background(), items, opt)
		if err != nil {
			b.Fatal(err)
		}
		size = res.Packets[0].PageBytes
	}
	b.ReportMetric(float64(size)/1e6, "MB/packet")
}

// BenchmarkBuild300 builds one 300-item packet and reports its size.
func BenchmarkBuild300(b *testing.B) {
	items := SynthItems(300, 16, 256, 11)
	dir := b.TempDir()
	var size int64
	n := 0
	for b.Loop() {
		res, err := Build(context.Background(), items, testOptions(filepath.Join(dir, fmt.Sprint(n)), "alice"))
		n++
		if err != nil {
			b.Fatal(err)
		}
		size = res.Packets[0].PageBytes
	}
	b.ReportMetric(float64(size)/1e6, "MB/packet")
}
