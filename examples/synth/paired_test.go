package synth

import (
	"context"
	"os"
	"testing"

	"lixiv/engine/notebook"
)

// TestPairedExampleRecoversTruth: the stored paired example's comparison
// finds the added silicate weathering its truth holds: the 95 % interval
// of the before-after-control-impact difference in silicate CO2
// consumption per km² contains the truth's, and the difference is
// declared (its interval above zero).
func TestPairedExampleRecoversTruth(t *testing.T) {
	const file = "../lintmoor-whinlaw/lintmoor-whinlaw.lixiv.json"
	f, err := os.Open(file)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	d, err := notebook.Load(f, file)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	want := PairedTruthDifference()
	name := "(after − before) treated − (after − before) control: difference in silicate CO2 consumption per km²"
	got := d.Output("comparison").Figure(name)
	if got == nil {
		t.Fatalf("no figure %q", name)
	}
	t.Logf("truth %.4g mol/km²/yr; comparison %.4g [%.4g, %.4g]", want, got.Median, got.Low, got.High)
	if !(got.Low <= want && want <= got.High) {
		t.Errorf("95 %% interval [%.4g, %.4g] misses the truth %.4g mol/km²/yr", got.Low, got.High, want)
	}
	if !(got.Low > 0) {
		t.Errorf("the added flux is not detected: interval [%.4g, %.4g]", got.Low, got.High)
	}
}
