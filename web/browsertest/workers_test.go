//go:build browser

package browsertest

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
)

// TestWorkersSameResults opens example budget files, whose stored results
// were computed natively, on the page computing with its Web Workers and
// on the page forced onto its own thread (?workers=0, which the page says
// in a note): every rerun matches the stored results checksum, so the
// workers give the single-threaded page's results. The demo's per-sample
// inversions go to the workers sample by sample; the catchment-wide
// example's model (TestWorkersCatchmentSameResults) round by round.
func TestWorkersSameResults(t *testing.T) { workersSameResults(t, "corrie-vale") }

// TestWorkersCatchmentSameResults is TestWorkersSameResults for the
// catchment-wide example, whose chains and samples go to the workers in
// rounds.
func TestWorkersCatchmentSameResults(t *testing.T) { workersSameResults(t, "scarrow-ghyll") }

func workersSameResults(t *testing.T, example string) {
	file := filepath.Join(repo, "examples", example, example+".lixiv.json")
	catchment := example == "scarrow-ghyll"
	srv := startServer(t)
	for _, c := range []struct {
		query   string
		workers bool
	}{{"", true}, {"?workers=1", true}, {"?workers=0", false}} {
		t.Run("page"+c.query, func(t *testing.T) {
			ctx := newBrowser(t, "")
			open(t, ctx, srv.URL+c.query)
			waitIdle(t, ctx)
			size := eval[int](t, ctx, `window.lixivPool ? lixivPool.size : -1`)
			note := eval[string](t, ctx, `(document.getElementById("compute-note") || {textContent: ""}).textContent`)
			switch {
			case c.workers && (size < 1 || note != ""):
				t.Fatalf("%d workers, note %q: want workers and no note", size, note)
			case !c.workers && (size != 0 || !strings.Contains(note, "own thread")):
				t.Fatalf("%d workers, note %q: want none and a note saying so", size, note)
			}
			// Count the jobs that are rounds of the catchment-wide model
			// (those that carry a round's state).
			eval[bool](t, ctx, `(() => { window.lixivRounds = 0; const run = lixivPool.run;
				if (run) { lixivPool.run = function (...a) { if (a[8]) { lixivRounds++; } return run.apply(this, a); }; }
				return true })()`)
			gen := eval[string](t, ctx, `document.body.dataset.gen`)
			if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
				t.Fatal(err)
			}
			waitGen(t, ctx, gen)
			if v := text(t, ctx, "#verify"); v != "stored results match the rerun" {
				t.Errorf("%d workers: footer %q, want the stored results checksum matched", size, v)
			}
			if jobs := eval[int](t, ctx, `lixivPool.jobs`); (jobs > 0) != c.workers {
				t.Errorf("%d workers: %d inversions handed to them", size, jobs)
			}
			if rounds := eval[int](t, ctx, `lixivRounds`); (rounds > 0) != (c.workers && catchment) {
				t.Errorf("%d workers: %d rounds of the catchment-wide model handed to them", size, rounds)
			}
			if bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting")].map(s => s.id)`); len(bad) > 0 {
				t.Errorf("%d workers: cells with problems %q", size, bad)
			}
		})
	}
}

// TestLostWorkerIsNamed stops a worker as it is handed a sample (in the
// catchment-wide example, the first chain of a round): the apportionment
// cell shows a problem naming the worker (never a silent hang), and the
// next edit computes again on fresh workers.
func TestLostWorkerIsNamed(t *testing.T) {
	for _, c := range []struct {
		example, when, setting, first, next string
	}{
		{"", "m.sample === 0", "draws", "2100", "2200"},
		{"scarrow-ghyll", "m.sample === 0 && m.state", "seed", "21", "22"},
	} {
		t.Run("demo"+c.example, func(t *testing.T) {
			ctx := openDemo(t)
			if eval[int](t, ctx, `lixivPool.size`) < 1 {
				t.Skip("the page has no workers")
			}
			if c.example != "" {
				gen := eval[string](t, ctx, `document.body.dataset.gen`)
				file := filepath.Join(repo, "examples", c.example, c.example+".lixiv.json")
				if err := chromedp.Do(ctx, chromedp.SetUploadFiles(chromedp.CSS("#file-open"), []string{file})); err != nil {
					t.Fatal(err)
				}
				waitGen(t, ctx, gen)
			}
			ap := cellOf(t, ctx, "apportionment")
			eval[bool](t, ctx, `(() => { const post = Worker.prototype.postMessage;
				Worker.prototype.postMessage = function (m, tr) {
					if (m && `+c.when+` && !window.lixivStopped) {
						window.lixivStopped = true;
						this.terminate();
						this.onerror({message: "stopped from outside", preventDefault() {}});
						return;
					}
					return post.call(this, m, tr);
				};
				return true })()`)
			edit(t, ctx, "#p-"+ap+"-"+c.setting, c.first)
			if msg := text(t, ctx, "#cell-"+ap+" .problem"); !strings.Contains(msg, "worker 1 of") || !strings.Contains(msg, "stopped from outside") {
				t.Errorf("apportionment after a worker stopped: %q, want the worker named", msg)
			}
			edit(t, ctx, "#p-"+ap+"-"+c.setting, c.next)
			if bad := eval[[]string](t, ctx, `[...document.querySelectorAll("section.state-problem, section.state-waiting")].map(s => s.id)`); len(bad) > 0 {
				t.Errorf("after the next edit: cells with problems %q", bad)
			}
		})
	}
}
