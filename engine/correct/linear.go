package correct

import (
	"fmt"
	"math"

	"lixiv/engine/chem"
)

// Precision is the analytical precision of measured concentrations: the
// 1σ of species s measured at x is max(Rel[s] x, Floor[s]) (µmol/L, µeq/L
// for alkalinity). Typical figures are 2-5 % relative for major ions by
// ion chromatography or ICP, with a floor near the detection limit (common
// practice, no source; docs/methods.md §7.2).
type Precision struct {
	Rel   [chem.NSpecies]float64 // relative 1σ, such as 0.03 for 3 %
	Floor [chem.NSpecies]float64 // smallest 1σ, µmol/L (µeq/L for Alk)
}

// UniformPrecision returns the same relative precision and floor for every
// species but Sr, whose floor is srFloor (Sr is about a thousand times
// scarcer than the major ions in most waters).
func UniformPrecision(rel, floor, srFloor float64) Precision {
	var p Precision
	for s := range p.Rel {
		p.Rel[s], p.Floor[s] = rel, floor
	}
	p.Floor[chem.Sr] = srFloor
	return p
}

// Sigma returns the 1σ of species s measured at x (0 for NaN).
func (p *Precision) Sigma(s chem.Species, x float64) float64 {
	if math.IsNaN(x) {
		return 0
	}
	return math.Max(p.Rel[s]*math.Abs(x), p.Floor[s])
}

// Check reports a negative, infinite or NaN precision.
func (p *Precision) Check() error {
	for s := range p.Rel {
		for _, x := range []float64{p.Rel[s], p.Floor[s]} {
			if !(x >= 0) || math.IsInf(x, 0) {
				return fmt.Errorf("%w: precision of %s is %g, want finite and >= 0", ErrOption, chem.Species(s), x)
			}
		}
	}
	return nil
}

// Affine is a quantity to first order in the error sources of a Linear:
// Value + sum_i Grad[i] z_i, with the z_i independent standard normal.
// A nil Grad means an exact value.
type Affine struct {
	Value float64
	Grad  []float64
}

// At returns the quantity at the error draw z.
func (a *Affine) At(z []float64) float64 {
	v := a.Value
	for i, g := range a.Grad {
		v += float64(g * z[i])
	}
	return v
}

// Var returns the variance of the quantity.
func (a *Affine) Var() float64 {
	v := 0.0
	for _, g := range a.Grad {
		v += g * g
	}
	return v
}

// Cov returns the covariance of two quantities of the same Linear.
func (a *Affine) Cov(b *Affine) float64 {
	v := 0.0
	for i := range min(len(a.Grad), len(b.Grad)) {
		v += a.Grad[i] * b.Grad[i]
	}
	return v
}

// ErrorSource is one independent input error of a correction.
type ErrorSource struct {
	Species chem.Species // the species measured, or whose X/Cl ratio of rain is uncertain (Cl for Cl*)
	Kind    SourceKind
	Sigma   float64 // 1σ: µmol/L for a measurement, relative for a ratio or Cl*
}

// SourceKind says what an ErrorSource stands for.
type SourceKind int

// The kinds of error source.
const (
	Measured   SourceKind = iota // analytical error of a measured concentration
	RainRatio                    // spread of an X/Cl ratio of the atmospheric input
	CriticalCl                   // spread of Cl* through the evapotranspiration factor
	numSourceKinds
)

// String names the error source, such as "Na measured" or "Na/Cl of rain".
func (e ErrorSource) String() string {
	switch e.Kind {
	case Measured:
		return e.Species.Symbol() + " measured"
	case RainRatio:
		return e.Species.Symbol() + "/Cl of rain"
	case CriticalCl:
		return "Cl* (evapotranspiration factor)"
	}
	return "unknown error source"
}

// Linear is a correction written to first order in its input errors
// (JCGM 100:2008, the law of propagation of uncertainty): the measured
// concentrations with their analytical precision, the X/Cl ratios of the
// atmospheric input with their relative spread, and Cl* with the spread of
// the evapotranspiration factor. The correction is piecewise linear in all
// of them (a min at Cl*, a max at SO4* = 0), so the first-order form is
// exact away from those kinks. Every quantity shares the same error
// sources, so covariances follow from the gradients: the shared Cl gives
// the corrected species their off-diagonal terms.
type Linear struct {
	Sources []ErrorSource
	Input   [chem.NSpecies]Affine // the measured concentrations
	Atm     [chem.NSpecies]Affine // atmospheric input
	Halite  Affine                // Na (= Cl) of halite from Cl above Cl*
	Gypsum  Affine                // Ca (= SO4) of gypsum
	Human   Affine                // Na (= Cl) removed as human input
	// Residual is X* = Input − Atm − Evap − Human, not limited at zero
	// (the negative policy does not apply: a negative value is the data).
	Residual [chem.NSpecies]Affine
	SO4Sulf  Affine // sulfate from sulfide oxidation
}

// Evap returns the evaporite amount of species s (halite Na and Cl, gypsum
// Ca and SO4).
func (l *Linear) Evap(s chem.Species) Affine {
	switch s {
	case chem.Na, chem.Cl:
		return l.Halite
	case chem.Ca, chem.SO4:
		return l.Gypsum
	}
	return Affine{}
}

// linearSpecies are the measured species whose errors a Linear carries:
// Cl, the corrected species, and the alkalinity.
var linearSpecies = [...]chem.Species{chem.Cl, chem.Na, chem.K, chem.Ca, chem.Mg, chem.SO4, chem.Sr, chem.Br, chem.Alk, chem.HCO3}

// Linearize writes the correction r to first order in its input errors: the
// analytical precision p of every measured species the correction reads (and
// of the alkalinity), the relative spread u.Ratios of each X/Cl ratio of the
// atmospheric input, and, when scaleCl (Cl* from measured rain) and Cl is
// above Cl*, the relative spread u.Factor of Cl*. Error sources with no
// effect (a species not measured, a zero spread, no atmospheric input) are
// left out. r must come from Apply (or Vary).
func (r *Result) Linearize(p *Precision, u Uncertainty, scaleCl bool) Linear {
	var l Linear
	in := &r.Input
	var meas [chem.NSpecies]int
	var ratio [chem.NSpecies]int
	for i := range meas {
		meas[i], ratio[i] = -1, -1
	}
	for _, s := range linearSpecies {
		if sd := p.Sigma(s, in[s]); sd > 0 {
			meas[s] = len(l.Sources)
			l.Sources = append(l.Sources, ErrorSource{Species: s, Kind: Measured, Sigma: sd})
		}
	}
	cl := in[chem.Cl]
	regimeB := cl > r.ClCritical // Cl above Cl*: Cl_atm = Cl*
	clAtm := math.Min(cl, r.ClCritical)
	if u.Ratios > 0 && clAtm > 0 {
		for _, s := range corrected {
			if r.Ratios[s] > 0 {
				ratio[s] = len(l.Sources)
				l.Sources = append(l.Sources, ErrorSource{Species: s, Kind: RainRatio, Sigma: u.Ratios})
			}
		}
	}
	clStar := -1
	if regimeB && scaleCl && u.Factor > 0 {
		clStar = len(l.Sources)
		l.Sources = append(l.Sources, ErrorSource{Species: chem.Cl, Kind: CriticalCl, Sigma: u.Factor})
	}
	q := len(l.Sources)
	grad := func() []float64 { return make([]float64, q) }
	for s := range l.Input {
		l.Input[s].Value = in[s]
		if meas[s] >= 0 {
			l.Input[s].Grad = grad()
			l.Input[s].Grad[meas[s]] = l.Sources[meas[s]].Sigma
		}
	}
	// Cl_atm = min(Cl, Cl*).
	dClAtm := grad()
	switch {
	case !regimeB && meas[chem.Cl] >= 0:
		dClAtm[meas[chem.Cl]] = l.Sources[meas[chem.Cl]].Sigma
	case regimeB && clStar >= 0:
		dClAtm[clStar] = r.ClCritical * u.Factor
	}
	l.Atm[chem.Cl] = Affine{Value: clAtm, Grad: dClAtm}
	for _, s := range corrected {
		g := grad()
		for i, d := range dClAtm {
			g[i] = r.Ratios[s] * d
		}
		if ratio[s] >= 0 {
			g[ratio[s]] = clAtm * r.Ratios[s] * u.Ratios
		}
		l.Atm[s] = Affine{Value: float64(clAtm * r.Ratios[s]), Grad: g}
	}
	// Cl above Cl*, to halite or human input, with its Na.
	if ex := cl - clAtm; ex > 0 {
		g := grad()
		if meas[chem.Cl] >= 0 {
			g[meas[chem.Cl]] = l.Sources[meas[chem.Cl]].Sigma
		}
		for i, d := range dClAtm {
			g[i] -= d
		}
		switch r.excess {
		case Halite:
			l.Halite = Affine{Value: ex, Grad: g}
		case HumanInput:
			l.Human = Affine{Value: ex, Grad: g}
		}
	}
	// Sulfate above the atmospheric share, to gypsum and sulfide.
	if so4 := in[chem.SO4]; !math.IsNaN(so4) {
		if star := so4 - l.Atm[chem.SO4].Value; star > 0 {
			g := grad()
			if meas[chem.SO4] >= 0 {
				g[meas[chem.SO4]] = l.Sources[meas[chem.SO4]].Sigma
			}
			for i, d := range l.Atm[chem.SO4].Grad {
				g[i] -= d
			}
			gy, su := grad(), grad()
			for i, d := range g {
				gy[i], su[i] = (1-r.FSulf)*d, r.FSulf*d
			}
			l.Gypsum = Affine{Value: (1 - r.FSulf) * star, Grad: gy}
			l.SO4Sulf = Affine{Value: r.FSulf * star, Grad: su}
		}
	}
	// Residuals X* = Input − Atm − Evap − Human.
	for s := range l.Residual {
		res := Affine{Value: in[s]}
		parts := []*Affine{&l.Atm[s]}
		switch chem.Species(s) {
		case chem.Na, chem.Cl:
			parts = append(parts, &l.Halite, &l.Human)
		case chem.Ca, chem.SO4:
			parts = append(parts, &l.Gypsum)
		}
		for _, a := range parts {
			res.Value -= a.Value
		}
		if meas[s] >= 0 || len(parts) > 0 {
			res.Grad = grad()
			if meas[s] >= 0 {
				res.Grad[meas[s]] = l.Sources[meas[s]].Sigma
			}
			for _, a := range parts {
				for i, d := range a.Grad {
					res.Grad[i] -= d
				}
			}
		}
		l.Residual[s] = res
	}
	return l
}
