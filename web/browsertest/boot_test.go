//go:build browser

package browsertest

import (
	"net/http"
	"net/http/httptest"
	"net/http/httputil"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// TestBodyLateStillMounts holds the page's body back for two seconds after
// its head, as a slow network or a busy machine can: the module, fetched
// from the head, is compiled before the mount point is parsed. The page
// must wait for the body, not panic for want of the mount point (a gate
// run once failed so).
func TestBodyLateStillMounts(t *testing.T) {
	s := startServer(t)
	page, err := os.ReadFile(filepath.Join(light, "index.html"))
	if err != nil {
		t.Fatal(err)
	}
	head, body, ok := strings.Cut(string(page), "<body>")
	if !ok {
		t.Fatal("index.html has no <body>")
	}
	target, err := url.Parse(s.URL)
	if err != nil {
		t.Fatal(err)
	}
	proxy := httputil.NewSingleHostReverseProxy(target)
	late := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.URL.Path != "/late.html" {
			proxy.ServeHTTP(w, r)
			return
		}
		w.Header().Set("Content-Type", "text/html; charset=utf-8")
		w.Write([]byte(head))
		w.(http.Flusher).Flush()
		// Long enough for the module to download and compile meanwhile.
		select {
		case <-time.After(2 * time.Second):
		case <-r.Context().Done():
			return
		}
		w.Write([]byte("<body>" + body))
	}))
	t.Cleanup(late.Close)
	ctx := newBrowser(t, "")
	open(t, ctx, late.URL+"/late.html")
	if got := eval[string](t, ctx, `String(!!window.lixivBoot.compiled && window.lixivBoot.compiled < performance.getEntriesByType("navigation")[0].domContentLoadedEventStart)`); got != "true" {
		t.Errorf("the module was not compiled before the body was parsed (%s): the test did not hold the body back long enough", got)
	}
	waitIdle(t, ctx)
}
