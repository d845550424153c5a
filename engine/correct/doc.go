// Package correct removes the atmospheric (rain) and evaporite (halite,
// gypsum) contributions from the chemistry of one water sample, and records
// what each step removed.
//
// All concentrations are µmol/L (alkalinity µeq/L), as in chem.Composition.
// For one sample, Apply runs these steps (docs/methods.md §4 and §5):
//
//  1. Critical chloride Cl*: Options.ClCritical if set; otherwise, with
//     measured rain, Cl* = Cl_rain × F × f_dry with F = P/(P−ET) = P/R;
//     otherwise Cl* = +Inf (all Cl atmospheric), with a warning.
//  2. Atmospheric input: Cl_atm = min(Cl, Cl*) and X_atm = Cl_atm × (X/Cl)
//     for X in Na, K, Ca, Mg, SO4, Sr, Br. The ratios are those of the
//     measured rain if given, otherwise sea salt (SeaSalt, Millero et al.
//     2008), or any Ratios the user supplies.
//  3. Excess chloride Cl − Cl_atm: halite (Na_evap = Cl_excess, the default)
//     or human input (removed with its Na equivalent, and flagged).
//  4. Sulfate SO4* = SO4 − SO4_atm: from gypsum/anhydrite (Ca_evap = SO4*,
//     the default), from sulfide oxidation (SO4_sulf = SO4*), or split by
//     δ34S two-end-member mixing. Bracket runs the two end scenarios.
//  5. Residual X* = X − X_atm − X_evap − X_human for every species. Any
//     negative residual is reported (species and amount) and handled by
//     the explicit Options.Negative policy; nothing is clipped silently.
//     (A residual below zero by no more than 1e-9 of the measured value is
//     rounding, as an exact sea-salt sample gives, and is set to 0.)
//
// Result keeps the input, the removed parts (Atm, Evap, Human), the
// residual, SO4_sulf and the warnings, so that the forward model
// (mix.Forward) and the CO2 accounting (package co2) can use them.
package correct
