package chem

import "math"

// Composition is the chemistry of one water: a concentration for every
// species in µmol/L (µeq/L for Alk), NaN where not measured. The zero value
// holds zeros, so build one with NewComposition.
type Composition [NSpecies]float64

// NewComposition returns a composition with every species missing (NaN).
func NewComposition() Composition {
	var c Composition
	for i := range c {
		c[i] = math.NaN()
	}
	return c
}

// Has reports whether species s has a value.
func (c *Composition) Has(s Species) bool { return !math.IsNaN(c[s]) }

// Eq returns the concentration of s in µeq/L (charge times µmol/L; Alk is
// already in µeq/L).
func (c *Composition) Eq(s Species) float64 {
	if s == Alk {
		return c[s]
	}
	return c[s] * math.Abs(float64(s.Charge()))
}

// Scale returns the composition with every concentration multiplied by f,
// as for dilution or evaporative concentration.
func (c Composition) Scale(f float64) Composition {
	for i := range c {
		c[i] *= f
	}
	return c
}
