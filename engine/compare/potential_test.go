package compare

import (
	"math"
	"testing"
)

// TestPotential checks the cation charge and CO2 potential of two
// feedstocks against the values docs/methods.md §17 gives, computed from
// the form of Renforth (2012), Int. J. Greenh. Gas Control 10, 229–243
// (from memory), with the IUPAC 2021 atomic weights and η = 1.
func TestPotential(t *testing.T) {
	for _, c := range []struct {
		name           string
		ox             Oxides
		charge, tCO2   float64
		chargeTol, tol float64
	}{
		// A basalt: CaO 10, MgO 7, Na2O 2.5, K2O 0.8 wt % → 8.017 mol/kg → 0.3528 t CO2/t (docs/methods.md §17, computed).
		{"basalt", Oxides{CaO: 10, MgO: 7, Na2O: 2.5, K2O: 0.8}, 8.017, 0.3528, 5e-4, 5e-4},
		// A dunite of forsterite, MgO 57.3 wt % → 28.43 mol/kg → 1.251 t CO2/t (docs/methods.md §17, computed).
		{"dunite", Oxides{MgO: 57.3}, 28.43, 1.251, 5e-4, 5e-4},
		{"nothing", Oxides{}, 0, 0, 0, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			if err := c.ox.Validate(); err != nil {
				t.Fatal(err)
			}
			if got := c.ox.Charge(); math.Abs(got-c.charge) > c.chargeTol*math.Max(1, c.charge) {
				t.Errorf("charge %.5g mol/kg, want %.4g", got, c.charge)
			}
			if got := c.ox.Potential(1); math.Abs(got-c.tCO2) > c.tol*math.Max(1, c.tCO2) {
				t.Errorf("potential %.5g t CO2/t, want %.4g", got, c.tCO2)
			}
			// η scales the potential.
			if got, want := c.ox.Potential(0.85), 0.85*c.ox.Potential(1); math.Abs(got-want) > 1e-12 {
				t.Errorf("η 0.85: %g, want %g", got, want)
			}
		})
	}
}

// TestOxideMasses: the molar masses of the oxides from the IUPAC 2021
// atomic weights (Prohaska et al. 2022), as docs/methods.md §17 writes them:
// CaO 56.077, MgO 40.304, Na2O 61.979, K2O 94.196 g/mol.
func TestOxideMasses(t *testing.T) {
	want := map[string]float64{"CaO": 56.077, "MgO": 40.304, "Na2O": 61.979, "K2O": 94.196}
	for _, p := range (Oxides{}).Parts() {
		if math.Abs(p.MolarMass-want[p.Name]) > 6e-4 {
			t.Errorf("%s: %.5f g/mol, want %.3f", p.Name, p.MolarMass, want[p.Name])
		}
	}
}

func TestOxidesValidate(t *testing.T) {
	for _, c := range []struct {
		ox   Oxides
		want string
	}{
		{Oxides{CaO: -1}, "CaO: -1 wt % is outside 0 to 100"},
		{Oxides{MgO: math.NaN()}, "MgO: NaN wt % is outside 0 to 100"},
		{Oxides{CaO: 60, MgO: 50}, "the oxides add up to 110 wt %, more than 100"},
	} {
		if err := c.ox.Validate(); err == nil || err.Error() != c.want {
			t.Errorf("%+v: %v, want %q", c.ox, err, c.want)
		}
	}
}

// TestApplication: 40 t/ha of the basalt over 120 ha is 4800 t, able to
// take up 4800 × 0.35281 t CO2; 100 t CO2 is that share of it.
func TestApplication(t *testing.T) {
	a := Application{TonnesPerHa: 40, AreaHa: 120, Oxides: Oxides{CaO: 10, MgO: 7, Na2O: 2.5, K2O: 0.8}, Eta: 1}
	if a.Tonnes() != 4800 {
		t.Errorf("tonnes %g, want 4800", a.Tonnes())
	}
	pot := 4800 * a.Oxides.Potential(1)
	if math.Abs(a.PotentialTonnes()-pot) > 1e-9 || math.Abs(pot-1693.5) > 0.5 {
		t.Errorf("potential %g t CO2, want %g (about 1693.5)", a.PotentialTonnes(), pot)
	}
	if got := a.Share(100); math.Abs(got-100/pot) > 1e-15 {
		t.Errorf("share %g, want %g", got, 100/pot)
	}
	if !math.IsNaN((Application{}).Share(1)) {
		t.Error("a share of no potential should be NaN")
	}
}
