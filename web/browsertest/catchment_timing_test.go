//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"lixiv/engine/notebook"
)

// catchmentBudget100x4 writes a budget for the catchment-wide model at the
// size of its speed goal (BenchmarkCatchment100x4 in engine/mix): the
// Scarrow Ghyll example with its samples replaced by 100 invented weekly
// waters of a fictional catchment of our own mixed from four sources (the
// granite silicate, a basaltic silicate, carbonate and evaporite, at the
// central ratios of the budget's end-member table, each sample's own
// ratios scattered by 10 %), the sources' shares of the cation charge
// uniform on the simplex and the charge log-uniform between 100 and
// 2,000 µeq/L, measured at 3 %, with a little rain (the rain method); the
// end-member table gains the basaltic silicate, and the apportionment
// reads Ca/Na, Mg/Na, HCO3/Na, Cl/Na and K/Na. It returns the file's path.
func catchmentBudget100x4(t testing.TB) string {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(repo, "examples", "scarrow-ghyll", "scarrow-ghyll.lixiv.json"))
	if err != nil {
		t.Fatal(err)
	}
	d, err := notebook.Parse(data, "scarrow-ghyll.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Title = "Catchment-wide model, 100 samples and four sources (timing)"
	src := d.Cell("sources").Table
	// The basaltic silicate: trade ranges from memory (engine/mix
	// PresetBasaltic), read as 95 % log-normal ranges.
	for _, r := range [][4]string{{"Ca/Na", "0.7", "1", "3"}, {"Mg/Na", "0.5", "1", "3"}, {"K/Na", "0.02", "0.1", "0.3"}, {"HCO3/Na", "3", "5", "10"}} {
		src.Rows = append(src.Rows, []string{"basalt", "silicate", r[0], r[1], r[2], r[3], "log-normal", "trade ranges from memory"})
	}
	src.Source = nil
	central := map[string]map[string]float64{}
	for _, r := range src.Rows {
		if central[r[0]] == nil {
			central[r[0]] = map[string]float64{}
		}
		v, err := strconv.ParseFloat(r[4], 64)
		if err != nil {
			t.Fatal(err)
		}
		central[r[0]][r[2]] = v
	}
	ems := []string{"silicate (global)", "basalt", "carbonate", "evaporite"}
	rng := rand.New(rand.NewPCG(100, 4))
	cols := []string{"Na", "K", "Ca", "Mg", "Cl", "Alk"}
	st := &notebook.Table{Columns: append([]string{"sample", "date"}, cols...), Units: []string{"", "", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µeq/L"}}
	day := time.Date(2021, 10, 4, 0, 0, 0, 0, time.UTC)
	for i := range 100 {
		// Shares of the cation charge uniform on the simplex.
		share := make([]float64, len(ems))
		sum := 0.0
		for j := range share {
			share[j] = -math.Log(1 - rng.Float64())
			sum += share[j]
		}
		charge := 100 * math.Pow(20, rng.Float64())
		c := map[string]float64{"Cl": 2} // the rain's
		for j, em := range ems {
			r := func(name string) float64 { return central[em][name] * math.Exp(0.1*rng.NormFloat64()) }
			k, ca, mg := r("K/Na"), r("Ca/Na"), r("Mg/Na")
			na := share[j] / sum * charge / (1 + k + 2*ca + 2*mg)
			c["Na"] += na
			c["K"] += na * k
			c["Ca"] += na * ca
			c["Mg"] += na * mg
			c["Cl"] += na * central[em]["Cl/Na"]
			c["Alk"] += na * r("HCO3/Na")
		}
		row := []string{fmt.Sprintf("TW-%03d", i+1), day.AddDate(0, 0, 7*i).Format("2006-01-02")}
		for _, sp := range cols {
			row = append(row, strconv.FormatFloat(c[sp]*math.Exp(0.03*rng.NormFloat64()), 'f', 2, 64))
		}
		st.Rows = append(st.Rows, row)
	}
	d.Cell("samples").Table = st
	rain := d.Cell("rain")
	rain.Settings.(*notebook.AtmosphereSettings).Method = "rain"
	rain.Table = &notebook.Table{Columns: []string{"Na", "Cl"}, Units: []string{"µmol/L", "µmol/L"}, Rows: [][]string{{"1.7", "2"}}}
	ap := d.Cell("apportionment").Settings.(*notebook.ApportionmentSettings)
	ap.Tracers = []string{"Ca/Na", "Mg/Na", "HCO3/Na", "Cl/Na", "K/Na"}
	file := filepath.Join(t.TempDir(), "catchment-100x4.lixiv.json")
	if err := os.WriteFile(file, d.Marshal(), 0o644); err != nil {
		t.Fatal(err)
	}
	return file
}

// TestCatchmentBudget100x4 computes the timing's budget natively: its
// apportionment runs the catchment-wide model (the counting check passes)
// on 100 samples with four end-members and five tracers.
func TestCatchmentBudget100x4(t *testing.T) {
	file := catchmentBudget100x4(t)
	data, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	d, err := notebook.Parse(data, filepath.Base(file))
	if err != nil {
		t.Fatal(err)
	}
	start := time.Now()
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	for _, c := range d.Cells {
		if st, err := d.Status(c.ID); st != notebook.UpToDate {
			t.Errorf("cell %s: %v %v", c.ID, st, err)
		}
	}
	a := d.Output("apportionment").Value.(*notebook.Apportioned)
	c := a.Catchment
	if c == nil || c.Fallback != "" || c.Samples != 100 || len(c.Ratios) < 12 {
		t.Fatalf("catchment-wide model: %+v, want it run on 100 samples and four end-members", c)
	}
	t.Logf("natively: %.1f s; %d shared ratios, %d steps per chain, largest R-hat %.3f, smallest ESS %.0f, converged %v",
		time.Since(start).Seconds(), len(c.Ratios), c.Steps, c.MaxRHat, c.MinESS, c.Converged)
}

// TestTimingCatchment times the catchment-wide model of 100 samples and
// four end-members (catchmentBudget100x4) in the page: from the moment the
// apportionment cell starts (its quick pass) to the moment it shows every
// interval (its full pass done), as the page's cell states show them,
// looked at every 10 ms (so within the page's 40 ms hand-backs of its
// thread); with the page's default workers, one worker and none. Printed,
// never asserted.
func TestTimingCatchment(t *testing.T) {
	if os.Getenv("LIXIV_TIMING") == "" {
		t.Skip("LIXIV_TIMING not set")
	}
	file := catchmentBudget100x4(t)
	srv := startDemoServer(t)
	for _, query := range []string{"", "?workers=1", "?workers=0"} {
		var spans, totals, jobs, walls, busies []float64
		for range min(timingRuns, 5) {
			ctx := newBrowser(t, "")
			open(t, ctx, srv.URL+query)
			waitIdle(t, ctx)
			gen := eval[string](t, ctx, `document.body.dataset.gen`)
			eval[bool](t, ctx, `(() => { window.lixivT0 = performance.now(); window.lixivApStart = 0; window.lixivApEnd = 0;
				window.lixivWatch = setInterval(() => {
					const c = document.querySelector("section.kind-apportionment"), now = performance.now();
					if (!c) { return; }
					if (!lixivApStart && c.classList.contains("state-running")) { lixivApStart = now; }
					if (lixivApStart && !lixivApEnd && c.classList.contains("state-ok")) { lixivApEnd = now; }
				}, 10);
				return true })()`)
			eval[bool](t, ctx, `(() => { if (window.lixivPool && lixivPool.stats) { lixivPool.stats = {jobs: 0, wall: 0, busy: 0} } return true })()`)
			if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
				t.Fatal(err)
			}
			js := fmt.Sprintf(`document.body.dataset.gen !== %q && document.body.dataset.busy === "0"`, gen)
			if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(5*time.Minute), chromedp.WithPollingInterval(100*time.Millisecond))); err != nil {
				t.Fatalf("the budget was not computed: %v", err)
			}
			if bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting")].map(s => s.id)`); len(bad) > 0 {
				t.Fatalf("cells with problems %q", bad)
			}
			span := eval[float64](t, ctx, `lixivApEnd && lixivApStart ? lixivApEnd - lixivApStart : -1`)
			if span < 0 {
				t.Fatal("the apportionment cell was not seen running and then computed")
			}
			spans = append(spans, span)
			if eval[int](t, ctx, `lixivPool.size`) > 0 {
				jobs = append(jobs, eval[float64](t, ctx, `lixivPool.stats.jobs`))
				walls = append(walls, eval[float64](t, ctx, `lixivPool.stats.wall`))
				busies = append(busies, eval[float64](t, ctx, `lixivPool.stats.busy / lixivPool.size`))
			}
			totals = append(totals, eval[float64](t, ctx, `performance.now() - lixivT0`))
		}
		t.Logf("timing: catchment-wide model, 100 samples × 4 end-members + K/Na, page%s: apportionment from its start to all its intervals %s; whole budget after opening %s",
			query, stats(spans), stats(totals))
		if len(jobs) > 0 {
			t.Logf("timing: of the whole budget, page%s: jobs on the workers %s, from each job's start to its last result %s, the workers' time on their parts per worker %s",
				query, stats(jobs), stats(walls), stats(busies))
		}
	}
}
