// Package carbonate is the carbonate system of a stream water: the
// temperature-dependent equilibrium constants, activity coefficients, the
// speciation of dissolved inorganic carbon from alkalinity, pH and
// temperature, the partial pressure of CO2 the water would be in
// equilibrium with, and the saturation indices of calcite, aragonite and
// dolomite (docs/methods.md §10).
//
// Everything here is a pure function of its arguments. Concentrations are
// in mol/L (taken equal to mol/kg in fresh water), temperatures in °C,
// pressures in atm. A notebook cell (engine/notebook) turns µmol/L into
// mol/L on the way in and back on the way out.
//
// # Constants
//
// At(t) gives log K1, log K2, log KH, log Kcal and log Karg from the
// equations of Plummer & Busenberg (1982), valid 0–90 °C at 1 atm, log Kw
// from the fit quoted by Stumm & Morgan (1996), and log Kdol from the 25 °C
// value and reaction enthalpy of ordered dolomite (Nordstrom et al. 1990)
// with the van 't Hoff equation. Sources and check values are in
// constants.go and its tests.
//
// # Activities
//
// Model chooses the activity coefficients: Ideal (γ = 1), Davies (Davies
// 1962; valid to I ≈ 0.5 mol/L) or ExtendedDH (extended Debye–Hückel with
// Kielland's ion sizes; valid to I ≈ 0.1 mol/L). Validity returns the upper
// ionic strength of a model; Analyse warns when a water exceeds it.
//
// # Speciation
//
// Speciate splits alkalinity into HCO3⁻, CO3²⁻ and H2CO3* at a given pH
// and activity coefficients; PH inverts it for a given pCO2. Analyse does
// the whole calculation for one Water: ionic strength from the major ions,
// iterated with the carbonate species it implies, activities, species,
// pCO2 and saturation indices. Ion pairs (CaHCO3⁺, CaCO3°, MgSO4°, …) are
// neglected, as is common practice for fresh water; that raises the
// saturation indices of hard waters by a few hundredths to about 0.1.
// Alkalinity is taken as carbonate alkalinity plus OH⁻ − H⁺ (organic and
// borate alkalinity neglected; common practice).
package carbonate
