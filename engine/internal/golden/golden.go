// Package golden compares test output with golden files under a package's
// testdata/ folder. Run `go test -update` to rewrite them; on a mismatch the
// output is written beside the golden file with the extension .got (ignored
// by git) so that the two can be diffed.
package golden

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"
)

// Update is the -update flag shared by every engine test that uses golden
// files.
var Update = flag.Bool("update", false, "rewrite the golden files under testdata/")

// Check compares got with testdata/name, rewriting the file under -update.
// A missing golden file fails the test with a hint to run -update.
func Check(t testing.TB, name string, got []byte) {
	t.Helper()
	path := filepath.Join("testdata", name)
	if *Update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		_ = os.WriteFile(path+".got", got, 0o644)
		t.Errorf("%s differs from the golden file; got written to %s.got\n%s", name, path, got)
	}
}
