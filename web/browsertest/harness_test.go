//go:build browser

package browsertest

import (
	"context"
	"fmt"
	"net"
	"net/http"
	"os"
	"os/exec"
	"path/filepath"
	goruntime "runtime"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// repo is the repository root, dist the built page, lixivBin the native
// command built once for every test. light is the built page with a light
// demo in place of the demo (lightDemo), which most tests open.
var repo, dist, light, lixivBin string

// patience is how long a test waits for the page (a render, a recompute,
// a download, the service worker) before it fails: far beyond the seconds
// any of them takes (each takes under 10 s on an idle machine, and one
// took over 2 minutes with the machine's two cores shared by some forty
// busy processes), so that a machine busy with other work never fails a
// test, while a page that hangs still ends it. Tests wait for events (the
// page's data-ready, data-busy and data-gen marks, the browser's download
// events), never for a fixed time.
const patience = 5 * time.Minute

// sessionLimit ends a browser that a test left running.
const sessionLimit = 30 * time.Minute

func TestMain(m *testing.M) {
	os.Exit(setup(m))
}

func setup(m *testing.M) int {
	_, file, _, _ := goruntime.Caller(0)
	repo = filepath.Clean(filepath.Join(filepath.Dir(file), "..", ".."))
	dist = filepath.Join(repo, "web", "dist")
	if _, err := os.Stat(filepath.Join(dist, "main.wasm")); err != nil {
		fmt.Fprintln(os.Stderr, "browsertest: the page is not built; run `make build` (or `make browser`)")
		return 1
	}
	tmp, err := os.MkdirTemp("", "lixiv-browser")
	if err != nil {
		fmt.Fprintln(os.Stderr, err)
		return 1
	}
	defer os.RemoveAll(tmp)
	lixivBin = filepath.Join(tmp, "lixiv")
	cmd := exec.Command("go", "build", "-o", lixivBin, "./engine/cmd/lixiv")
	cmd.Dir = repo
	if out, err := cmd.CombinedOutput(); err != nil {
		fmt.Fprintf(os.Stderr, "browsertest: building lixiv: %v\n%s", err, out)
		return 1
	}
	light = filepath.Join(tmp, "light")
	if err := lightDemo(dist, light); err != nil {
		fmt.Fprintln(os.Stderr, "browsertest: the light demo:", err)
		return 1
	}
	return m.Run()
}

// server is a running `lixiv serve` on a free loopback port.
type server struct {
	URL string
	cmd *exec.Cmd
}

// startServer runs the real page server, as `make serve` does, on a port
// of its own, serving the page with the light demo (lightDemo): for tests
// of the page's controls, which do not depend on how many draws the demo
// keeps. Stop ends it; the test cleanup stops it too.
func startServer(t testing.TB) *server { return serveDir(t, light) }

// startDemoServer is startServer serving the page as built, with the demo
// itself: for what depends on the demo's own settings (the timing
// harness, the screenshots, the demo's stored results).
func startDemoServer(t testing.TB) *server { return serveDir(t, dist) }

// serveDir runs `lixiv serve` on the files of dir.
func serveDir(t testing.TB, dir string) *server {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	addr := ln.Addr().String()
	ln.Close()
	cmd := exec.Command(lixivBin, "serve", "-addr", addr, "-dir", dir)
	cmd.Stdout, cmd.Stderr = os.Stderr, os.Stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	s := &server{URL: "http://" + addr + "/", cmd: cmd}
	t.Cleanup(s.Stop)
	for deadline := time.Now().Add(patience); time.Now().Before(deadline); {
		resp, err := http.Get(s.URL + "index.html")
		if err == nil {
			resp.Body.Close()
			return s
		}
		time.Sleep(50 * time.Millisecond)
	}
	t.Fatalf("server at %s did not answer", addr)
	return nil
}

// Stop ends the server process.
func (s *server) Stop() {
	if s.cmd.Process != nil && s.cmd.ProcessState == nil {
		s.cmd.Process.Kill()
		s.cmd.Wait()
	}
}

// chromiumPath finds Debian's Chromium.
func chromiumPath(t testing.TB) string {
	for _, p := range []string{os.Getenv("CHROMIUM"), "/usr/bin/chromium", "/usr/bin/chromium-browser"} {
		if p != "" {
			if _, err := os.Stat(p); err == nil {
				return p
			}
		}
	}
	t.Fatal("chromium not found; `make chromium` installs it")
	return ""
}

// newBrowser starts a headless Chromium with an empty profile and returns
// a tab context. Console messages and page errors go to the test log.
func newBrowser(t testing.TB, profile string) context.Context {
	t.Helper()
	if profile == "" {
		profile = t.TempDir()
	}
	opts := []chromedp.ExecAllocatorOption{
		chromedp.ExecPath(chromiumPath(t)), chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU,
		chromedp.NoFirstRun, chromedp.NoDefaultBrowserCheck,
		chromedp.Flag("disable-background-networking", true), chromedp.Flag("disable-component-update", true),
		chromedp.Flag("disable-sync", true), chromedp.Flag("disable-dev-shm-usage", true),
		chromedp.Flag("disable-quic", true),
		chromedp.WindowSize(1280, 1000),
		chromedp.UserDataDir(profile),
	}
	ctx, cancel := context.WithTimeout(context.Background(), sessionLimit)
	t.Cleanup(cancel)
	actx, acancel := chromedp.NewExecAllocator(ctx, opts...)
	t.Cleanup(acancel)
	tctx, tcancel := chromedp.NewContext(actx)
	t.Cleanup(tcancel)
	if err := chromedp.Do(tctx); err != nil {
		t.Fatalf("starting chromium: %v", err)
	}
	console := chromedp.Events(tctx, runtime.ConsoleAPICalled)
	exceptions := chromedp.Events(tctx, runtime.ExceptionThrown)
	go func() {
		for ev, err := range console {
			if err != nil {
				return
			}
			var parts []string
			for _, a := range ev.Args {
				parts = append(parts, strings.Trim(string(a.Value), `"`)+a.Description)
			}
			t.Logf("console.%s: %s", ev.Type, strings.Join(parts, " "))
		}
	}()
	go func() {
		for ev, err := range exceptions {
			if err != nil {
				return
			}
			d := ev.ExceptionDetails
			msg := d.Text
			if d.Exception != nil {
				msg += " " + d.Exception.Description
			}
			t.Logf("page exception: %s", msg)
		}
	}()
	return tctx
}

// open navigates to url and waits until the page has rendered.
func open(t testing.TB, ctx context.Context, url string) {
	t.Helper()
	if err := chromedp.Do(ctx, chromedp.Navigate(url)); err != nil {
		t.Fatalf("navigate %s: %v", url, err)
	}
	waitReady(t, ctx)
}

// waitReady waits until the page's first render has marked the body.
func waitReady(t testing.TB, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`document.body.dataset.ready === "1"`, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("page did not render: %v", err)
	}
}

// eval runs a script in the page and returns its value.
func eval[T any](t testing.TB, ctx context.Context, script string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](script))
	if err != nil {
		t.Fatalf("evaluate %q: %v", script, err)
	}
	return v
}

// waitIdle waits until no recompute is running.
func waitIdle(t testing.TB, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`document.body.dataset.busy === "0"`, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("page did not finish computing: %v", err)
	}
}

// reloadSaved waits until the page has saved the last edit in browser
// storage, reloads it and waits until it has computed again.
func reloadSaved(t testing.TB, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`document.getElementById("saved-state").textContent.startsWith("Saved in this browser")`,
		chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("no visible saved state: %v", err)
	}
	if err := chromedp.Do(ctx, chromedp.Reload()); err != nil {
		t.Fatal(err)
	}
	waitReady(t, ctx)
	waitIdle(t, ctx)
}

// intoDemo answers the question the page asks of a table opened over the
// demo: into the demo's table.
func intoDemo(t testing.TB, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Run(ctx, chromedp.Poll[bool](`!!document.getElementById("choice-demo")`, chromedp.WithPollingTimeout(patience))); err != nil {
		t.Fatalf("no question for a table opened over the demo: %v", err)
	}
	if err := chromedp.Do(ctx, chromedp.Click(chromedp.CSS("#choice-demo"))); err != nil {
		t.Fatal(err)
	}
}
