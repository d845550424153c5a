package carbonate

import (
	"math"
	"testing"
)

// TestActivityCoefficients checks the Davies and extended Debye–Hückel
// coefficients against the values of the docs/methods.md §10.2, computed
// there with A = 0.5085 and B = 0.3281 (Truesdell & Jones 1974, from
// memory) and Kielland's (1937) sizes Ca 6 Å, HCO3 4 Å. Tolerance 5e-6.
func TestActivityCoefficients(t *testing.T) {
	const A, B = 0.5085, 0.3281
	for _, c := range []struct {
		name string
		logG float64
		want float64
	}{
		{"Davies z=1 I=0.003", LogGammaDavies(1, 0.003, A), 0.94200},
		{"Davies z=2 I=0.003", LogGammaDavies(2, 0.003, A), 0.78742},
		{"Davies z=1 I=0.01", LogGammaDavies(1, 0.01, A), 0.90219},
		{"Davies z=2 I=0.01", LogGammaDavies(2, 0.01, A), 0.66251},
		{"ext. DH Ca a=6 I=0.01", LogGammaDH(2, SizeCa, 0.01, A, B), 0.67617},
		{"ext. DH HCO3 a=4 I=0.01", LogGammaDH(1, SizeHCO3, 0.01, A, B), 0.90167},
	} {
		if got := math.Pow(10, c.logG); math.Abs(got-c.want) > 5e-6 {
			t.Errorf("%s: γ = %.6f, want %.5f (docs/methods.md §10.2)", c.name, got, c.want)
		}
	}
}

// TestDebyeHuckelAt25 checks that the temperature fits give the 25 °C
// constants A = 0.5085 and B = 0.3281 (Truesdell & Jones 1974, from
// memory) to the four digits quoted.
func TestDebyeHuckelAt25(t *testing.T) {
	A, B := DebyeHuckel(25)
	if math.Abs(A-0.5085) > 5e-5 || math.Abs(B-0.3281) > 5e-5 {
		t.Errorf("A, B at 25 °C = %.5f, %.5f; want 0.5085, 0.3281", A, B)
	}
}

func TestModels(t *testing.T) {
	for _, c := range []struct {
		name     string
		model    Model
		validity float64
	}{{"davies", Davies, 0.5}, {"extended-debye-huckel", ExtendedDH, 0.1}, {"ideal", Ideal, 0}} {
		m, err := ParseModel(c.name)
		if err != nil || m != c.model || m.String() != c.name || m.Validity() != c.validity {
			t.Errorf("%s: parsed %v (%v), validity %g", c.name, m, err, m.Validity())
		}
	}
	if _, err := ParseModel("pitzer"); err == nil {
		t.Error("an unknown model was accepted")
	}
	// At zero ionic strength every model is ideal; at any other, every
	// coefficient is below 1 and a divalent ion's below a monovalent one's.
	for _, m := range []Model{Davies, ExtendedDH} {
		if g := m.Gammas(0, 15); g != Unit() {
			t.Errorf("%s at I = 0: %+v", m, g)
		}
		g := m.Gammas(0.01, 15)
		if !(g.Ca < g.HCO3 && g.HCO3 < 1 && g.CO3 < g.H) {
			t.Errorf("%s at I = 0.01: %+v", m, g)
		}
	}
}
