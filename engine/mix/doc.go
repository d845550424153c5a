// Package mix apportions the major cations of a water sample among their
// sources: the atmosphere, evaporites, silicate and carbonate rocks.
//
// Concentrations are µmol/L. Two models share the Split type: the forward
// model (sequential subtraction with fixed silicate end-member ratios,
// forward*.go) and the inverse model (uncertain end-members, one weighted
// posterior per sample). docs/methods.md §6 and §7 give their equations.
//
// # Inverse model
//
// The inverse model (Invert, or NewRun and Run.Step) works in concentration
// space, sample by sample:
//
//  1. The data are Na* and the numerators of the chosen tracers (Ca*, Mg*,
//     K*, HCO3 or alkalinity, Cl*, Sr*, and the Sr-weighted 87Sr/86Sr),
//     corrected for rain and evaporites by engine/correct when a Water has
//     a Correction. Their errors come from the measurements: each measured
//     concentration has the analytical precision of Options.Precision (3 %
//     with a floor by default), the rain's X/Cl ratios and Cl* the spread of
//     Options.Rain, and the correction, linear in all of them, carries them
//     to the data with the covariance the shared Cl brings
//     (correct.Result.Linearize).
//  2. The unknowns are the amounts n_j >= 0 (µmol/L of Na) each end-member
//     brings and the end-members' ratios. Data = A(ratios) n + error: Na* =
//     sum n_j, X* = sum (X/Na)_j n_j. No closure, and Na* <= 0 needs no
//     special algebra.
//  3. Each ratio has a prior (Prior): a published central value with a
//     range reads as a log-normal with the range as its 95 % interval
//     (Within); presets carry their sources. The amounts have a
//     spike-and-slab prior (slab.go): each end-member present with
//     probability ½, the present ones' shares of the rock-derived cation
//     charge uniform, so amounts of exactly 0 — and shares of exactly 0 and
//     1 — are reachable.
//  4. The posterior is sampled by importance sampling (sample.go,
//     proposal.go): first-stage draws from the priors, shared by all
//     samples, then refinement stages that propose the ratios from a
//     Gaussian mixture fitted to the weighted draws so far (one component
//     per set of present end-members), until the effective sample size
//     reaches Options.TargetESS or the draws reach Options.MaxDraws. For
//     each draw of the ratios, a set of present end-members is proposed in
//     proportion to a Laplace estimate of its evidence and the amounts from
//     the Gaussian of its least-squares problem; every draw is weighted by
//     the exact ratio of prior × likelihood to its proposal (the balance
//     heuristic over all stages). Every draw counts with its weight.
//  5. Per sample: weighted quantiles of each end-member's Na fraction and
//     of the amount and share of Na, K, Ca and Mg from each source (the
//     correction's atmospheric and evaporite amounts drawn with the same
//     errors; an end-member's share of a cation times the corrected amount,
//     so no source gets more than was measured), the ESS, a posterior
//     predictive check of the misfit, the width of each fraction against
//     what the priors alone give, the ratios whose posterior lies beyond
//     their prior's range, the posterior correlation of the amounts, and a
//     verdict in words (SampleResult.Verdict; SampleResult.Doubtful).
//
// An evaporite end-member takes part only with the Cl/Na tracer (elsewhere
// no tracer can tell its Na from silicate Na), and Problem's confusions
// name, before the run, end-members the chosen tracers cannot tell from a
// mix of others and the tracer that would separate them. A water with Na*
// <= 0 that no mix fits gets the Na-free rule (Ca* and Mg* to carbonate).
// The draws of each sample, with their weights, are its posterior
// (Result.Draw); draws of different samples are unrelated.
//
// # Catchment-wide model
//
// InvertCatchment (or NewCatchmentRun and CatchmentRun.Step) fits every
// water of a Problem at once (catchment*.go, docs/methods.md §7.12): the
// end-member ratios the likelihood reads are shared by all samples, with a
// log-normal scatter per end-member about them, and each sample's amounts
// are integrated out given the shared values. Four Metropolis–Hastings
// chains sample the shared latents and scatters: each climbs to a mode from
// its own draw of the priors, the modes make a mixture of t distributions
// that a short warm-up refits to the posterior by importance weights, and
// the chains then propose from it (whole or one end-member at a time) with
// random-walk steps between, the proposal fixed. They run until split R-hat
// and the effective sample size of every shared ratio say they converged,
// or to a cap (Catchment.Converged, Catchment.Message). A counting check runs first
// (Identifiability: enough equations beyond the samples' own amounts, at
// least MinSpare in most samples, and spread along the mixing space); when
// it fails, the per-sample model runs and Catchment.Fallback says why. Its draws are joint (Result.Joint): draw d
// of every sample comes from the same shared ratios.
//
// A catchment-wide run can share its work with other copies of the engine
// (the page's Web Workers) round by round (catchment_farm.go): Round
// returns the next round's state and units (the chains' mode searches; the
// chains' steps between two points at which they wait for each other; the
// samples' summaries), WorkUnit works a unit in another run of the same
// problem, options and seed, and PutUnit takes its result in, bit for bit
// what the run would have computed itself.
//
// The waters may be raw river chemistry, with the rain end-member in the
// inversion (DefaultEndMembers(true)), or corrected by engine/correct, in
// which case rain is left out (DefaultEndMembers(false)).
//
// Results are bit-identical for a given seed on every supported target
// (amd64 and WebAssembly): the first-stage draws come from one PCG stream
// in a fixed order, each sample's later draws and data errors from streams
// of its own, exp, log, the normal quantile and its distribution function
// are computed by portable code of this package rather than the math
// package (which uses assembly on amd64), and each sample is worked by one
// goroutine in draw order, so neither the number of cores nor the chunking
// of Run.Step changes a bit. Result.Checksum hashes every number of a
// result. (On arm64 and some other targets the Go compiler may fuse a
// multiply and an add into one rounding, so bits there can differ from
// amd64 and WebAssembly in the last place.)
package mix
