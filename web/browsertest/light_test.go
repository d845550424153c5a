//go:build browser

package browsertest

import (
	"context"
	"os"
	"path/filepath"
	"strings"

	"lixiv/engine/notebook"
)

// lightSettings are the settings by which the light demo differs from the
// demo: fewer draws and replicates, so that it computes in a fraction of
// the time. Every cell, table and chart of the demo is still there.
var lightSettings = []struct{ cell, key, value string }{
	{"apportionment", "draws", "200"},
	{"apportionment", "target_ess", "100"},
	{"fluxes", "bootstrap", "100"},
	{"fluxes", "series_bootstrap", "40"},
}

// lightDemo writes into dir the built page of from (its files linked, not
// copied) with a light demo: the demo with lightSettings, computed
// natively and its results stored, as the examples are. Most browser
// tests open it: each test opens the demo at least once and waits until
// it is computed, and with the demo's own draws that wait was most of the
// browser tests' time. The demo itself is opened by startDemoServer.
func lightDemo(from, dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	entries, err := os.ReadDir(from)
	if err != nil {
		return err
	}
	for _, e := range entries {
		// The demo's compressed twins go: the server then sends the light
		// demo uncompressed.
		if strings.HasPrefix(e.Name(), "demo"+notebook.Extension) {
			continue
		}
		if err := os.Symlink(filepath.Join(from, e.Name()), filepath.Join(dir, e.Name())); err != nil {
			return err
		}
	}
	data, err := os.ReadFile(filepath.Join(from, "demo"+notebook.Extension))
	if err != nil {
		return err
	}
	d, err := notebook.Parse(data, "demo"+notebook.Extension)
	if err != nil {
		return err
	}
	for _, s := range lightSettings {
		if err := d.SetParam(s.cell, s.key, s.value); err != nil {
			return err
		}
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		return err
	}
	if err := d.Keep(); err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(dir, "demo"+notebook.Extension), d.Marshal(), 0o644)
}
