package discharge

import (
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
)

// FuzzRead checks that the importer never panics and that whatever loads
// is a well-formed record: consecutive days, non-negative discharge or NaN.
func FuzzRead(f *testing.F) {
	seeds := []string{
		"Date,Q (m3/s)\n2021-01-01,1\n2021-01-03,3\n",
		"\ufeffDate;Discharge\n;L/s\n30.09.2021;1,5\n01.10.2021;n.a.\n",
		"Date,Time,Q (cfs)\n2021-01-01,00:00,1\n2021-01-01,12:00,-3\n",
		"01/02/2021\t1\n02/02/2021\t2\n",
		"Timestamp,Q,Unit\n2021-01-01T06:00,1,m3/s\n2021-01-01T07:00,2,L/s\n",
		"\"Date\",\"Q (mm/day)\"\n\"2021-01-01\",\"2\"\n",
		"Date,Q (m3/s)\n9999-12-31,1\n1000-01-01,2\n",
		"2021-01-01 00:00 1\n",
		"a\"b,c\n",
	}
	for _, s := range seeds {
		f.Add(s, uint8(0))
	}
	awk, err := filepath.Glob("testdata/awkward/*.csv")
	if err != nil {
		f.Fatal(err)
	}
	for _, n := range awk {
		b, err := os.ReadFile(n)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(string(b), uint8(0))
	}
	f.Fuzz(func(t *testing.T, in string, mode uint8) {
		defer watchdog.Start([]any{in, mode})()
		opt := Options{DateOrder: DateOrder(mode % 3), Decimal: DecimalMark(mode / 3 % 3), AreaKm2: float64(mode % 2)}
		if mode&0x80 != 0 {
			opt.Unit = LPerS
		}
		imp := ReadString(in, opt)
		r := imp.Record
		if r == nil {
			t.Fatal("nil record")
		}
		for _, p := range append(append(Problems{}, imp.Problems...), imp.Notices...) {
			if p.Row < 0 || p.Err == nil || p.Error() == "" {
				t.Fatalf("malformed problem %#v", p)
			}
		}
		if len(r.Days) != len(r.Q) {
			t.Fatalf("%d days, %d values", len(r.Days), len(r.Q))
		}
		if len(r.Days) > 400*366*10 {
			return // a far-apart pair of dates: allowed, but do not walk it
		}
		for i := range r.Days {
			if i > 0 && r.Days[i] != r.Days[i-1]+1 {
				t.Fatalf("days not consecutive at %d", i)
			}
			if q := r.Q[i]; !math.IsNaN(q) && (q < 0 || math.IsInf(q, 0)) {
				t.Fatalf("day %d: discharge %g", i, q)
			}
		}
		for _, p := range imp.Problems {
			if p.Err == nil || p.Error() == "" {
				t.Fatalf("empty problem %+v", p)
			}
		}
		_ = r.Gaps()
	})
}

// FuzzRoundTrip checks that WriteCSV and Read give back the record.
func FuzzRoundTrip(f *testing.F) {
	// Invented seed values (no source; any values do for a fuzz seed).
	f.Add(int64(0), 1.5, 2.25, 0.0, uint8(3))
	f.Add(int64(-30000), 1e-9, 1e6, 3.0, uint8(0))
	f.Fuzz(func(t *testing.T, first int64, a, b, c float64, gaps uint8) {
		defer watchdog.Start([]any{first, a, b, c, gaps})()
		if first < -200000 || first > 200000 {
			return
		}
		q := []float64{a, b, c, a + b, math.NaN()}
		for i := range q {
			if q[i] < 0 || math.IsInf(q[i], 0) || gaps&(1<<i) != 0 {
				q[i] = math.NaN()
			}
		}
		r := NewRecord("rt", Day(first), q)
		var sb strings.Builder
		if err := r.WriteCSV(&sb); err != nil {
			t.Fatal(err)
		}
		imp := ReadString(sb.String(), Options{})
		if err := imp.Problems.Err(); err != nil {
			t.Fatalf("%v\n%s", err, sb.String())
		}
		got := imp.Record
		// Leading and trailing gaps keep their rows, so the span survives.
		if got.Len() != r.Len() || got.First() != r.First() {
			t.Fatalf("got %d days from %s, want %d from %s", got.Len(), got.First(), r.Len(), r.First())
		}
		for i := range q {
			if math.Float64bits(got.Q[i]) != math.Float64bits(q[i]) && !(math.IsNaN(got.Q[i]) && math.IsNaN(q[i])) {
				t.Fatalf("day %d: got %g, want %g", i, got.Q[i], q[i])
			}
		}
	})
}
