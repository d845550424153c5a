//go:build browser

package browsertest

import (
	"encoding/json"
	"os"
	"sort"
	"testing"

	"github.com/chromedp/cdproto/cdp"
	"github.com/chromedp/cdproto/profiler"
	"github.com/chromedp/chromedp"
)

// TestProfileDemo records, without asserting anything, a CPU profile of
// the page's own thread from navigation until the demo is computed, and
// logs the functions that take the most of it (self time). Set
// LIXIV_PROFILE to a file to run it (`make browser-profile`); the profile
// is written there, for Chromium's developer tools. The Web Workers are
// other threads and are not in it.
func TestProfileDemo(t *testing.T) {
	out := os.Getenv("LIXIV_PROFILE")
	if out == "" {
		t.Skip("LIXIV_PROFILE not set")
	}
	srv := startDemoServer(t)
	ctx := newBrowser(t, "")
	if _, err := chromedp.Call(ctx, profiler.Enable, cdp.Empty{}); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Call(ctx, profiler.SetSamplingInterval, profiler.SetSamplingIntervalParams{Interval: 200}); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Call(ctx, profiler.Start, cdp.Empty{}); err != nil {
		t.Fatal(err)
	}
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
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
	name := map[int64]string{}
	for _, n := range p.Nodes {
		name[n.ID] = n.CallFrame.FunctionName
		if name[n.ID] == "" {
			name[n.ID] = "(anonymous " + n.CallFrame.URL + ")"
		}
	}
	self := map[string]float64{}
	total := 0.0
	for i, id := range p.Samples {
		if i < len(p.TimeDeltas) {
			d := float64(p.TimeDeltas[i]) / 1000
			self[name[id]] += d
			total += d
		}
	}
	type fn struct {
		name string
		ms   float64
	}
	var fs []fn
	for n, ms := range self {
		fs = append(fs, fn{n, ms})
	}
	sort.Slice(fs, func(i, j int) bool { return fs[i].ms > fs[j].ms })
	t.Logf("profile: the page's thread, %.0f ms from navigation to the demo computed", total)
	for i, f := range fs {
		if i == 40 {
			break
		}
		t.Logf("profile: %7.0f ms %5.1f %%  %s", f.ms, 100*f.ms/total, f.name)
	}
}
