package synth

import (
	"math"
	"math/rand/v2"

	"lixiv/engine/carbonate"
	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// WaterTruth invents what a field team measures beside the chemistry: the
// water temperature, and the pH that the sample's alkalinity gives at an
// invented pCO2 (Davies activities, the carbonate package's constants), so
// that the carbonate cell has a known pCO2 to recover.
type WaterTruth struct {
	TempMean, TempAmp float64 // °C: annual mean, and half the seasonal range (warmest in late July)
	AirPCO2           float64 // µatm
	// Excess is the stream's pCO2 over the air's at mean flow; it follows
	// discharge as (Q/Qmean)^ExcessSlope (soil CO2 flushed at high flow,
	// degassed at low flow) with 20 % log-normal noise.
	Excess, ExcessSlope float64
	NoPH, NoTemp        []int // samples (from 1) whose pH or temperature was not measured
}

// measure gives each sample its temperature and pH.
func (w *WaterTruth) measure(t *Truth, ss []Sample, meanQ float64) {
	r := rand.New(rand.NewPCG(t.Seed, 3)) // a stream of its own: the chemistry's noise is unchanged
	for i := range ss {
		s := &ss[i]
		s.Temp = w.TempMean + w.TempAmp*math.Cos(2*math.Pi*(s.Day.YearFraction()-0.56)) + 0.8*r.NormFloat64()
		s.Temp = math.Max(0.2, s.Temp)
		s.PCO2 = w.AirPCO2 * w.Excess * math.Pow(s.Q/meanQ, w.ExcessSlope) * math.Exp(0.2*r.NormFloat64()-0.02)
		// pH at that pCO2, with the activity coefficients of the ionic
		// strength it implies (two rounds settle it to well below the
		// 0.01 pH the table is written to).
		bg, _ := carbonate.Background(s.C)
		alk := s.C[chem.Alk] * 1e-6
		k := carbonate.At(s.Temp)
		I := bg + alk/2
		for it := 0; it < 3; it++ {
			ph, err := carbonate.PH(alk, s.PCO2*1e-6, k, carbonate.Davies.Gammas(I, s.Temp))
			if err != nil {
				panic(err) // the invented waters all have alkalinity above zero
			}
			res, err := carbonate.Analyse(carbonate.Water{TempC: s.Temp, PH: ph, Alk: alk, Ca: math.NaN(), Mg: math.NaN(), Background: bg}, carbonate.Davies)
			if err != nil {
				panic(err)
			}
			s.PH, I = ph, res.I
		}
	}
	for _, k := range w.NoPH {
		ss[k-1].PH = math.NaN()
	}
	for _, k := range w.NoTemp {
		ss[k-1].Temp = math.NaN()
	}
}

// blankNaN writes x to digits decimals, or "" when it is NaN.
func blankNaN(x float64, digits int) string {
	if math.IsNaN(x) {
		return ""
	}
	return g(x, digits)
}

// Greyhope is a fictional upland valley of granodiorite with limestone in
// its floor: 46 km², three water years of three-weekly samples with field
// pH and temperature. Its silicate water is made by plagioclase An30,
// K-feldspar and biotite weathering to kaolinite (the truth's silicate
// ratios are those minerals'), its carbonate water by a magnesian calcite
// of 15 mol % MgCO3, so the mineral cell has a known answer to find.
func Greyhope() *Truth {
	t := &Truth{Name: "Greyhope Beck", Code: "GB", Title: "Greyhope Beck weathering budget", AreaKm2: 46, P: 1150, ET: 460,
		Start: discharge.Date(2021, 10, 1), Days: 1095, SampleEvery: 21, Seed: 37, BaseQ: 0.9, Storminess: 3,
		Cl: 210, NaSil: 90, CaNaSil: 0.3 / 0.7, MgNaSil: 0.12, KNaSil: 0.15, CaCarb: 900, MgCarb: 900 * 0.15 / 0.85,
		Slope: -0.15, Noise: 0.03,
		Water: &WaterTruth{TempMean: 9, TempAmp: 5, AirPCO2: 420, Excess: 2.2, ExcessSlope: 0.45, NoPH: []int{9}, NoTemp: []int{31}}}
	m := GreyhopeMinerals(t, 1, 0)
	t.SiPerNa = 1.4*m["plagioclase An30"] + 2*m["K-feldspar"] + 2*m["biotite"] // SiO2 the three release per silicate Na
	return t
}

// GreyhopeMinerals returns the moles per litre of each mineral the truth
// weathers at the given silicate Na and carbonate Ca (µmol/L): plagioclase
// An30 gives the silicate Na and its Ca (Ca/Na 0.3/0.7), biotite
// (KMg3AlSi3O10(OH)2) the silicate Mg, K-feldspar the rest of the
// silicate K and the magnesian calcite Ca0.85Mg0.15CO3 the carbonate Ca
// and Mg; kaolinite takes their Al. Net of the kaolinite, the silicates
// release 1.4, 2 and 2 SiO2 per mole.
func GreyhopeMinerals(t *Truth, naSil, caCarb float64) map[string]float64 {
	plag := naSil / 0.7
	bio := t.MgNaSil * naSil / 3
	ksp := t.KNaSil*naSil - bio
	return map[string]float64{"plagioclase An30": plag, "biotite": bio, "K-feldspar": ksp, MagnesianCalcite: caCarb / 0.85,
		"kaolinite": -(1.3*plag + bio + ksp) / 2}
}

// GreyhopeYields returns the truth's mean annual yield (mol/km²/yr) of each
// mineral of GreyhopeMinerals over the days of its record before end: the
// minerals weathered day by day at the day's discharge.
func GreyhopeYields(t *Truth, end discharge.Day) map[string]float64 {
	q := t.Discharge()
	mean := 0.0
	for _, x := range q {
		mean += x
	}
	mean /= float64(len(q))
	sum := map[string]float64{}
	days := 0
	for i, x := range q {
		if t.Start+discharge.Day(i) >= end {
			break
		}
		days++
		dil := math.Pow(x/mean, t.Slope)
		for k, v := range GreyhopeMinerals(t, t.NaSil*dil, t.CaCarb*dil) {
			sum[k] += v * x * 86.4 // mol/day: µmol/L × m³/s × 86.4
		}
	}
	for k := range sum {
		sum[k] = sum[k] / t.AreaKm2 / float64(days) * 365.25
	}
	return sum
}

// MagnesianCalcite names the typed mineral of the Greyhope balance.
const MagnesianCalcite = "magnesian calcite"

// greyhopeBudget is the Greyhope example: the usual budget with a
// carbonate cell below the discharge and a mineral balance at the end.
func greyhopeBudget() (*notebook.Document, error) {
	d, err := Greyhope().Budget("granite", "inverse", 2000, 500,
		"Greyhope Beck is a fictional upland valley of granodiorite with limestone in its floor. The samples, their field pH and temperature, and the discharge are invented from a known truth (examples/synth), not measured.",
		"The carbonate cell speciates each sample and flags calcite supersaturation at low flow; the mineral cell balances the rain-corrected water against plagioclase, K-feldspar, biotite and a magnesian calcite (a formula typed in the cell) weathering to kaolinite.")
	if err != nil {
		return nil, err
	}
	// Two tracers for two end-members, as in Corrie Vale.
	if err := d.SetParam("apportionment", "tracers", "Ca/Na, Mg/Na"); err != nil {
		return nil, err
	}
	c := notebook.NewCell(notebook.KindCarbonate, "carbonate", "Carbonate system and calcite saturation")
	at := 0
	for i, x := range d.Cells {
		if x.ID == "discharge" {
			at = i + 1
		}
	}
	if err := d.Insert(c, at); err != nil {
		return nil, err
	}
	m := notebook.NewCell(notebook.KindMinerals, "minerals", "Which minerals weathered")
	ms := m.Settings.(*notebook.MineralSettings)
	ms.Primary = []string{"plagioclase An30", "K-feldspar", "biotite", MagnesianCalcite + " = Ca0.85Mg0.15CO3"}
	return d, d.Insert(m, -1)
}
