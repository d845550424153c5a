// Package co2 computes the CO2 consumed by chemical weathering of one water
// sample from its source apportionment (mix.Split) and its sulfide-derived
// sulfate, and converts amounts of CO2 to tonnes of carbon and of CO2.
//
// Concentrations are µmol/L of CO2 (the same arithmetic holds for mol/yr or
// mol/km²/yr once fluxes exist). For one sample, Consumption:
//
//  1. splits SO4_sulf between silicate and carbonate weathering, in
//     proportion to the cation equivalents each delivered (default) or all
//     to carbonate (docs/methods.md §9.3);
//  2. forms the alkalinity each produced, Alk_sil = (Na+K+2Ca+2Mg)_sil −
//     2 S_sil and Alk_carb = 2(Ca+Mg)_carb − 2 S_carb;
//  3. gives the short-term consumption phi_sil = Alk_sil and phi_carb =
//     (Ca+Mg)_carb − 2 S_carb, which with no sulfuric acid are the standard
//     Na_sil + K_sil + 2(Ca_sil + Mg_sil) and Ca_carb + Mg_carb (§9.2);
//  4. gives the geological figures: the alkalinity-based net_long =
//     phi_total − (Alk_sil + Alk_carb)/2, split into its silicate part
//     Alk_sil/2 and its carbonate part −S_carb, and the conventional
//     silicate sink (Ca+Mg)_sil, less the Ca+Mg share of S_sil when there
//     is sulfuric acid (Result.SinkSil).
//
// OverDraws repeats this on every draw of the forward Monte Carlo
// (mix.ForwardResult.Draws) and returns 2.5, 50 and 97.5 % quantiles.
// TonnesC and TonnesCO2 convert mol (or mol/km²/yr) to tonnes.
//
// CO2 consumption is a geochemical budget, not a carbon-removal credit
// (docs/methods.md §12).
package co2
