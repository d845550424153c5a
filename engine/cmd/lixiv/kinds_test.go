package main

import (
	"strings"
	"testing"

	"lixiv/engine/notebook/notebooktest"
)

// TestKindsListsDescribedFakes: a kind and an estimator registered through
// their descriptors alone are listed by lixiv kinds.
func TestKindsListsDescribedFakes(t *testing.T) {
	defer notebooktest.DescribeFakes()()
	outb, code, err := runStatus([]string{"kinds", "glaze", "fluxes"})
	out := string(outb)
	if code != 0 {
		t.Fatalf("exit status %d: %v", code, err)
	}
	for _, want := range []string{"glaze — Glaze\n", `finish = "matt" (finish, text): one of "matt", "gloss" (gloss (shiny)); how the surface looks`,
		"  table coats: coat, depth (mm)\n", `"beale", "window-mean"`} {
		if !strings.Contains(out, want) {
			t.Errorf("lixiv kinds does not say %q:\n%s", want, out)
		}
	}
}
