// Command gen writes the example budgets in examples/, and the small golden
// budgets in testdata/budgets/ and the command-line test CSV files, from their invented truth (package synth),
// computes them and stores their results snapshot.
// Run it from the repository root: go run ./examples/gen
package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"

	"lixiv/examples/synth"
)

func main() {
	if err := run("."); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
}

func run(dir string) error {
	for _, ex := range append(synth.Examples, synth.Goldens...) {
		d, err := synth.Computed(context.Background(), ex)
		if err != nil {
			return fmt.Errorf("%s: %v", ex.File, err)
		}
		path := filepath.Join(dir, ex.File)
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			return err
		}
		if err := os.WriteFile(path, d.Marshal(), 0o644); err != nil {
			return err
		}
		fmt.Println("wrote", path)
	}
	smp, flow := synth.QuickCSV()
	for i, text := range []string{smp, flow} {
		path := filepath.Join(dir, synth.QuickFiles[i])
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			return err
		}
		fmt.Println("wrote", path)
	}
	return nil
}
