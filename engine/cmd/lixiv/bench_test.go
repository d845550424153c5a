package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"testing"

	"lixiv/examples/synth"
)

// writeBatch writes n budgets of 100 samples each with the given draws
// into dir: one year of daily discharge, inverse model, 200 bootstrap
// replicates for the headline fluxes, each catchment with its own invented
// noise.
func writeBatch(tb testing.TB, dir string, n, draws int) []string {
	tb.Helper()
	paths := make([]string, n)
	for i := range paths {
		t := synth.CorrieVale()
		t.Name, t.Code, t.Title, t.Seed = fmt.Sprintf("Batch catchment %d", i+1), "B", "Batch budget", uint64(1000+i)
		t.Days, t.NSamples = 365, 100
		d, err := t.Budget("granite", "inverse", draws, 200)
		if err != nil {
			tb.Fatal(err)
		}
		if err := d.SetParam("apportionment", "tracers", "Ca/Na, Mg/Na"); err != nil {
			tb.Fatal(err)
		}
		// Every setting but draws and tracers at its default, including
		// intervals for every flux series (series_bootstrap 200).
		paths[i] = filepath.Join(dir, fmt.Sprintf("b%04d.lixiv.json", i))
		if err := os.WriteFile(paths[i], d.Marshal(), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	return paths
}

func benchmarkBatch(b *testing.B, n int) {
	paths := writeBatch(b, b.TempDir(), n, 1000)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		for _, o := range batch(context.Background(), paths, runtime.NumCPU(), "") {
			if o.failed {
				b.Fatal(o.line)
			}
		}
	}
	b.ReportMetric(float64(b.Elapsed().Seconds())/float64(b.N), "s/batch")
}

// BenchmarkBatch1000 runs 1,000 budget files of 100 samples at 1,000 draws
// in one call on all cores (the goal is under a minute on two cores).
func BenchmarkBatch1000(b *testing.B) { benchmarkBatch(b, 1000) }

// BenchmarkBatch20 is the same batch at a fiftieth of the size, for quick runs.
func BenchmarkBatch20(b *testing.B) { benchmarkBatch(b, 20) }

func TestBatchRunsGeneratedBudgets(t *testing.T) {
	paths := writeBatch(t, t.TempDir(), 3, 100)
	for _, o := range batch(context.Background(), paths, 2, "") {
		if o.failed {
			t.Errorf("%s", o.line)
		}
	}
}
