package compare

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Oxides is the part of a rock feedstock's composition, in weight per cent,
// whose cations weathering can carry away as bicarbonate.
type Oxides struct {
	CaO, MgO, Na2O, K2O float64 // wt %
}

// Oxide is one oxide of a feedstock: its content, molar mass and the
// cation charge it gives per kilogram of feedstock.
type Oxide struct {
	Name      string  // "CaO", "MgO", "Na2O", "K2O"
	Percent   float64 // wt %
	MolarMass float64 // g/mol, from the IUPAC 2021 atomic weights
	Charge    float64 // mol of cation charge per kg of feedstock
}

// oxideMass returns the molar mass of an oxide of n atoms of element el and
// one oxygen (IUPAC 2021 atomic weights through chem.AtomicWeight).
func oxideMass(el string, n float64) float64 {
	w, _ := chem.AtomicWeight(el)
	o, _ := chem.AtomicWeight("O")
	return n*w + o
}

// Every oxide here carries two units of cation charge per mole: one Ca²⁺ or
// Mg²⁺, or two Na⁺ or K⁺.
var oxideTable = []struct {
	name string
	el   string
	n    float64
	pick func(*Oxides) float64
}{
	{"CaO", "Ca", 1, func(o *Oxides) float64 { return o.CaO }},
	{"MgO", "Mg", 1, func(o *Oxides) float64 { return o.MgO }},
	{"Na2O", "Na", 2, func(o *Oxides) float64 { return o.Na2O }},
	{"K2O", "K", 2, func(o *Oxides) float64 { return o.K2O }},
}

// Parts lists the oxides with the charge each gives: 10 × 2 × wt % / M
// mol/kg (10 turns wt % into g per kg, 2 is the charge per mole of oxide).
func (o Oxides) Parts() []Oxide {
	out := make([]Oxide, len(oxideTable))
	for i, t := range oxideTable {
		m := oxideMass(t.el, t.n)
		p := t.pick(&o)
		out[i] = Oxide{Name: t.name, Percent: p, MolarMass: m, Charge: 10 * 2 * p / m}
	}
	return out
}

// Charge returns the cation charge the feedstock can release, mol/kg:
// 10 × (2 CaO/M_CaO + 2 MgO/M_MgO + 2 Na2O/M_Na2O + 2 K2O/M_K2O), the oxides
// in wt % (docs/methods.md §17; the form of Renforth 2012, from memory).
func (o Oxides) Charge() float64 {
	s := 0.0
	for _, p := range o.Parts() {
		s += p.Charge
	}
	return s
}

// Potential returns the CO2 the feedstock can take up, t CO2 per t: its
// charge (mol/kg) × M_CO2 / 1000 × eta, eta the mol of CO2 per mol of
// charge (1 as bicarbonate in fresh water; less once the ocean's carbonate
// buffering is counted, about 0.8–0.85, from memory).
func (o Oxides) Potential(eta float64) float64 {
	return o.Charge() * chem.MassCO2 / 1000 * eta
}

// Validate reports a content outside 0–100 wt %, or contents summing to
// more than 100.
func (o Oxides) Validate() error {
	sum := 0.0
	for _, p := range o.Parts() {
		if math.IsNaN(p.Percent) || p.Percent < 0 || p.Percent > 100 {
			return fmt.Errorf("%s: %g wt %% is outside 0 to 100", p.Name, p.Percent)
		}
		sum += p.Percent
	}
	if sum > 100 {
		return fmt.Errorf("the oxides add up to %g wt %%, more than 100", sum)
	}
	return nil
}

// Application is a spreading of feedstock: how much, over how much land,
// of what composition, and the CO2 taken up per mole of charge.
type Application struct {
	TonnesPerHa float64 // t of feedstock per hectare
	AreaHa      float64 // hectares spread
	Oxides      Oxides
	Eta         float64 // mol CO2 per mol of cation charge
}

// Tonnes returns the feedstock spread, t.
func (a Application) Tonnes() float64 { return a.TonnesPerHa * a.AreaHa }

// PotentialTonnes returns the CO2 the whole application can take up, t CO2.
func (a Application) PotentialTonnes() float64 { return a.Tonnes() * a.Oxides.Potential(a.Eta) }

// Share returns the share of the application's potential that an uptake
// of tCO2 tonnes represents (NaN without a potential).
func (a Application) Share(tCO2 float64) float64 {
	p := a.PotentialTonnes()
	if !(p > 0) {
		return math.NaN()
	}
	return tCO2 / p
}
