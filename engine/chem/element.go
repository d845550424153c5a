package chem

// Standard atomic weights in g/mol, IUPAC/CIAAW 2021 (Prohaska et al. 2022,
// Pure Appl. Chem. 94, 573-600). Elements whose standard atomic weight is an
// interval use the CIAAW conventional value.
var atomicWeight = map[string]float64{
	"H":  1.008,
	"C":  12.011,
	"N":  14.007,
	"O":  15.999,
	"F":  18.998403162,
	"Na": 22.98976928,
	"Mg": 24.305,
	"Si": 28.085,
	"P":  30.973761998,
	"S":  32.06,
	"Cl": 35.45,
	"K":  39.0983,
	"Ca": 40.078,
	"Br": 79.904,
	"Sr": 87.62,
}

// AtomicWeight returns the standard atomic weight of an element in g/mol
// (IUPAC/CIAAW 2021) and whether the element is known.
func AtomicWeight(symbol string) (float64, bool) {
	w, ok := atomicWeight[symbol]
	return w, ok
}

// formula is a chemical formula as element counts, in a fixed order so that
// sums are computed in the same order on every platform.
type formula []term

type term struct {
	el string
	n  float64
}

// mass returns the molar mass of the formula in g/mol.
func (f formula) mass() float64 {
	m := 0.0
	for _, t := range f {
		w, ok := atomicWeight[t.el]
		if !ok {
			panic("chem: unknown element " + t.el)
		}
		m += t.n * w
	}
	return m
}

// Molar masses of neutral compounds used in conversions and reports (g/mol).
var (
	// MassCaCO3 is the molar mass of calcium carbonate.
	MassCaCO3 = formula{{"Ca", 1}, {"C", 1}, {"O", 3}}.mass()
	// MassCO2 is the molar mass of carbon dioxide.
	MassCO2 = formula{{"C", 1}, {"O", 2}}.mass()
	// MassC is the atomic weight of carbon.
	MassC = atomicWeight["C"]
)

// EqMassCaCO3 is the equivalent mass of CaCO3 (M/2, g/eq), the basis of
// alkalinity reported "as CaCO3".
var EqMassCaCO3 = MassCaCO3 / 2
