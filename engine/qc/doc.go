// Package qc checks the quality of water-sample chemistry: the charge
// balance of each sample, the major ions it lacks, how many of its values
// were below detection, and ratios to chloride that stand out from the rest
// of the table. It flags and warns; it never drops a sample.
//
// # Units
//
// Concentrations are in µmol/L and alkalinity in µeq/L (chem.Composition);
// charge sums TZ+ and TZ− are in µeq/L; imbalances and thresholds are in
// percent; temperature is in °C.
//
// # Pipeline
//
// Check runs, for each sample:
//
//  1. Charge sums from the ions present (docs/methods.md §3.1): TZ+ = Na + K +
//     2Ca + 2Mg + 2Sr + NH4 (+ H+ from pH when no alkalinity is given);
//     TZ− = Cl + 2SO4 + NO3 + F + Br + Alk, or HCO3 + 2CO3 without
//     alkalinity. Alkalinity is taken as HCO3− in charge terms; at a known
//     pH it is split into HCO3− and CO3²− with K2 of Plummer & Busenberg
//     (1982) for display, which leaves TZ− unchanged (see ChargeBalance).
//  2. NICB = 100 (TZ+ − TZ−)/TZ+ and CBE = 100 (TZ+ − TZ−)/(TZ+ + TZ−),
//     in percent. Both are reported; Options.Measure says which one the
//     thresholds apply to (NICB by default; CBE is about half of NICB).
//  3. Status from the thresholds (DefaultThresholds: |NICB| ≤ 5 % accepted,
//     5-10 % flagged, > 10 % rejected; common practice), which the user can
//     change. Dilute waters may get wider limits (Options.DiluteBelow and
//     Options.Dilute; common practice).
//  4. Missing major ions (Na, K, Ca, Mg, Cl, SO4, alkalinity): with any of
//     them missing there is no NICB or CBE (NaN) and the status is
//     Incomplete, "missing major ion(s): …" (Report.Flag), since sums over
//     part of the water say nothing about the analysis. Also the count of
//     censored values, whose substitutes (sample.Policy) enter the sums.
//  5. Outliers: for each species in Options.Ratios, the robust z-score
//     0.6745 (ln(X/Cl) − median)/MAD against all the samples given, flagged
//     beyond 3.5 (Iglewicz & Hoaglin 1993, from memory). Censored values
//     and fewer than Options.MinSamples samples are left out of the test.
//
// Findings are Report.Warnings, wrapping the Err* sentinels.
package qc
