package discharge

import (
	"fmt"
	"strings"
	"testing"
)

// BenchmarkReadSubDaily reads ten years of 15-minute readings (350,640 rows).
func BenchmarkReadSubDaily(b *testing.B) {
	var sb strings.Builder
	sb.WriteString("Timestamp,Q (L/s)\n")
	for d := Date(2011, 1, 1); d < Date(2021, 1, 1); d++ {
		for m := 0; m < 24*60; m += 15 {
			fmt.Fprintf(&sb, "%sT%02d:%02d,%d\n", d, m/60, m%60, 500+int(d)%97+m%13)
		}
	}
	text := sb.String()
	b.SetBytes(int64(len(text)))
	b.ResetTimer()
	for b.Loop() {
		imp := ReadString(text, Options{})
		if imp.Problems.Err() != nil || imp.Record.Len() != 3653 {
			b.Fatalf("%v, %d days", imp.Problems.Err(), imp.Record.Len())
		}
	}
}
