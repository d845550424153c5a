// Package mix apportions the major cations of a water sample among their
// sources: the atmosphere, evaporites, silicate and carbonate rocks.
//
// Concentrations are µmol/L. Two models share the Split type: the forward
// model (sequential subtraction with fixed silicate end-member ratios) and
// the inverse Monte Carlo model (uncertain end-members, constrained least
// squares per draw).
package mix
