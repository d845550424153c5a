package mineral

import (
	"math"
	"strings"

	"lixiv/engine/internal/enum"
)

// Component is a row of the mass balance: what a water holds (Na, K, Ca,
// Mg, Cl, SO4, HCO3, SiO2) and Al, which stays in the solids.
type Component int

// The components, in table order. The water's components come first.
const (
	Na Component = iota
	K
	Ca
	Mg
	Cl
	SO4
	HCO3
	SiO2
	Al
	NComponents      // number of components; not a component
	NWater      = Al // the components a water holds
)

var componentNames = [NComponents]string{"Na", "K", "Ca", "Mg", "Cl", "SO4", "HCO3", "SiO2", "Al"}

// String returns the component's symbol.
func (c Component) String() string { return enum.Name(c, componentNames[:], "?") }

// Column is what one mole of a mineral gives the water when it weathers
// with carbonic acid, by component (mol per mol):
//
//   - Na, K, Ca, Mg and Cl as the formula holds them; S as sulfate (sulfide
//     oxidised), Si as silica, Al as the formula holds it (it must end in
//     a secondary phase);
//   - HCO3, the bicarbonate that balances the charge of the ions released:
//     Na + K + 2 Ca + 2 Mg − 2 SO4 − Cl. It counts the mineral's own
//     carbonate carbon and the CO2 taken from soil air, and is negative
//     where the mineral releases acid (pyrite);
//   - Fe, Mn and Ti stay in the solids as oxides and give the water
//     nothing, whatever their oxidation state.
func (m Mineral) Column() [NComponents]float64 {
	f := m.Formula
	var c [NComponents]float64
	c[Na], c[K], c[Ca], c[Mg] = f.Count("Na"), f.Count("K"), f.Count("Ca"), f.Count("Mg")
	c[Cl], c[SO4], c[SiO2], c[Al] = f.Count("Cl"), f.Count("S"), f.Count("Si"), f.Count("Al")
	c[HCO3] = c[Na] + c[K] + 2*c[Ca] + 2*c[Mg] - 2*c[SO4] - c[Cl]
	return c
}

// CO2PerMole returns the CO2 one mole of the mineral consumes when it
// weathers with carbonic acid: the bicarbonate it gives less its own
// carbon (docs/methods.md §9.1): 1 for albite, 2 for anorthite, 4 for
// forsterite, 1 for calcite, 2 for dolomite, 0 for gypsum and halite, and
// −4 (released) for pyrite, whose acid turns bicarbonate back into CO2.
func (m Mineral) CO2PerMole() float64 {
	return m.Column()[HCO3] - m.Formula.Count("C")
}

// Species of weathering reactions: formula text and charge.
type species struct {
	text   string
	charge float64
}

var (
	spCO2       = species{"CO2", 0}
	spH2O       = species{"H2O", 0}
	spO2        = species{"O2", 0}
	spHCO3      = species{"HCO3", -1}
	spSO4       = species{"SO4", -2}
	spH4SiO4    = species{"H4SiO4", 0}
	spKaolinite = species{"Al2Si2O5(OH)4", 0}
	spGibbsite  = species{"Al(OH)3", 0}
	spFeOOH     = species{"FeOOH", 0}
	spMnO2      = species{"MnO2", 0}
	spTiO2      = species{"TiO2", 0}
	cations     = []struct {
		el     string
		charge float64
	}{{"Na", 1}, {"K", 1}, {"Ca", 2}, {"Mg", 2}}
)

// ReactionTerm is one species of a reaction and its coefficient: positive
// among the products, negative among the reactants.
type ReactionTerm struct {
	Coef    float64
	Species string  // formula, such as "HCO3" or "Al2Si2O5(OH)4"
	Charge  float64 // ionic charge
}

// Reaction is a balanced weathering reaction.
type Reaction []ReactionTerm

// The Al products of weathering reactions, as Formula.String writes them.
var (
	kaoliniteFormula = mustParse(spKaolinite.text).String()
	gibbsiteFormula  = mustParse(spGibbsite.text).String()
)

func mustParse(s string) Formula {
	f, err := Parse(s)
	if err != nil {
		panic("mineral: " + err.Error())
	}
	return f
}

// Reaction returns the balanced reaction of one mole of the mineral with
// carbonic acid (CO2 and water), with O2 where Fe, Mn or sulfide are
// oxidised: Na⁺, K⁺, Ca²⁺, Mg²⁺ and Cl⁻ go to the water, S as SO4²⁻, the
// charge they carry is balanced by HCO3⁻, Al goes to kaolinite (to
// gibbsite for Al beyond the Si), the rest of the Si to H4SiO4, Fe to
// FeOOH, Mn to MnO2 and Ti to TiO2; CO2, H2O and O2 close the carbon,
// hydrogen and oxygen balances. A coefficient below zero puts the species
// among the reactants. Kaolinite weathers to gibbsite; gibbsite, where Al
// ends, has no reaction (nil).
func (m Mineral) Reaction() Reaction {
	f := m.Formula
	col := m.Column()
	r := Reaction{{Coef: -1, Species: m.Text}}
	add := func(c float64, s species) {
		if math.Abs(c) > 1e-12 {
			r = append(r, ReactionTerm{Coef: c, Species: s.text, Charge: s.charge})
		}
	}
	al, si := col[Al], col[SiO2]
	kaol := math.Min(al, si) / 2
	switch m.Formula.String() {
	case kaoliniteFormula: // kaolinite itself weathers to gibbsite
		kaol = 0
	case gibbsiteFormula: // where Al ends: no reaction
		return nil
	}
	gibb := al - 2*kaol
	h4sio4 := si - 2*kaol
	h := col[HCO3]
	fe, mn, ti := f.Count("Fe"), f.Count("Mn"), f.Count("Ti")
	co2 := h - f.Count("C") // consumed
	// H: mineral H + 2 H2O = HCO3 + 4 H4SiO4 + 4 kaolinite + 3 gibbsite + FeOOH
	h2o := (h + 4*h4sio4 + 4*kaol + 3*gibb + fe - f.Count("H")) / 2
	// O: mineral O + 2 CO2 + H2O + 2 O2 = 3 HCO3 + 4 SO4 + 4 H4SiO4 + 9 kaolinite + 3 gibbsite + 2 FeOOH + 2 MnO2 + 2 TiO2
	o2 := (3*h + 4*col[SO4] + 4*h4sio4 + 9*kaol + 3*gibb + 2*(fe+mn+ti) - f.Count("O") - 2*co2 - h2o) / 2
	add(-co2, spCO2)
	add(-h2o, spH2O)
	add(-o2, spO2)
	for _, c := range cations {
		add(f.Count(c.el), species{c.el, c.charge})
	}
	add(col[Cl], species{"Cl", -1})
	add(h, spHCO3)
	add(col[SO4], spSO4)
	add(h4sio4, spH4SiO4)
	add(kaol, spKaolinite)
	add(gibb, spGibbsite)
	add(fe, spFeOOH)
	add(mn, spMnO2)
	add(ti, spTiO2)
	return r
}

// String writes the reaction as "NaAlSi3O8 + CO2 + 5.5 H2O → Na⁺ + HCO3⁻ +
// 2 H4SiO4 + 0.5 Al2Si2O5(OH)4", and no reaction as "".
func (r Reaction) String() string {
	if len(r) == 0 {
		return ""
	}
	var left, right []string
	for _, t := range r {
		s := chargeText(t.Species, t.Charge)
		if c := math.Abs(t.Coef); c != 1 {
			s = Number(c) + " " + s
		}
		if t.Coef < 0 {
			left = append(left, s)
		} else {
			right = append(right, s)
		}
	}
	return strings.Join(left, " + ") + " → " + strings.Join(right, " + ")
}

func chargeText(s string, q float64) string {
	switch q {
	case 1:
		return s + "⁺"
	case 2:
		return s + "²⁺"
	case -1:
		return s + "⁻"
	case -2:
		return s + "²⁻"
	}
	return s
}
