//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// setWidth lays the page out for a window width px wide.
func setWidth(t testing.TB, ctx context.Context, px int64) {
	t.Helper()
	if _, err := chromedp.Call(ctx, emulation.SetDeviceMetricsOverride, emulation.SetDeviceMetricsOverrideParams{
		Width: px, Height: 1000, DeviceScaleFactor: 1, Mobile: px < 600}); err != nil {
		t.Fatal(err)
	}
	afterFrames(t, ctx)
}

// smallestChartText returns the smallest size, in CSS pixels as drawn, of
// the text of the charts on the page, and how many texts there are.
func smallestChartText(t testing.TB, ctx context.Context) (px float64, n int) {
	t.Helper()
	r := eval[[]float64](t, ctx, `(() => {
		let least = Infinity, n = 0;
		for (const svg of document.querySelectorAll(".svg-mount svg")) {
			const scale = svg.getBoundingClientRect().width / svg.viewBox.baseVal.width;
			for (const tx of svg.querySelectorAll("text")) {
				least = Math.min(least, parseFloat(getComputedStyle(tx).fontSize) * scale);
				n++;
			}
		}
		return [least, n];
	})()`)
	return r[0], int(r[1])
}

// TestSmallScreen lays the demo out 400 px wide: the page does not scroll
// sideways, every cell header fits, and chart text stays at least 10 px;
// at 1,400 px the chart text stays so too.
func TestSmallScreen(t *testing.T) {
	ctx := openDemo(t)
	for _, w := range []int64{400, 1400} {
		setWidth(t, ctx, w)
		if sw := eval[int64](t, ctx, `document.documentElement.scrollWidth`); sw > w {
			t.Errorf("%d px: the page is %d px wide and scrolls sideways", w, sw)
		}
		out := eval[[]string](t, ctx, `[...document.querySelectorAll(".cell-head")].filter(h => {
			const box = h.getBoundingClientRect();
			return [...h.querySelectorAll("button, .state, input")].some(e => { const r = e.getBoundingClientRect(); return r.right > box.right + 0.5 || r.left < box.left - 0.5; });
		}).map(h => h.closest("section").id)`)
		if len(out) > 0 {
			t.Errorf("%d px: cell headers with a control outside them: %v", w, out)
		}
		px, n := smallestChartText(t, ctx)
		if n == 0 {
			t.Fatalf("%d px: no chart text", w)
		}
		if px < 10 {
			t.Errorf("%d px: chart text as small as %.1f px", w, px)
		}
		t.Logf("%d px: smallest of %d chart texts %.1f px", w, n, px)
	}
}

// TestOwnBudgetShots saves screenshots of a budget of one's own at 1,400
// and 400 px into the folder named by LIXIV_SHOTS: the new budget, the
// import banner and the samples cell with its problem. It is skipped when
// LIXIV_SHOTS is unset; the pictures are for looking at.
func TestOwnBudgetShots(t *testing.T) {
	dir := os.Getenv("LIXIV_SHOTS")
	if dir == "" {
		t.Skip("LIXIV_SHOTS not set")
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	ctx := openDemo(t)
	shot := func(name string, full bool) {
		t.Helper()
		var png []byte
		var err error
		if full {
			png, err = chromedp.Run(ctx, chromedp.FullScreenshot(100))
		} else {
			png, err = chromedp.Run(ctx, chromedp.CaptureScreenshot())
		}
		if err != nil {
			t.Fatal(err)
		}
		save(t, filepath.Join(dir, name+".png"), png)
	}
	element := func(name, selector string) {
		t.Helper()
		png, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS(selector)))
		if err != nil {
			t.Fatal(err)
		}
		save(t, filepath.Join(dir, name+".png"), png)
	}
	// The demo on a narrow screen: the top, and a cell with a long title and a chart.
	setWidth(t, ctx, 400)
	shot("demo-top-400", false)
	element("demo-co2-400", "section.kind-co2")
	setWidth(t, ctx, 1400)
	// A file opened over the demo: the question, then the demo's values
	// marked beside the file's.
	openFile(t, ctx, sallowmere("sallowmere-samples.csv"))
	waitFor(t, ctx, "the question", `!!document.getElementById("file-choice")`)
	for _, w := range []int64{1400, 400} {
		setWidth(t, ctx, w)
		element(fmt.Sprintf("question-%d", w), "#file-choice")
	}
	setWidth(t, ctx, 1400)
	click(t, ctx, "#choice-demo")
	for _, w := range []int64{1400, 400} {
		setWidth(t, ctx, w)
		element(fmt.Sprintf("demo-site-%d", w), "section.kind-site")
	}
	setWidth(t, ctx, 1400)
	newBudget(t, ctx)
	for _, w := range []int64{1400, 400} {
		setWidth(t, ctx, w)
		eval[bool](t, ctx, `(window.scrollTo(0, 0), true)`)
		shot(fmt.Sprintf("new-budget-%d", w), true)
	}
	setWidth(t, ctx, 1400)
	openTable(t, ctx, sallowmere("sallowmere-samples.csv"), "Samples")
	for _, w := range []int64{1400, 400} {
		setWidth(t, ctx, w)
		element(fmt.Sprintf("banner-%d", w), "#import-banner")
		element(fmt.Sprintf("problem-cell-%d", w), "#cell-samples")
	}
	setWidth(t, ctx, 1400)
	openTable(t, ctx, sallowmere("sallowmere-discharge.csv"), "Discharge")
	edit(t, ctx, "#p-site-area_km2", "250")
	edit(t, ctx, "#p-site-water_year_start_month", "1")
	waitIdle(t, ctx)
	for _, w := range []int64{1400, 400} {
		setWidth(t, ctx, w)
		eval[bool](t, ctx, `(window.scrollTo(0, 0), true)`)
		shot(fmt.Sprintf("own-budget-top-%d", w), false)
		element(fmt.Sprintf("discharge-%d", w), "#cell-discharge")
		element(fmt.Sprintf("site-%d", w), "#cell-site")
	}
}
