package notebook

import (
	"context"
	"math"
	"runtime"
	"strconv"
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

// BenchmarkApportionment100x10000 recomputes an inverse apportionment of
// 100 samples × 10,000 draws. B/op counts every allocation; held-MB is the
// heap still in use after the run (what the budget keeps for the cells
// below).
func BenchmarkApportionment100x10000(b *testing.B) {
	d := bigApportionment(b, 100, 10000)
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

// TestDrawsWithoutExpanding checks that an apportionment that keeps only
// the model's result gives, draw by draw, the splits and weights of one
// that stores every draw, and the same tables.
func TestDrawsWithoutExpanding(t *testing.T) {
	defer func(v bool) { expandSplits = v }(expandSplits)
	for _, model := range []string{"inverse", "forward"} {
		t.Run(model, func(t *testing.T) {
			var got [2]*Apportioned
			var sums [2]string
			for j, expand := range []bool{true, false} {
				expandSplits = expand
				d := bigApportionment(t, 12, 300)
				if err := d.SetParam("apportionment", "model", model); err != nil {
					t.Fatal(err)
				}
				d.Recompute(context.Background(), nil)
				o := d.Output("apportionment")
				if o == nil {
					st, err := d.Status("apportionment")
					t.Fatalf("apportionment: %v %v", st, err)
				}
				got[j] = o.Value.(*Apportioned)
				sums[j] = d.checksum()
			}
			if (got[0].splits == nil) || (got[1].splits != nil) {
				t.Fatalf("splits stored: %v with expanding, %v without; want true, false", got[0].splits != nil, got[1].splits != nil)
			}
			if sums[0] != sums[1] {
				t.Errorf("results checksum %s with expanding, %s without; want equal", sums[0], sums[1])
			}
			kept := 0
			for i := range got[0].Names {
				for dr := 0; dr < got[0].Draws; dr++ {
					s0, w0, ok0 := got[0].Draw(i, dr)
					s1, w1, ok1 := got[1].Draw(i, dr)
					if ok0 != ok1 || w0 != w1 || (ok0 && s0 != s1) {
						t.Fatalf("sample %d draw %d: expanded (%v, %g, %v), lazy (%v, %g, %v); want identical", i, dr, s0, w0, ok0, s1, w1, ok1)
					}
					if ok0 {
						kept++
					}
				}
			}
			if kept == 0 {
				t.Errorf("no draw kept in any sample; the comparison tested nothing")
			}
		})
	}
}

// TestRainDrawsFollowVary checks that an apportionment with a spread on
// the rain ratios gives, draw by draw, what the whole redone correction
// (correct.Result.Vary) gives: the inversion is rerun with the residuals
// of Vary, the forward model with Vary's Result, and every split's
// atmospheric and evaporite rows and every sulfide sulfate are compared
// with Vary's, bit for bit, under the negative policies and sulfate
// scenarios the cell offers.
func TestRainDrawsFollowVary(t *testing.T) {
	defer func(v bool) { expandSplits = v }(expandSplits)
	expandSplits = false // keep the model's result for the reruns
	for _, tc := range []struct{ model, sulfate, negative string }{
		{"inverse", "gypsum", "zero-and-flag"}, {"inverse", "sulfide", "keep"}, {"inverse", "isotope", "zero-and-flag"},
		{"forward", "gypsum", "zero-and-flag"}, {"forward", "isotope", "keep"},
	} {
		t.Run(tc.model+"/"+tc.sulfate+"/"+tc.negative, func(t *testing.T) {
			d := bigApportionment(t, 12, 300)
			for _, p := range [][3]string{{"rain", "rain_ratio_uncertainty_percent", "10"}, {"apportionment", "model", tc.model},
				{"apportionment", "sulfate", tc.sulfate}, {"apportionment", "negative_residuals", tc.negative}} {
				if err := d.SetParam(p[0], p[1], p[2]); err != nil {
					t.Fatal(err)
				}
			}
			if err := d.Recompute(context.Background(), nil); err != nil {
				t.Fatal(err)
			}
			o := d.Output("apportionment")
			if o == nil {
				st, err := d.Status("apportionment")
				t.Fatalf("apportionment: %v %v", st, err)
			}
			a := o.Value.(*Apportioned)
			if a.scales == nil {
				t.Fatal("no rain draws; the comparison would test nothing")
			}
			ems := d.Output("sources").Value.([]mix.EndMember)
			s := d.Cell("apportionment").Settings.(*ApportionmentSettings)
			vary := func(i, dr int) correct.Result { return a.Corrected[i].Vary(&a.scales[dr]) }
			if tc.model == "inverse" {
				checkInverseFollowsVary(t, a, ems, s, vary)
			} else {
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
					}
				}
			}
			for i := range a.Corrected {
				for dr := 0; dr < a.Draws; dr++ {
					if got, want := a.SO4Sulf(i, dr), vary(i, dr).SO4Sulf; math.Float64bits(got) != math.Float64bits(want) {
						t.Fatalf("sample %d draw %d: SO4 from sulfide %g, Vary gives %g", i, dr, got, want)
					}
				}
			}
		})
	}
}

// checkInverseFollowsVary reruns the inversion of a with the residuals of
// Vary and compares every kept draw, and the rows added from the
// correction, with a's.
func checkInverseFollowsVary(t *testing.T, a *Apportioned, ems []mix.EndMember, s *ApportionmentSettings, vary func(i, d int) correct.Result) {
	t.Helper()
	p := mix.Problem{EndMembers: ems}
	for _, name := range s.Tracers {
		tr, err := mix.ParseTracer(name)
		if err != nil {
			t.Fatal(err)
		}
		p.Tracers = append(p.Tracers, tr)
	}
	for i, r := range a.Corrected {
		p.Waters = append(p.Waters, mix.Water{Name: a.Names[i], Conc: r.Residual,
			Sr87Sr86: a.Samples.Table.Samples[a.Index[i]].Sr87Sr86})
	}
	mo := &mix.Options{Draws: s.Draws, Seed: uint64(s.Seed), Workers: 1, Vary: func(i, d int) (chem.Composition, bool) {
		v := vary(i, d)
		return v.Residual, !v.Rejected
	}}
	ref, err := mix.Invert(context.Background(), p, mo)
	if err != nil {
		t.Fatal(err)
	}
	kept := 0
	for i := range a.Corrected {
		if got, want := a.inverse.Kept(i), ref.Kept(i); got != want {
			t.Fatalf("sample %d: %d draws kept, %d with Vary", i, got, want)
		}
		for k := 0; k < ref.Kept(i); k++ {
			dr, want, w := ref.Draw(i, k)
			v := vary(i, dr)
			for c, sp := range mix.Cations {
				want[mix.Atmosphere][c] += v.Atm[sp]
				want[mix.Evaporite][c] += v.Evap[sp]
			}
			got, gw, ok := a.Draw(i, dr)
			if !ok || math.Float64bits(gw) != math.Float64bits(w) || !sameSplit(got, want) {
				t.Fatalf("sample %d draw %d: (%v, %g, %v), Vary gives (%v, %g)", i, dr, got, gw, ok, want, w)
			}
			kept++
		}
	}
	if kept == 0 {
		t.Error("no draw kept in any sample; the comparison tested nothing")
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
