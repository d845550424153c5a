package notebook

import (
	"context"
	"math"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/correct"
	"lixiv/engine/mix"
)

// bigApportionment returns the demo budget cut to its apportionment, with
// its samples repeated up to n and the given draws.
func bigApportionment(tb testing.TB, n, draws int) *Document {
	tb.Helper()
	d, err := loadFile("../../examples/corrie-vale/corrie-vale.lixiv.json")
	if err != nil {
		tb.Fatal(err)
	}
	for _, id := range []string{"chart", "co2", "fluxes"} {
		if err := d.Remove(id); err != nil {
			tb.Fatal(err)
		}
	}
	t := *d.Cell("samples").Table
	rows := t.Rows
	t.Rows = nil
	for i := 0; len(t.Rows) < n; i++ {
		r := append([]string(nil), rows[i%len(rows)]...)
		r[0] += "-" + strconv.Itoa(i/len(rows))
		t.Rows = append(t.Rows, r)
	}
	if err := d.SetTable("samples", &t); err != nil {
		tb.Fatal(err)
	}
	if err := d.SetParam("apportionment", "draws", strconv.Itoa(draws)); err != nil {
		tb.Fatal(err)
	}
	d.Workers = 1
	return d
}

// BenchmarkApportionment100 recomputes an inverse apportionment of 100
// samples at the default settings (ESS 1,000 each). B/op counts every
// allocation; held-MB is the heap still in use after the run (what the
// budget keeps for the cells below).
func BenchmarkApportionment100(b *testing.B) {
	d := bigApportionment(b, 100, 1000)
	if err := d.Recompute(context.Background(), nil); err != nil {
		b.Fatal(err)
	}
	if o := d.Output("apportionment"); o == nil || len(o.Value.(*Apportioned).Names) != 100 {
		st, err := d.Status("apportionment")
		b.Fatalf("apportionment: %v %v", st, err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	var ms runtime.MemStats
	for i := 0; i < b.N; i++ {
		d.SetParam("apportionment", "seed", strconv.Itoa(2+i%2))
		if err := d.Recompute(context.Background(), nil); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	runtime.GC()
	runtime.ReadMemStats(&ms)
	b.ReportMetric(float64(ms.HeapInuse)/(1<<20), "held-MB")
	runtime.KeepAlive(d)
}

// TestApportionmentIsTheInversion checks that the cell hands the model each
// sample's measured chemistry with its correction, the samples cell's
// precision and the rain spread, and passes its draws on unchanged: a
// direct mix.Invert of the same problem gives the same result bit for bit,
// and every draw's split is the cell's.
func TestApportionmentIsTheInversion(t *testing.T) {
	d := bigApportionment(t, 12, 300)
	for _, p := range [][3]string{{"rain", "rain_ratio_uncertainty_percent", "10"}, {"apportionment", "target_ess", "200"}} {
		if err := d.SetParam(p[0], p[1], p[2]); err != nil {
			t.Fatal(err)
		}
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	a := d.Output("apportionment").Value.(*Apportioned)
	atm := d.Output("rain").Value.(*Atmosphere)
	s := d.Cell("apportionment").Settings.(*ApportionmentSettings)
	p := mix.Problem{EndMembers: d.Output("sources").Value.([]mix.EndMember)}
	for _, name := range s.Tracers {
		tr, err := mix.ParseTracer(name)
		if err != nil {
			t.Fatal(err)
		}
		p.Tracers = append(p.Tracers, tr)
	}
	for i := range a.Corrected {
		p.Waters = append(p.Waters, mix.Water{Name: a.Names[i], Correction: &a.Corrected[i], Sr87Sr86: a.Samples.Table.Samples[a.Index[i]].Sr87Sr86})
	}
	prec := atm.Samples.Precision
	ref, err := mix.Invert(context.Background(), p, &mix.Options{Draws: s.Draws, TargetESS: s.TargetESS, MaxDraws: s.MaxDraws,
		Seed: uint64(s.Seed), Precision: &prec, IsoErr: atm.Samples.IsoPrecision, Rain: atm.Uncertainty, ScaleCl: atm.ScaleCl, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	if ref.Checksum() != a.inverse.Checksum() {
		t.Fatal("the cell's inversion differs from a direct one of the same problem")
	}
	if atm.Uncertainty.Ratios != 0.1 {
		t.Fatalf("rain spread %g handed on, want 0.1", atm.Uncertainty.Ratios)
	}
	for i := range a.Names {
		if a.Kept(i) == 0 {
			t.Fatalf("sample %d has no draws", i)
		}
		for k := range a.Kept(i) {
			_, want, ww := ref.Draw(i, k)
			got, gw, _ := a.Draw(i, k)
			if !sameSplit(got, want) || gw != ww {
				t.Fatalf("sample %d draw %d differs", i, k)
			}
		}
	}
}

// TestForwardRainDrawsFollowVary checks that a forward apportionment with a
// spread on the rain ratios gives, draw by draw, what the whole redone
// correction (correct.Result.Vary) gives, bit for bit, under the negative
// policies and sulfate scenarios the cell offers.
func TestForwardRainDrawsFollowVary(t *testing.T) {
	for _, tc := range []struct{ sulfate, negative string }{{"gypsum", "zero-and-flag"}, {"isotope", "keep"}} {
		t.Run(tc.sulfate+"/"+tc.negative, func(t *testing.T) {
			d := bigApportionment(t, 12, 300)
			for _, p := range [][3]string{{"rain", "rain_ratio_uncertainty_percent", "10"}, {"apportionment", "model", "forward"},
				{"apportionment", "sulfate", tc.sulfate}, {"apportionment", "negative_residuals", tc.negative}} {
				if err := d.SetParam(p[0], p[1], p[2]); err != nil {
					t.Fatal(err)
				}
			}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			a := d.Output("apportionment").Value.(*Apportioned)
			if a.scales == nil {
				t.Fatal("no rain draws; the comparison would test nothing")
			}
			ems := d.Output("sources").Value.([]mix.EndMember)
			s := d.Cell("apportionment").Settings.(*ApportionmentSettings)
			vary := func(i, dr int) correct.Result { return a.Corrected[i].Vary(&a.scales[dr]) }
			for i := range a.Corrected {
				fo := &mix.ForwardOptions{Silicate: forwardRatios(ems), Draws: s.Draws, Seed: uint64(s.Seed),
					Vary: func(k int) correct.Result { return vary(i, k) }}
				fr, err := mix.Forward(&a.Corrected[i], fo)
				if err != nil {
					t.Fatal(err)
				}
				for dr, want := range fr.Draws {
					if got, _, _ := a.Draw(i, dr); !sameSplit(got, want) {
						t.Fatalf("sample %d draw %d: %v, Vary gives %v", i, dr, got, want)
					}
					if got, want := a.SO4Sulf(i, dr), vary(i, dr).SO4Sulf; math.Float64bits(got) != math.Float64bits(want) {
						t.Fatalf("sample %d draw %d: SO4 from sulfide %g, Vary gives %g", i, dr, got, want)
					}
				}
			}
		})
	}
}

// TestPrecisionColumns checks that a column "Ca rsd (%)" sets the relative
// precision of Ca for its samples only, and that a bad value stops the
// samples cell naming its sample, line and column.
func TestPrecisionColumns(t *testing.T) {
	d := bigApportionment(t, 4, 300)
	tab := *d.Cell("samples").Table
	tab.Columns = append(append([]string(nil), tab.Columns...), "Ca rsd (%)")
	tab.Units = append(append([]string(nil), tab.Units...), "")
	var rows [][]string
	for i, r := range tab.Rows {
		v := ""
		if i == 1 {
			v = "8"
		}
		rows = append(rows, append(append([]string(nil), r...), v))
	}
	tab.Rows = rows
	if err := d.SetTable("samples", &tab); err != nil {
		t.Fatal(err)
	}
	if err := d.Recompute(context.Background(), nil); err != nil {
		t.Fatal(err)
	}
	smp := d.Output("samples").Value.(*Samples)
	if p := smp.SamplePrecision(0); p != nil {
		t.Errorf("sample 0 has a precision of its own: %+v", p.Rel[chem.Ca])
	}
	if p := smp.SamplePrecision(1); p == nil || p.Rel[chem.Ca] != 0.08 || p.Rel[chem.Na] != 0.03 {
		t.Errorf("sample 1 precision %+v, want Ca 8 %% and Na the default 3 %%", p)
	}
	tab.Rows[2][len(tab.Columns)-1] = "lots"
	if err := d.SetTable("samples", &tab); err != nil {
		t.Fatal(err)
	}
	d.Recompute(context.Background(), nil)
	st, err := d.Status("samples")
	if err == nil || !strings.Contains(err.Error(), "Ca rsd (%)") || !strings.Contains(err.Error(), tab.Rows[2][0]) {
		t.Errorf("bad precision: state %v, error %v; want one naming the sample and the column", st, err)
	}
}

// sameSplit reports whether two splits agree bit for bit.
func sameSplit(a, b mix.Split) bool {
	for src := range a {
		for k := range a[src] {
			if math.Float64bits(a[src][k]) != math.Float64bits(b[src][k]) {
				return false
			}
		}
	}
	return true
}
