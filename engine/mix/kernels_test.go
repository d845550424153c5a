package mix

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"lixiv/engine/chem"
)

// The unrolled kernels (dense.go, gaussOrthant, logOrthant, face,
// sampleLogL) must give the bits of their plain loop versions
// (kernels_ref_test.go) for every size, over random inputs with zeros of
// both signs, tiny, huge and infinite values, within the padding their
// callers give them (zeros past the data's rows and the end-members).

// sameFloat reports whether a and b have the same bits, every NaN counting
// as one (no result keeps a NaN of these kernels: a sample's log
// likelihood that is NaN makes the chain's density −Inf).
func sameFloat(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || a != a && b != b
}

// kernelGen draws the kernels' inputs; with zeros, most of its values are
// zeros of either sign (so that whole sums are ±0).
type kernelGen struct {
	rng   *rand.Rand
	zeros bool
}

// value returns a number of random sign and scale, now and then an edge:
// ±0, a subnormal, a tiny or huge value, or an infinity.
func (g kernelGen) value() float64 {
	if g.zeros && g.rng.IntN(4) != 0 {
		return math.Copysign(0, float64(g.rng.IntN(2))-0.5)
	}
	switch g.rng.IntN(24) {
	case 0:
		return 0
	case 1:
		return math.Copysign(0, -1)
	case 2:
		return 5e-324
	case 3:
		return -1e-300
	case 4:
		return 1e300
	case 5:
		return -1e200
	case 6:
		if g.rng.IntN(4) == 0 {
			return math.Inf(1)
		}
	}
	return g.rng.NormFloat64() * math.Pow(10, float64(g.rng.IntN(9)-4))
}

// plain returns a moderate value, an edge only now and then.
func (g kernelGen) plain() float64 {
	if g.rng.IntN(16) == 0 {
		return g.value()
	}
	return g.rng.NormFloat64()
}

// rows fills the first R rows and K columns of a, zeros elsewhere.
func (g kernelGen) rows(R, K int, a *[maxRows][MaxEndMembers]float64) {
	*a = [maxRows][MaxEndMembers]float64{}
	for i := range R {
		for j := range K {
			a[i][j] = g.value()
		}
	}
}

// lower fills the lower triangle of the first R rows of w, zeros elsewhere;
// with diag, only the diagonal.
func (g kernelGen) lower(R int, diag bool, w *[maxRows][maxRows]float64) {
	*w = [maxRows][maxRows]float64{}
	for i := range R {
		for j := 0; j <= i; j++ {
			if i == j || !diag {
				w[i][j] = g.value()
			} else if g.rng.IntN(2) == 0 {
				w[i][j] = math.Copysign(0, -1)
			}
		}
	}
}

// spd returns a symmetric K×K matrix (zeros past K): mostly a Gram matrix
// plus a diagonal (positive definite), sometimes any symmetric one.
func (g kernelGen) spd(K int) mat6 {
	var H mat6
	if g.rng.IntN(5) == 0 {
		for i := range K {
			for j := 0; j <= i; j++ {
				H[i][j] = g.value()
				H[j][i] = H[i][j]
			}
		}
		return H
	}
	var A [maxRows][MaxEndMembers]float64
	for i := range maxRows {
		for j := range K {
			A[i][j] = g.plain()
		}
	}
	var y [maxRows]float64
	var b vec6
	refGram(maxRows, K, &A, &y, &H, &b)
	for i := range K {
		H[i][i] += math.Abs(g.plain()) * 1e-3
	}
	return H
}

func (g kernelGen) vec(K int) vec6 {
	var v vec6
	for i := range K {
		v[i] = g.value()
	}
	return v
}

// checkKernels compares every kernel with its plain version on inputs
// drawn from rng for R rows and K end-members, and returns what differs.
func checkKernels(rng *rand.Rand, R, K int) error {
	g := kernelGen{rng, rng.IntN(4) == 0}
	var A, At, At0 [maxRows][MaxEndMembers]float64
	var yt [maxRows]float64
	var w, c [maxRows][maxRows]float64
	var H, H0 mat6
	var b, b0 vec6
	g.rows(R, K, &At)
	for i := range R {
		yt[i] = g.value()
	}
	gram(R, K, &At, &yt, &H, &b)
	refGram(R, K, &At, &yt, &H0, &b0)
	if err := sameMat("gram", K, &H, &H0, &b, &b0); err != nil {
		return err
	}
	g.rows(R, K, &A)
	g.lower(R, false, &w)
	At, At0 = [maxRows][MaxEndMembers]float64{}, [maxRows][MaxEndMembers]float64{}
	whiten(R, K, &w, &A, &At)
	refWhiten(R, K, &w, &A, &At0)
	for i := range maxRows {
		for j := range MaxEndMembers {
			if !sameFloat(At[i][j], At0[i][j]) {
				return fmt.Errorf("whiten: At[%d][%d] = %v, plain %v", i, j, At[i][j], At0[i][j])
			}
		}
	}
	normal(R, K, &w, &A, &yt, &H, &b)
	refNormal(R, K, &w, &A, &yt, &H0, &b0)
	if err := sameMat("normal", K, &H, &H0, &b, &b0); err != nil {
		return err
	}
	g.lower(R, rng.IntN(2) == 0, &c)
	if got, want := diagonal(&c), refDiagonal(R, &c); got != want {
		return fmt.Errorf("diagonal: %v, plain %v", got, want)
	}
	H = g.spd(K)
	b = g.vec(K)
	yy := g.value()
	if got, want := gaussOrthant(K, &H, &b, yy), refGaussOrthant(K, &H, &b, yy); !sameFloat(got, want) {
		return fmt.Errorf("gaussOrthant: %v, plain %v", got, want)
	}
	var L mat6
	var mu vec6
	if refChol(K, &H, &L) {
		for i := range K {
			mu[i] = g.plain() * math.Sqrt(H[i][i]) * 0.1
		}
		if got, want := logOrthant(K, &L, &mu), refLogOrthant(K, &L, &mu); !sameFloat(got, want) {
			return fmt.Errorf("logOrthant: %v, plain %v", got, want)
		}
	}
	for mask := range 1 << K {
		var n, n0 vec6
		ok, ok0 := face(K, uint8(mask), &H, &b, &n), refFace(K, uint8(mask), &H, &b, &n0)
		if ok != ok0 {
			return fmt.Errorf("face %b: %v, plain %v", mask, ok, ok0)
		}
		if err := sameVec("face", &n, &n0); err != nil {
			return err
		}
	}
	var n, n0 vec6
	nnls(K, &H, &b, &n)
	refNnls(K, &H, &b, &n0)
	return sameVec("nnls", &n, &n0)
}

// refChol sets L to the Cholesky factor of H as gaussOrthant takes it, and
// false where it has none.
func refChol(K int, H *mat6, L *mat6) bool {
	for j := range K {
		d := H[j][j]
		for p := range j {
			d -= L[j][p] * L[j][p]
		}
		if !(d > 1e-13*H[j][j]) {
			return false
		}
		L[j][j] = math.Sqrt(d)
		for i := j + 1; i < K; i++ {
			s := H[i][j]
			for p := range j {
				s -= L[i][p] * L[j][p]
			}
			L[i][j] = s / L[j][j]
		}
	}
	return true
}

func sameMat(name string, K int, H, H0 *mat6, b, b0 *vec6) error {
	for i := range K {
		for j := range K {
			if !sameFloat(H[i][j], H0[i][j]) {
				return fmt.Errorf("%s: H[%d][%d] = %v, plain %v", name, i, j, H[i][j], H0[i][j])
			}
		}
	}
	return sameVec(name, b, b0)
}

func sameVec(name string, v, v0 *vec6) error {
	for i := range v {
		if !sameFloat(v[i], v0[i]) {
			return fmt.Errorf("%s: [%d] = %v, plain %v", name, i, v[i], v0[i])
		}
	}
	return nil
}

func TestKernelsSameBits(t *testing.T) {
	for R := 1; R <= maxRows; R++ {
		for K := 1; K <= MaxEndMembers; K++ {
			t.Run(fmt.Sprintf("R%dK%d", R, K), func(t *testing.T) {
				rng := rand.New(rand.NewPCG(uint64(R), uint64(K)))
				for range 300 {
					if err := checkKernels(rng, R, K); err != nil {
						t.Fatal(err)
					}
				}
			})
		}
	}
}

// FuzzKernelsSameBits compares the kernels with their plain versions on
// the inputs a seed draws.
func FuzzKernelsSameBits(f *testing.F) {
	for _, s := range []uint64{0, 1, 7, 42, 1 << 40} {
		f.Add(s, uint8(6), uint8(4))
	}
	f.Add(uint64(3), uint8(8), uint8(6))
	f.Add(uint64(5), uint8(1), uint8(1))
	f.Fuzz(func(t *testing.T, seed uint64, r, k uint8) {
		R, K := 1+int(r)%maxRows, 1+int(k)%MaxEndMembers
		if err := checkKernels(rand.New(rand.NewPCG(seed, 0)), R, K); err != nil {
			t.Fatal(err)
		}
	})
}

// TestSampleLogLSameBits compares the catchment-wide likelihood of each
// sample of synthetic catchments of two to four end-members with its plain
// version, at shared ratios and scatters drawn about the priors, with the
// samples' own covariances and with covariances given terms beside the
// diagonal (as corrected waters have), and with two rows more (Sr/Na and
// the isotope's).
func TestSampleLogLSameBits(t *testing.T) {
	for _, n := range []int{2, 3, 4} {
		sc := makeCatchment(12, n, uint64(n))
		sc.prob.Tracers = append(sc.prob.Tracers, KNa)
		c, err := NewCatchmentRun(sc.prob, &Options{Seed: 1}, nil)
		if err != nil {
			t.Fatal(err)
		}
		r := c.base
		rng := rand.New(rand.NewPCG(uint64(n), 9))
		g := kernelGen{rng, false}
		for trial := range 40 {
			var th [NTracers][MaxEndMembers]float64
			var tau [MaxEndMembers]float64
			for tr := range NTracers {
				for j := range r.n {
					th[tr][j] = r.smp[tr][j].v * math.Exp(0.5*rng.NormFloat64())
					if trial%10 == 9 && rng.IntN(8) == 0 {
						th[tr][j] = math.Abs(g.value())
					}
				}
			}
			for j := range r.n {
				tau[j] = 0.2 * math.Abs(rng.NormFloat64())
			}
			for s := range r.res.Samples {
				st := r.res.Samples[s].setup
				if st.skip {
					continue
				}
				if trial%4 >= 2 && st.r == 6 {
					// Sr/Na and the isotope's rows too.
					st.r, st.iso = 8, 7
					st.tr[6], st.tr[7] = SrNa, Sr87Sr86
					for i := 6; i < 8; i++ {
						st.y[i] = math.Abs(g.plain())
						st.cov[i][i] = 0.01 + math.Abs(g.plain())
						st.linv[i][i] = 1 / math.Sqrt(st.cov[i][i])
						st.yt[i] = st.y[i] * st.linv[i][i]
					}
				}
				if trial%2 == 1 {
					for i := 1; i < st.r; i++ {
						for j := range i {
							st.cov[i][j] = 0.1 * rng.NormFloat64() * math.Sqrt(st.cov[i][i]*st.cov[j][j])
						}
					}
				}
				var A, A0 [maxRows][MaxEndMembers]float64
				design(&st, &th, &A)
				refDesign(&st, &th, &A0)
				if A != A0 {
					t.Fatalf("%d end-members, trial %d, sample %d: design %v, plain %v", n, trial, s, A, A0)
				}
				got, want := c.sampleLogLOf(&st, &th, &tau), refSampleLogL(&st, &th, &tau)
				if !sameFloat(got, want) {
					t.Fatalf("%d end-members, trial %d, sample %d: %v, plain %v", n, trial, s, got, want)
				}
			}
		}
	}
}

// TestDist2SameBits compares the proposal components' scaled distance with
// its plain version for 1 to 40 parameters.
func TestDist2SameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 3))
	g := kernelGen{rng, false}
	for np := 1; np <= 40; np++ {
		for range 50 {
			c := tComp{mu: make([]float64, np), m: make([]float64, np*np)}
			y := make([]float64, np)
			for i := range np {
				c.mu[i], y[i] = g.plain(), g.plain()
				for p := 0; p <= i; p++ {
					c.m[i*np+p] = g.value()
				}
			}
			if got, want := c.dist2(y), refDist2(&c, y); !sameFloat(got, want) {
				t.Fatalf("%d parameters: %v, plain %v", np, got, want)
			}
		}
	}
}

// TestDesignSameBits compares the design with its plain version for every
// number of rows, with and without the isotope's row (last, as the setup
// places it).
func TestDesignSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 5))
	g := kernelGen{rng, false}
	for R := 1; R <= maxRows; R++ {
		for range 100 {
			var st setup
			st.r, st.iso = R, -1
			st.tr[0] = -1
			for i := 1; i < R; i++ {
				st.tr[i] = Tracer(rng.IntN(int(Sr87Sr86)))
			}
			if R > 1 && rng.IntN(2) == 0 {
				st.iso = R - 1
				st.tr[st.iso] = Sr87Sr86
			}
			st.act = rng.Perm(MaxEndMembers)[:1+rng.IntN(MaxEndMembers)]
			var th [NTracers][MaxEndMembers]float64
			for tr := range NTracers {
				for j := range MaxEndMembers {
					th[tr][j] = g.value()
				}
			}
			var A, A0 [maxRows][MaxEndMembers]float64
			design(&st, &th, &A)
			refDesign(&st, &th, &A0)
			for i := range maxRows {
				for j := range MaxEndMembers {
					if !sameFloat(A[i][j], A0[i][j]) {
						t.Fatalf("%d rows: A[%d][%d] = %v, plain %v", R, i, j, A[i][j], A0[i][j])
					}
				}
			}
		}
	}
}

// sampleLogLOf is sampleLogL with the sample's own design.
func (c *CatchmentRun) sampleLogLOf(st *setup, th *[NTracers][MaxEndMembers]float64, tau *[MaxEndMembers]float64) float64 {
	var A [maxRows][MaxEndMembers]float64
	design(st, th, &A)
	return c.sampleLogL(st, &A, th, tau, diagonal(&st.cov))
}

// TestLogPostSharesDesign checks that the chains' log posterior, which
// reuses a design across samples of one layout in a row, is the sum of the
// plain likelihoods of the samples with their own designs, in a catchment
// where some samples lack a tracer.
func TestLogPostSharesDesign(t *testing.T) {
	sc := makeCatchment(30, 3, 5)
	sc.prob.Tracers = append(sc.prob.Tracers, KNa)
	for i := range sc.prob.Waters {
		if i%4 == 1 || i%7 == 3 {
			sc.prob.Waters[i].Conc[chem.Mg] = math.NaN()
		}
	}
	c, err := NewCatchmentRun(sc.prob, &Options{Seed: 1}, nil)
	if err != nil {
		t.Fatal(err)
	}
	shared, own := 0, 0
	for _, s := range c.sameA {
		if s {
			shared++
		} else {
			own++
		}
	}
	if shared < 5 || own < 5 {
		t.Fatalf("%d samples share the design before them, %d do not: the test needs both", shared, own)
	}
	ch := c.newChain(0)
	used := c.used
	for range 20 {
		for i := range ch.x {
			ch.prop[i] = ch.x[i] + 0.3*normal01(ch.rng)
			if i >= c.nd {
				ch.prop[i] = math.Abs(ch.prop[i])
			}
		}
		got := c.logPost(ch, ch.prop)
		// The priors' part alone, then each sample's plain likelihood.
		c.used = nil
		want := c.logPost(ch, ch.prop)
		c.used = used
		for _, s := range used {
			want += refSampleLogL(&c.base.res.Samples[s].setup, &ch.th, &ch.tau)
		}
		if !sameFloat(got, want) {
			t.Fatalf("log posterior %v, with each sample's own design and the plain likelihood %v", got, want)
		}
		if math.IsInf(got, 0) || got != got {
			t.Fatalf("log posterior %v: the test needs a finite one", got)
		}
	}
}
