package discharge

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"text/tabwriter"

	"lixiv/engine/internal/golden"
)

func formatImport(imp *Import) string {
	var b strings.Builder
	fmt.Fprintf(&b, "notes:\n")
	for _, n := range imp.Notes {
		fmt.Fprintf(&b, "  %s\n", n)
	}
	fmt.Fprintf(&b, "problems:\n")
	for _, p := range imp.Problems {
		fmt.Fprintf(&b, "  %s\n", p)
	}
	fmt.Fprintf(&b, "notices:\n")
	for _, p := range imp.Notices {
		fmt.Fprintf(&b, "  %s (%s): %s\n", p.Severity, p.Effect, p)
	}
	fmt.Fprintf(&b, "gaps:\n")
	for _, g := range imp.Gaps {
		fmt.Fprintf(&b, "  %s\n", g)
	}
	tw := tabwriter.NewWriter(&b, 0, 8, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "day\tQ m3/s\t\n")
	for i, d := range imp.Record.Days {
		fmt.Fprintf(tw, "%s\t%.6g\t\n", d, imp.Record.Q[i])
	}
	tw.Flush()
	return b.String()
}

func TestGoldenMessy(t *testing.T) {
	f, err := os.Open(filepath.Join("..", "..", "testdata", "discharge_corrie_vale_messy.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	imp := Read(f, Options{File: "discharge_corrie_vale_messy.csv"})
	golden.Check(t, "messy.golden", []byte(formatImport(imp)))
}
