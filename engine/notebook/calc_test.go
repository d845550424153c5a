package notebook

import (
	"context"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
	"lixiv/engine/flux"
	"lixiv/engine/mix"
	"lixiv/engine/qc"
)

// samplesCell computes a samples cell holding rows under the given columns
// (µmol/L, Alk µeq/L) and returns its output.
func samplesCell(t *testing.T, cols []string, rows [][]string) *Output {
	t.Helper()
	d := New("s")
	c := NewCell(KindSamples, "lab", "")
	units := make([]string, len(cols))
	for i, h := range cols {
		switch h {
		case "sample", "date", "pH":
		case "Alk":
			units[i] = "µeq/L"
		default:
			units[i] = "µmol/L"
		}
	}
	c.Table = &Table{Columns: cols, Units: units, Rows: rows}
	if err := d.Insert(c, -1); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	o := d.Output("lab")
	if o == nil {
		st, err := d.Status("lab")
		t.Fatalf("samples cell: %v %v", st, err)
	}
	return o
}

func TestSamplesCellNICB(t *testing.T) {
	cols := []string{"sample", "date", "pH", "Na", "K", "Ca", "Mg", "Cl", "SO4", "NO3", "Alk"}
	tests := []struct {
		name string
		row  []string
		want float64
		flag string
	}{
		// docs/methods.md §13 item 4 (computed): TZ+ 610, TZ− 590 µeq/L, NICB +3.2787 %.
		{"brief example", []string{"A", "2021-05-01", "", "100", "10", "200", "50", "50", "40", "10", "450"}, 3.2787, ""},
		// With alkalinity given, H+ from pH is not added to TZ+ (alkalinity
		// already holds it; common practice): the same +3.2787 % at pH 4.
		{"pH 4 with alkalinity", []string{"A", "2021-05-01", "4", "100", "10", "200", "50", "50", "40", "10", "450"}, 3.2787, ""},
		// No anion measured: no balance, and the sample is left out.
		{"no anions", []string{"A", "2021-05-01", "", "100", "10", "200", "50", "", "", "", ""}, math.NaN(),
			"left out: no charge balance (no anion measured)"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			// A second, balanced sample keeps the cell from leaving every sample out.
			o := samplesCell(t, cols, [][]string{tt.row, {"B", "2021-06-01", "", "100", "10", "200", "50", "50", "40", "10", "450"}})
			got := o.Table("samples").Column("NICB").Num[0]
			if math.IsNaN(tt.want) != math.IsNaN(got) || !math.IsNaN(got) && math.Abs(got-tt.want) > 1e-4 {
				t.Errorf("NICB %g %%, want %g %% (±1e-4)", got, tt.want)
			}
			if f := o.Table("samples").Column("flag").Text[0]; f != tt.flag {
				t.Errorf("flag %q, want %q", f, tt.flag)
			}
		})
	}
}

func TestEndMemberTable(t *testing.T) {
	for _, p := range Presets {
		t.Run(p, func(t *testing.T) {
			tab, err := SourcesTable(p)
			if err != nil {
				t.Fatal(err)
			}
			ems, err := parseEndMembers(tab)
			if err != nil {
				t.Fatal(err)
			}
			back := EndMemberTable(ems)
			if back.CSV() != tab.CSV() {
				t.Errorf("table → end-members → table changed:\n%s\n%s", tab.CSV(), back.CSV())
			}
		})
	}
	tab, _ := SourcesTable("global")
	bad := []struct {
		name      string
		row, col  int
		text, msg string
	}{
		{"source", 0, 1, "volcano", "row 1, column source"},
		{"ratio", 1, 2, "Fe/Na", "row 2, column ratio"},
		{"number", 2, 3, "lots", `row 3, column low: "lots" is not a number`},
		{"shape", 0, 6, "gaussian", "row 1, column shape"},
		{"range", 0, 3, "5", "row 1 (silicate"},
	}
	for _, b := range bad {
		t.Run(b.name, func(t *testing.T) {
			tt := tab.Clone()
			tt.Rows[b.row][b.col] = b.text
			_, err := parseEndMembers(tt)
			if err == nil || !strings.Contains(err.Error(), b.msg) {
				t.Errorf("got %v, want an error containing %q", err, b.msg)
			}
		})
	}
	if _, err := SourcesTable("chalk"); err == nil {
		t.Errorf("an unknown preset was accepted")
	}
	_ = mix.Silicate
}

func TestRainVWM(t *testing.T) {
	tab := &Table{Columns: []string{"precipitation", "Na", "Cl"}, Units: []string{"mm", "µmol/L", "µmol/L"},
		Rows: [][]string{{"300", "10", "20"}, {"100", "30", "40"}}}
	c, err := rainVWM(tab)
	if err != nil {
		t.Fatal(err)
	}
	// VWM = Σ c P / Σ P (docs/methods.md §1.3): Na (3000 + 3000)/400 = 15, Cl (6000 + 4000)/400 = 25.
	if c[chem.Na] != 15 || c[chem.Cl] != 25 {
		t.Errorf("VWM Na %g Cl %g, want 15 and 25", c[chem.Na], c[chem.Cl])
	}
	tab.Rows[1][2] = "n/a"
	if _, err := rainVWM(tab); err == nil || !strings.Contains(err.Error(), "row 2, column Cl") {
		t.Errorf("bad cell: got %v, want row 2, column Cl", err)
	}
	tab.Units[1] = "mg/L"
	if _, err := rainVWM(tab); err == nil || !strings.Contains(err.Error(), "µmol/L") {
		t.Errorf("mg/L rain: got %v, want a request for µmol/L", err)
	}
}

func TestPeriod(t *testing.T) {
	rec := discharge.NewRecord("q", discharge.Date(2021, 1, 1), []float64{1, 2, 3, 4, 5})
	s := &Site{HasStart: true, Start: discharge.Date(2021, 1, 2), HasEnd: true, End: discharge.Date(2021, 1, 4)}
	got, err := period(rec, s)
	if err != nil || got.Len() != 3 || got.Q[0] != 2 || got.Q[2] != 4 {
		t.Errorf("period: %v %v, want days 2..4", got, err)
	}
	s.End = discharge.Date(2021, 2, 1)
	if _, err := period(rec, s); err == nil || !strings.Contains(err.Error(), "outside the discharge record") {
		t.Errorf("end outside: got %v", err)
	}
}

// TestRatingCurveKeepsItsEstimator: an apportioned series with zero or
// negative values (clamped carbonate, CO2 released by sulfuric acid) stays
// on the rating curve: the curve is fitted to the measured species, which
// are positive, and the quantity takes its flow-weighted share, so there
// is no switch to another estimator and no warning of one.
func TestRatingCurveKeepsItsEstimator(t *testing.T) {
	q := make([]float64, 365)
	for i := range q {
		q[i] = 1 + float64(i%30)/10
	}
	first := discharge.Date(2021, 1, 1)
	rec := discharge.NewRecord("q", first, q)
	opt := flux.Options{Method: flux.Rating, AreaKm2: 10, FirstMonth: 1}
	days := []discharge.Day{first + 10, first + 100, first + 200, first + 300}
	for _, tt := range []struct {
		name string
		c    []float64
	}{
		{"positive", []float64{10, 12, 9, 11}},
		{"one negative", []float64{10, -2, 9, 11}},
		{"one zero", []float64{10, 0, 9, 11}},
	} {
		t.Run(tt.name, func(t *testing.T) {
			a := flux.Apportioned{Name: "x", Days: days, Parts: []flux.Share{{Of: "Ca", Measured: []float64{50, 60, 45, 55}, Amount: tt.c}}}
			r, err := flux.EstimateApportioned(rec, a, opt)
			if err != nil {
				t.Fatal(err)
			}
			if r.Method != flux.Rating || len(r.Warnings) != 0 {
				t.Errorf("method %v, warnings %v; want the rating curve, no warning", r.Method, r.Warnings)
			}
		})
	}
}

func TestSamplesCellReportsPositions(t *testing.T) {
	d := New("s")
	c := NewCell(KindSamples, "lab", "")
	c.Table = &Table{Columns: []string{"sample", "date", "Na", "K", "Ca", "Mg", "Cl", "SO4", "Alk"},
		Units: []string{"", "", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µmol/L", "µeq/L"},
		Rows: [][]string{
			{"A", "2021-05-01", "100", "10", "200", "50", "50", "40", "460"},
			{"B", "2021-05-15", "abc", "10", "200", "50", "50", "40", "460"},
			{"C", "2021-05-29", "100", "10", "200", "50", "50", "40", "900"}, // NICB far below −10 %
		}}
	if err := d.Insert(c, -1); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	o := d.Output("lab")
	if o == nil {
		st, err := d.Status("lab")
		t.Fatalf("samples cell: %v %v", st, err)
	}
	found := false
	for _, m := range o.Messages {
		if m.File == "lab" && m.Value == "abc" && m.Row == 1 && m.Column == "Na" {
			found = true
		}
	}
	if !found {
		t.Errorf("messages %v do not name the bad cell", o.Messages)
	}
	flags := o.Table("samples").Column("flag").Text
	want := []string{"", "left out: no Na", "left out: |NICB| above 10 %"}
	for i := range want {
		if flags[i] != want[i] {
			t.Errorf("sample %d flag %q, want %q", i+1, flags[i], want[i])
		}
	}
	if got := o.Figure("samples left out").Median; got != 2 {
		t.Errorf("left out %g, want 2", got)
	}
}

func TestChecksumIgnoresLastBits(t *testing.T) {
	mk := func(vals []float64, med float64) *Document {
		d := New("c")
		d.funcs = map[Kind]ComputeFunc{KindNote: func(e *Env) (*Output, error) {
			return &Output{Figures: []Figure{{Name: "f", Median: med, Low: med * 0.5, High: med * 2}},
				Tables: []*ResultTable{{Name: "t", Columns: []*Column{NumColumn("x", "", vals)}}}}, nil
		}}
		d.Add(KindNote, -1)
		d.Recompute(context.Background(), nil)
		return d
	}
	base := mk([]float64{1234.5678, 1e-17, 3.25, -0.5}, 151344.47120206445)
	for _, tt := range []struct {
		name  string
		vals  []float64
		med   float64
		match bool
	}{
		{"same", []float64{1234.5678, 1e-17, 3.25, -0.5}, 151344.47120206445, true},
		{"last bits", []float64{1234.5678000000002, -3e-17, 3.2500000000000004, -0.49999999999999994}, 151344.4712020645, true},
		{"real change", []float64{1234.5679, 1e-17, 3.25, -0.5}, 151344.47120206445, false},
		{"figure change", []float64{1234.5678, 1e-17, 3.25, -0.5}, 151344.48, false},
	} {
		t.Run(tt.name, func(t *testing.T) {
			d := mk(tt.vals, tt.med)
			if got := d.checksum() == base.checksum(); got != tt.match {
				t.Errorf("checksums match = %v, want %v", got, tt.match)
			}
		})
	}
}

func TestSulfateIsotopeSplit(t *testing.T) {
	// Marlow Fen, one year: the isotope split lies between the gypsum and
	// sulfide scenarios, which bracket it (docs/methods.md §5.2).
	carb := map[string]float64{}
	for _, sc := range []struct{ name, sulfate, river string }{
		{"gypsum", "gypsum", ""}, {"sulfide", "sulfide", ""}, {"isotope", "isotope", "2.5"}} {
		d, err := loadFile("../../testdata/budgets/small-forward.lixiv.json")
		if err != nil {
			t.Fatal(err)
		}
		d.SetParam("co2", "time_scale", "short")
		if err := d.SetParam("apportionment", "sulfate", sc.sulfate); err != nil {
			t.Fatal(err)
		}
		if sc.river != "" {
			// Halfway between +15 and −10 ‰: half the sulfate from sulfide.
			d.SetParam("apportionment", "d34s_river_permil", sc.river)
		}
		d.Recompute(context.Background(), nil)
		f := d.Output("co2").Figure("carbonate CO2 consumption per km²")
		if f == nil {
			st, err := d.Status("co2")
			t.Fatalf("%s: %v %v", sc.name, st, err)
		}
		carb[sc.name] = f.Median
	}
	if !(carb["sulfide"] < carb["isotope"] && carb["isotope"] < carb["gypsum"]) {
		t.Errorf("carbonate CO2: sulfide %g, isotope %g, gypsum %g; want the isotope split in between", carb["sulfide"], carb["isotope"], carb["gypsum"])
	}
	if got := map[string]string{"d34S": "7.5"}; true {
		if v, ok := delta34S(got); !ok || v != 7.5 {
			t.Errorf("delta34S(d34S) = %g %v, want 7.5", v, ok)
		}
	}
	if v, ok := delta34S(map[string]string{"δ34S-SO4 (‰)": "-3,5"}); !ok || v != -3.5 {
		t.Errorf("delta34S(δ34S-SO4 (‰)) = %g %v, want -3.5", v, ok)
	}
}

// TestSamplesNICBMatchesQC checks that the samples cell's charge balance is
// engine/qc's, sample by sample, on the demo budget.
func TestSamplesNICBMatchesQC(t *testing.T) {
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	for range d.Cells { // the samples cell comes early in compute order
		if d.Output("samples") != nil {
			break
		}
		if _, err := d.Step(context.Background(), nil); err != nil {
			t.Fatal(err)
		}
	}
	o := d.Output("samples")
	if o == nil {
		st, err := d.Status("samples")
		t.Fatalf("samples cell: %v %v", st, err)
	}
	v := o.Value.(*Samples)
	got := o.Table("samples").Column("NICB").Num
	if len(got) != len(v.Table.Samples) || len(got) < 10 {
		t.Fatalf("%d NICB values for %d samples", len(got), len(v.Table.Samples))
	}
	for i, smp := range v.Table.Samples {
		want := qc.ChargeBalance(smp.C, smp.PH, smp.Temp).NICB
		if got[i] != want && !(math.IsNaN(got[i]) && math.IsNaN(want)) {
			t.Errorf("sample %s: NICB %g %%, qc.ChargeBalance gives %g %% (exact)", smp.ID, got[i], want)
		}
	}
}

// TestFluxesAndCO2ReportProgress checks that the fluxes and CO2 cells call
// the progress callback as they go, ending at their total, so that a page
// on one goroutine can yield to the browser between bootstraps.
func TestFluxesAndCO2ReportProgress(t *testing.T) {
	d, err := loadFile("../../testdata/budgets/small-forward.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Workers = 1
	got := map[string][]Progress{}
	if err := d.Recompute(context.Background(), func(p Progress) { got[p.Cell] = append(got[p.Cell], p) }); err != nil {
		t.Fatal(err)
	}
	for _, id := range []string{"fluxes", "co2"} {
		t.Run(id, func(t *testing.T) {
			ps := got[id]
			if len(ps) < 3 {
				t.Fatalf("%d progress reports, want at least 3", len(ps))
			}
			for i, p := range ps {
				if p.Total <= 0 || p.Done < 0 || p.Done > p.Total || i > 0 && p.Done < ps[i-1].Done {
					t.Errorf("report %d: %d of %d after %v", i, p.Done, p.Total, ps[max(i-1, 0)])
				}
			}
			if last := ps[len(ps)-1]; last.Done != last.Total {
				t.Errorf("last report %d of %d, want done = total", last.Done, last.Total)
			}
		})
	}
}

// TestFluxesEveryRowHasInterval checks that every row of the mean table
// carries a bootstrap interval around its median, and that the rating table
// lists each series the rating curve fitted.
func TestFluxesEveryRowHasInterval(t *testing.T) {
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Workers = 1
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("fluxes")
	if o == nil {
		st, err := d.Status("fluxes")
		t.Fatalf("fluxes: %v %v", st, err)
	}
	m := o.Table("mean")
	names := m.Column("series").Text
	if len(names) < 16 {
		t.Fatalf("%d rows in the mean table, want the 8 species, 6 source cations and 2 sums", len(names))
	}
	for i, name := range names {
		lo, med, hi := m.Column("flux_low").Num[i], m.Column("flux").Num[i], m.Column("flux_high").Num[i]
		if !(lo <= med && med <= hi && lo < hi) {
			t.Errorf("%s: interval %g .. %g .. %g, want low ≤ median ≤ high, low < high", name, lo, med, hi)
		}
	}
	r := o.Table("rating")
	if r == nil {
		t.Fatal("no rating table with the rating-curve estimator")
	}
	for i, name := range r.Column("series").Text {
		a, b, n, f := r.Column("a").Num[i], r.Column("b").Num[i], r.Column("n").Num[i], r.Column("bias_factor").Num[i]
		// Smearing factors of natural waters lie a little above 1 (Duan 1983; the
		// bound of 2 is a loose sanity limit, common practice).
		if !(a > 0) || math.IsNaN(b) || n < 10 || !(f >= 1 && f < 2) {
			t.Errorf("%s: a %g, b %g, n %g, bias factor %g", name, a, b, n, f)
		}
	}
	est := o.Table("estimators").Column("estimator").Text
	if !strings.Contains(strings.Join(est, ","), "beale") {
		t.Errorf("estimators %q lack beale", est)
	}
}

// TestFluxesBealeSetting checks that estimator "beale" runs flux.Beale:
// the cell's point value for the silicate cations equals the Beale row of
// its estimators table, and no rating table is made.
func TestFluxesBealeSetting(t *testing.T) {
	d, err := loadFile("../../testdata/budgets/small-forward.lixiv.json")
	if err != nil {
		t.Fatal(err)
	}
	d.Workers = 1
	if err := d.SetParam("fluxes", "estimator", "beale"); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	o := d.Output("fluxes")
	if o == nil {
		st, err := d.Status("fluxes")
		t.Fatalf("fluxes: %v %v", st, err)
	}
	if o.Table("rating") != nil {
		t.Error("a rating table without the rating curve")
	}
	v := o.Value.(*Fluxes)
	if v.Options.Method != flux.Beale {
		t.Fatalf("method %v, want %v", v.Options.Method, flux.Beale)
	}
	r, err := flux.EstimateApportioned(v.Record, v.quantity("silicate cations", 0, false, []int{0, 1, 2, 3}, cationsOf(mix.Silicate, 0, 1, 2, 3)), v.Options)
	if err != nil {
		t.Fatal(err)
	}
	e := o.Table("estimators")
	for i, name := range e.Column("series").Text {
		if name == "silicate cations" && e.Column("estimator").Text[i] == "beale" {
			if got := e.Column("point").Num[i]; got != r.Mean.Mol {
				t.Errorf("beale row %g mol/yr, flux.EstimateApportioned gives %g (exact)", got, r.Mean.Mol)
			}
			if lo, med, hi := e.Column("flux_low").Num[i], e.Column("flux").Num[i], e.Column("flux_high").Num[i]; !(lo < med && med < hi) {
				t.Errorf("beale row interval %g [%g, %g]", med, lo, hi)
			}
			return
		}
	}
	t.Error("no beale row for the silicate cations")
}
