// Package mineral is the inverse mass balance of weathering: which minerals
// dissolved, and which formed, to give a stream water its composition, and
// the CO2 each consumed (docs/methods.md §9.1 and §16; Garrels & Mackenzie
// 1967, "Origin of the chemical compositions of some springs and lakes",
// Adv. Chem. Ser. 67).
//
// # Minerals
//
// Catalogue is a table of built-in minerals, each with its formula, a name
// and the source of the formula; Lookup finds one by name, makes
// plagioclase of any composition ("plagioclase An38"), or reads a formula
// the user typed with Parse, our own formula syntax (fractional counts,
// brackets, water of hydration after "·": Na0.62Ca0.38Al1.38Si2.62O8,
// CaMg(CO3)2, CaSO4·2H2O). Parse names the position of anything it cannot
// read. Every built-in formula balances charge with the oxidation states of
// its atoms (a test checks it).
//
// # Reactions
//
// A mineral weathers with carbonic acid (Mineral.Reaction): its Na, K, Ca,
// Mg and Cl go to the water, its S as sulfate, the charge they carry is
// balanced by bicarbonate, its Si goes to silica, its Al to a clay, its
// Fe, Mn and Ti to oxides. Column gives the water components one mole
// releases, CO2PerMole the CO2 it consumes (the bicarbonate less the
// mineral's own carbon; below zero for pyrite, whose acid releases CO2).
// Each reaction balances atoms and charge (tested for every built-in).
//
// # Balance
//
// NewBalance takes primary phases, which only dissolve, and secondary
// phases, which may form; Al, which the water does not carry, is
// conserved in the secondary phases exactly. Balance.Solve turns one
// water (Na, K, Ca, Mg, Cl, SO4, HCO3, SiO2) into moles of each phase:
// exactly when the phases match the components one for one (square), by
// non-negative least squares when there are more components than phases
// (over-determined), with residuals; it says so in plain words when the
// phases are more than the components can tell apart (under-determined)
// or when a primary phase would have to form to fit the water. Because
// every phase's bicarbonate follows from its charge, HCO3 is never
// independent of the cations: it checks that the water's charge is
// carried by bicarbonate (NO3 and organic anions break that).
package mineral
