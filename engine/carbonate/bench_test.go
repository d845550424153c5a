package carbonate

import "testing"

// BenchmarkAnalyse times the carbonate system of one stream water with
// Davies activities (what the notebook's cell does once per sample).
func BenchmarkAnalyse(b *testing.B) {
	w := Water{TempC: 12, PH: 7.9, Alk: 1.8e-3, Ca: 0.85e-3, Mg: 0.2e-3, Background: 3.1e-3}
	for b.Loop() {
		if _, err := Analyse(w, Davies); err != nil {
			b.Fatal(err)
		}
	}
}
