package correct

import "lixiv/engine/chem"

// Ratios are molar ratios X/Cl of an atmospheric input, indexed by species.
// An entry of zero means the species gets no atmospheric correction; the
// Cl entry is ignored.
type Ratios [chem.NSpecies]float64

// Species corrected for atmospheric input (docs/methods.md §4.1).
var corrected = [...]chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.SO4, chem.Sr, chem.Br}

// Corrected returns the species that receive an atmospheric correction:
// Na, K, Ca, Mg, SO4, Sr and Br.
func Corrected() []chem.Species {
	out := make([]chem.Species, len(corrected))
	copy(out, corrected[:])
	return out
}

// SeawaterMolality is the Reference Composition of seawater at practical
// salinity 35 in mol per kg of H2O (Millero, Feistel, Wright & McDougall
// 2008, Deep-Sea Research I 55, 50-72, table of the reference composition;
// as reproduced in the docs/methods.md §4.2). Species not in the table are 0.
// SeaSalt derives the default ratios from it. Treat it as read-only: a
// budget changes its ratios through Options.Ratios (starting from SeaSalt()),
// so that the change is saved with the budget and reruns alike.
var SeawaterMolality = [chem.NSpecies]float64{
	chem.Na:   0.4860597,
	chem.Mg:   0.0547421,
	chem.Ca:   0.0106568,
	chem.K:    0.0105797,
	chem.Sr:   0.0000940,
	chem.Cl:   0.5657647,
	chem.SO4:  0.0292643,
	chem.HCO3: 0.0017803,
	chem.Br:   0.0008728,
	chem.F:    0.0000708,
	chem.CO3:  0.0002477,
}

// SeaSalt returns the sea-salt ratios X/Cl of the species in Corrected,
// computed from SeawaterMolality (Millero et al. 2008), for example Na/Cl
// 0.859120 and Mg/Cl 0.0967577.
func SeaSalt() Ratios {
	var r Ratios
	cl := SeawaterMolality[chem.Cl]
	for _, s := range corrected {
		r[s] = SeawaterMolality[s] / cl
	}
	r[chem.Cl] = 1
	return r
}
