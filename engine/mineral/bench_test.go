package mineral

import "testing"

// BenchmarkSolve times the balance of one water against six minerals
// (what the notebook's cell does once per sample).
func BenchmarkSolve(b *testing.B) {
	bal, err := NewBalance(phases(b, "plagioclase An30", "K-feldspar", "biotite", "calcite", "dolomite", "kaolinite*"))
	if err != nil {
		b.Fatal(err)
	}
	w := [NWater]float64{Na: 70, K: 12, Ca: 250, Mg: 60, HCO3: 640, SiO2: 150}
	for b.Loop() {
		bal.Solve(w)
	}
}
