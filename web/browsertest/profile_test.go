//go:build browser

package browsertest

import (
	"encoding/json"
	"fmt"
	"os"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/profiler"
	"github.com/chromedp/chromedp"
)

// TestProfileDemo records, without asserting anything, a CPU profile of
// the page's own thread and logs the functions that take the most of it
// (self time), and those of its longest stretch without an idle moment
// (self and total time). Set LIXIV_PROFILE to a file to run it (`make
// browser-profile`); the profile is written there, for Chromium's
// developer tools. LIXIV_PROFILE_OF says what is profiled: "demo" (the
// default) from navigation until the demo is computed, "edit" an edit of a
// rain ratio with the apportionment at 2,000 draws, until it is computed,
// "draws" a run of the demo at 40,000 draws, "open" the opening of the
// budget at the engine's limits (engine/notebook/atlimits) through the
// file picker, for 20 s, "catchment" the opening of the 100-sample,
// four-source catchment-wide budget of TestTimingCatchment, for 12 s. The Web Workers are other
// threads and are not in it.
func TestProfileDemo(t *testing.T) {
	out := os.Getenv("LIXIV_PROFILE")
	if out == "" {
		t.Skip("LIXIV_PROFILE not set")
	}
	of := os.Getenv("LIXIV_PROFILE_OF")
	srv := startDemoServer(t)
	ctx := newBrowser(t, "")
	if _, err := chromedp.Call(ctx, profiler.Enable, cdp.Empty{}); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Call(ctx, profiler.SetSamplingInterval, profiler.SetSamplingIntervalParams{Interval: 200}); err != nil {
		t.Fatal(err)
	}
	start := func() {
		if _, err := chromedp.Call(ctx, profiler.Start, cdp.Empty{}); err != nil {
			t.Fatal(err)
		}
	}
	var what string
	switch of {
	case "", "demo":
		what = "from navigation to the demo computed"
		start()
		open(t, ctx, srv.URL)
		waitIdle(t, ctx)
	case "edit", "draws":
		open(t, ctx, srv.URL)
		waitIdle(t, ctx)
		ap := eval[string](t, ctx, `document.querySelector("section.kind-apportionment").id`)[len("cell-"):]
		if of == "edit" {
			setField(t, ctx, "#p-"+ap+"-draws", "2000")
			what = "an edit of a rain ratio at 2,000 draws, until computed"
			start()
			edit(t, ctx, "#p-"+cellOf(t, ctx, "atmosphere")+"-na_per_cl", "0.811")
		} else {
			what = "a run at 40,000 draws"
			start()
			edit(t, ctx, "#p-"+ap+"-draws", "40000")
		}
	case "open", "catchment":
		var file string
		var span time.Duration
		if of == "open" {
			file, what, span = atLimitsFile(t), "the budget at the limits opened, its first 20 s", 20*time.Second
		} else {
			file, what, span = catchmentBudget100x4(t), "the 100-sample, four-source catchment-wide budget opened, its first 12 s", 12*time.Second
		}
		open(t, ctx, srv.URL)
		waitIdle(t, ctx)
		start()
		openFile(t, ctx, file)
		time.Sleep(span)
	default:
		t.Fatalf("LIXIV_PROFILE_OF %q: demo, edit, draws, open or catchment", of)
	}
	res, err := chromedp.Call(ctx, profiler.Stop, cdp.Empty{})
	if err != nil {
		t.Fatal(err)
	}
	p := res.Profile
	data, err := json.Marshal(p)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(out, data, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("profile: wrote %s", out)
	logProfile(t, p, what)
}

// logProfile logs the heaviest functions of a profile by self time, then
// its longest busy stretch (no idle or garbage-collector-free sample
// between) with its heaviest functions by self and by total time.
func logProfile(t *testing.T, p *profiler.Profile, what string) {
	name := map[int64]string{}
	parent := map[int64]int64{}
	for _, n := range p.Nodes {
		name[n.ID] = n.CallFrame.FunctionName
		if name[n.ID] == "" {
			name[n.ID] = "(anonymous " + n.CallFrame.URL + ")"
		}
		for _, c := range n.Children {
			parent[c] = n.ID
		}
	}
	type fn struct {
		name string
		ms   float64
	}
	top := func(m map[string]float64, n int) []fn {
		var fs []fn
		for k, ms := range m {
			fs = append(fs, fn{k, ms})
		}
		sort.Slice(fs, func(i, j int) bool { return fs[i].ms > fs[j].ms })
		if len(fs) > n {
			fs = fs[:n]
		}
		return fs
	}
	self := map[string]float64{}
	total := 0.0
	// The longest stretch of samples none of which is idle.
	bestFrom, bestTo, bestMs, from, run := 0, 0, 0.0, 0, 0.0
	for i, id := range p.Samples {
		if i >= len(p.TimeDeltas) {
			break
		}
		d := float64(p.TimeDeltas[i]) / 1000
		self[name[id]] += d
		total += d
		if name[id] == "(idle)" {
			from, run = i+1, 0
			continue
		}
		run += d
		if run > bestMs {
			bestFrom, bestTo, bestMs = from, i+1, run
		}
	}
	t.Logf("profile: the page's thread, %.0f ms, %s", total, what)
	for _, f := range top(self, 40) {
		t.Logf("profile: %7.0f ms %5.1f %%  %s", f.ms, 100*f.ms/total, f.name)
	}
	self, incl := map[string]float64{}, map[string]float64{}
	for i := bestFrom; i < bestTo; i++ {
		d := float64(p.TimeDeltas[i]) / 1000
		id := p.Samples[i]
		self[name[id]] += d
		seen := map[string]bool{}
		for n, ok := id, true; ok; n, ok = parent[n] {
			if !seen[name[n]] {
				seen[name[n]] = true
				incl[name[n]] += d
			}
		}
	}
	t.Logf("profile: the longest busy stretch, %.0f ms:", bestMs)
	var line []string
	for _, f := range top(self, 25) {
		line = append(line, fmt.Sprintf("%s %.1f", f.name, f.ms))
	}
	t.Logf("profile: self (ms): %s", strings.Join(line, "; "))
	line = line[:0]
	for _, f := range top(incl, 60) {
		line = append(line, fmt.Sprintf("%s %.1f", f.name, f.ms))
	}
	t.Logf("profile: total (ms): %s", strings.Join(line, "; "))
}
