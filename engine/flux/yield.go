package flux

import "lixiv/engine/chem"

// Part is the flux of one species, for weathering rates.
type Part struct {
	Species  chem.Species
	MolPerYr float64
}

// WeatheringRate returns a chemical weathering rate in t/km²/yr: the summed
// mass fluxes Σ mol/yr × M × 1e-6 of the parts over areaKm2. The silicate
// cation rate takes Na, K, Ca and Mg from silicate; adding SiO2 gives the
// cations-plus-silica rate; the carbonate rate takes Ca and Mg from
// carbonate (common practice).
func WeatheringRate(areaKm2 float64, parts ...Part) float64 {
	t := 0.0
	for _, p := range parts {
		t += p.MolPerYr * p.Species.MolarMass() * 1e-6
	}
	return t / areaKm2
}

// CarbonMass converts CO2 consumption in mol (per km² and year) to tonnes of
// carbon: × 12.011e-6 (docs/methods.md §8.5).
func CarbonMass(mol float64) float64 { return mol * chem.MassC * 1e-6 }

// CO2Mass converts CO2 consumption in mol to tonnes of CO2: × 44.009e-6
// (docs/methods.md §8.5).
func CO2Mass(mol float64) float64 { return mol * chem.MassCO2 * 1e-6 }
