//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
)

// TestShots saves full-page screenshots of the demo budget, and one of each
// cell, into the folder named by LIXIV_SHOTS. It is skipped when unset; it
// makes pictures to look at, and asserts nothing about them.
func TestShots(t *testing.T) {
	dir := os.Getenv("LIXIV_SHOTS")
	if dir == "" {
		t.Skip("LIXIV_SHOTS not set")
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	srv := startDemoServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	waitIdle(t, ctx)
	if f := os.Getenv("LIXIV_SHOTS_BUDGET"); f != "" { // pictures of another budget than the demo
		gen := eval[string](t, ctx, `document.body.dataset.gen`)
		if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{f})); err != nil {
			t.Fatal(err)
		}
		waitGen(t, ctx, gen)
	}
	time.Sleep(300 * time.Millisecond)
	png, err := chromedp.Run(ctx, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatal(err)
	}
	save(t, filepath.Join(dir, "page.png"), png)
	top, err := chromedp.Run(ctx, chromedp.CaptureScreenshot())
	if err != nil {
		t.Fatal(err)
	}
	save(t, filepath.Join(dir, "top.png"), top)
	ids := eval[[]string](t, ctx, `[...document.querySelectorAll("section.cell")].map(e => e.id)`)
	for _, id := range ids {
		png, err := shotOf(t, ctx, id)
		if err != nil {
			t.Errorf("%s: %v", id, err)
			continue
		}
		save(t, filepath.Join(dir, id+".png"), png)
	}
	charts := eval[[]string](t, ctx, `[...document.querySelectorAll(".svg-mount")].map(e => e.id)`)
	for _, id := range charts {
		png, err := shotOf(t, ctx, id)
		if err != nil {
			t.Errorf("%s: %v", id, err)
			continue
		}
		save(t, filepath.Join(dir, id+".png"), png)
	}
	// A problem in the samples table, shown beside it.
	if col := eval[int](t, ctx, `[...document.querySelectorAll("section.kind-samples table.data thead tr:first-child input")].findIndex(e => e.value === "Na")`); col >= 0 {
		edit(t, ctx, fmt.Sprintf("section.kind-samples table.data tbody tr:nth-child(3) td:nth-child(%d) input", col+2), "abc")
		id := eval[string](t, ctx, `document.querySelector("section.kind-samples").id`)
		if png, err := chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS("#"+id))); err == nil {
			save(t, filepath.Join(dir, id+"-problem.png"), png)
		}
	}
	// A long run in progress.
	ap := eval[string](t, ctx, `(document.querySelector("section.kind-apportionment") || {id: ""}).id`)
	if ap != "" {
		eval[bool](t, ctx, `(() => { document.querySelector("section.kind-apportionment").scrollIntoView(); return true })()`)
		eval[bool](t, ctx, fmt.Sprintf(`(() => { const el = document.getElementById("p-%s-draws");
			el.value = "40000"; el.dispatchEvent(new Event("change", {bubbles: true})); return true })()`, ap[len("cell-"):]))
		if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`!!document.querySelector("section.state-running progress")`,
			chromedp.WithPollingTimeout(30*time.Second), chromedp.WithPollingInterval(20*time.Millisecond))); err == nil {
			if png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot()); err == nil {
				save(t, filepath.Join(dir, "running.png"), png)
			}
		}
		waitIdle(t, ctx)
	}
	// The page as printed (black and white is how most will print it).
	if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"}); err == nil {
		eval[bool](t, ctx, `(() => { document.querySelector("section.kind-fluxes").scrollIntoView(); return true })()`)
		if png, err := chromedp.Run(ctx, chromedp.CaptureScreenshot()); err == nil {
			save(t, filepath.Join(dir, "print.png"), png)
		}
	}
}

func save(t *testing.T, path string, data []byte) {
	t.Helper()
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Logf("wrote %s", path)
}

// shotOf takes a picture of the element with the given id once it is on
// the screen. The page lays out results only near the screen
// (content-visibility on .outputs), and a picture of a cell taller than the
// screen showed its results blank: the pictures lay them all out, as
// printing does (the page itself was checked on the screen: it draws them
// as they scroll in).
func shotOf(t *testing.T, ctx context.Context, id string) ([]byte, error) {
	t.Helper()
	eval[bool](t, ctx, `(() => { if (!document.getElementById("shots-all-laid-out")) {
		const s = document.createElement("style"); s.id = "shots-all-laid-out";
		s.textContent = ".outputs { content-visibility: visible !important; }"; document.head.appendChild(s) }
		return true })()`)
	eval[bool](t, ctx, fmt.Sprintf(`(() => { document.getElementById(%q).scrollIntoView(); return true })()`, id))
	time.Sleep(150 * time.Millisecond)
	return chromedp.Run(ctx, chromedp.Screenshot(chromedp.CSS("#"+id)))
}
