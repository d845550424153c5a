package correct

import (
	"math"

	"lixiv/engine/chem"
)

// The functions in this file each give one part of r.Vary(k), bit for bit,
// for the Monte Carlo callers that need only that part: they work through
// the species the correction changes (Cl and the corrected species) and
// fill no Result. Like Vary, they take r as Apply made it (with a nil error
// or a *NegativeError) or as Vary made it: the residual of a species the
// correction leaves alone is then r's own and does not depend on the draw.
// Each repeats the arithmetic of remove, splitSulfate, residuals and the
// negative policy in the same order; products are rounded explicitly so no
// platform fuses them into a later subtraction.

// VaryResidual sets *dst to r.Vary(k).Residual and returns
// r.Vary(k).Rejected: the residuals X* of the draw after the negative
// policy, and whether the Reject policy rejects the draw. The species are
// written out one a line, Cl and then corrected in order
// (TestVaryPartsSpecies keeps the two lists alike).
func (r *Result) VaryResidual(k *Scale, dst *chem.Composition) (rejected bool) {
	*dst = r.Residual
	clAtm := r.clAtm(k)
	halite, human := r.excessTo(clAtm)
	atmSO4 := r.atmOf(k, clAtm, chem.SO4)
	gypSO4, gypCa, _ := r.split(atmSO4)
	in := &r.Input
	const none = 0.0 // Evap or Human of a species they do not touch
	rejected = r.policyOn(dst, chem.Cl, in[chem.Cl]-clAtm-halite-human)
	rejected = r.policyOn(dst, chem.Na, in[chem.Na]-r.atmOf(k, clAtm, chem.Na)-halite-human) || rejected
	rejected = r.policyOn(dst, chem.K, in[chem.K]-r.atmOf(k, clAtm, chem.K)-none-none) || rejected
	rejected = r.policyOn(dst, chem.Ca, in[chem.Ca]-r.atmOf(k, clAtm, chem.Ca)-gypCa-none) || rejected
	rejected = r.policyOn(dst, chem.Mg, in[chem.Mg]-r.atmOf(k, clAtm, chem.Mg)-none-none) || rejected
	rejected = r.policyOn(dst, chem.SO4, in[chem.SO4]-atmSO4-gypSO4-none) || rejected
	rejected = r.policyOn(dst, chem.Sr, in[chem.Sr]-r.atmOf(k, clAtm, chem.Sr)-none-none) || rejected
	rejected = r.policyOn(dst, chem.Br, in[chem.Br]-r.atmOf(k, clAtm, chem.Br)-none-none) || rejected
	return rejected
}

// VaryRemoved sets *atm and *evap to r.Vary(k).Atm and r.Vary(k).Evap: the
// atmospheric input and the evaporite (halite and gypsum) amounts the
// draw removes.
func (r *Result) VaryRemoved(k *Scale, atm, evap *chem.Composition) {
	clAtm := r.clAtm(k)
	*atm = chem.Composition{}
	atm[chem.Cl] = clAtm
	for _, s := range corrected {
		atm[s] = r.atmOf(k, clAtm, s)
	}
	*evap = chem.Composition{}
	if halite, _ := r.excessTo(clAtm); halite > 0 {
		evap[chem.Cl], evap[chem.Na] = halite, halite
	}
	evap[chem.SO4], evap[chem.Ca], _ = r.split(atm[chem.SO4])
}

// VarySO4Sulf returns r.Vary(k).SO4Sulf, the sulfide-derived sulfate of
// the draw (µmol/L).
func (r *Result) VarySO4Sulf(k *Scale) float64 {
	_, _, sulf := r.split(r.atmOf(k, r.clAtm(k), chem.SO4))
	return sulf
}

// clAtm returns the atmospheric chloride of draw k, min(Cl, Cl* × k) (as in
// remove).
func (r *Result) clAtm(k *Scale) float64 {
	return math.Min(r.Input[chem.Cl], r.ClCritical*k.ClCritical)
}

// atmOf returns the atmospheric input of species s under draw k given the
// draw's atmospheric chloride (as in remove).
func (r *Result) atmOf(k *Scale, clAtm float64, s chem.Species) float64 {
	return float64(clAtm * float64(r.Ratios[s]*k.Ratios[s]))
}

// excessTo returns the chloride above clAtm given to halite and to human
// input, each 0 when it goes elsewhere or there is none; Na follows it (as
// in remove).
func (r *Result) excessTo(clAtm float64) (halite, human float64) {
	if ex := r.Input[chem.Cl] - clAtm; ex > 0 {
		switch r.excess {
		case Halite:
			return ex, 0
		case HumanInput:
			return 0, ex
		}
	}
	return 0, 0
}

// split returns the gypsum sulfate, the gypsum calcium and the sulfide
// sulfate of a draw whose atmospheric sulfate is atmSO4 (as in
// splitSulfate). Without a measured SO4 there is no gypsum and the sulfide
// sulfate stays r's.
func (r *Result) split(atmSO4 float64) (gypSO4, gypCa, sulf float64) {
	so4 := r.Input[chem.SO4]
	if math.IsNaN(so4) {
		return 0, 0, r.SO4Sulf
	}
	star := math.Max(so4-atmSO4, 0)
	gypSO4 = float64((1 - r.FSulf) * star)
	gypCa += gypSO4 // Evap[Ca] += gyp, from the zero Vary starts with
	return gypSO4, gypCa, float64(r.FSulf * star)
}

// policyOn stores the residual x of species s in dst after the negative
// policy (as in Vary) and reports whether it rejects the draw.
func (r *Result) policyOn(dst *chem.Composition, s chem.Species, x float64) (rejected bool) {
	if x < 0 {
		switch {
		case -x <= roundoff*r.Input[s] || r.policy == Zero:
			x = 0
		case r.policy == Reject:
			rejected = true
		}
	}
	dst[s] = x
	return rejected
}
