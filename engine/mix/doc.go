// Package mix apportions the major cations of a water sample among their
// sources: the atmosphere, evaporites, silicate and carbonate rocks.
//
// Concentrations are µmol/L. Two models share the Split type: the forward
// model (sequential subtraction with fixed silicate end-member ratios) and
// the inverse Monte Carlo model (uncertain end-members, constrained least
// squares per draw).
//
// # Inverse model
//
// The inverse model (Invert, or NewRun and Run.Step) follows docs/methods.md §7:
//
//  1. End-members are user-defined (EndMember): a name, the Source their
//     cations are booked to, and a Prior per ratio to Na and for 87Sr/86Sr
//     (fixed, log-uniform or log-normal). Presets carry their published
//     sources: PresetRain (sea salt), PresetEvaporite, PresetCarbonate,
//     PresetSilicate and the lithology-specific PresetGranitic and
//     PresetBasaltic.
//  2. Tracers are any subset of Ca/Na, Mg/Na, K/Na, HCO3/Na, Cl/Na, Sr/Na
//     and 87Sr/86Sr. The isotope ratio mixes in proportion to Sr and enters
//     linearised: sum_j a_j (Sr/Na)_j (R_j - R_measured) = 0.
//  3. For each draw every end-member ratio is drawn once from its prior and
//     shared by all samples (the same rocks for the whole catchment), so
//     draw d is coherent across samples and fluxes can be propagated draw
//     by draw (Result.Draw, Result.SplitAt).
//  4. For each sample and draw the Na fractions a_j solve the weighted least
//     squares with sum a_j = 1 and a_j >= 0 exactly (closed-form solves on
//     the faces of the simplex; no grid). The weights are the analytical
//     uncertainties of the measured ratios; with Options.Perturb the
//     measured ratios themselves are also drawn from those uncertainties.
//  5. The draw is accepted when chi-square is within the 95 % quantile
//     (Accept), or weighted by exp(-chi2/2) (Weight).
//  6. Per sample: median and 2.5/97.5 % quantiles of each end-member's Na
//     fraction and of each source's share and amount of Na, K, Ca and Mg
//     (amount of X from end-member j = a_j Na (X/Na)_j, scaled so the
//     sources add up to the measured X), the acceptance rate, a Status and
//     warnings (under-determined, ill-conditioned, missing tracer, no fit).
//
// The waters may be raw river chemistry, with the rain end-member in the
// inversion (DefaultEndMembers(true)), or already corrected for atmospheric
// and evaporite input by engine/correct, in which case rain is left out
// (DefaultEndMembers(false)) and Cl/Na is useful only if halite remains.
//
// Results are bit-identical for a given seed on every supported target
// (amd64 and WebAssembly): draws come from one PCG stream in a fixed
// order, exp and log are computed by portable code of this package rather
// than the math package (which uses assembly on amd64), and each sample is
// worked by one goroutine in draw order, so neither the number of cores
// nor the chunking of Run.Step changes a bit. Result.Checksum hashes every
// number of a result. (On arm64 and some other targets the Go compiler may
// fuse a multiply and an add into one rounding, so bits there can differ
// from amd64 and WebAssembly in the last place.)
package mix
