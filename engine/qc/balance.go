package qc

import (
	"math"

	"lixiv/engine/chem"
)

// Balance is the charge balance of one water. Sums are in µeq/L,
// imbalances in percent.
type Balance struct {
	TZPlus  float64 // sum of cation charge, µeq/L
	TZMinus float64 // sum of anion charge, µeq/L
	// NICB is (TZ+ − TZ−) / TZ+ × 100 and CBE (TZ+ − TZ−) / (TZ+ + TZ−) ×
	// 100. Both are NaN when no cation or no anion was measured.
	NICB float64
	CBE  float64

	// HCO3 and CO3 are the carbonate species (µmol/L) that alkalinity was
	// split into at the sample's pH; NaN when there was no alkalinity or no
	// pH. Their charge, with OH− less H+, is the alkalinity itself, so the
	// split does not change TZ−; it is reported for display.
	HCO3, CO3 float64
	// H is the H+ (µmol/L) from pH counted in TZ+; 0 when not counted.
	H float64

	Cations []chem.Species // cations that entered TZ+
	Anions  []chem.Species // anions (and Alk) that entered TZ−
}

// balanceCations and balanceAnions are the ions of the charge balance
// (docs/methods.md §3.1): TZ+ = Na + K + 2Ca + 2Mg (+ 2Sr + NH4 + H),
// TZ− = Cl + 2SO4 + NO3 + Alk (+ F + Br).
var (
	balanceCations = []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Sr, chem.NH4}
	balanceAnions  = []chem.Species{chem.Cl, chem.SO4, chem.NO3, chem.F, chem.Br}
)

// ChargeBalance returns the charge balance of composition c (µmol/L, Alk in
// µeq/L) at the given pH and water temperature (°C); pass NaN for either
// when unknown (25 °C is then used for the carbonate constants).
//
// The carbonate part of TZ− is the alkalinity when it is given: alkalinity
// is HCO3− + 2CO3²− + OH− − H+ (carbonate alkalinity, organic and borate
// alkalinity neglected; common practice), which already holds the charge of
// CO3²−, OH− and, with a minus sign, H+, so H+ from pH is not added to TZ+.
// Without alkalinity, measured HCO3− and 2CO3²− are used, and H+ from pH
// is added to TZ+ (it matters only below pH 5 or so). HCO3− without CO3²−
// is taken as alkalinity expressed as HCO3−, as laboratories derive it from
// a titration, so no CO3²− is added to it; at a known pH it is split for
// display with K2 (Plummer & Busenberg 1982, activity coefficients 1). A measured H (chem.H) is used as given. Missing ions are left out:
// the balance is "from the ions present". Phosphate is left out, since its
// charge depends on pH.
func ChargeBalance(c chem.Composition, pH, tempC float64) Balance {
	b := Balance{HCO3: math.NaN(), CO3: math.NaN()}
	for _, s := range balanceCations {
		if c.Has(s) {
			b.TZPlus += c.Eq(s)
			b.Cations = append(b.Cations, s)
		}
	}
	for _, s := range balanceAnions {
		if c.Has(s) {
			b.TZMinus += c.Eq(s)
			b.Anions = append(b.Anions, s)
		}
	}
	if math.IsNaN(tempC) {
		tempC = 25
	}
	hasPH := !math.IsNaN(pH) && pH > 0 && pH < 14
	switch {
	case c.Has(chem.Alk):
		b.TZMinus += c[chem.Alk]
		b.Anions = append(b.Anions, chem.Alk)
		if hasPH {
			b.HCO3, b.CO3 = SplitAlkalinity(c[chem.Alk], pH, tempC)
		}
	default:
		if c.Has(chem.HCO3) {
			b.TZMinus += c[chem.HCO3]
			b.Anions = append(b.Anions, chem.HCO3)
			b.HCO3 = c[chem.HCO3]
		}
		switch {
		case c.Has(chem.CO3):
			b.TZMinus += c.Eq(chem.CO3)
			b.Anions = append(b.Anions, chem.CO3)
			b.CO3 = c[chem.CO3]
		case hasPH && c.Has(chem.HCO3):
			// HCO3 without CO3 is alkalinity expressed as HCO3, as labs
			// derive it from a titration: split it for display only.
			b.HCO3, b.CO3 = SplitAlkalinity(c[chem.HCO3], pH, tempC)
		}
		if hasPH && !c.Has(chem.H) {
			b.H = math.Pow(10, -pH) * 1e6
			b.TZPlus += b.H
		}
	}
	if c.Has(chem.H) {
		b.H = c[chem.H]
		b.TZPlus += b.H
		b.Cations = append(b.Cations, chem.H)
	}
	d := b.TZPlus - b.TZMinus
	b.NICB, b.CBE = math.NaN(), math.NaN()
	if len(b.Cations) == 0 || len(b.Anions) == 0 {
		return b // no cation or no anion measured: no balance
	}
	if b.TZPlus > 0 {
		b.NICB = d / b.TZPlus * 100
	}
	if b.TZPlus+b.TZMinus > 0 {
		b.CBE = d / (b.TZPlus + b.TZMinus) * 100
	}
	return b
}

// K2 returns the second dissociation constant of carbonic acid at tempC
// (°C), from Plummer & Busenberg (1982), Geochim. Cosmochim. Acta 46,
// 1011-1040 (docs/methods.md §10.1): log K2 = −107.8871 − 0.03252849 T +
// 5151.79/T + 38.92561 log T − 563713.9/T², T in kelvin.
func K2(tempC float64) float64 {
	T := tempC + 273.15
	return math.Pow(10, -107.8871-0.03252849*T+5151.79/T+38.92561*math.Log10(T)-563713.9/(T*T))
}

// Kw returns the ion product of water at tempC (°C): log Kw = −4470.99/T +
// 6.0875 − 0.01706 T (Stumm & Morgan 1996, from memory; docs/methods.md §10.1).
func Kw(tempC float64) float64 {
	T := tempC + 273.15
	return math.Pow(10, -4470.99/T+6.0875-0.01706*T)
}

// SplitAlkalinity splits alkalinity (µeq/L) at the given pH and temperature
// into HCO3− and CO3²− (µmol/L), with activity coefficients 1 (docs/methods.md
// §10.3): carbonate alkalinity = Alk − OH− + H+; HCO3− = carbonate
// alkalinity / (1 + 2 K2/aH); CO3²− = K2 HCO3− / aH. A negative carbonate
// alkalinity (acid water) gives zero for both.
func SplitAlkalinity(alk, pH, tempC float64) (hco3, co3 float64) {
	aH := math.Pow(10, -pH)
	oh := Kw(tempC) / aH * 1e6
	carb := alk - oh + aH*1e6
	if carb <= 0 {
		return 0, 0
	}
	k2 := K2(tempC)
	hco3 = carb / (1 + 2*k2/aH)
	return hco3, k2 * hco3 / aH
}
