//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/chromedp"
)

// openPaired opens the Lintmoor–Whinlaw example (four sections and a
// comparison) through the file picker and waits until its comparison has
// computed: the last cell of a long recompute, so the wait is on the
// page's own busy flag and the cell's state, with a cap for a busy machine.
func openPaired(t *testing.T) context.Context {
	t.Helper()
	ctx := openDemo(t)
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	openFile(t, ctx, filepath.Join(repo, "examples", "lintmoor-whinlaw", "lintmoor-whinlaw.lixiv.json"))
	js := fmt.Sprintf(`document.body.dataset.gen !== %q && document.body.dataset.busy === "0" &&
		!!document.getElementById("cell-comparison") && document.getElementById("cell-comparison").className.includes("state-ok")`, gen)
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(200*time.Second))); err != nil {
		st := eval[string](t, ctx, `(document.getElementById("cell-comparison") || {className: "absent"}).className`)
		t.Fatalf("the comparison did not compute (%s): %v", st, err)
	}
	return ctx
}

// TestComparisonRenders: the paired example shows a heading for each of its
// four sections, marks its shared cells, and its comparison cell shows its
// figures, its tables (the differences per km² and per mm of runoff, the
// budgets, how the draws were shared, the feedstock, the years and the
// monitoring design), its three charts and its cautions; with one budget
// apportioned under another seed it warns that the uncertainty the budgets
// share is not carried as shared. With LIXIV_SHOTS set, it also saves
// pictures of the comparison cell there.
func TestComparisonRenders(t *testing.T) {
	ctx := openPaired(t)
	heads := eval[[]string](t, ctx, `[...document.querySelectorAll(".section-head")].map(e => e.textContent)`)
	want := []string{"Shared by every section", "Lintmoor Beck, before spreading", "Lintmoor Beck, after spreading",
		"Whinlaw Beck, before", "Whinlaw Beck, after", "Shared by every section"}
	if strings.Join(heads, "|") != strings.Join(want, "|") {
		t.Errorf("section heads %q, want %q", heads, want)
	}
	shared := eval[[]string](t, ctx, `[...document.querySelectorAll("section.cell")].filter(s => s.querySelector(".shared-mark")).map(s => s.id)`)
	if strings.Join(shared, " ") != "cell-about cell-sources cell-comparison" {
		t.Errorf("cells marked shared: %q", shared)
	}
	if k := cellText(t, ctx, "comparison", ".cell-head .kind"); len(k) != 1 || k[0] != "Comparison" {
		t.Errorf("kind label %q", k)
	}
	figs := strings.Join(cellText(t, ctx, "comparison", ".figure .fig-name"), "\n")
	for _, f := range []string{"difference in silicate CO2 consumption per km²", "per mm of runoff", "CO2 potential of the feedstock",
		"share of the application's CO2 potential", "smallest increase of the silicate CO2 flux detectable", "samples a year needed"} {
		if !strings.Contains(figs, f) {
			t.Errorf("figures lack %q:\n%s", f, figs)
		}
	}
	titles := cellText(t, ctx, "comparison", ".result .table-tools b")
	for i, w := range []string{"Mean annual yield per km² of catchment", "Mean annual yield per mm of runoff", "The budgets compared",
		"How each paired replicate draws", "The feedstock's oxides", "silicate CO2 consumption", "Monitoring design"} {
		if i >= len(titles) || !strings.HasPrefix(titles[i], w) {
			t.Errorf("table %d: %q, want %q", i, titles, w)
		}
	}
	rows := eval[int](t, ctx, `document.querySelectorAll("#cell-comparison .result")[0].querySelectorAll("tbody tr").length`)
	if rows < 5 {
		t.Errorf("the difference table shows %d rows", rows)
	}
	svgs := eval[[]string](t, ctx, `[...document.querySelectorAll("#cell-comparison .svg-mount svg")].map(s => s.getAttribute("aria-label"))`)
	for i, w := range []string{"Difference per km² of catchment", "Difference per mm of runoff", "Smallest increase detectable"} {
		if i >= len(svgs) || !strings.HasPrefix(svgs[i], w) {
			t.Errorf("chart %d: %q, want %q", i, svgs, w)
		}
	}
	if marks := eval[int](t, ctx, `document.querySelectorAll("#cell-comparison .svg-mount svg rect, #cell-comparison .svg-mount svg path").length`); marks < 20 {
		t.Errorf("the charts draw only %d marks", marks)
	}
	warn := strings.Join(cellText(t, ctx, "comparison", ".warnings li"), "\n")
	for _, w := range []string{"not a carbon-removal credit", "exchange sites", "degassing", "Na-poor feedstock"} {
		if !strings.Contains(warn, w) {
			t.Errorf("cautions lack %q", w)
		}
	}
	if dir := os.Getenv("LIXIV_SHOTS"); dir != "" {
		if err := os.MkdirAll(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		shots := map[string]string{"comparison": "#cell-comparison", "inputs": "#cell-comparison .inputs",
			"figures": "#cell-comparison .figures", "warnings": "#cell-comparison .warnings", "sources": "#cell-sources",
			"section-head": "#cell-tb-site", "difference": "#chart-comparison-diff", "per-mm": "#chart-comparison-mm",
			"design": "#chart-comparison-design"}
		for name, sel := range shots {
			png, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS(sel)))
			if err != nil {
				t.Errorf("%s: %v", sel, err)
				continue
			}
			save(t, filepath.Join(dir, "paired-"+name+".png"), png)
		}
	}
	// One budget apportioned with another seed: no joint draws, and the
	// cell says what the budgets' shared uncertainty then lacks.
	edit(t, ctx, "#p-tb-apportionment-seed", "2")
	js := `document.getElementById("cell-comparison").className.includes("state-ok")`
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(200*time.Second))); err != nil {
		t.Fatalf("the comparison did not compute again: %v", err)
	}
	warn = strings.Join(cellText(t, ctx, "comparison", ".warnings li"), "\n")
	if !strings.Contains(warn, "not carried as shared") {
		t.Errorf("no warning that the shared uncertainty is not carried as shared:\n%s", warn)
	}
	if dir := os.Getenv("LIXIV_SHOTS"); dir != "" {
		if png, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS("#cell-comparison"))); err == nil {
			save(t, filepath.Join(dir, "paired-own-draws.png"), png)
		}
	}
}
