// Package chem holds the chemical species Lixiv knows, their charges and
// molar masses, the concentration units laboratories report in, and exact
// conversions between them.
//
// # Units
//
// The internal unit of every concentration is µmol/L, except alkalinity
// (Alk), which is an equivalent quantity in µeq/L. A Composition holds one
// value per Species; NaN means not measured, never 0. Molar masses come from
// the IUPAC/CIAAW 2021 standard atomic weights (Prohaska et al. 2022, Pure
// Appl. Chem. 94, 573-600), conventional values for elements with an
// interval. ppm and ppb are taken as mg/L and µg/L, which holds for fresh
// water (density within 0.5 % of 1 kg/L from 0 to 30 °C; common practice).
//
// # Pipeline
//
// A header such as "NO3-N (mg/L)" becomes µmol/L in these steps:
//
//  1. ParseSpecies reads the name ("NO3-N", "Nitrate as N", "SO₄²⁻",
//     "Sulphate", "Ca2+", "Sodium, dissolved") and the mass basis it implies
//     ("N", "S", "Si", "CaCO3", "H4SiO4", or "" for the species itself).
//  2. ParseUnit reads the unit ("mg/L", "µg/L", "ppm", "mmol/L", "uM",
//     "µeq/L", "mg/L as CaCO3", "mg N/L", "mg/L SiO2"); µ, μ and u are all
//     micro. A basis in the unit, when given, takes precedence over the one
//     the name implies (the caller sets Unit.Basis from the name otherwise).
//  3. Factor gives the number that multiplies a value in that unit to give
//     µmol/L: mass units divide by the molar mass of the basis (the element
//     for "as N", 50.043 g/eq for alkalinity "as CaCO3"); amount units scale,
//     counting moles of the basis; equivalent units divide by the charge.
//     A unit that cannot apply (calcium "as N", silica in meq/L, a Unit
//     without a scale) gives ErrUnitMismatch or ErrUnknownUnit, never 0.
//  4. ToMicromolar and FromMicromolar apply the factor.
package chem
