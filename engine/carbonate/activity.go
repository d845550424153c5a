package carbonate

import (
	"fmt"
	"math"
)

// Model is an activity model: how activity coefficients follow ionic
// strength.
type Model int

// The activity models.
const (
	// Ideal takes every activity coefficient as 1. It has no range of
	// validity in natural water; it is kept for checks against textbook
	// values computed that way.
	Ideal Model = iota
	// Davies is log γ = −A z² (√I/(1+√I) − 0.3 I) (Davies 1962, Ion
	// Association, Butterworths), valid to I ≈ 0.5 mol/L (from memory).
	Davies
	// ExtendedDH is the extended Debye–Hückel equation log γ = −A z² √I /
	// (1 + B a √I) with the ion sizes a of Kielland (1937), valid to
	// I ≈ 0.1 mol/L (from memory).
	ExtendedDH
)

var modelNames = [...]string{"ideal", "davies", "extended-debye-huckel"}

// String returns the model's name as settings write it.
func (m Model) String() string {
	if m < 0 || int(m) >= len(modelNames) {
		return fmt.Sprintf("Model(%d)", int(m))
	}
	return modelNames[m]
}

// ParseModel reads a model name ("ideal", "davies" or
// "extended-debye-huckel").
func ParseModel(s string) (Model, error) {
	for i, n := range modelNames {
		if s == n {
			return Model(i), nil
		}
	}
	return 0, fmt.Errorf("activity model %q is not one of %q", s, modelNames[:])
}

// Validity returns the highest ionic strength (mol/L) at which the model
// holds: 0.5 for Davies and 0.1 for extended Debye–Hückel (docs/methods.md
// §10.2, from memory); 0 for Ideal, which any salt exceeds.
func (m Model) Validity() float64 {
	switch m {
	case Davies:
		return 0.5
	case ExtendedDH:
		return 0.1
	}
	return 0
}

// DebyeHuckel returns the Debye–Hückel constants A (kg^½ mol^-½) and B
// (Å⁻¹ kg^½ mol^-½) at tC °C from the linear fits A = 0.4883 + 8.074e-4 t
// and B = 0.3241 + 1.600e-4 t, which give 0.5085 and 0.3281 at 25 °C
// (Truesdell & Jones 1974, J. Res. U.S. Geol. Surv. 2, tabulated in
// Langmuir 1997; the fits from memory, docs/methods.md §10.2).
func DebyeHuckel(tC float64) (A, B float64) {
	return 0.4883 + 8.074e-4*tC, 0.3241 + 1.600e-4*tC
}

// LogGammaDavies returns log10 γ of an ion of charge z at ionic strength I
// (mol/L) by the Davies equation with constant A.
func LogGammaDavies(z int, I, A float64) float64 {
	s := math.Sqrt(I)
	return -A * float64(z*z) * (s/(1+s) - 0.3*I)
}

// LogGammaDH returns log10 γ of an ion of charge z and size a (Å) at ionic
// strength I by the extended Debye–Hückel equation with constants A and B.
func LogGammaDH(z int, a, I, A, B float64) float64 {
	s := math.Sqrt(I)
	return -A * float64(z*z) * s / (1 + B*a*s)
}

// Ion sizes a (Å) of the extended Debye–Hückel equation (Kielland 1937,
// J. Am. Chem. Soc. 59, 1675–1678; from memory, docs/methods.md §10.2).
// Kielland gives 4–4.5 Å for HCO3⁻; 4 is used.
const (
	SizeH    = 9.0
	SizeOH   = 3.5
	SizeHCO3 = 4.0
	SizeCO3  = 4.5
	SizeCa   = 6.0
	SizeMg   = 8.0
)

// Gammas are the activity coefficients of the ions the carbonate system
// needs. Neutral species (H2CO3*) take γ = 1.
type Gammas struct {
	H, OH, HCO3, CO3, Ca, Mg float64
}

// Unit returns coefficients all equal to 1 (ideal solution).
func Unit() Gammas { return Gammas{1, 1, 1, 1, 1, 1} }

// Gammas returns the activity coefficients of model m at ionic strength I
// (mol/L) and tC °C.
func (m Model) Gammas(I, tC float64) Gammas {
	A, B := DebyeHuckel(tC)
	switch m {
	case Davies:
		g1 := math.Pow(10, LogGammaDavies(1, I, A))
		g2 := math.Pow(10, LogGammaDavies(2, I, A))
		return Gammas{H: g1, OH: g1, HCO3: g1, CO3: g2, Ca: g2, Mg: g2}
	case ExtendedDH:
		g := func(z int, a float64) float64 { return math.Pow(10, LogGammaDH(z, a, I, A, B)) }
		return Gammas{H: g(1, SizeH), OH: g(1, SizeOH), HCO3: g(1, SizeHCO3), CO3: g(2, SizeCO3), Ca: g(2, SizeCa), Mg: g(2, SizeMg)}
	}
	return Unit()
}
