package notebook

import (
	"context"
	"runtime"
	"strconv"
	"testing"
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
