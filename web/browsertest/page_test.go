//go:build browser

package browsertest

import "testing"

func TestPageLoads(t *testing.T) {
	srv := startServer(t)
	ctx := newBrowser(t, "")
	open(t, ctx, srv.URL)
	got := eval[string](t, ctx, `document.getElementById("budget-title").value`)
	if got == "" {
		t.Errorf("header: got empty text")
	}
}
