package mineral

import "strings"

// symbols are the element symbols of the periodic table (IUPAC), 1 to 118.
var symbols = strings.Fields(`H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn
Ga Ge As Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho
Er Tm Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am Cm Bk Cf Es Fm Md No Lr Rf
Db Sg Bh Hs Mt Ds Rg Cn Nh Fl Mc Lv Ts Og`)

var isSymbol = func() map[string]bool {
	m := map[string]bool{}
	for _, s := range symbols {
		m[s] = true
	}
	return m
}()

// IsElement reports whether s is an element symbol.
func IsElement(s string) bool { return isSymbol[s] }

// oxidation is the usual oxidation state of each element the mass balance
// follows, used to check that a formula balances charge and to count the
// electrons (O2) of a weathering reaction: Fe and Mn as divalent, S as
// sulfate. A mineral whose atoms hold other states (S⁻ in pyrite) says so.
var oxidation = map[string]float64{
	"H": 1, "O": -2, "C": 4, "Na": 1, "K": 1, "Ca": 2, "Mg": 2, "Al": 3, "Si": 4, "S": 6, "Cl": -1,
	"Fe": 2, "Mn": 2, "Ti": 4,
}

// Followed lists the elements a mineral of the mass balance may hold:
// those that go into the water (Na, K, Ca, Mg, Cl; Si as silica, S as
// sulfate, C as bicarbonate), Al, which stays in the secondary clays, Fe,
// Mn and Ti, which stay in the solids as oxides, and H and O.
const Followed = "Na, K, Ca, Mg, Al, Si, C, S, Cl, Fe, Mn, Ti, H and O"
