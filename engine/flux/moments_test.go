package flux

import (
	"hash/fnv"
	"math"
	"testing"
)

// bootstrapRatingNoSeason runs the non-seasonal rating-curve bootstrap of
// the synthetic Corrie Vale catchment.
func bootstrapRatingNoSeason(t *testing.T) *Uncertainty {
	t.Helper()
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	u, err := Bootstrap(cv.gauge, s, Options{Method: Rating, AreaKm2: cv.area}, BootstrapOptions{Replicates: 300, Seed: 7, DischargeError: 0.1, AreaError: 0.03})
	if err != nil {
		t.Fatal(err)
	}
	return u
}

// TestMomentsMatchDailyLoop checks that the moment series of the rating
// curve gives the daily loop's replicate loads to rounding: the first
// omitted Taylor term is below 1e-16 of the sum (common practice: the
// remainder bound of the exponential series).
func TestMomentsMatchDailyLoop(t *testing.T) {
	before := momentUses.Load()
	fast := bootstrapRatingNoSeason(t)
	if used := momentUses.Load() - before; used < int64(len(fast.MeanMol))/2 {
		t.Fatalf("moments summed %d of %d replicates; the comparison would test little", used, len(fast.MeanMol))
	}
	useMoments = false
	slow := bootstrapRatingNoSeason(t)
	useMoments = true
	if len(fast.MeanMol) != len(slow.MeanMol) {
		t.Fatalf("%d replicates, want %d", len(fast.MeanMol), len(slow.MeanMol))
	}
	for r := range fast.MeanMol {
		got, want := fast.MeanMol[r], slow.MeanMol[r]
		if math.Abs(got-want) > 1e-12*math.Abs(want) {
			t.Fatalf("replicate %d: %.17g mol with moments, %.17g with the daily loop", r, got, want)
		}
	}
}

// TestMomentsChecksum pins the bits of the moment path; the constant was
// computed natively on amd64 and make wasmtest checks it under WebAssembly.
func TestMomentsChecksum(t *testing.T) {
	u := bootstrapRatingNoSeason(t)
	h := fnv.New64a()
	for _, v := range u.MeanMol {
		b := math.Float64bits(v)
		h.Write([]byte{byte(b), byte(b >> 8), byte(b >> 16), byte(b >> 24), byte(b >> 32), byte(b >> 40), byte(b >> 48), byte(b >> 56)})
	}
	const want = uint64(0xdcc20b375f02bf8a)
	if got := h.Sum64(); got != want {
		t.Errorf("checksum %#x, want %#x", got, want)
	}
}

// BenchmarkBootstrapRatingNoSeason times 300 replicates of the plain rating
// curve (moment path).
func BenchmarkBootstrapRatingNoSeason(b *testing.B) {
	cv := newCorrieVale()
	s := withDraws(cv.series, 50)
	for b.Loop() {
		if _, err := Bootstrap(cv.gauge, s, Options{Method: Rating, AreaKm2: cv.area}, BootstrapOptions{Replicates: 300, Seed: 7, DischargeError: 0.1, AreaError: 0.03}); err != nil {
			b.Fatal(err)
		}
	}
}
