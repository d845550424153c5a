// Package synth writes budgets of fictional catchments from a known,
// invented truth: a daily discharge record and water samples mixed from
// sea salt, silicate, carbonate and evaporite sources. The example budgets
// in examples/ and the batch benchmark are made with it. Nothing here is
// measured data.
package synth

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strconv"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/notebook"
)

// Truth describes a fictional catchment and how its water is made.
type Truth struct {
	Name, Title      string
	Code             string // prefix of the sample ids, such as "CV"
	AreaKm2          float64
	P, ET            float64 // mm/yr
	Start            discharge.Day
	Days             int     // length of the daily record
	SampleEvery      int     // days between samples
	NSamples         int     // when above 0, this many samples spread evenly over the record instead
	Seed             uint64  // seed of the invented noise
	BaseQ            float64 // m³/s, mean flow before storms
	Storminess       float64 // mean storm peaks per 30 days
	Cl               float64 // µmol/L sea-salt Cl at mean flow
	NaSil            float64 // µmol/L silicate Na at mean flow
	CaNaSil, MgNaSil float64 // silicate ratios of the truth
	KNaSil           float64
	CaCarb, MgCarb   float64 // µmol/L carbonate Ca and Mg at mean flow
	CaNaCarb         float64 // Ca/Na of the carbonate rock (0: the carbonate brings no Na)
	Gypsum           float64 // µmol/L Ca and SO4 from gypsum
	Pyrite           float64 // µmol/L SO4 from sulfide oxidation, buffered by carbonate
	NO3              float64 // µmol/L
	SiPerNa          float64 // SiO2 per silicate Na
	Slope            float64 // log C − log Q slope of the rock-derived solutes (dilution < 0)
	CarbSlope        float64 // the carbonate's own slope, when not 0 (carbonate from deeper flow paths dilutes faster)
	Noise            float64 // relative analytical noise (1σ)
	// Water, when set, gives each sample a temperature and a pH (from its
	// alkalinity and an invented pCO2); nil leaves both unmeasured.
	Water *WaterTruth
}

// Seawater X/Cl molar ratios (Millero et al. 2008 reference composition,
// as in the docs/methods.md §4.2).
var seaPerCl = map[chem.Species]float64{chem.Na: 0.859120, chem.K: 0.0186998, chem.Ca: 0.0188361,
	chem.Mg: 0.0967577, chem.SO4: 0.0517252}

// Discharge returns the invented daily record: a seasonal baseflow with
// storm peaks that recede exponentially.
func (t *Truth) Discharge() []float64 {
	r := rand.New(rand.NewPCG(t.Seed, 1))
	q := make([]float64, t.Days)
	storm := 0.0
	for i := range q {
		frac := t.Start + discharge.Day(i)
		season := 1 + 0.45*math.Cos(2*math.Pi*(frac.YearFraction()-0.05)) // wetter in winter
		if r.Float64() < t.Storminess/30 {
			storm += t.BaseQ * (1 + 6*r.ExpFloat64())
		}
		storm *= 0.6
		q[i] = t.BaseQ*season*(0.85+0.3*r.Float64()) + storm
	}
	// Scale the record so that its runoff is P − ET.
	sum := 0.0
	for _, x := range q {
		sum += x
	}
	f := (t.P - t.ET) / discharge.RunoffMM(sum, t.AreaKm2) * float64(t.Days) / 365.25
	for i := range q {
		q[i] *= f
	}
	return q
}

// Sample is one invented water sample in µmol/L (Alk µeq/L).
type Sample struct {
	ID       string
	Day      discharge.Day
	Q        float64
	C        chem.Composition
	PH, Temp float64 // NaN when not measured
	PCO2     float64 // the invented pCO2 behind the pH, µatm (NaN without one)
}

// Samples mixes the samples on every SampleEvery-th day of q.
func (t *Truth) Samples(q []float64) []Sample {
	r := rand.New(rand.NewPCG(t.Seed, 2))
	mean := 0.0
	for _, x := range q {
		mean += x
	}
	mean /= float64(len(q))
	var out []Sample
	days := []int{}
	for i := 3; i < len(q); i += t.SampleEvery {
		days = append(days, i)
	}
	if t.NSamples > 0 {
		days = days[:0]
		for k := 0; k < t.NSamples; k++ {
			days = append(days, 2+k*(len(q)-4)/t.NSamples)
		}
	}
	for _, i := range days {
		f := q[i] / mean
		dil := math.Pow(f, t.Slope)
		c := chem.NewComposition()
		cl := t.Cl * math.Pow(f, -0.1)
		naSil := t.NaSil * dil
		dilCarb := dil
		if t.CarbSlope != 0 {
			dilCarb = math.Pow(f, t.CarbSlope)
		}
		ca, mg := t.CaCarb*dilCarb, t.MgCarb*dilCarb
		c[chem.Cl] = cl
		c[chem.Na] = cl*seaPerCl[chem.Na] + naSil
		if t.CaNaCarb > 0 {
			c[chem.Na] += ca / t.CaNaCarb
		}
		c[chem.K] = cl*seaPerCl[chem.K] + naSil*t.KNaSil
		no3 := t.NO3 * (0.5 + r.Float64())
		// Sulfuric acid from pyrite and nitric acid from nitrification are
		// buffered by calcite: 2 CaCO3 + H2SO4 -> 2 Ca + 2 HCO3 + SO4 and
		// CaCO3 + HNO3 -> Ca + HCO3 + NO3 (docs/methods.md §9.1).
		c[chem.Ca] = cl*seaPerCl[chem.Ca] + naSil*t.CaNaSil + ca + t.Gypsum*dil + 2*t.Pyrite*dil + no3
		c[chem.Mg] = cl*seaPerCl[chem.Mg] + naSil*t.MgNaSil + mg
		c[chem.SO4] = cl*seaPerCl[chem.SO4] + t.Gypsum*dil + t.Pyrite*dil
		c[chem.NO3] = no3
		// Alkalinity: silicate cations by carbonic acid (one per charge),
		// carbonate by carbonic acid (2 per Ca or Mg), and the buffered acids.
		c[chem.Alk] = naSil*(1+t.KNaSil+2*t.CaNaSil+2*t.MgNaSil) + 2*(ca+mg) + 2*t.Pyrite*dil + no3
		c[chem.SiO2] = naSil * t.SiPerNa
		for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4, chem.NO3, chem.Alk, chem.SiO2} {
			c[sp] *= math.Exp(t.Noise*r.NormFloat64() - t.Noise*t.Noise/2)
		}
		out = append(out, Sample{ID: fmt.Sprintf("%s-%03d", t.Code, len(out)+1), Day: t.Start + discharge.Day(i), Q: q[i], C: c,
			PH: math.NaN(), Temp: math.NaN(), PCO2: math.NaN()})
	}
	if t.Water != nil {
		t.Water.measure(t, out, mean)
	}
	return out
}

func g(x float64, digits int) string { return strconv.FormatFloat(x, 'f', digits, 64) }

// mgL converts µmol/L of sp to mg/L.
func mgL(sp chem.Species, umol float64) float64 { return umol * sp.MolarMass() / 1000 }

// SampleTable writes samples as a laboratory would: mg/L for the ions and
// silica, µeq/L for alkalinity, nitrate below 0.05 mg/L reported as "<0.05".
func SampleTable(ss []Sample) *notebook.Table {
	t := &notebook.Table{
		Columns: []string{"sample", "date", "Na", "K", "Ca", "Mg", "Cl", "SO4", "NO3", "Alk", "SiO2"},
		Units:   []string{"", "", "mg/L", "mg/L", "mg/L", "mg/L", "mg/L", "mg/L", "mg/L", "µeq/L", "mg/L"},
	}
	water := len(ss) > 0 && !math.IsNaN(ss[0].Temp)
	if water {
		t.Columns = append(t.Columns, "pH", "temperature")
		t.Units = append(t.Units, "", "°C")
	}
	for _, s := range ss {
		row := []string{s.ID, s.Day.String()}
		for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.SO4} {
			row = append(row, g(mgL(sp, s.C[sp]), 3))
		}
		if no3 := mgL(chem.NO3, s.C[chem.NO3]); no3 < 0.05 {
			row = append(row, "<0.05")
		} else {
			row = append(row, g(no3, 3))
		}
		row = append(row, g(s.C[chem.Alk], 1), g(mgL(chem.SiO2, s.C[chem.SiO2]), 3))
		if water {
			row = append(row, blankNaN(s.PH, 2), blankNaN(s.Temp, 1))
		}
		t.Rows = append(t.Rows, row)
	}
	return t
}

// DischargeTable writes the daily record in m³/s.
func DischargeTable(first discharge.Day, q []float64) *notebook.Table {
	t := &notebook.Table{Columns: []string{"date", "discharge"}, Units: []string{"", "m3/s"}}
	for i, x := range q {
		t.Rows = append(t.Rows, []string{(first + discharge.Day(i)).String(), g(x, 4)})
	}
	return t
}

// Budget returns a complete budget of the catchment: site, samples,
// discharge, atmosphere, sources (the preset named), apportionment (model,
// draws), fluxes (bootstrap), CO2, and the notes given.
func (t *Truth) Budget(preset, model string, draws, bootstrap int, notes ...string) (*notebook.Document, error) {
	q := t.Discharge()
	ss := t.Samples(q)
	d := notebook.New(t.Title)
	add := func(k notebook.Kind, id, title string) *notebook.Cell {
		c := notebook.NewCell(k, id, title)
		if err := d.Insert(c, -1); err != nil {
			panic(err) // ids are fixed above; a clash is a programming error
		}
		return c
	}
	for i, n := range notes {
		add(notebook.KindNote, fmt.Sprintf("note-%d", i+1), "").Settings.(*notebook.NoteSettings).Text = n
	}
	site := add(notebook.KindSite, "site", t.Name+" above the gauge").Settings.(*notebook.SiteSettings)
	site.Name, site.AreaKm2, site.Precipitation, site.Evapotranspiration = t.Name, t.AreaKm2, t.P, t.ET
	add(notebook.KindSamples, "samples", "Stream samples").Table = SampleTable(ss)
	add(notebook.KindDischarge, "discharge", "Daily discharge at the gauge").Table = DischargeTable(t.Start, q)
	add(notebook.KindAtmosphere, "rain", "Sea-salt correction")
	src := add(notebook.KindSources, "sources", "End-members")
	tab, err := notebook.SourcesTable(preset)
	if err != nil {
		return nil, err
	}
	src.Table = tab
	src.Settings.(*notebook.SourcesSettings).Preset = preset
	app := add(notebook.KindApportionment, "apportionment", "Sources of the cations").Settings.(*notebook.ApportionmentSettings)
	app.Model, app.Draws = model, draws
	fl := add(notebook.KindFluxes, "fluxes", "Annual fluxes").Settings.(*notebook.FluxSettings)
	fl.Bootstrap = bootstrap
	add(notebook.KindCO2, "co2", "CO2 consumption")
	return d, nil
}

// TrueSilicateCO2 returns the mean annual short-term CO2 consumption by
// silicate weathering (mol/km²/yr) that the truth implies over the record
// q: every day's noise-free silicate alkalinity Na_sil (1 + K/Na + 2 Ca/Na
// + 2 Mg/Na) at that day's discharge, times the discharge (docs/methods.md
// §8.5 and §9.2).
func (t *Truth) TrueSilicateCO2(q []float64) float64 {
	mean := 0.0
	for _, x := range q {
		mean += x
	}
	mean /= float64(len(q))
	sum := 0.0
	for _, x := range q {
		phi := t.NaSil * math.Pow(x/mean, t.Slope) * (1 + t.KNaSil + 2*t.CaNaSil + 2*t.MgNaSil)
		sum += phi * x * 86.4 // mol/day: µmol/L × m³/s × 86.4
	}
	return sum / t.AreaKm2 / float64(len(q)) * 365.25
}
