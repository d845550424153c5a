package notebook_test

import (
	"context"
	"os"
	"testing"

	"lixiv/engine/notebook"
	"lixiv/engine/notebook/atlimits"
)

// BenchmarkDemo computes the demo budget (Corrie Vale) from scratch on one
// goroutine, as the page does in the browser.
func BenchmarkDemo(b *testing.B) {
	data, err := os.ReadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < b.N; i++ {
		d, err := notebook.Parse(data, "corrie-vale")
		if err != nil {
			b.Fatal(err)
		}
		d.Workers = 1
		if err := d.Recompute(context.Background(), nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRainEdit times an edit of the rain cell and the recompute of
// the cells below it, the page's edit-to-result path.
func BenchmarkRainEdit(b *testing.B) {
	d := demoBudget(b)
	d.Workers = 1
	d.Recompute(context.Background(), nil)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		v := "0.86"
		if i%2 == 1 {
			v = "0.859120" // near the demo's seawater Na/Cl (Millero et al. 2008, from memory); only a value to edit to
		}
		d.SetParam("rain", "na_per_cl", v)
		if err := d.Recompute(context.Background(), nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFluxesEdit times an edit of the fluxes cell (its bootstrap seed)
// and the recompute of it and the cells below it (CO2, charts).
func BenchmarkFluxesEdit(b *testing.B) { benchFluxesEdit(b, "") }

// BenchmarkFluxesEditPointSeries is BenchmarkFluxesEdit with
// series_bootstrap 0: intervals for the cation sums only.
func BenchmarkFluxesEditPointSeries(b *testing.B) { benchFluxesEdit(b, "0") }

func benchFluxesEdit(b *testing.B, seriesBootstrap string) {
	d := demoBudget(b)
	d.Workers = 1
	if seriesBootstrap != "" {
		if err := d.SetParam("fluxes", "series_bootstrap", seriesBootstrap); err != nil {
			b.Fatal(err)
		}
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		d.SetParam("fluxes", "seed", []string{"2", "1"}[i%2])
		if err := d.Recompute(context.Background(), nil); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkRainEditQuickPass times the quick pass of a rain edit
// (Document.Quick): from the edit to point values in every cell, before
// the fluxes and CO2 cells are refined with their bootstrap intervals.
func BenchmarkRainEditQuickPass(b *testing.B) { benchRainEditQuickPass(b, "") }

// benchRainEditQuickPass times the quick pass of a rain edit with the rain
// cell's rain_ratio_uncertainty_percent set to ratioSpread ("" leaves the
// demo's value) and the settings in set (cell, name, value, …) changed.
func benchRainEditQuickPass(b *testing.B, ratioSpread string, set ...string) {
	d := demoBudget(b)
	if ratioSpread != "" {
		if err := d.SetParam("rain", "rain_ratio_uncertainty_percent", ratioSpread); err != nil {
			b.Fatal(err)
		}
	}
	for i := 0; i+2 < len(set); i += 3 {
		if err := d.SetParam(set[i], set[i+1], set[i+2]); err != nil {
			b.Fatal(err)
		}
	}
	d.Workers, d.Quick = 1, true
	ctx := context.Background()
	d.Recompute(ctx, nil)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		v := "0.86"
		if i%2 == 1 {
			v = "0.859120" // near the demo's seawater Na/Cl (Millero et al. 2008, from memory); only a value to edit to
		}
		d.SetParam("rain", "na_per_cl", v)
		for !d.QuickPassDone() {
			if _, err := d.Step(ctx, nil); err != nil {
				b.Fatal(err)
			}
		}
		b.StopTimer()
		d.Recompute(ctx, nil) // refine, untimed
		b.StartTimer()
	}
}

// BenchmarkRainEditQuickPassRatioSpread is BenchmarkRainEditQuickPass with
// a 10 % spread on the rain ratios, so that every draw of every sample
// redoes its rain correction.
func BenchmarkRainEditQuickPassRatioSpread(b *testing.B) {
	benchRainEditQuickPass(b, "10")
}

// BenchmarkRainEditQuickPassForwardRatioSpread is
// BenchmarkRainEditQuickPassRatioSpread with the forward model, whose
// draws each subtract from their own redone correction.
func BenchmarkRainEditQuickPassForwardRatioSpread(b *testing.B) {
	benchRainEditQuickPass(b, "10", "apportionment", "model", "forward")
}

// demoBudget reads the demo budget (Corrie Vale) for a benchmark.
func demoBudget(b *testing.B) *notebook.Document {
	b.Helper()
	data, err := os.ReadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		b.Fatal(err)
	}
	d, err := notebook.Parse(data, "corrie-vale")
	if err != nil {
		b.Fatal(err)
	}
	return d
}

// BenchmarkWorstAllowed computes, on one goroutine as the page does, the
// costliest budget the limits allow (package atlimits): 4,000 samples ×
// 1,000 draws with rain-ratio spread, 200 years of daily discharge, every
// series (each mineral's too) bootstrapped 647 times with a seasonal
// rating curve. It
// shows that the worst input computes in bounded time; it asserts no
// time.
func BenchmarkWorstAllowed(b *testing.B) {
	demo, err := os.ReadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		b.Fatal(err)
	}
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		d, err := atlimits.Budget(demo)
		if err != nil {
			b.Fatal(err)
		}
		d.Workers = 1
		b.StartTimer()
		if err := d.Recompute(context.Background(), nil); err != nil {
			b.Fatal(err)
		}
		b.StopTimer()
		for _, c := range d.Cells {
			if st, err := d.Status(c.ID); st != notebook.UpToDate {
				b.Fatalf("cell %s: %v %v", c.ID, st, err)
			}
		}
		b.StartTimer()
	}
}
