// Package flux turns sparse concentration samples and a daily discharge
// record into annual solute loads, specific yields and their uncertainty.
//
// # Units
//
// Concentrations are µmol/L (µeq/L for alkalinity), discharge m³/s, area km².
// 1 µmol/L × 1 m³/s × 1 day = 86.4 mol. Loads are mol per reporting year
// (calendar or water year, Options.FirstMonth) and t/yr through the series'
// molar mass; yields mol/km²/yr and t/km²/yr; runoff mm/yr. CO2 consumption
// is fluxed like any other series (per-sample φ in µmol/L) with MolarMass set
// to chem.MassC to give t C; CarbonMass and CO2Mass convert mol to t C and
// t CO2, and WeatheringRate sums mass yields of several species (silicate
// cations, with or without SiO2). Further CO2 accounting belongs to co2.
//
// # Estimators (docs/methods.md §8)
//
//   - FlowWeighted: each year's discharge-weighted mean concentration
//     C_fw = Σ C_i Q_i / Σ Q_i over that year's samples, times the year's
//     discharge: L = 86.4 C_fw Σ Q_d.
//   - PeriodWeighted: concentration interpolated in time between sample
//     days (same-day samples averaged), held at the ends of the record,
//     times daily discharge: L = 86.4 Σ C_d Q_d. The interpolation is
//     flow-adjusted: C_d = Q_d^b × interp(C_i Q_i^−b), with b the
//     least-squares slope of ln C on ln Q of the samples, which is plain
//     linear interpolation when b = 0.
//   - Beale: the bias-corrected ratio estimator on each year's samples (§8.4).
//   - Rating: ln C = b0 + b1 ln Q (+ b2 sin 2πt + b3 cos 2πt) fitted by least
//     squares over all samples, applied to every day and multiplied by a
//     retransformation bias factor: Duan's smearing (default), Ferguson's
//     exp(s²/2), or none. RatingFit reports a, b, R², s and the factor.
//
// Every estimator writes its load as 86.4 (Cref Σ Q_d + Σ (C_d − Cref) Q_d),
// Cref the first sample's concentration, so a constant concentration gives
// exactly 86.4 C Σ Q_d. Samples take the discharge at sampling from
// Series.Q, or else the daily record's value of their day.
//
// # Pipeline
//
//  1. Estimate matches every sample to its day of the record and its
//     reporting year; samples outside the record, on gap days, without a
//     concentration, or (rating curve) not positive are left out and listed
//     in Result.Warnings.
//  2. The estimator gives a load for every year the record touches. Years
//     with gap days are flagged incomplete and left out of the mean annual
//     load (fill gaps first with discharge.Record.Fill if they should count).
//  3. Bootstrap repeats step 2 for each replicate: a stratified resampling of
//     samples within years, a Monte Carlo draw of each sample's
//     concentration (Series.Draws: per sample from its own weighted
//     posterior, a rejected draw never taken; or one joint draw number for
//     every sample, JointDraw), a systematic discharge error and an area
//     error; it reports the median and 95 % interval of every figure
//     (docs/methods.md §8.6). BootstrapOptions.Hold holds chosen sources at
//     their central values (Alone varies one source only), for a breakdown
//     of an interval by source; its zero value varies them all.
//
// # Apportioned quantities
//
// A quantity a source apportionment attributes to measured species (a
// cation from a source, a sum of them, CO2 consumption) is an Apportioned:
// each measured species is fluxed by the estimator, and the quantity takes
// the flow-weighted share of it that its amounts are in each year's samples
// (EstimateApportioned, BootstrapApportioned; docs/methods.md §8.7). The
// sources of a species then add up to its load with every estimator, and
// the rating curve never meets the zeros and negative values of
// apportioned amounts. A Cache shared by the bootstraps of one budget keeps
// each measured species' replicate loads, the resampling counts and error
// factors of the seed, and each sample's draws, which are the same in every
// bootstrap with the same seed and samples.
//
// # Reproducibility
//
// Bootstrap is seeded (PCG from math/rand/v2, with separate streams for
// resampling, draws and errors) and gives the same bits natively and under
// WebAssembly: the random path and every load computation use a portable exp
// and log of the package's own (the amd64 math.Exp and math.Log are assembly
// that can differ in the last bit), normal draws by the polar method, and no
// fused multiply-add. Two series bootstrapped with the same seed and sample
// days resample the same samples and share the discharge errors, so their
// replicate loads (Uncertainty.MeanMol) can be added replicate by replicate.
package flux
