package flux

import (
	"errors"
	"math"
	"testing"
)

// TestGivenDrawNumbers: draw numbers given by the caller are taken by every
// sample, in the series and the apportioned bootstraps alike: with the
// samples, discharge and area held and draw d multiplying every
// concentration by 0.9 + 0.2 d/49, replicate r's load is that factor of
// the base load, for the draw given to it. A draw a sample rejected, or too
// few numbers, is refused.
func TestGivenDrawNumbers(t *testing.T) {
	rec := constantRecord(1, 365)
	s := rejecting(rec)
	// Only the first two samples reject draws (0 … 9 and 7 … 16).
	for i := 2; i < len(s.Days); i++ {
		for d := range s.Draws[i] {
			s.Draws[i][d], s.Weights[i][d] = 100*(0.9+0.2*float64(d)/49), 1
		}
	}
	base := 86.4 * 100 * 365.0
	kept := []int{}
	for d := range 50 {
		ok := true
		for i := range s.Days {
			if s.Weights[i][d] == 0 {
				ok = false
			}
		}
		if ok {
			kept = append(kept, d)
		}
	}
	if len(kept) == 0 {
		t.Fatal("the test series has no draw kept by every sample")
	}
	nums := make([]int, 40)
	for r := range nums {
		nums[r] = kept[(3*r)%len(kept)]
	}
	a := Apportioned{Name: "Ca", Days: s.Days, Weights: s.Weights,
		Parts: []Share{{Of: "Ca", Measured: fill(len(s.Days), 100), Amount: fill(len(s.Days), 100), Draws: s.Draws}}}
	hold := AllSources &^ Apportionment
	for _, m := range []Method{FlowWeighted, Rating} {
		opt := Options{Method: m, AreaKm2: 100}
		b := BootstrapOptions{Replicates: len(nums), Seed: 3, Hold: hold, DrawNumbers: nums, KeepReplicates: true}
		us, err := Bootstrap(rec, s, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		ua, err := BootstrapApportioned(rec, a, opt, b)
		if err != nil {
			t.Fatal(err)
		}
		for r, d := range nums {
			want := base * (0.9 + 0.2*float64(d)/49)
			for name, u := range map[string]*Uncertainty{"series": us, "apportioned": ua} {
				if relErr(u.MeanMol[r], want) > 1e-9 {
					t.Errorf("%v %s: replicate %d (draw %d) load %.8g, want %.8g", m, name, r, d, u.MeanMol[r], want)
				}
				if u.Loads[r].Mean.Mol != u.MeanMol[r] || len(u.Loads[r].Years) != len(u.Years) {
					t.Errorf("%v %s: replicate %d kept loads %+v, want the mean %g and %d years", m, name, r, u.Loads[r], u.MeanMol[r], len(u.Years))
				}
			}
		}
	}
	bad := append([]int(nil), nums...)
	bad[5] = 7 // rejected by sample 1 (draws 7 … 16)
	for _, b := range []BootstrapOptions{
		{Replicates: len(nums), Seed: 3, DrawNumbers: bad},
		{Replicates: len(nums) + 1, Seed: 3, DrawNumbers: nums},
	} {
		if _, err := Bootstrap(rec, s, Options{Method: FlowWeighted, AreaKm2: 100}, b); !errors.Is(err, ErrDraws) {
			t.Errorf("series: %v, want ErrDraws", err)
		}
		if _, err := BootstrapApportioned(rec, a, Options{Method: FlowWeighted, AreaKm2: 100}, b); !errors.Is(err, ErrDraws) {
			t.Errorf("apportioned: %v, want ErrDraws", err)
		}
	}
	// Without KeepReplicates no loads are kept.
	u, err := Bootstrap(rec, s, Options{Method: FlowWeighted, AreaKm2: 100}, BootstrapOptions{Replicates: 10, Seed: 3})
	if err != nil || u.Loads != nil || math.IsNaN(u.MeanMol[0]) {
		t.Errorf("loads kept without asking (%v)", err)
	}
}
