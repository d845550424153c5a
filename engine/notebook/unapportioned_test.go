package notebook

import (
	"context"
	"math"
	"sort"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

const demoPath = "../../examples/corrie-vale/corrie-vale.lixiv.json"

// Unfittable returns the demo budget with n of its samples made impossible
// to apportion: those at the highest discharge when high, else the lowest.
// Each loses its Ca and Mg, whose charge goes to Na, so that the charge
// balance (and whether the sample enters the budget) does not change: no
// silicate of the granitic preset (Ca/Na and Mg/Na of 0.1 and more) and no
// carbonate gives a water with Na and no Ca or Mg, and the sample does not
// fit. The data stay invented.
func unfittable(t *testing.T, n int, high bool) *Document {
	t.Helper()
	d, err := loadFile(demoPath)
	if err != nil {
		t.Fatal(err)
	}
	// Fewer draws than the demo's: the unfittable samples run to the draw
	// cap, and what is checked here (counts, shares, statuses) does not
	// depend on how many draws the fitting samples keep.
	for _, p := range [][3]string{{"apportionment", "target_ess", "300"}, {"apportionment", "max_draws", "3000"}, {"fluxes", "bootstrap", "200"}} {
		if err := d.SetParam(p[0], p[1], p[2]); err != nil {
			t.Fatal(err)
		}
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	rec := d.Output("discharge").Value.(*Flow).Record
	tab := d.Cell("samples").Table.Clone()
	col := map[string]int{}
	for j, c := range tab.Columns {
		col[c] = j
	}
	type row struct {
		i int
		q float64
	}
	var rows []row
	for i, r := range tab.Rows {
		day, err := parseDay(r[col["date"]])
		if err != nil {
			t.Fatal(err)
		}
		q, err := rec.At(discharge.Day(day))
		if err != nil {
			t.Fatal(err)
		}
		rows = append(rows, row{i, q})
	}
	sort.Slice(rows, func(a, b int) bool { return rows[a].q > rows[b].q == high })
	num := func(s string) float64 {
		x, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		return x
	}
	for _, r := range rows[:n] {
		cells := tab.Rows[r.i]
		// The table is in mg/L: µmol/L = mg/L / M × 1000.
		na := num(cells[col["Na"]]) / chem.Na.MolarMass() * 1000
		ca := num(cells[col["Ca"]]) / chem.Ca.MolarMass() * 1000
		mg := num(cells[col["Mg"]]) / chem.Mg.MolarMass() * 1000
		naNew := na + 2*(ca+mg)
		cells[col["Na"]] = strconv.FormatFloat(naNew*chem.Na.MolarMass()/1000, 'f', 6, 64)
		cells[col["Ca"]], cells[col["Mg"]] = "0", "0"
	}
	if err := d.SetTable("samples", tab); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	return d
}

// TestUnapportionedSamplesAreNamed: samples without a usable apportionment
// are counted, with the share of the flow-weighted cation load they
// carried, as headline figures; beyond doubtful_above_percent (25) the
// fluxes and CO2 cells are doubtful and the report says why; the two
// policies give different fluxes, and each keeps the sources adding up to
// the measured cations over the samples it fluxes.
func TestUnapportionedSamplesAreNamed(t *testing.T) {
	d := unfittable(t, 20, true)
	fig := func(cell, name string) float64 {
		f := d.Output(cell).Figure(name)
		if f == nil {
			t.Fatalf("%s: no figure %q", cell, name)
		}
		return f.Median
	}
	if n := fig("fluxes", "samples without a usable apportionment"); n != 20 {
		t.Errorf("%g samples without a usable apportionment, want 20", n)
	}
	share := fig("fluxes", "share of the flow-weighted cation load in samples without a usable apportionment")
	if !(share > 0.25 && share < 1) {
		t.Errorf("share of the load %g, want above a quarter (the 20 samples at the highest flow of 78)", share)
	}
	for _, id := range []string{"fluxes", "co2"} {
		st, err := d.Status(id)
		if st != Doubtful || err == nil || !strings.Contains(err.Error(), "20 of 78 samples without a usable apportionment carried") {
			t.Errorf("%s: %v (%v), want doubtful because of the 20 samples", id, st, err)
		}
	}
	r := d.Report()
	if len(r.Doubtful["fluxes"]) == 0 || len(r.Doubtful["co2"]) == 0 || r.Unapportioned == nil || r.Unapportioned.Samples != 20 ||
		r.Unapportioned.Policy != "leave-out" || float64(r.Unapportioned.Share) != share {
		t.Errorf("report: doubtful %v, unapportioned %+v", r.Doubtful, r.Unapportioned)
	}
	for _, p := range r.Problems {
		if p.Cell == "fluxes" || p.Cell == "co2" {
			t.Errorf("a doubtful cell listed as a problem: %+v", p)
		}
	}
	closure := func() {
		t.Helper()
		ct := d.Output("fluxes").Table("closure")
		for i, c := range ct.Column("cation").Text {
			if dd := ct.Column("difference").Num[i]; math.Abs(dd) > ClosureTolerance {
				t.Errorf("%s: sources and measured %g apart", c, dd)
			}
		}
	}
	closure()
	left := fig("fluxes", "silicate cations flux")
	if err := d.SetParam("fluxes", "unapportioned_samples", "fill-shares"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	closure()
	filled := fig("fluxes", "silicate cations flux")
	if left == filled {
		t.Errorf("leaving out and filling gave the same silicate flux %g", left)
	}
	if note := d.Output("fluxes").Figure("silicate cations flux").Note; !strings.Contains(note, "20 samples without a usable apportionment filled with the flow-weighted source shares") {
		t.Errorf("the note beside the headline does not name the fill: %q", note)
	}
	if st, _ := d.Status("fluxes"); st != Doubtful {
		t.Errorf("filled: %v, want still doubtful (the filled values rest on failed fits)", st)
	}

	// The 15 samples at the lowest flow carry little of the load: counted,
	// but not doubtful.
	d = unfittable(t, 15, false)
	if n := d.Output("fluxes").Figure("samples without a usable apportionment").Median; n != 15 {
		t.Errorf("%g samples without a usable apportionment, want 15", n)
	}
	for _, id := range []string{"apportionment", "fluxes", "co2"} {
		if st, err := d.Status(id); st != UpToDate {
			t.Errorf("%s: %v (%v), want up to date with 15 low-flow samples left out", id, st, err)
		}
	}
}

// TestRunoffIsTheRecords: the fluxes cell's runoff is exactly the discharge
// record's over the complete years (Σ Q_d × 86.4 / A; docs/methods.md §8.5), with an
// interval around it, and the report carries both runoffs.
func TestRunoffIsTheRecords(t *testing.T) {
	d, err := loadFile(demoPath)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	v := d.Output("fluxes").Value.(*Fluxes)
	var sum float64
	n := 0
	for _, y := range v.Record.Years(v.Options.FirstMonth) {
		if !y.Complete() {
			continue
		}
		q := 0.0
		for k := v.Record.Index(y.Start); k <= v.Record.Index(y.End); k++ {
			q += v.Record.Q[k]
		}
		sum += q
		n++
	}
	want := discharge.RunoffMM(sum/float64(n), v.Site.AreaKm2)
	f := d.Output("fluxes").Figure(RunoffFigure)
	if f == nil || f.Median != want || !(f.Low < want && want < f.High) {
		t.Fatalf("runoff %+v, the record's %.15g mm/yr", f, want)
	}
	r := d.Report()
	if float64(r.RunoffMM.Median) != want || !finite(float64(r.RecordRunoffMM)) {
		t.Errorf("report runoffs %+v and %g", r.RunoffMM, r.RecordRunoffMM)
	}
}

// TestDemoEstimatorsAgree: on the demo the four estimators' silicate CO2
// consumption per km² lie within 15 % of each other, each with its 95 %
// interval.
func TestDemoEstimatorsAgree(t *testing.T) {
	d, err := loadFile(demoPath)
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	et := d.Output("co2").Table("estimators")
	lo, hi := math.Inf(1), math.Inf(-1)
	seen := 0
	for i, src := range et.Column("source").Text {
		if src != "silicate" {
			continue
		}
		seen++
		m, l, h := et.Column("per_km2").Num[i], et.Column("per_km2_low").Num[i], et.Column("per_km2_high").Num[i]
		if !(l < m && m < h) {
			t.Errorf("%s: %g [%g, %g]", et.Column("estimator").Text[i], m, l, h)
		}
		lo, hi = math.Min(lo, m), math.Max(hi, m)
	}
	if seen != 4 || hi/lo > 1.15 {
		t.Errorf("%d estimators, silicate CO2 from %g to %g mol/km²/yr: want four within 15 %%", seen, lo, hi)
	}
	r := d.Report()
	if len(r.CO2Estimators["silicate"]) != 4 || len(r.Estimators["silicate cations"]) != 4 {
		t.Errorf("report estimators: %v / %v", r.CO2Estimators, r.Estimators)
	}
}

// TestSulfateBracket: Marlow Fen (gypsum and pyrite; the budget books all
// sulfate above the rain share to gypsum) shows its CO2 with that sulfate
// from sulfide oxidation beside the chosen figures: sulfuric acid takes
// alkalinity from carbonate weathering, so the carbonate CO2 consumption is
// lower (docs/methods.md §9.3), and the span covers both; the report carries both.
func TestSulfateBracket(t *testing.T) {
	d, err := loadFile("../../examples/marlow-fen/marlow-fen.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("co2")
	chosen := o.Figure("carbonate CO2 consumption per km²")
	other := o.Figure("carbonate CO2 consumption per km² with the sulfate from sulfide oxidation")
	if chosen == nil || other == nil || !(other.Median < chosen.Median) || !(other.Low < other.Median && other.Median < other.High) {
		t.Fatalf("carbonate CO2: gypsum %+v, sulfide %+v; want the sulfide figure lower, with an interval", chosen, other)
	}
	if !strings.Contains(chosen.Note, "from gypsum") || !strings.Contains(other.Note, "span") {
		t.Errorf("notes %q and %q should name the chosen origin and the span", chosen.Note, other.Note)
	}
	r := d.Report()
	b := r.Sulfate
	if b == nil || b.Chosen != "gypsum" || len(b.Origins) != 2 {
		t.Fatalf("report sulfate bracket %+v", b)
	}
	sp := b.Span["carbonate"]
	if float64(sp.Low) != other.Median || float64(sp.High) != chosen.Median {
		t.Errorf("span %+v, want %g to %g", sp, other.Median, chosen.Median)
	}
}
