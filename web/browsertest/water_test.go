//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// openGreyhope opens the Greyhope example, which holds a carbonate cell and
// a minerals cell, through the file picker and waits for it to compute.
func openGreyhope(t *testing.T) context.Context {
	t.Helper()
	ctx := openDemo(t)
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	f := filepath.Join(repo, "examples", "greyhope-beck", "greyhope-beck.lixiv.json")
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{f})); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	waitIdle(t, ctx)
	return ctx
}

// cellText returns, for the cell with the given id, the text of what
// selector finds in it, one entry per element.
func cellText(t testing.TB, ctx context.Context, id, selector string) []string {
	t.Helper()
	return eval[[]string](t, ctx, fmt.Sprintf(`[...document.querySelectorAll("#cell-%s %s")].map(e => e.textContent)`, id, selector))
}

// TestWaterCellsRender: the carbonate and minerals cells of the Greyhope
// example show their state, tables, charts and warnings on the page.
func TestWaterCellsRender(t *testing.T) {
	ctx := openGreyhope(t)
	for _, c := range []struct {
		id, kind string
		tables   []string // result table titles (prefixes)
		headers  []string // text of the first table's header
		charts   []string // chart titles
		warn     string
	}{
		{"carbonate", "Carbonate system", []string{"Carbonate system of each sample: davies activities (valid to I ≈ 0.5 mol/L)"},
			[]string{"pCO2 (µatm)", "|SI of calcite|", "ionic strength (mol/L)"},
			[]string{"Saturation indices against discharge", "pCO2 against discharge"}, "sample GB-009 has no pH: left out of this carbonate cell only"},
		{"minerals", "Mineral balance", []string{"Minerals of the balance", "Moles of each mineral", "Residuals", "Mean annual flux of each mineral", "Built-in minerals"},
			[]string{"mineral", "balanced reaction with carbonic acid", "CO2 per mole (mol/mol)"},
			[]string{"Minerals per sample", "CO2 consumed by each mineral"}, "biotite would have to form"},
	} {
		t.Run(c.id, func(t *testing.T) {
			if st := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("cell-%s").className`, c.id)); !strings.Contains(st, "state-ok") {
				t.Fatalf("cell class %q, want up to date", st)
			}
			if k := cellText(t, ctx, c.id, ".cell-head .kind"); len(k) != 1 || k[0] != c.kind {
				t.Errorf("kind label %q, want %q", k, c.kind)
			}
			titles := cellText(t, ctx, c.id, ".result .table-tools b")
			for i, want := range c.tables {
				if i >= len(titles) || !strings.HasPrefix(titles[i], want) {
					t.Errorf("table %d: %q, want %q", i, titles, want)
				}
			}
			head := strings.Join(eval[[]string](t, ctx, fmt.Sprintf(`[...document.querySelectorAll("#cell-%s .result")[0].querySelectorAll("thead th")].map(e => e.textContent)`, c.id)), "|")
			for _, h := range c.headers {
				if !strings.Contains(head, h) {
					t.Errorf("first table's header %q lacks %q", head, h)
				}
			}
			if rows := eval[int](t, ctx, fmt.Sprintf(`document.querySelectorAll("#cell-%s .result")[0].querySelectorAll("tbody tr").length`, c.id)); rows < 5 {
				t.Errorf("%d rows in the first table", rows)
			}
			svgs := eval[[]string](t, ctx, fmt.Sprintf(`[...document.querySelectorAll("#cell-%s .svg-mount svg")].map(s => s.getAttribute("aria-label"))`, c.id))
			if len(svgs) != len(c.charts) {
				t.Fatalf("charts %q, want %q", svgs, c.charts)
			}
			for i, want := range c.charts {
				if !strings.HasPrefix(svgs[i], want) {
					t.Errorf("chart %d: %q, want %q", i, svgs[i], want)
				}
			}
			if marks := eval[int](t, ctx, fmt.Sprintf(`document.querySelectorAll("#cell-%s .svg-mount svg circle, #cell-%s .svg-mount svg rect, #cell-%s .svg-mount svg path").length`, c.id, c.id, c.id)); marks < 50 {
				t.Errorf("the charts draw only %d marks", marks)
			}
			if w := strings.Join(cellText(t, ctx, c.id, ".warnings li"), "\n"); !strings.Contains(w, c.warn) {
				t.Errorf("warnings lack %q:\n%s", c.warn, w)
			}
		})
	}
}

// TestWaterCellsEdit: the carbonate cell's flag reaches the fluxes cell's
// caution, and a formula that cannot be read is a problem of the minerals
// cell that names the position, with the text kept as typed.
func TestWaterCellsEdit(t *testing.T) {
	ctx := openGreyhope(t)
	edit(t, ctx, "#p-carbonate-si_calcite_flag", "0")
	waitIdle(t, ctx)
	if w := strings.Join(cellText(t, ctx, "fluxes", ".warnings li"), "\n"); !strings.Contains(w, "have SI of calcite above 0 (carbonate cell)") {
		t.Errorf("the fluxes cell does not caution:\n%s", w)
	}
	typed := "plagioclase An30, K-feldspar, biotite, odd = CaMg(CO3"
	edit(t, ctx, "#p-minerals-primary_minerals", typed)
	waitIdle(t, ctx)
	p := cellText(t, ctx, "minerals", ".problem")
	if len(p) == 0 || !strings.Contains(p[0], "primary_minerals") || !strings.Contains(p[0], `formula "CaMg(CO3", position 5`) {
		t.Errorf("problem %q, want the setting, the formula and position 5 named", p)
	}
	if v := eval[string](t, ctx, `document.getElementById("p-minerals-primary_minerals").value`); v != typed {
		t.Errorf("field holds %q, want the text typed %q", v, typed)
	}
}
