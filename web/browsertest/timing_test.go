//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"testing"
	"time"

	"github.com/chromedp/chromedp"

	"lixiv/engine/notebook/atlimits"
)

// TestTiming measures, without asserting anything, the time from
// navigation to the first render of the demo (cold: empty profile; warm:
// a reload served by the service worker), medians of loadRuns loads, the
// bytes the first load transferred, and the time from an edit of a rain
// ratio to the repainted result, with the apportionment at 2,000 draws.
// Run it with `make browser-timing`, which builds the page with the timing
// probes (-tags timing).
func TestTiming(t *testing.T) {
	if os.Getenv("LIXIV_TIMING") == "" {
		t.Skip("LIXIV_TIMING not set")
	}
	srv := startDemoServer(t)
	var cold, warm, computed, after, sent, coldCompile, warmCompile, demoSteps, demoCharts []float64
	for i := 0; i < timingRuns; i++ {
		ctx := newBrowser(t, "")
		open(t, ctx, srv.URL)
		if eval[string](t, ctx, `typeof lixivLastBuild`) != "number" {
			t.Fatal("the page has no timing probes: build it with LIXIV_TAGS=timing (make browser-timing does)")
		}
		cold = append(cold, eval[float64](t, ctx, `lixivBoot.firstRender`))
		coldCompile = append(coldCompile, eval[float64](t, ctx, compileTime))
		waitIdle(t, ctx)
		computed = append(computed, eval[float64](t, ctx, `performance.now()`))
		after = append(after, computed[len(computed)-1]-cold[len(cold)-1])
		demoSteps = append(demoSteps, eval[float64](t, ctx, `lixivLastStep`))
		demoCharts = append(demoCharts, eval[float64](t, ctx, `lixivLastCharts`))
		if i == 0 {
			t.Logf("timing: first load transferred (bytes, headers included): %s", eval[string](t, ctx, transferred))
			t.Logf("timing: the first load's marks (ms after navigation): boot.js %.0f, module compiled %.0f, %s; first render %.0f",
				eval[float64](t, ctx, `lixivBoot.start`), eval[float64](t, ctx, `lixivBoot.compiled`), eval[string](t, ctx, `window.lixivMarks || ""`), cold[0])
		}
		sent = append(sent, eval[float64](t, ctx, `performance.getEntriesByType("navigation").concat(performance.getEntriesByType("resource")).reduce((s, e) => s + e.transferSize, 0)`))
		time.Sleep(1500 * time.Millisecond) // let the service worker install
		if err := chromedp.Do(ctx, chromedp.Reload()); err != nil {
			t.Fatal(err)
		}
		waitReady(t, ctx)
		warm = append(warm, eval[float64](t, ctx, `lixivBoot.firstRender`))
		warmCompile = append(warmCompile, eval[float64](t, ctx, compileTime))
	}
	t.Logf("timing: first load, bytes transferred (every file the page fetched, headers included): median %.0f", median(sent))
	t.Logf("timing: first render, cold (empty profile): %s", stats(cold))
	t.Logf("timing: of which fetching and compiling the module: %s", stats(coldCompile))
	t.Logf("timing: first render, reload from the service worker: %s", stats(warm))
	t.Logf("timing: of which fetching and compiling the module: %s", stats(warmCompile))
	t.Logf("timing: demo fully computed after navigation (cold): %s", stats(computed))
	t.Logf("timing: demo fully computed after first render (cold): %s", stats(after))
	t.Logf("timing: of which computing (engine steps on the page's thread, with their waits for the workers and yields): %s; drawing the charts: %s", stats(demoSteps), stats(demoCharts))

	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	t.Logf("timing: computed with %d Web Workers (0: on the page's own thread; %d cores)", eval[int](t, ctx, `window.lixivPool ? lixivPool.size : 0`), eval[int](t, ctx, `navigator.hardwareConcurrency`))
	if ap := eval[string](t, ctx, `(document.querySelector("section.kind-apportionment") || {id: ""}).id`); ap != "" {
		setField(t, ctx, "#p-"+ap[len("cell-"):]+"-draws", "2000")
	}
	atm := cellOf(t, ctx, "atmosphere")
	var edits, first, quick, quickDone, steps, charts []float64
	for i := 0; i < timingRuns; i++ {
		edit(t, ctx, "#p-"+atm+"-na_per_cl", fmt.Sprintf("%.3f", 0.80+0.01*float64(i%5)))
		edits = append(edits, eval[float64](t, ctx, `lixivLastRecompute`))
		first = append(first, eval[float64](t, ctx, `lixivLastFirstPaint`))
		quick = append(quick, eval[float64](t, ctx, `lixivLastQuickPaint`))
		quickDone = append(quickDone, eval[float64](t, ctx, `lixivLastQuick`))
		steps = append(steps, eval[float64](t, ctx, `lixivLastStep`))
		charts = append(charts, eval[float64](t, ctx, `lixivLastCharts`))
	}
	t.Logf("timing: edit of a rain ratio to first repaint: %s", stats(first))
	t.Logf("timing: edit of a rain ratio to repainted result at 2000 draws (every cell's point values; flux and CO2 intervals still computing): %s", stats(quick))
	t.Logf("timing: of which the quick pass (edit to point values computed, before the render): %s", stats(quickDone))
	t.Logf("timing: the last of those repaints: %s; its steps began at (ms after the edit): %s", eval[string](t, ctx, `lixivLastQuickRender`), eval[string](t, ctx, `lixivQuickSteps`))
	t.Logf("timing: edit of a rain ratio to repainted result with every interval: %s", stats(edits))
	t.Logf("timing: of which computing (engine steps, with their yields to the browser): %s", stats(steps))
	t.Logf("timing: of which drawing the charts again: %s", stats(charts))
	note := cellOf(t, ctx, "note")
	var notes []float64
	for i := 0; i < timingRuns; i++ {
		edit(t, ctx, "#note-"+note, fmt.Sprintf("Field note %d", i))
		notes = append(notes, eval[float64](t, ctx, `lixivLastRecompute`))
	}
	t.Logf("timing: edit of a note (no science downstream) to repainted page: %s", stats(notes))
	var renders, builds, syncs []float64
	for i := 0; i < timingRuns; i++ {
		eval[bool](t, ctx, `document.querySelector("section.cell .fold").click() || true`)
		time.Sleep(150 * time.Millisecond)
		renders = append(renders, eval[float64](t, ctx, `lixivLastRender`))
		builds = append(builds, eval[float64](t, ctx, `lixivLastBuild`))
		syncs = append(syncs, eval[float64](t, ctx, `lixivLastSync`))
	}
	t.Logf("timing: one full render of the page (a fold click): %s", stats(renders))
	t.Logf("timing: of which building the page: %s; syncing it to the DOM: %s", stats(builds), stats(syncs))
	t.Logf("timing: (the page holds %d elements)", eval[int](t, ctx, `document.querySelectorAll("*").length`))
	// Responsiveness during a long run: the longest gap of a 10 ms
	// heartbeat and the longest task the browser saw (PerformanceObserver).
	if ap := eval[string](t, ctx, `(document.querySelector("section.kind-apportionment") || {id: ""}).id`); ap != "" {
		draws := "#p-" + ap[len("cell-"):] + "-draws"
		var gaps, longs, runs []float64
		for i := 0; i < timingRuns; i++ {
			eval[bool](t, ctx, `(() => { window.lixivGap = 0; window.lixivLong = 0; let last = performance.now();
				window.lixivBeat = setInterval(() => { const n = performance.now(); lixivGap = Math.max(lixivGap, n - last); last = n; }, 10);
				window.lixivLongObs = new PerformanceObserver(l => l.getEntries().forEach(e => { lixivLong = Math.max(lixivLong, e.duration) }));
				lixivLongObs.observe({type: "longtask"});
				return true })()`)
			edit(t, ctx, draws, fmt.Sprint(40000+i%2))
			gaps = append(gaps, eval[float64](t, ctx, `(() => { clearInterval(lixivBeat); lixivLongObs.disconnect(); return lixivGap })()`))
			longs = append(longs, eval[float64](t, ctx, `lixivLong`))
			runs = append(runs, eval[float64](t, ctx, `lixivLastRecompute`))
		}
		t.Logf("timing: a 40000-draw run (40,000 and 40,001 in turn) took %s", stats(runs))
		t.Logf("timing: longest main-thread stall during it (10 ms heartbeat gap): %s", stats(gaps))
		t.Logf("timing: longest main-thread task during it (longtask observer; 0: none over 50 ms): %s (longest engine slice between the runner's hand-backs, not counting waits for the workers: %s)",
			stats(longs), eval[string](t, ctx, `window.lixivLongestSlice || ""`))
	}
	samples := eval[int](t, ctx, `document.querySelectorAll("section.kind-samples table.out tbody tr").length`)
	t.Logf("timing: (demo shows %d sample rows)", samples)
}

// compileTime is the time from the start of boot.js to the module compiled.
const compileTime = `lixivBoot.compiled - lixivBoot.start`

// transferred lists, as text, each file the page fetched with the bytes
// that came over the wire for it and its size decoded.
const transferred = `performance.getEntriesByType("navigation").concat(performance.getEntriesByType("resource"))
	.map(e => e.name.replace(location.origin, "") + " " + e.transferSize + " (" + e.decodedBodySize + " decoded)").join("; ")`

func median(v []float64) float64 {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	if len(s) == 0 {
		return 0
	}
	return s[len(s)/2]
}

// setField edits a field to value, unless it holds it already (an edit
// to the same value computes nothing).
func setField(t *testing.T, ctx context.Context, selector, value string) {
	if eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).value`, selector)) != value {
		edit(t, ctx, selector, value)
	}
}

// timingRuns is how many times each figure is measured (8, or
// LIXIV_TIMING_RUNS for a quick look); stats reports their median.
var timingRuns = func() int {
	if n, err := strconv.Atoi(os.Getenv("LIXIV_TIMING_RUNS")); err == nil && n > 0 {
		return n
	}
	return 8
}()

func stats(v []float64) string {
	s := append([]float64(nil), v...)
	sort.Float64s(s)
	if len(s) == 0 {
		return "no data"
	}
	return fmt.Sprintf("median %.0f ms (min %.0f, max %.0f, n=%d)", s[len(s)/2], s[0], s[len(s)-1], len(s))
}

// atLimitsFile writes the budget at the engine's limits
// (engine/notebook/atlimits) to a file for the file picker.
func atLimitsFile(t *testing.T) string {
	t.Helper()
	demo, err := os.ReadFile(filepath.Join(repo, "examples", "corrie-vale", "corrie-vale.lixiv.json"))
	if err != nil {
		t.Fatal(err)
	}
	d, err := atlimits.Budget(demo)
	if err != nil {
		t.Fatal(err)
	}
	file := filepath.Join(t.TempDir(), "at-limits.lixiv.json")
	if err := os.WriteFile(file, d.Marshal(), 0o644); err != nil {
		t.Fatal(err)
	}
	return file
}

// TestTimingAtLimits opens the costliest budget the engine's limits allow
// (engine/notebook/atlimits: 4,000 samples × 1,000 draws, 200 years of
// daily discharge, every series bootstrapped at the limit) through the file
// picker and reports, without asserting anything, how long the page takes
// to compute it and the longest stretch the main thread went without
// handing back to the browser meanwhile, or, when it is not done within
// the browser's session, how far each cell got. Run it with `make
// browser-timing`.
func TestTimingAtLimits(t *testing.T) {
	if os.Getenv("LIXIV_TIMING") == "" {
		t.Skip("LIXIV_TIMING not set")
	}
	file := atLimitsFile(t)
	srv := startDemoServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	eval[bool](t, ctx, `(() => { window.lixivGap = 0; window.lixivT0 = performance.now(); let last = lixivT0;
		window.lixivBeat = setInterval(() => { const n = performance.now(); lixivGap = Math.max(lixivGap, n - last); last = n; }, 10);
		return true })()`)
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
		t.Fatal(err)
	}
	js := fmt.Sprintf(`document.body.dataset.gen !== %q && document.body.dataset.busy === "0"`, gen)
	// The browser's session ends at sessionLimit: stop waiting well before,
	// and say how far the page got.
	wait := sessionLimit - 5*time.Minute
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(wait), chromedp.WithPollingInterval(time.Second))); err != nil {
		where := eval[string](t, ctx, `[...document.querySelectorAll("section.cell")].map(s => s.id.replace("cell-", "") + " " +
			s.className.replace(/.*state-/, "") + (s.querySelector("progress") ? " " + Math.round(100 * s.querySelector("progress").value) + " %" : "")).join(", ")`)
		t.Logf("timing: budget at the limits (%d samples × %d draws, %d days, %d replicates per series) not computed after %.0f min (longest main-thread stall so far %.0f ms); the cells: %s",
			atlimits.Samples, atlimits.Draws, atlimits.Days, atlimits.Replicates, wait.Minutes(), eval[float64](t, ctx, `lixivGap`), where)
		return
	}
	took := eval[float64](t, ctx, `(() => { clearInterval(lixivBeat); return performance.now() - lixivT0 })()`)
	gap := eval[float64](t, ctx, `lixivGap`)
	slice := eval[string](t, ctx, `window.lixivLongestSlice || ""`)
	bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting")].map(s => s.id)`)
	t.Logf("timing: budget at the limits (%d samples × %d draws, %d days, %d replicates per series) opened and computed in %.0f s; longest main-thread stall %.0f ms (longest engine slice without a yield: %s); cells with problems: %q",
		atlimits.Samples, atlimits.Draws, atlimits.Days, atlimits.Replicates, took/1000, gap, slice, bad)
}
