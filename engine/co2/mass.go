package co2

import "lixiv/engine/chem"

// TonnesC converts an amount of CO2 in mol to tonnes of carbon (12.011 g
// per mol, IUPAC/CIAAW 2021 conventional atomic weight of C). Per-year and
// per-km² amounts convert the same way: mol/km²/yr to t C/km²/yr.
func TonnesC(mol float64) float64 { return mol * chem.MassC * 1e-6 }

// TonnesCO2 converts an amount of CO2 in mol to tonnes of CO2 (44.009 g
// per mol from the IUPAC/CIAAW 2021 atomic weights).
func TonnesCO2(mol float64) float64 { return mol * chem.MassCO2 * 1e-6 }
