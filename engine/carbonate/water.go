package carbonate

import (
	"errors"
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Water is what Analyse needs of one water sample.
type Water struct {
	TempC float64 // water temperature, °C
	PH    float64 // pH on the activity scale (field pH preferred)
	Alk   float64 // alkalinity, eq/L
	Ca    float64 // calcium, mol/L (NaN: not measured; no saturation indices)
	Mg    float64 // magnesium, mol/L (NaN: not measured; no dolomite index)
	// Background is the ionic strength (mol/L) of the ions other than the
	// carbonate species, H⁺ and OH⁻: see Background.
	Background float64
}

// Background returns the ionic strength (mol/L), I = ½ Σ cᵢ zᵢ², of the
// ions of c (µmol/L) other than the carbonate species and H⁺: Na⁺, K⁺,
// Ca²⁺, Mg²⁺, Cl⁻ and SO4²⁻, and NH4⁺, Sr²⁺, NO3⁻, F⁻ and Br⁻ where
// measured. It also returns the first six when any is not measured: they
// are left out of the sum, and the caller should say so.
func Background(c chem.Composition) (I float64, missing []chem.Species) {
	for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4} {
		if !c.Has(sp) {
			missing = append(missing, sp)
		}
	}
	for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.NH4, chem.Sr, chem.NO3, chem.F, chem.Br} {
		if c.Has(sp) && c[sp] > 0 {
			z := float64(sp.Charge())
			I += 0.5 * c[sp] * 1e-6 * z * z
		}
	}
	return I, missing
}

// Result is the carbonate system of one water.
type Result struct {
	Constants Constants
	Model     Model
	I         float64 // ionic strength, mol/L, with the carbonate species
	Gammas    Gammas
	Species
	LogPCO2 float64 // log10 pCO2 (atm)
	// SICalcite, SIAragonite and SIDolomite are the saturation indices;
	// NaN without Ca (all three) or Mg (dolomite).
	SICalcite, SIAragonite, SIDolomite float64
	// Warnings name what the result rests on that is outside the methods'
	// ranges: temperature outside 0–90 °C, ionic strength beyond the
	// activity model's validity.
	Warnings []string
}

// Errors Analyse returns for a water it cannot speciate.
var (
	ErrNoPH          = errors.New("no pH")
	ErrNoTemperature = errors.New("no temperature")
	ErrNoAlkalinity  = errors.New("no alkalinity above zero")
)

// Analyse computes the carbonate system of w with activity model m
// (docs/methods.md §10): constants at the water's temperature, ionic
// strength from the background ions and the carbonate species (iterated
// until it changes by less than 1e-12 of itself), activity coefficients,
// species, pCO2 and saturation indices. It returns an error, wrapping
// ErrNoPH, ErrNoTemperature or ErrNoAlkalinity, when the water lacks what
// the calculation needs or holds a value no water has (pH outside 0–14,
// temperature outside −5 to 100 °C).
func Analyse(w Water, m Model) (Result, error) {
	switch {
	case math.IsNaN(w.PH):
		return Result{}, ErrNoPH
	case math.IsNaN(w.TempC):
		return Result{}, ErrNoTemperature
	case !(w.Alk > 0):
		return Result{}, ErrNoAlkalinity
	case w.PH < 0 || w.PH > 14:
		return Result{}, fmt.Errorf("pH %g is outside 0–14", w.PH)
	case w.TempC < -5 || w.TempC > 100:
		return Result{}, fmt.Errorf("temperature %g °C is outside −5 to 100 °C", w.TempC)
	case w.Background < 0 || math.IsNaN(w.Background):
		return Result{}, fmt.Errorf("background ionic strength %g is not a value", w.Background)
	}
	r := Result{Constants: At(w.TempC), Model: m}
	if w.TempC < ValidMinC || w.TempC > ValidMaxC {
		r.Warnings = append(r.Warnings, fmt.Sprintf("temperature %g °C is outside the 0–90 °C of the Plummer & Busenberg (1982) constants", w.TempC))
	}
	I := w.Background + 0.5*w.Alk // first guess: all alkalinity as HCO3⁻
	for it := 0; it < 100; it++ {
		r.Gammas = m.Gammas(I, w.TempC)
		r.Species = Speciate(w.Alk, w.PH, r.Constants, r.Gammas)
		next := w.Background + 0.5*(r.HCO3+4*r.CO3+r.OH+r.H)
		done := math.Abs(next-I) <= 1e-12*next
		I = next
		if done {
			break
		}
	}
	r.I = I
	r.Gammas = m.Gammas(I, w.TempC)
	r.Species = Speciate(w.Alk, w.PH, r.Constants, r.Gammas)
	switch v := m.Validity(); {
	case m == Ideal:
		r.Warnings = append(r.Warnings, fmt.Sprintf("activity coefficients taken as 1 (ideal solution) at ionic strength %.3g mol/L", I))
	case I > v:
		r.Warnings = append(r.Warnings, fmt.Sprintf("ionic strength %.3g mol/L is above the %g mol/L to which the %s model holds", I, v, m))
	}
	r.LogPCO2 = math.Log10(r.PCO2)
	r.SICalcite, r.SIAragonite, r.SIDolomite = math.NaN(), math.NaN(), math.NaN()
	if w.Ca > 0 && r.CO3 > 0 {
		r.SICalcite = SaturationIndex(w.Ca, r.CO3, r.Gammas, r.Constants.LogKcal)
		r.SIAragonite = SaturationIndex(w.Ca, r.CO3, r.Gammas, r.Constants.LogKarg)
		if w.Mg > 0 {
			r.SIDolomite = SaturationIndexDolomite(w.Ca, w.Mg, r.CO3, r.Gammas, r.Constants.LogKdol)
		}
	}
	return r, nil
}
