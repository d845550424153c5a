package portable

import "testing"

var sink float64

// BenchmarkExp times Exp over arguments spread across [-20, 20).
func BenchmarkExp(b *testing.B) {
	s := 0.0
	for i := 0; b.Loop(); i++ {
		s += Exp(float64(i%4000)*0.01 - 20)
	}
	sink = s
}

// BenchmarkLog times Log over arguments spread across (0, 400].
func BenchmarkLog(b *testing.B) {
	s := 0.0
	for i := 0; b.Loop(); i++ {
		s += Log(float64(i%4000+1) * 0.1)
	}
	sink = s
}
