package correct

import (
	"fmt"
	"strings"

	"lixiv/engine/chem"
)

// Result is the corrected chemistry of one sample and a record of what each
// step removed. All compositions are µmol/L; species a step does not touch
// are 0 in Atm, Evap and Human.
type Result struct {
	Input chem.Composition // the measured sample
	Atm   chem.Composition // atmospheric input removed (Cl_atm, X_atm)
	Evap  chem.Composition // evaporite removed: halite Na and Cl, gypsum Ca and SO4
	Human chem.Composition // human input removed (excess Cl and its Na), if chosen
	// Residual is X* = Input − Atm − Evap − Human after the negative policy;
	// Residual[SO4] is the sulfide-derived share when any.
	Residual chem.Composition

	ClCritical float64 // Cl* used, µmol/L (+Inf when all Cl is atmospheric)
	ClExcess   float64 // Cl above Cl*, µmol/L
	F          float64 // evapotranspiration factor (1 without measured rain)
	Ratios     Ratios  // X/Cl ratios used for the atmospheric input
	SO4Star    float64 // SO4* = SO4 − SO4_atm before the sulfate split
	SO4Sulf    float64 // sulfate from sulfide oxidation, µmol/L
	FSulf      float64 // share of SO4* from sulfide oxidation, [0, 1]

	Negatives []Deficit // residuals that were below zero, before the policy
	Rejected  bool      // the sample was rejected by the Reject policy
	Warnings  []error   // problems that do not stop the correction

	excess Excess   // where Cl above Cl* went (for Vary)
	policy Negative // the negative-residual policy (for Vary)
}

// Deficit is a species whose residual fell below zero after correction.
type Deficit struct {
	Species chem.Species
	Amount  float64 // the residual before the policy, µmol/L (< 0)
}

// String gives the deficit as "K* = -0.87 µmol/L".
func (d Deficit) String() string {
	return fmt.Sprintf("%s* = %.4g µmol/L", d.Species, d.Amount)
}

// NegativeError is returned by Apply under the Reject policy when any
// residual is negative. It unwraps to ErrNegativeResidual.
type NegativeError struct {
	Deficits []Deficit
}

// Error lists the species and amounts.
func (e *NegativeError) Error() string {
	parts := make([]string, len(e.Deficits))
	for i, d := range e.Deficits {
		parts[i] = d.String()
	}
	return "sample rejected: " + ErrNegativeResidual.Error() + ": " + strings.Join(parts, ", ")
}

// Unwrap returns ErrNegativeResidual.
func (e *NegativeError) Unwrap() error { return ErrNegativeResidual }
