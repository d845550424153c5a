//go:build browser

package browsertest

import (
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/browser"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"
)

// figures returns every figure the cells show, "cell: name" → "value unit
// interval".
func figures(t testing.TB, ctx context.Context) map[string]string {
	t.Helper()
	js := `Object.fromEntries([...document.querySelectorAll("section.cell .figures .figure")].map(f =>
		[f.closest("section.cell").id + ": " + f.querySelector(".fig-name").textContent,
		 f.querySelector(".fig-value").textContent + " " + f.querySelector(".fig-interval").textContent]))`
	return eval[map[string]string](t, ctx, js)
}

// co2Figure returns the page's silicate CO2 consumption per km² (else the
// first CO2 figure by name), name and value.
func co2Figure(t testing.TB, ctx context.Context) (string, string) {
	t.Helper()
	figs := figures(t, ctx)
	keys := make([]string, 0, len(figs))
	for k := range figs {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, want := range []string{"silicate CO2 consumption per km²", "CO2"} {
		for _, k := range keys {
			if strings.Contains(k, want) {
				return k, figs[k]
			}
		}
	}
	return "", ""
}

// cellOf returns the id (without "cell-") of the first cell of a kind.
func cellOf(t testing.TB, ctx context.Context, kind string) string {
	t.Helper()
	id := eval[string](t, ctx, fmt.Sprintf(`(document.querySelector("section.kind-%s") || {id: ""}).id`, kind))
	if id == "" {
		t.Fatalf("the page shows no %s cell", kind)
	}
	return strings.TrimPrefix(id, "cell-")
}

// edit sets a field's value as a user would (input and change events) and
// waits for the recompute it starts.
func edit(t testing.TB, ctx context.Context, selector, value string) {
	t.Helper()
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	q, _ := json.Marshal(selector)
	v, _ := json.Marshal(value)
	ok := eval[bool](t, ctx, fmt.Sprintf(`(() => { const el = document.querySelector(%s); if (!el) return false;
		el.focus(); el.value = %s; el.dispatchEvent(new Event("input", {bubbles: true}));
		el.dispatchEvent(new Event("change", {bubbles: true})); el.blur(); return true })()`, q, v))
	if !ok {
		t.Fatalf("no field %s", selector)
	}
	waitGen(t, ctx, gen)
}

// waitGen waits until a recompute after generation gen has finished.
func waitGen(t testing.TB, ctx context.Context, gen string) {
	t.Helper()
	js := fmt.Sprintf(`document.body.dataset.gen !== %q && document.body.dataset.busy === "0"`, gen)
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](js, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("no recompute finished after the edit: %v", err)
	}
}

// paste sends a paste event holding text to the element selected.
func paste(t testing.TB, ctx context.Context, selector, text string) {
	t.Helper()
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	q, _ := json.Marshal(selector)
	v, _ := json.Marshal(text)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const dt = new DataTransfer(); dt.setData("text/plain", %s);
		document.querySelector(%s).dispatchEvent(new ClipboardEvent("paste", {clipboardData: dt, bubbles: true, cancelable: true})); return true })()`, v, q))
	waitGen(t, ctx, gen)
}

func TestDemoShowsCO2(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	name, value := co2Figure(t, ctx)
	if name == "" {
		t.Fatalf("no CO2 figure on the page; figures: %v", figures(t, ctx))
	}
	if strings.HasPrefix(value, "–") || strings.TrimSpace(value) == "" {
		t.Errorf("%s: got %q, want a number", name, value)
	}
	summary := eval[string](t, ctx, `document.getElementById("summary").textContent`)
	if !strings.Contains(summary, "CO2") {
		t.Errorf("summary strip: got %q, want a CO2 figure", summary)
	}
	t.Logf("%s = %s", name, value)
	// The (light) demo file carries the results computed natively; opened
	// as a budget file of one's own, the page's rerun in WebAssembly must
	// reproduce them (TestWorkersSameResults does so with the demo itself).
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{filepath.Join(light, "demo.lixiv.json")})); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	if v := eval[string](t, ctx, `document.getElementById("verify").textContent`); v != "stored results match the rerun" {
		t.Errorf("footer: got %q, want the demo's stored results to match the rerun", v)
	}
	if v := eval[string](t, ctx, `document.getElementById("engine-version").textContent`); v == "" {
		t.Errorf("footer: no engine version")
	}
}

func TestRainRatioChangesResult(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	name, before := co2Figure(t, ctx)
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.6")
	after := figures(t, ctx)[name]
	if after == "" || after == before {
		t.Errorf("%s after Na/Cl 0.6: got %q, want a change from %q", name, after, before)
	}
	if got := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("p-%s-na_per_cl").value`, atm)); got != "0.6" {
		t.Errorf("Na/Cl field: got %q, want 0.6", got)
	}
}

// samplesBlock is two samples in the demo's column order, tab-separated.
func samplesBlock(t testing.TB, ctx context.Context, names ...string) string {
	t.Helper()
	cols := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr:first-child input")].map(e => e.value)`)
	first := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data tbody tr:first-child input")].map(e => e.value)`)
	if len(cols) == 0 || len(first) < len(cols) {
		t.Fatalf("samples table: columns %v, first row %v", cols, first)
	}
	var b strings.Builder
	for k, n := range names {
		row := append([]string(nil), first[:len(cols)]...)
		for j, c := range cols {
			switch strings.ToLower(c) {
			case "sample", "id", "name":
				row[j] = n
			case "date":
				row[j] = fmt.Sprintf("2022-08-%02d", 10+k)
			}
		}
		b.WriteString(strings.Join(row, "\t") + "\n")
	}
	return b.String()
}

func TestPasteAddsSamples(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	id := cellOf(t, ctx, "samples")
	count := func() int {
		return eval[int](t, ctx, `document.querySelectorAll("section.kind-samples table.out tbody tr").length + 0*0`)
	}
	rowsBefore := eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`)
	before := count()
	paste(t, ctx, "#paste-"+id, samplesBlock(t, ctx, "PASTE-1", "PASTE-2"))
	rowsAfter := eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`)
	if rowsAfter == rowsBefore {
		t.Errorf("samples table: got %q after the paste, want two more rows than %q", rowsAfter, rowsBefore)
	}
	var nBefore, nAfter int
	fmt.Sscanf(rowsBefore, "%d", &nBefore)
	fmt.Sscanf(rowsAfter, "%d", &nAfter)
	if nAfter != nBefore+2 {
		t.Errorf("rows: got %d, want %d", nAfter, nBefore+2)
	}
	text := eval[string](t, ctx, `document.querySelector("section.kind-samples .outputs").textContent`)
	if !strings.Contains(text, "PASTE-1") || !strings.Contains(text, "PASTE-2") {
		t.Errorf("the samples output does not list the pasted samples")
	}
	_ = before
}

func TestMarkupShownAsText(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	id := cellOf(t, ctx, "samples")
	const evil = `<img src=x onerror="document.body.dataset.owned=1"><b>CV-bold</b>`
	paste(t, ctx, "#paste-"+id, samplesBlock(t, ctx, evil))
	if n := eval[int](t, ctx, `document.querySelectorAll("section.cell img, section.cell b.injected, section.cell td b").length`); n != 0 {
		t.Errorf("markup from a sample name became %d elements", n)
	}
	if owned := eval[string](t, ctx, `document.body.dataset.owned || ""`); owned != "" {
		t.Errorf("a script in a sample name ran")
	}
	eval[bool](t, ctx, `[...document.querySelectorAll("section.kind-samples .result > button")].forEach(b => b.click()) || true`)
	// Wait for the output table to show the pasted sample (or give up
	// after patience): the check below then reads a rendered table.
	q, _ := json.Marshal(evil)
	chromedp.Run(ctx, chromedp.Poll[bool](fmt.Sprintf(`[...document.querySelectorAll("section.kind-samples table.out td")].some(td => td.textContent === %s)`, q),
		chromedp.WithPollingTimeout(patience)))
	cells := eval[string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.out td")].map(td => td.textContent).join("|")`)
	if !strings.Contains(cells, evil) {
		t.Errorf("the sample name is not shown as its text; output cells: %.200s", cells)
	}
	// A note holding markup is shown as text too.
	note := eval[string](t, ctx, `(document.querySelector("section.kind-note textarea") || {id: ""}).id`)
	if note != "" {
		edit(t, ctx, "#"+note, "<i>field</i> note")
		if got := eval[string](t, ctx, `document.querySelector("section.kind-note .note-text").textContent`); got != "<i>field</i> note" {
			t.Errorf("note text: got %q", got)
		}
		if n := eval[int](t, ctx, `document.querySelectorAll("section.kind-note .note-text i").length`); n != 0 {
			t.Errorf("note markup became elements")
		}
	}
}

func TestSavedBudgetReopens(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.7") // a budget of the user's own, not the demo
	want := figures(t, ctx)
	file := download(t, ctx, t.TempDir(), func() {
		if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#download"))); err != nil {
			t.Fatal(err)
		}
	})
	data, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(data), `"results"`) {
		t.Errorf("the downloaded budget holds no results snapshot")
	}
	// Open the file in a fresh browser profile, through the file picker.
	ctx2 := newBrowser(t, "")
	open(t, ctx2, srv.URL)
	waitIdle(t, ctx2)
	named := filepath.Join(t.TempDir(), "reopened.lixiv.json")
	if err := os.WriteFile(named, data, 0o644); err != nil {
		t.Fatal(err)
	}
	gen := eval[string](t, ctx2, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx2, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{named})); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx2, gen)
	got := figures(t, ctx2)
	if len(got) == 0 || len(got) != len(want) {
		t.Errorf("figures: got %d, want %d", len(got), len(want))
	}
	for k, v := range want {
		if got[k] != v {
			t.Errorf("%s: got %q, want %q", k, got[k], v)
		}
	}
	if v := eval[string](t, ctx2, `document.getElementById("verify").textContent`); v != "stored results match the rerun" {
		t.Errorf("footer: got %q, want the stored results to match", v)
	}
}

// download runs start, which makes the page download a file, and waits
// for the browser to report the download complete (not for a file to
// appear, which may still be written); it returns the file, saved in dir.
func download(t testing.TB, ctx context.Context, dir string, start func()) string {
	t.Helper()
	if _, err := chromedp.Call(ctx, browser.SetDownloadBehavior, browser.SetDownloadBehaviorParams{
		Behavior: browser.SetDownloadBehaviorBehaviorAllowAndName, DownloadPath: dir, EventsEnabled: new(true)}); err != nil {
		t.Fatal(err)
	}
	wctx, cancel := context.WithTimeout(ctx, patience)
	defer cancel()
	events := chromedp.Events(wctx, browser.DownloadProgress)
	start()
	for ev, err := range events {
		if err != nil {
			break
		}
		switch ev.State {
		case browser.DownloadProgressStateCompleted:
			return filepath.Join(dir, ev.GUID)
		case browser.DownloadProgressStateCanceled:
			t.Fatal("the download was cancelled")
		}
	}
	t.Fatal("no download completed")
	return ""
}

func TestOfflineReload(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	_, want := co2Figure(t, ctx)
	// Wait until the service worker has cached the page and controls it.
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`!!navigator.serviceWorker.controller || (location.reload(), false)`,
		chromedp.WithPollingTimeout(patience), chromedp.WithPollingInterval(1500*time.Millisecond))); err != nil {
		t.Fatalf("service worker never took control: %v", err)
	}
	waitReady(t, ctx)
	srv.Stop()
	if err := chromedp.Do(ctx, chromedp.Reload()); err != nil {
		t.Fatalf("reload with the server stopped: %v", err)
	}
	waitReady(t, ctx)
	waitIdle(t, ctx)
	_, got := co2Figure(t, ctx)
	if got == "" || got != want {
		t.Errorf("CO2 figure offline: got %q, want %q", got, want)
	}
	// Editing still works offline.
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.8")
	if _, after := co2Figure(t, ctx); after == got {
		t.Errorf("an edit offline did not change the result")
	}
}

func TestNoRequestLeavesTheOrigin(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	if _, err := chromedp.Call(ctx, network.Enable, network.EnableParams{}); err != nil {
		t.Fatal(err)
	}
	requests := chromedp.Events(ctx, network.RequestWillBeSent)
	var mu sync.Mutex
	var urls []string
	go func() {
		for ev, err := range requests {
			if err != nil {
				return
			}
			mu.Lock()
			urls = append(urls, ev.Request.URL)
			mu.Unlock()
		}
	}()
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.75")
	// The content security policy blocks a request to another origin.
	violated, err := chromedp.Run(ctx, chromedp.Evaluate[string](`new Promise(resolve => {
		document.addEventListener("securitypolicyviolation", e => resolve(e.effectiveDirective), {once: true});
		fetch("http://127.0.0.2:9/lixiv-csp-check").catch(() => {});
		setTimeout(() => resolve("none"), 60000); // only if no violation comes at all
	})`, chromedp.EvalAwaitPromise))
	if err != nil {
		t.Fatal(err)
	}
	if violated != "connect-src" {
		t.Errorf("a request to another origin: got violation %q, want connect-src", violated)
	}
	// The events arrive on their own goroutine: wait until the page's own
	// requests (index, scripts, wasm, demo) have all been seen.
	seen := func() []string { // the requests seen so far, without data: and blob: URLs
		mu.Lock()
		defer mu.Unlock()
		var out []string
		for _, u := range urls {
			if !strings.HasPrefix(u, "data:") && !strings.HasPrefix(u, "blob:") {
				out = append(out, u)
			}
		}
		return out
	}
	for deadline := time.Now().Add(patience); len(seen()) < 4 && time.Now().Before(deadline); {
		time.Sleep(50 * time.Millisecond)
	}
	origin := strings.TrimSuffix(srv.URL, "/")
	n := 0
	for _, u := range seen() {
		n++
		if u != origin && !strings.HasPrefix(u, origin+"/") {
			if strings.Contains(u, "lixiv-csp-check") {
				t.Logf("blocked by policy (not sent): %s", u)
				continue
			}
			t.Errorf("request to another origin: %s", u)
		}
	}
	if n < 4 {
		t.Errorf("saw %d requests, want the page's own (index, scripts, wasm, demo)", n)
	}
}

func TestExportsTableAndChart(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	dir := t.TempDir()
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	tests := []struct {
		name, button string
		check        func(b []byte) bool
	}{
		{"table as CSV", `section.cell .result .table-tools button`, func(b []byte) bool { return strings.Count(string(b), "\n") > 1 && strings.Contains(string(b), ",") }},
		{"chart as SVG", `figure.chart figcaption button:nth-child(1)`, func(b []byte) bool { return strings.HasPrefix(string(b), "<svg") }},
		{"chart as PNG", `figure.chart figcaption button:nth-child(2)`, func(b []byte) bool { return len(b) > 8 && string(b[1:4]) == "PNG" }},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := filepath.Join(dir, strings.ReplaceAll(tt.name, " ", "-"))
			file := download(t, ctx, d, func() {
				if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS(tt.button))); err != nil {
					t.Fatal(err)
				}
			})
			data, err := os.ReadFile(file)
			if err != nil {
				t.Fatal(err)
			}
			if !tt.check(data) {
				t.Errorf("download: got %.60q", data)
			}
		})
	}
}

func TestUndoRedoKeys(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	name, before := co2Figure(t, ctx)
	atm := cellOf(t, ctx, "atmosphere")
	field := fmt.Sprintf(`document.getElementById("p-%s-na_per_cl").value`, atm)
	original := eval[string](t, ctx, field)
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.5")
	changed := figures(t, ctx)[name]
	key := func(shift bool) {
		gen := eval[string](t, ctx, `document.body.dataset.gen`)
		eval[bool](t, ctx, fmt.Sprintf(`document.body.dispatchEvent(new KeyboardEvent("keydown", {key: "z", ctrlKey: true, shiftKey: %v, bubbles: true})) || true`, shift))
		waitGen(t, ctx, gen)
	}
	key(false)
	if got := eval[string](t, ctx, field); got != original {
		t.Errorf("Na/Cl after Ctrl+Z: got %q, want %q", got, original)
	}
	if got := figures(t, ctx)[name]; got != before {
		t.Errorf("%s after Ctrl+Z: got %q, want %q", name, got, before)
	}
	key(true)
	if got := eval[string](t, ctx, field); got != "0.5" {
		t.Errorf("Na/Cl after Ctrl+Shift+Z: got %q, want 0.5", got)
	}
	if got := figures(t, ctx)[name]; got != changed {
		t.Errorf("%s after Ctrl+Shift+Z: got %q, want %q", name, got, changed)
	}
}

func TestDropSamplesFile(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	block := samplesBlock(t, ctx, "DROP-1", "DROP-2", "DROP-3")
	cols := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr:first-child input")].map(e => e.value)`)
	units := eval[[]string](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr.units input")].map(e => e.value)`)
	file := strings.Join(cols, "\t") + "\n" + strings.Join(units, "\t") + "\n" + block
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	text, _ := json.Marshal(file)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const dt = new DataTransfer();
		dt.items.add(new File([%s], "new-samples.tsv", {type: "text/tab-separated-values"}));
		document.querySelector(".page").dispatchEvent(new DragEvent("drop", {dataTransfer: dt, bubbles: true, cancelable: true}));
		return true })()`, text))
	intoDemo(t, ctx)
	waitGen(t, ctx, gen)
	if got := eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`); !strings.HasPrefix(got, "3 rows") {
		t.Errorf("samples table after the drop: got %q, want 3 rows", got)
	}
	notes := eval[string](t, ctx, `document.querySelector("section.kind-samples .notes").textContent`)
	if !strings.Contains(notes, "new-samples.tsv") {
		t.Errorf("import note: got %q, want the file named", notes)
	}
}

// TestLongRunStaysResponsive starts a long Monte Carlo run and checks that
// the page shows its progress and still handles a click while it computes,
// and that another edit cancels the run and computes in its place.
func TestLongRunStaysResponsive(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	ap := cellOf(t, ctx, "apportionment")
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const el = document.getElementById("p-%s-draws");
		el.value = "40000"; el.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, ap))
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`!!document.querySelector("section.state-running progress")`,
		chromedp.WithPollingTimeout(patience), chromedp.WithPollingInterval(20*time.Millisecond))); err != nil {
		t.Fatalf("no progress bar while computing: %v", err)
	}
	// The bar moves as the run goes on (the quick pass's, then the full
	// pass's from its start).
	first := eval[float64](t, ctx, `document.querySelector("section.state-running progress").value`)
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](fmt.Sprintf(`(() => { const p = document.querySelector("section.state-running progress"); return !!p && p.value != %g })()`, first),
		chromedp.WithPollingTimeout(patience), chromedp.WithPollingInterval(20*time.Millisecond))); err != nil {
		t.Fatalf("the progress bar stayed at %g: %v", first, err)
	}
	// A click on the note's fold button is handled while the run goes on.
	note := cellOf(t, ctx, "note")
	eval[bool](t, ctx, fmt.Sprintf(`document.querySelector("#cell-%s .fold").click() || true`, note))
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](fmt.Sprintf(`!document.querySelector("#cell-%s .cell-body")`, note),
		chromedp.WithPollingTimeout(patience), chromedp.WithPollingInterval(20*time.Millisecond))); err != nil {
		t.Fatalf("the fold click was not handled: %v", err)
	}
	if busy := eval[string](t, ctx, `document.body.dataset.busy`); busy != "1" {
		t.Logf("the run ended before the click was checked (busy %q); the click still went through", busy)
	}
	// Another edit cancels the long run, and the page computes the new one.
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const el = document.getElementById("p-%s-draws");
		el.value = "200"; el.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, ap))
	waitGen(t, ctx, gen)
	if v := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("p-%s-draws").value`, ap)); v != "200" {
		t.Errorf("draws after the second edit: %q, want 200", v)
	}
	if bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting, section.state-running")].map(s => s.id)`); len(bad) > 0 {
		t.Errorf("after the cancelled run, cells not computed: %q", bad)
	}
}

func TestImportProblemBesideTable(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	col := naColumn(t, ctx)
	sel := fmt.Sprintf("section.kind-samples table.data tbody tr:nth-child(3) td:nth-child(%d) input", col+2)
	edit(t, ctx, sel, "abc")
	text := eval[string](t, ctx, `(document.querySelector("section.kind-samples .table-problems") || {textContent: ""}).textContent`)
	if !strings.Contains(text, "row 3") || !strings.Contains(text, "column Na") {
		t.Errorf("problems beside the table: got %q, want row 3 and column Na named", text)
	}
	if cls := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).className`, sel)); cls != "bad" {
		t.Errorf("the bad cell: got class %q, want it marked", cls)
	}
	if v := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).value`, sel)); v != "abc" {
		t.Errorf("what the user typed: got %q, want it kept", v)
	}
}

func TestAutosaveReopens(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	atm := cellOf(t, ctx, "atmosphere")
	edit(t, ctx, "#p-"+atm+"-na_per_cl", "0.66")
	_, want := co2Figure(t, ctx)
	reloadSaved(t, ctx)
	if got := eval[string](t, ctx, fmt.Sprintf(`document.getElementById("p-%s-na_per_cl").value`, atm)); got != "0.66" {
		t.Errorf("Na/Cl after reopening: got %q, want the autosaved 0.66", got)
	}
	if _, got := co2Figure(t, ctx); got != want {
		t.Errorf("CO2 after reopening: got %q, want %q", got, want)
	}
	if s := eval[string](t, ctx, `document.getElementById("saved-state").textContent`); !strings.Contains(s, "storage") {
		t.Errorf("saved state after reopening: got %q", s)
	}
}

// TestEveryExampleOpens opens each example budget through the file picker
// and checks that every cell computes and the stored results match.
func TestEveryExampleOpens(t *testing.T) {
	files, _ := filepath.Glob(filepath.Join(repo, "examples", "*", "*.lixiv.json"))
	if len(files) == 0 {
		t.Skip("no example budgets")
	}
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	for _, f := range files {
		t.Run(filepath.Base(f), func(t *testing.T) {
			gen := eval[string](t, ctx, `document.body.dataset.gen`)
			if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{f})); err != nil {
				t.Fatal(err)
			}
			waitGen(t, ctx, gen)
			bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting")].map(s => s.id + ": " + (s.querySelector(".problem") || {textContent: ""}).textContent)`)
			if len(bad) > 0 {
				t.Errorf("cells with problems: %q", bad)
			}
			if n := eval[int](t, ctx, `document.querySelectorAll(".svg-mount svg").length`); n == 0 {
				t.Errorf("no chart drawn")
			}
			if v := eval[string](t, ctx, `document.getElementById("verify").textContent`); v != "stored results match the rerun" && v != "this budget holds no stored results" {
				t.Errorf("footer: got %q", v)
			}
		})
	}
}

func TestBadBudgetFileKeepsTheOpenOne(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	title := eval[string](t, ctx, `document.getElementById("budget-title").value`)
	bad := filepath.Join(t.TempDir(), "broken.lixiv.json")
	if err := os.WriteFile(bad, []byte("{\n  \"format\": \"lixiv-budget\",\n  \"cells\": [ oops ]\n}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{bad})); err != nil {
		t.Fatal(err)
	}
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`!!document.getElementById("page-message")`, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("no message about the bad file: %v", err)
	}
	msg := eval[string](t, ctx, `document.getElementById("page-message").textContent`)
	if !strings.Contains(msg, "broken.lixiv.json") || !strings.Contains(msg, ":3") {
		t.Errorf("message: got %q, want the file and line 3 named", msg)
	}
	if got := eval[string](t, ctx, `document.getElementById("budget-title").value`); got != title {
		t.Errorf("open budget: got %q, want %q kept", got, title)
	}
}

func TestRerunThatDiffersIsFlagged(t *testing.T) {
	data, err := os.ReadFile(filepath.Join(light, "demo.lixiv.json"))
	if err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`"sha256": "[0-9a-f]+"`)
	if !re.Match(data) {
		t.Fatal("the demo holds no results checksum")
	}
	tampered := re.ReplaceAll(data, []byte(`"sha256": "0000000000000000000000000000000000000000000000000000000000000000"`))
	file := filepath.Join(t.TempDir(), "tampered.lixiv.json")
	if err := os.WriteFile(file, tampered, 0o644); err != nil {
		t.Fatal(err)
	}
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
		t.Fatal(err)
	}
	waitGen(t, ctx, gen)
	if v := eval[string](t, ctx, `document.getElementById("verify").className + ": " + document.getElementById("verify").textContent`); !strings.HasPrefix(v, "verify bad: stored results DIFFER") {
		t.Errorf("footer: got %q, want the difference flagged", v)
	}
}

func TestUnreadableAutosaveIsKept(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	eval[bool](t, ctx, `localStorage.setItem("lixiv.budget", "{ not a budget"); true`)
	if err := chromedp.Do(ctx, chromedp.Reload()); err != nil {
		t.Fatal(err)
	}
	waitReady(t, ctx)
	waitIdle(t, ctx)
	msg := eval[string](t, ctx, `(document.getElementById("page-message") || {textContent: ""}).textContent`)
	if !strings.Contains(msg, "could not be read") {
		t.Errorf("message: got %q, want the unreadable autosave reported", msg)
	}
	if kept := eval[string](t, ctx, `localStorage.getItem("lixiv.budget.unreadable") || ""`); kept != "{ not a budget" {
		t.Errorf("unreadable autosave: got %q kept, want the text as it was", kept)
	}
	if name, _ := co2Figure(t, ctx); name == "" {
		t.Errorf("the demo did not open in its place")
	}
}

// TestInputTableEdits edits the samples table as a user would: a value
// typed in one field keeps the focus in the next field (the table is
// updated in place, not written anew), and a row's remove button removes it.
func TestInputTableEdits(t *testing.T) {
	ctx := openDemo(t)
	col := naColumn(t, ctx)
	field := func(row int) string {
		return fmt.Sprintf("section.kind-samples table.data tbody tr:nth-child(%d) td:nth-child(%d) input", row, col+2)
	}
	// Type in row 2, then move to row 3 (as Tab does): change fires on row 2.
	gen := eval[string](t, ctx, `document.body.dataset.gen`)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { const a = document.querySelector(%q), b = document.querySelector(%q);
		a.focus(); a.value = "123.5"; a.dispatchEvent(new Event("input", {bubbles: true}));
		b.focus(); b.lixivMark = 1; a.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, field(2), field(3)))
	waitGen(t, ctx, gen)
	if v := eval[string](t, ctx, fmt.Sprintf(`document.querySelector(%q).value`, field(2))); v != "123.5" {
		t.Errorf("edited field: got %q, want 123.5", v)
	}
	if !eval[bool](t, ctx, `document.activeElement.lixivMark === 1`) {
		t.Errorf("the field moved to lost the focus after the edit was painted")
	}
	before := eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`)
	first := eval[string](t, ctx, `document.querySelector("section.kind-samples table.data tbody tr:nth-child(2) td:nth-child(2) input").value`)
	gen = eval[string](t, ctx, `document.body.dataset.gen`)
	eval[bool](t, ctx, `document.querySelector("section.kind-samples table.data tbody tr:first-child .row-remove").click() || true`)
	waitGen(t, ctx, gen)
	var nBefore, nAfter int
	fmt.Sscanf(before, "%d", &nBefore)
	fmt.Sscanf(eval[string](t, ctx, `document.querySelector("section.kind-samples .table-tools span").textContent`), "%d", &nAfter)
	if nAfter != nBefore-1 {
		t.Errorf("rows after removing one: got %d, want %d", nAfter, nBefore-1)
	}
	if got := eval[string](t, ctx, `document.querySelector("section.kind-samples table.data tbody tr:first-child td:nth-child(2) input").value`); got != first {
		t.Errorf("first row after removing the first: got %q, want the former second row's %q", got, first)
	}
}

// naColumn returns the index of the Na column of the samples input table.
func naColumn(t testing.TB, ctx context.Context) int {
	t.Helper()
	col := eval[int](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr:first-child input")].findIndex(e => e.value === "Na")`)
	if col < 0 {
		t.Fatal("the demo's samples table has no Na column")
	}
	return col
}

// openDemo starts a server and a browser, and opens the demo budget,
// computed.
func openDemo(t testing.TB) context.Context {
	t.Helper()
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	return ctx
}
