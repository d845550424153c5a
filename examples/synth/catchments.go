package synth

import (
	"context"
	"fmt"

	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// CorrieVale is a fictional granite upland burn: 12 km², wet and near the
// sea, fortnightly samples over three water years, water dominated by sea
// salt and silicate weathering with a trace of calcite in the granite.
func CorrieVale() *Truth {
	return &Truth{Name: "Corrie Vale", Code: "CV", Title: "Corrie Vale weathering budget", AreaKm2: 12.1, P: 1850, ET: 420,
		Start: discharge.Date(2020, 10, 1), Days: 1095, SampleEvery: 14, Seed: 11, BaseQ: 0.40, Storminess: 4,
		Cl: 150, NaSil: 55, CaNaSil: 0.30, MgNaSil: 0.20, KNaSil: 0.12, CaCarb: 12, MgCarb: 2, NO3: 6,
		SiPerNa: 2.2, Slope: -0.2, Noise: 0.03}
}

// MarlowFen is a fictional lowland river on limestone and shale: 180 km²,
// drier, monthly samples over four water years, water dominated by
// carbonate weathering with gypsum and pyrite sulfate and some silicate.
func MarlowFen() *Truth {
	return &Truth{Name: "Marlow Fen", Code: "MF", Title: "Marlow Fen weathering budget", AreaKm2: 180, P: 720, ET: 470,
		Start: discharge.Date(2019, 10, 1), Days: 1461, SampleEvery: 28, Seed: 23, BaseQ: 1.2, Storminess: 2,
		Cl: 450, NaSil: 120, CaNaSil: 0.35, MgNaSil: 0.24, KNaSil: 0.15, CaCarb: 1400, MgCarb: 260,
		Gypsum: 180, Pyrite: 90, NO3: 250, SiPerNa: 1.8, Slope: -0.12, Noise: 0.03}
}

// ScarrowGhyll is a fictional upland valley of 38 km² cut through
// granite into a band of limestone: weekly samples over two water years,
// silicate water from the hillslopes and carbonate water from deeper flow
// paths that dilute faster in storms, so the samples spread along the
// mixing line between the two.
func ScarrowGhyll() *Truth {
	return &Truth{Name: "Scarrow Ghyll", Code: "SG", Title: "Scarrow Ghyll weathering budget", AreaKm2: 38, P: 1400, ET: 450,
		Start: discharge.Date(2021, 10, 1), Days: 730, SampleEvery: 7, Seed: 37, BaseQ: 0.9, Storminess: 3,
		Cl: 120, NaSil: 70, CaNaSil: 0.32, MgNaSil: 0.22, KNaSil: 0.13, CaCarb: 40, MgCarb: 8, CaNaCarb: 60,
		SiPerNa: 2.0, Slope: -0.12, CarbSlope: -1.1, Noise: 0.03}
}

// Example names the example budgets and how each is built.
type Example struct {
	File  string // path from the repository root
	Build func() (*notebook.Document, error)
}

// Examples lists the example budgets.
var Examples = []Example{
	{"examples/corrie-vale/corrie-vale.lixiv.json", func() (*notebook.Document, error) {
		d, err := CorrieVale().Budget("granite", "inverse", 1000, 500,
			"Corrie Vale is a fictional granite upland burn of 12 km². The samples and discharge are invented from a known truth (examples/synth), not measured.",
			"So that the demo opens quickly, its apportionment keeps 400 effective draws per sample (target ESS) where a new budget keeps 1,000; raise it for a budget you will report.")
		if err != nil {
			return nil, err
		}
		// 400 effective draws give each sample's 95 % interval ends to a
		// few per cent of its width (common practice: ESS ≥ 400 for
		// quantile summaries), at 2.5 times less work than the default.
		d.Cell("apportionment").Settings.(*notebook.ApportionmentSettings).TargetESS = 400
		// The default tracers, Ca/Na, Mg/Na and HCO3/Na: with Na, four
		// data for two end-members, so the misfit test has something to
		// say (docs/methods.md §7.9), and HCO3/Na tells the little calcite
		// of the granite from a granite richer in Ca.
		c := notebook.NewCell(notebook.KindChart, "chart", "Silicate CO2 consumption per litre through the seasons")
		s := c.Settings.(*notebook.ChartSettings)
		s.X, s.Y = "co2.per-litre.date", "co2.per-litre.silicate"
		return d, d.Insert(c, -1)
	}},
	{"examples/marlow-fen/marlow-fen.lixiv.json", func() (*notebook.Document, error) {
		return MarlowFen().Budget("global", "forward", 2000, 500,
			"Marlow Fen is a fictional lowland river on limestone and shale with gypsum and pyrite. The data are invented (examples/synth), not measured.",
			"Sulfate here comes from both gypsum and pyrite. The budget takes it all as gypsum; the CO2 cell shows beside it the other end of the bracket, all from sulfide oxidation.")
	}},
	{"examples/greyhope-beck/greyhope-beck.lixiv.json", greyhopeBudget},
	{"examples/lintmoor-whinlaw/lintmoor-whinlaw.lixiv.json", pairedBudget},
	{"examples/scarrow-ghyll/scarrow-ghyll.lixiv.json", func() (*notebook.Document, error) {
		return ScarrowGhyll().Budget("global", "catchment", 400, 500,
			"Scarrow Ghyll is a fictional upland valley of granite and limestone. The samples and discharge are invented from a known truth (examples/synth), not measured.",
			"The apportionment uses the catchment-wide model: the silicate and carbonate ratios are learned once from all 104 samples together, and the fluxes take its joint draws.")
	}},
}

// Computed builds an example, computes it and keeps its results snapshot,
// as the file in examples/ holds it.
func Computed(ctx context.Context, ex Example) (*notebook.Document, error) {
	d, err := ex.Build()
	if err != nil {
		return nil, err
	}
	if err := d.Recompute(ctx, nil); err != nil {
		return nil, err
	}
	for _, c := range d.Cells {
		if st, err := d.Status(c.ID); st != notebook.UpToDate {
			return nil, fmt.Errorf("cell %s: %v: %v", c.ID, st, err)
		}
	}
	return d, d.Keep()
}

// DoubtfulDemo returns the demo budget (the first example) with its fluxes
// made doubtful, for tests of the doubtful state: a limit of 1 % on the
// flow its samples do not bracket, which the 1.6 % of flow before its first
// sample exceeds. It is not computed.
func DoubtfulDemo() (*notebook.Document, error) {
	d, err := Examples[0].Build()
	if err != nil {
		return nil, err
	}
	return d, d.SetParam("fluxes", "doubtful_above_percent", "1")
}
