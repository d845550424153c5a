package mineral_test

import (
	"fmt"

	"lixiv/engine/mineral"
)

// A granite stream's water (µmol/L) balanced against plagioclase,
// K-feldspar, biotite and calcite weathering to kaolinite.
func ExampleBalance_Solve() {
	var phases []mineral.Phase
	for _, name := range []string{"plagioclase An30", "K-feldspar", "biotite", "calcite", "kaolinite"} {
		m, _, err := mineral.Lookup(name)
		if err != nil {
			fmt.Println(err)
			return
		}
		phases = append(phases, mineral.Phase{Mineral: m, Secondary: name == "kaolinite"})
	}
	b, err := mineral.NewBalance(phases)
	if err != nil {
		fmt.Println(err)
		return
	}
	water := [mineral.NWater]float64{mineral.Na: 70, mineral.K: 12, mineral.Ca: 55, mineral.Mg: 9,
		mineral.HCO3: 210, mineral.SiO2: 164}
	s := b.Solve(water)
	fmt.Println(s.Fit)
	for j, p := range b.Phases {
		fmt.Printf("%-16s %7.2f µmol/L, CO2 %6.2f µmol/L\n", p.Key, s.Amount[j], s.CO2[j])
	}
	fmt.Printf("SiO2 left %.2f µmol/L\n", s.Residual[mineral.SiO2])
	// Output:
	// least squares
	// plagioclase An30  100.00 µmol/L, CO2 130.00 µmol/L
	// K-feldspar          9.00 µmol/L, CO2   9.00 µmol/L
	// biotite             3.00 µmol/L, CO2  21.00 µmol/L
	// calcite            25.00 µmol/L, CO2  25.00 µmol/L
	// kaolinite         -71.00 µmol/L, CO2   0.00 µmol/L
	// SiO2 left 0.00 µmol/L
}

// The balanced carbonic-acid reaction of a typed plagioclase formula.
func ExampleMineral_Reaction() {
	m, _, err := mineral.Lookup("Na0.62Ca0.38Al1.38Si2.62O8")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(m.Reaction())
	fmt.Println("CO2 per mole:", mineral.Number(m.CO2PerMole()))
	// Output:
	// Na0.62Ca0.38Al1.38Si2.62O8 + 1.38 CO2 + 4.55 H2O → 0.62 Na⁺ + 0.38 Ca²⁺ + 1.38 HCO3⁻ + 1.24 H4SiO4 + 0.69 Al2Si2O5(OH)4
	// CO2 per mole: 1.38
}

func ExampleParse() {
	f, err := mineral.Parse("CaSO4·2H2O")
	fmt.Println(f, err)
	_, err = mineral.Parse("CaMg(CO3")
	fmt.Println(err)
	// Output:
	// CaSO6H4 <nil>
	// formula "CaMg(CO3", position 5: "(" is never closed
}
