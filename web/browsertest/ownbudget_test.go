//go:build browser

package browsertest

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// A budget of one's own, as a new user makes it: a new budget, then the
// invented Sallowmere Water files (testdata/sallowmere), the area and the
// reporting year. Every wait below is for an event of the page (a mark on
// the body, an element appearing), with a generous deadline; none races
// the machine's speed.

// sallowmere is the path of one of the invented Sallowmere Water files.
func sallowmere(name string) string {
	return filepath.Join(repo, "testdata", "sallowmere", name)
}

// waitFor waits until script is true in the page.
func waitFor(t testing.TB, ctx context.Context, what, script string) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](script, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("waiting for %s: %v", what, err)
	}
}

// text returns the text of the first element selected, its runs of white
// space made one space; "" when there is none.
func text(t testing.TB, ctx context.Context, selector string) string {
	t.Helper()
	q, _ := json.Marshal(selector)
	return strings.Join(strings.Fields(eval[string](t, ctx, fmt.Sprintf(`(document.querySelector(%s) || {textContent: ""}).textContent`, q))), " ")
}

// click clicks the element selected and waits for the recompute it starts.
func click(t testing.TB, ctx context.Context, selector string) {
	t.Helper()
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(selector))); err != nil {
		t.Fatalf("click %s: %v", selector, err)
	}
	waitGen(t, ctx, gen)
}

// openFile opens a file through the picker, as a user would.
func openFile(t testing.TB, ctx context.Context, path string) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{path})); err != nil {
		t.Fatalf("open %s: %v", path, err)
	}
}

// openTable opens a table through the picker into a budget that is not the
// demo, and waits until the cell that took it is computed and reported in
// the banner.
func openTable(t testing.TB, ctx context.Context, path, cell string) {
	t.Helper()
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	openFile(t, ctx, path)
	waitGen(t, ctx, gen)
	waitFor(t, ctx, "the import banner", fmt.Sprintf(`(document.getElementById("import-banner-title") || {textContent: ""}).textContent.includes(%q)`, filepath.Base(path)))
	if got := text(t, ctx, "#import-banner-title"); !strings.Contains(got, "The "+cell+" cell took") {
		t.Errorf("banner: got %q, want the %s cell named", got, cell)
	}
}

// headline returns the summary strip's figures, name → value and unit.
func headline(t testing.TB, ctx context.Context) map[string]string {
	t.Helper()
	return eval[map[string]string](t, ctx, `Object.fromEntries([...document.querySelectorAll("#summary a.figure")].map(f =>
		[f.querySelector(".fig-name").textContent, f.querySelector(".fig-value").textContent]))`)
}

// newBudget starts a new budget from the header and waits until its cells
// have been computed (they wait for their inputs).
func newBudget(t testing.TB, ctx context.Context) {
	t.Helper()
	click(t, ctx, "#new-budget")
	waitFor(t, ctx, "the new budget", `document.getElementById("budget-title").value === "Untitled budget"`)
}

func TestOwnBudgetJourney(t *testing.T) {
	ctx := openDemo(t)
	demo := headline(t, ctx)
	if len(demo) == 0 {
		t.Fatal("the demo shows no headline figures")
	}
	newBudget(t, ctx)

	// The usual cells in order, each waiting for its inputs and saying for what.
	kinds := eval[[]string](t, ctx, `[...document.querySelectorAll("section.cell")].map(s => s.className.match(/kind-(\S+)/)[1])`)
	if want := "site samples discharge atmosphere sources apportionment fluxes co2"; strings.Join(kinds, " ") != want {
		t.Fatalf("cells: got %v, want %s", kinds, want)
	}
	for _, k := range []string{"site", "samples", "discharge", "atmosphere", "apportionment", "fluxes", "co2"} {
		sel := "section.kind-" + k
		if cls := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).className`, sel)); !strings.Contains(cls, "state-waiting") {
			t.Errorf("%s cell: got class %q, want it waiting", k, cls)
		}
		if n := text(t, ctx, sel+" .needs"); !strings.HasPrefix(n, "Waiting for") {
			t.Errorf("%s cell: got %q, want a line saying what it waits for", k, n)
		}
	}
	if n := text(t, ctx, "section.kind-site .needs"); !strings.Contains(n, "the catchment area (km²)") {
		t.Errorf("site: got %q, want the area named", n)
	}
	if n := text(t, ctx, "section.kind-fluxes .needs"); !strings.Contains(n, "water samples") || !strings.Contains(n, "discharge record") || !strings.Contains(n, "catchment area") {
		t.Errorf("fluxes: got %q, want samples, discharge and area named", n)
	}
	if o := text(t, ctx, "section.kind-sources .table-tools .origin"); o != "values from the global preset" {
		t.Errorf("end-members: got %q, want them marked as the global preset's", o)
	}
	if s := text(t, ctx, "#budget-state"); !strings.HasPrefix(s, "not all computed") {
		t.Errorf("summary: got %q while cells wait", s)
	}

	// The samples, then the discharge record, from files.
	openTable(t, ctx, sallowmere("sallowmere-samples.csv"), "Samples")
	banner := text(t, ctx, "#import-banner")
	for _, want := range []string{"HCO3 (mg/L)", "HCO3 taken as alkalinity", "Na (mg/L) → Na, mg/L → µmol/L", "Lab → not used",
		"half the limit stands in", `problem row 7 (line 8), column K (mg/L): "O.95": not a number`, "36 rows of 13 columns, 2 of them not used"} {
		if !strings.Contains(banner, want) {
			t.Errorf("banner after the samples: got %q, want %q", banner, want)
		}
	}
	if href := eval[string](t, ctx, `document.querySelector("#import-banner .banner-head a").getAttribute("href")`); href != "#cell-samples" {
		t.Errorf("banner link: got %q, want the samples cell", href)
	}
	openTable(t, ctx, sallowmere("sallowmere-discharge.csv"), "Discharge")
	if banner := text(t, ctx, "#import-banner"); !strings.Contains(banner, "Discharge (m3/s) → discharge, m3/s → m³/s") || !strings.Contains(banner, "Quality → not used") {
		t.Errorf("banner after the discharge: got %q", banner)
	}

	// The area and calendar years.
	edit(t, ctx, "#p-site-area_km2", "250")
	edit(t, ctx, "#p-site-water_year_start_month", "1")
	waitIdle(t, ctx)
	if bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.cell:not(.state-ok)")].map(s => s.id + " " + s.className)`); len(bad) > 0 {
		t.Errorf("cells not computed: %q", bad)
	}
	if s := text(t, ctx, "#budget-state"); s != "all computed" {
		t.Errorf("summary state: got %q", s)
	}
	own := headline(t, ctx)
	if v := own["silicate CO2 consumption per km²"]; !regexp.MustCompile(`\d`).MatchString(v) {
		t.Fatalf("headline: got %v, want the silicate CO2 consumption per km²", own)
	}
	// No value of the demo survives: not in the headline, not in the site.
	for name, v := range own {
		if d, ok := demo[name]; ok && d == v {
			t.Errorf("%s: %q is the demo's value", name, v)
		}
	}
	for _, key := range []string{"name", "precipitation_mm", "evapotranspiration_mm"} {
		if v := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("p-site-%s").value`, key)); v != "" {
			t.Errorf("site %s: got %q, want it empty", key, v)
		}
	}
	if page := text(t, ctx, "#cells"); strings.Contains(page, "Corrie Vale") || strings.Contains(page, "from the demo") {
		t.Errorf("the new budget shows something of the demo")
	}
	// The two runoffs say how each was formed.
	figs := figures(t, ctx)
	if r := figs["cell-discharge: runoff of the whole record"]; r == "" {
		t.Errorf("no runoff in the discharge cell: %v", figs)
	}
	note := func(cell, name string) string {
		return eval[string](t, ctx, fmt.Sprintf(`(() => {
			for (const f of document.querySelectorAll("#cell-%s .figure")) {
				if (f.textContent.includes(%q)) { const n = f.querySelector(".fig-note"); return n ? n.textContent : ""; }
			}
			return "";
		})()`, cell, name))
	}
	if n := note("discharge", "runoff of the whole record"); !strings.Contains(n, "from the record") {
		t.Errorf("discharge runoff: got note %q", n)
	}
	if n := note("fluxes", "runoff over the complete years"); !strings.Contains(n, "discharge and area errors") {
		t.Errorf("flux runoff: got note %q", n)
	}
}

// TestNonNumberMarkedInItsCell opens the samples file with a potassium
// typed "O.95" (SM-07, line 8 of the file): the field is marked, the
// message sits under the table with the row, the file's line and the
// column, and the text is kept as typed.
func TestNonNumberMarkedInItsCell(t *testing.T) {
	ctx := openDemo(t)
	newBudget(t, ctx)
	openTable(t, ctx, sallowmere("sallowmere-samples.csv"), "Samples")
	field := "section.kind-samples table.data tbody tr:nth-child(7) td:nth-child(6) input" // row 7, column K (the 5th)
	if v := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).value`, field)); v != "O.95" {
		t.Fatalf("row 7, K: got %q, want the value as typed", v)
	}
	if cls := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).className`, field)); !strings.Contains(cls, "bad") {
		t.Errorf("row 7, K: got class %q, want it marked", cls)
	}
	if n := eval[int](t, ctx, `document.querySelectorAll("section.kind-samples table.data input.bad").length`); n != 1 {
		t.Errorf("marked fields: got %d, want 1", n)
	}
	probs := text(t, ctx, "#problems-samples")
	if !strings.Contains(probs, `problem row 7 (line 8), column K (mg/L): "O.95": not a number`) {
		t.Errorf("problems beside the table: got %q", probs)
	}
	if w := text(t, ctx, "#warnings-samples"); strings.Contains(w, "O.95") {
		t.Errorf("the problem is also listed far from the table: %q", w)
	}
	if b := text(t, ctx, "#import-banner"); !strings.Contains(b, `row 7 (line 8), column K (mg/L): "O.95": not a number`) {
		t.Errorf("the banner does not list the problem: %q", b)
	}
	// The message takes the user to the field.
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#problems-samples li.problem a"))); err != nil {
		t.Fatal(err)
	}
	waitFor(t, ctx, "the focus on the marked field", fmt.Sprintf(`document.activeElement === document.querySelector(%q)`, field))
}

// TestUndoInTableField edits a value in the samples table and presses the
// undo and redo keys while the field still has the focus: the document
// goes back and forth, the results with it, and leaving the field adds no
// edit.
func TestUndoInTableField(t *testing.T) {
	ctx := openDemo(t)
	name, before := co2Figure(t, ctx)
	col := naColumn(t, ctx)
	field := fmt.Sprintf("section.kind-samples table.data tbody tr:nth-child(2) td:nth-child(%d) input", col+2)
	value := func() string { return eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).value`, field)) }
	original := value()
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const el = document.querySelector(%q); el.focus(); el.select(); return true })()`, field))
	if err := chromedp.Do(ctx, chromedp.KeyEvent("999\r")); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	changed := figures(t, ctx)[name]
	if value() != "999" || changed == before {
		t.Fatalf("after typing 999 and Enter: field %q, %s %q (was %q)", value(), name, changed, before)
	}
	focused := func() bool {
		return eval[bool](t, ctx, fmt.Sprintf(`document.activeElement === document.querySelector(%q)`, field))
	}
	if !focused() {
		t.Fatal("the field lost the focus")
	}
	key := func(k string, mods ...chromedp.Modifier) {
		gen := eval[string](t, ctx, `document.body.dataset.gen`)
		if err := chromedp.Do(ctx, chromedp.KeyEvent(k, chromedp.KeyModifiers(mods...))); err != nil {
			t.Fatal(err)
		}
		waitGen(t, ctx, gen)
	}
	key("z", chromedp.ModifierCtrl)
	if got := value(); got != original {
		t.Errorf("field after Ctrl+Z: got %q, want %q", got, original)
	}
	if got := figures(t, ctx)[name]; got != before {
		t.Errorf("%s after Ctrl+Z: got %q, want %q", name, got, before)
	}
	if !focused() || eval[bool](t, ctx, `document.getElementById("redo").disabled`) {
		t.Errorf("after Ctrl+Z: focus kept %v, redo enabled %v", focused(), !eval[bool](t, ctx, `document.getElementById("redo").disabled`))
	}
	// Leaving the field records nothing: redo stays possible.
	if err := chromedp.Do(ctx, chromedp.KeyEvent("\t")); err != nil {
		t.Fatal(err)
	}
	afterFrames(t, ctx)
	if eval[bool](t, ctx, `document.getElementById("redo").disabled`) {
		t.Errorf("Tab after Ctrl+Z recorded a new edit (redo is gone)")
	}
	eval[bool](t, ctx, fmt.Sprintf(`(() => { document.querySelector(%q).focus(); return true })()`, field))
	key("Z", chromedp.ModifierCtrl, chromedp.ModifierShift)
	if got := value(); got != "999" {
		t.Errorf("field after Ctrl+Shift+Z: got %q, want 999", got)
	}
	if got := figures(t, ctx)[name]; got != changed {
		t.Errorf("%s after Ctrl+Shift+Z: got %q, want %q", name, got, changed)
	}
	// Typing not yet applied is dropped first; the document stays.
	gen = eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.KeyEvent("12")); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.KeyEvent("z", chromedp.KeyModifiers(chromedp.ModifierCtrl))); err != nil {
		t.Fatal(err)
	}
	afterFrames(t, ctx)
	if got := value(); got != "999" || eval[string](t, ctx, `document.body.dataset.gen`) != gen {
		t.Errorf("Ctrl+Z over typing not applied: field %q, want the applied 999 and no recompute", got)
	}
}

// afterFrames waits until the page has painted twice, so that what an
// event handler did has reached the screen.
func afterFrames(t testing.TB, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Evaluate[bool](`new Promise(r => requestAnimationFrame(() => requestAnimationFrame(() => r(true))))`, chromedp.EvalAwaitPromise)); err != nil {
		t.Fatal(err)
	}
}

// TestNoFalseDifference: the footer compares stored results only for a
// budget file the user opened or downloaded; the demo's, after an edit and
// a reload, or after undo back to it, are never called different.
func TestNoFalseDifference(t *testing.T) {
	ctx := openDemo(t)
	verify := func(when string) {
		t.Helper()
		if v := text(t, ctx, "#verify"); strings.Contains(v, "DIFFER") || strings.Contains(v, "match") {
			t.Errorf("footer %s: got %q, want no comparison", when, v)
		}
	}
	verify("with the demo")
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.7")
	reloadSaved(t, ctx)
	if got := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("p-%s-na_per_cl").value`, atm)); got != "0.7" {
		t.Fatalf("after the reload: Na/Cl %q, want the edit kept", got)
	}
	verify("after a reload of the edited demo")
	newBudget(t, ctx)
	verify("with a new budget")
	click(t, ctx, "#undo")
	verify("after undo back to the demo")
	reloadSaved(t, ctx)
	verify("after another reload")
}

// TestFileOverTheDemoAsks drops the samples file on the demo: the page
// asks, with starting a new budget as the default in focus; putting the
// file into the demo marks what is still the demo's.
func TestFileOverTheDemoAsks(t *testing.T) {
	ctx := openDemo(t)
	if n := eval[int](t, ctx, `document.querySelectorAll(".demo-tag, .field .origin").length`); n != 0 {
		t.Errorf("the demo itself shows %d marks of values of the demo", n)
	}
	drop := func() {
		t.Helper()
		b, err := os.ReadFile(sallowmere("sallowmere-samples.csv"))
		if err != nil {
			t.Fatal(err)
		}
		q, _ := json.Marshal(string(b))
		eval[bool](t, ctx, fmt.Sprintf(`(() => { const dt = new DataTransfer();
			dt.items.add(new File([%s], "sallowmere-samples.csv", {type: "text/csv"}));
			document.querySelector(".page").dispatchEvent(new DragEvent("drop", {dataTransfer: dt, bubbles: true, cancelable: true}));
			return true })()`, q))
	}
	drop()
	waitFor(t, ctx, "the question", `document.activeElement && document.activeElement.id === "choice-new"`)
	if q := text(t, ctx, "#file-choice"); !strings.Contains(q, "sallowmere-samples.csv is a samples table") {
		t.Errorf("question: got %q", q)
	}
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#choice-demo"))); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	if got := text(t, ctx, "section.kind-samples .table-tools span"); !strings.HasPrefix(got, "36 rows") {
		t.Errorf("samples after replacing the demo's: got %q", got)
	}
	if o := text(t, ctx, "section.kind-discharge .table-tools .origin"); o != "values from the demo" {
		t.Errorf("discharge table: got %q, want it marked as the demo's", o)
	}
	if cls := eval[string](t, ctx, `document.getElementById("p-site-area_km2").className`); cls != "from-demo" {
		t.Errorf("site area: got class %q, want it marked as the demo's", cls)
	}
	if l := text(t, ctx, "section.kind-site .params"); !strings.Contains(l, "area (km²) · from the demo") {
		t.Errorf("site labels: got %q", l)
	}
	if o := text(t, ctx, "section.kind-samples .table-tools .origin"); o != "" {
		t.Errorf("the user's samples are marked %q", o)
	}
	tagged := eval[[]string](t, ctx, `[...document.querySelectorAll("section.cell")].filter(s => s.querySelector(".cell-head .demo-tag")).map(s => s.id)`)
	for _, id := range []string{"cell-site", "cell-discharge", "cell-sources"} {
		if !strings.Contains(strings.Join(tagged, " "), id) {
			t.Errorf("cells tagged as holding demo values: got %v, want %s among them", tagged, id)
		}
	}
	if strings.Contains(strings.Join(tagged, " "), "cell-samples ") || strings.HasSuffix(strings.Join(tagged, " "), "cell-samples") {
		t.Errorf("the samples cell, holding the user's file only, is tagged as the demo's")
	}
	// Undo returns to the demo, which asks again; Enter takes the default.
	click(t, ctx, "#undo")
	drop()
	waitFor(t, ctx, "the question again", `document.activeElement && document.activeElement.id === "choice-new"`)
	gen = eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.KeyEvent("\r")); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	if got := eval[string](t, ctx, `document.getElementById("budget-title").value`); got != "Untitled budget" {
		t.Errorf("title after Enter: got %q, want a new budget", got)
	}
	if got := text(t, ctx, "section.kind-samples .table-tools span"); !strings.HasPrefix(got, "36 rows") {
		t.Errorf("samples of the new budget: got %q", got)
	}
	if cls := eval[string](t, ctx, `document.querySelector("section.kind-site").className`); !strings.Contains(cls, "state-waiting") {
		t.Errorf("site of the new budget: got %q, want it waiting for the area", cls)
	}
}
