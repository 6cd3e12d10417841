package importer

import (
	"context"
	"fmt"
	"path/filepath"
	"strings"
	"testing"
)

// BenchmarkRunCSV imports 100 000 rows (half clock times) into one recording.
func BenchmarkRunCSV(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("recording,onset,channel,score\n")
	for i := range 100000 {
		if i%2 == 0 {
			fmt.Fprintf(&sb, "rec-aaaa,%.3f,T7,0.5\n", float64(i)*0.25)
		} else {
			s := 22*3600 + 30*60 + float64(i)*0.25
			h := int(s/3600) % 24
			fmt.Fprintf(&sb, "PT01_night.edf,%02d:%02d:%06.3f,T8,0.7\n", h, int(s/60)%60, s-60*float64(int(s/60)))
		}
	}
	dir := b.TempDir()
	f := writeFile(b, dir, "big.csv", sb.String())
	o := Options{Files: []string{f}, Kind: KindCSV, Source: "bench", Recordings: testRecordings(), Measure: stubMeasure,
		OutDir: filepath.Join(dir, "c"), Replace: true}
	b.ReportAllocs()
	for b.Loop() {
		res, err := Run(context.Background(), o)
		if err != nil || res.Kept != 100000 {
			b.Fatalf("%v kept %d rejected %v", err, res.Kept, res.Rejected[:min(3, len(res.Rejected))])
		}
	}
}
