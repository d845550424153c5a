package carbonate

import (
	"errors"
	"math"
)

// Species are the concentrations (mol/L) of the carbonate system of a water.
type Species struct {
	HCO3, CO3 float64 // bicarbonate and carbonate ions
	H2CO3     float64 // H2CO3* = CO2(aq) + H2CO3
	H, OH     float64 // hydrogen and hydroxide ions
	DIC       float64 // dissolved inorganic carbon, H2CO3* + HCO3⁻ + CO3²⁻
	PCO2      float64 // partial pressure of CO2 in equilibrium with the water, atm
}

// Speciate splits alkalinity alk (eq/L) at pH (activity scale) with the
// constants k and activity coefficients g (docs/methods.md §10.3):
//
//	aH = 10^-pH, [OH⁻] = Kw/(aH γOH), [H⁺] = aH/γH
//	[HCO3⁻] = (Alk − [OH⁻] + [H⁺]) / (1 + 2 K2 γHCO3/(aH γCO3))
//	[CO3²⁻] = K2 γHCO3 [HCO3⁻]/(aH γCO3)
//	[H2CO3*] = aH γHCO3 [HCO3⁻]/K1,  pCO2 = [H2CO3*]/KH
func Speciate(alk, pH float64, k Constants, g Gammas) Species {
	aH := math.Pow(10, -pH)
	k1, k2 := math.Pow(10, k.LogK1), math.Pow(10, k.LogK2)
	var s Species
	s.OH = math.Pow(10, k.LogKw) / (aH * g.OH)
	s.H = aH / g.H
	r := k2 * g.HCO3 / (aH * g.CO3) // [CO3]/[HCO3]
	s.HCO3 = (alk - s.OH + s.H) / (1 + 2*r)
	s.CO3 = r * s.HCO3
	s.H2CO3 = aH * g.HCO3 * s.HCO3 / k1
	s.DIC = s.H2CO3 + s.HCO3 + s.CO3
	s.PCO2 = s.H2CO3 / math.Pow(10, k.LogKH)
	return s
}

// ErrNoMatch says that no pH between 0 and 14 gives the alkalinity asked for
// at the pCO2 given.
var ErrNoMatch = errors.New("carbonate: no pH between 0 and 14 matches this alkalinity and pCO2")

// maxHalvings bounds PH's bisection: 44 halvings of the range 0 to 14
// reach its 1e-12 tolerance, so the bound never ends a search early; it
// makes the loop's end plain, whatever the comparisons give.
const maxHalvings = 64

// PH returns the pH of a water of alkalinity alk (eq/L) in equilibrium with
// a CO2 partial pressure pCO2 (atm), with constants k and activity
// coefficients g: the inverse of Speciate. The alkalinity implied by a pH at
// fixed pCO2, HCO3⁻ + 2 CO3²⁻ + OH⁻ − H⁺, rises with pH, so the pH is found
// by bisection to within 1e-12.
func PH(alk, pCO2 float64, k Constants, g Gammas) (float64, error) {
	if !(pCO2 > 0) || math.IsNaN(alk) {
		return math.NaN(), ErrNoMatch
	}
	h2co3 := pCO2 * math.Pow(10, k.LogKH)
	k1, k2, kw := math.Pow(10, k.LogK1), math.Pow(10, k.LogK2), math.Pow(10, k.LogKw)
	implied := func(pH float64) float64 {
		aH := math.Pow(10, -pH)
		hco3 := k1 * h2co3 / (aH * g.HCO3)
		co3 := k2 * g.HCO3 * hco3 / (aH * g.CO3)
		return hco3 + 2*co3 + kw/(aH*g.OH) - aH/g.H
	}
	lo, hi := 0.0, 14.0
	if implied(lo) > alk || implied(hi) < alk {
		return math.NaN(), ErrNoMatch
	}
	for it := 0; it < maxHalvings && hi-lo > 1e-12; it++ {
		mid := (lo + hi) / 2
		if implied(mid) < alk {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2, nil
}

// SaturationIndex returns log10 of the ion activity product over the
// solubility product: log10(γCa [Ca²⁺] γCO3 [CO3²⁻]) − log K for calcite
// or aragonite (logK their LogKcal or LogKarg).
func SaturationIndex(ca, co3 float64, g Gammas, logK float64) float64 {
	return math.Log10(g.Ca*ca*g.CO3*co3) - logK
}

// SaturationIndexDolomite returns log10(γCa[Ca²⁺] γMg[Mg²⁺] (γCO3[CO3²⁻])²)
// − log Kdol.
func SaturationIndexDolomite(ca, mg, co3 float64, g Gammas, logKdol float64) float64 {
	a := g.CO3 * co3
	return math.Log10(g.Ca*ca*g.Mg*mg*a*a) - logKdol
}

// CalciteSolubility returns the calcium concentration (mol/L) of water in
// equilibrium with calcite at a CO2 partial pressure pCO2 (atm) and tC °C,
// with activities from model m: the reaction CaCO3 + CO2 + H2O = Ca²⁺ +
// 2 HCO3⁻, K = K1 Kcal KH / K2, with [HCO3⁻] = 2 [Ca²⁺] (CO3²⁻, OH⁻, H⁺
// and ion pairs neglected), so that
//
//	[Ca²⁺] = (K pCO2 / (4 γCa γHCO3²))^(1/3)
//
// iterated with the ionic strength I = 3 [Ca²⁺] it implies (docs/methods.md
// §10.3).
func CalciteSolubility(tC, pCO2 float64, m Model) float64 {
	k := At(tC)
	K := math.Pow(10, k.LogK1+k.LogKcal+k.LogKH-k.LogK2)
	ca := 0.0
	g := Unit()
	for it := 0; it < 100; it++ {
		next := math.Cbrt(K * pCO2 / (4 * g.Ca * g.HCO3 * g.HCO3))
		if math.Abs(next-ca) <= 1e-15*next {
			return next
		}
		ca = next
		g = m.Gammas(3*ca, tC)
	}
	return ca
}
