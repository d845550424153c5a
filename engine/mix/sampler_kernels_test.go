package mix

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// The inverse model's kernels written out for WebAssembly against their
// plain loops (sampler_loops_test.go), bit for bit, over random inputs of
// every size with −0, zeros, tiny and huge values among them.

// same reports whether a and b have the same bits, or are both NaN.
func same(a, b float64) bool {
	return math.Float64bits(a) == math.Float64bits(b) || (a != a && b != b)
}

// odd draws a value: mostly ordinary, sometimes −0, 0, tiny or huge.
func odd(rng *rand.Rand) float64 {
	switch rng.IntN(16) {
	case 0:
		return math.Copysign(0, -1)
	case 1:
		return 0
	case 2:
		return 1e-300 * (rng.Float64() - 0.5)
	case 3:
		return 1e300 * (rng.Float64() - 0.5)
	case 4:
		return 5e-324
	}
	return rng.NormFloat64() * math.Exp(2*rng.NormFloat64())
}

// randomProposal returns a proposal of d dimensions and nc components,
// from an ordinary covariance or, when wild, any lower triangle.
func randomProposal(rng *rand.Rand, d, nc int, wild bool) proposal {
	p := proposal{d: d}
	for range nc {
		c := component{pi: rng.Float64() + 0.01, mu: make([]float64, d), l: make([]float64, d*d)}
		for i := range d {
			c.mu[i] = rng.NormFloat64()
			if wild {
				c.mu[i] = odd(rng)
			}
			for k := 0; k <= i; k++ {
				switch {
				case wild:
					c.l[i*d+k] = odd(rng)
				case k == i:
					c.l[i*d+k] = 0.2 + rng.Float64()
				default:
					c.l[i*d+k] = 0.3 * rng.NormFloat64()
				}
			}
			c.halfDet += plog(abs(c.l[i*d+i]))
		}
		c.pad(d)
		p.comp = append(p.comp, c)
	}
	p.normalise()
	return p
}

func TestProposalKernelsSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for d := 0; d <= smallDim; d++ {
		for nc := 1; nc <= 4; nc++ {
			for trial := range 300 {
				p := randomProposal(rng, d, nc, trial%3 == 0)
				eta := make([]float64, d, d+rng.IntN(2*smallDim)) // with and without room to read smallDim lanes
				for i := range eta {
					eta[i] = rng.NormFloat64()
					if trial%2 == 0 {
						eta[i] = odd(rng)
					}
				}
				if got, want := p.ell(eta, make([]float64, d)), loopEll(&p, eta, make([]float64, d)); !same(got, want) {
					t.Fatalf("d %d, %d components: ell %v, loops %v", d, nc, got, want)
				}
				z := make([]float64, d, d+rng.IntN(2*smallDim))
				for i := range z {
					z[i] = odd(rng)
				}
				u := rng.Float64()
				got, want := make([]float64, d, cap(z)), make([]float64, d)
				p.draw(u, z, got)
				loopDraw(&p, u, z, want)
				for i := range got {
					if !same(got[i], want[i]) {
						t.Fatalf("d %d: draw %v, loops %v", d, got, want)
					}
				}
			}
		}
	}
}

func TestMomentsSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for d := 0; d <= smallDim; d++ {
		for _, stride := range []int{d, smallDim, smallDim + 5} {
			if stride < d {
				continue
			}
			for trial := range 200 {
				n := rng.IntN(40)
				ds := &draws{rec: make([]float64, n*stride), stride: stride, n: n}
				w, in := make([]float64, n), make([]bool, n)
				for k := range n {
					for i := range stride {
						ds.rec[k*stride+i] = rng.NormFloat64()
						if trial%2 == 0 {
							ds.rec[k*stride+i] = odd(rng)
						}
					}
					w[k] = rng.Float64()
					if trial%3 == 0 {
						w[k] = odd(rng)
					}
					in[k] = rng.IntN(4) > 0
				}
				g, tw, ok := moments(d, ds, w, in)
				g0, tw0, ok0 := loopMoments(d, ds, w, in)
				if ok != ok0 || (ok && !same(tw, tw0)) {
					t.Fatalf("d %d: moments %v %v, loops %v %v", d, tw, ok, tw0, ok0)
				}
				if !ok {
					continue
				}
				for i := range g.mu {
					if !same(g.mu[i], g0.mu[i]) {
						t.Fatalf("d %d: mean %v, loops %v", d, g.mu, g0.mu)
					}
				}
				for i := range g.cov {
					if !same(g.cov[i], g0.cov[i]) {
						t.Fatalf("d %d: covariance %v, loops %v", d, g.cov, g0.cov)
					}
				}
			}
		}
	}
}

// slabCase is one draw's problem for slabDraw: K end-members, the normal
// equations H, b of an R-row design, the data norm, the charges and the
// datum of Na that sets the regularisation.
type slabCase struct {
	K     int
	H     mat6
	b, c  vec6
	yy, y float64
}

// randomSlabCase makes a slab problem from seed: usually a design with
// data near a mix, sometimes a singular or wild one.
func randomSlabCase(seed uint64, K int) slabCase {
	rng := rand.New(rand.NewPCG(seed, uint64(K)))
	sc := slabCase{K: K, y: math.Exp(3 * rng.NormFloat64())}
	R := 1 + rng.IntN(maxRows)
	var A [maxRows][MaxEndMembers]float64
	var y [maxRows]float64
	for i := range R {
		for j := range K {
			A[i][j] = math.Exp(rng.NormFloat64())
		}
		y[i] = 10 * rng.Float64()
	}
	for i := range K {
		for j := range K {
			for p := range R {
				sc.H[i][j] += A[p][i] * A[p][j]
			}
		}
		for p := range R {
			sc.b[i] += A[p][i] * y[p]
		}
		sc.c[i] = 1 + 3*rng.Float64()
	}
	for p := range R {
		sc.yy += y[p] * y[p]
	}
	switch rng.IntN(6) {
	case 0: // wild entries
		for i := range K {
			for j := range K {
				sc.H[i][j] = odd(rng)
			}
			sc.b[i], sc.c[i] = odd(rng), odd(rng)
		}
		sc.yy = odd(rng)
	case 1: // a column of zeros
		j := rng.IntN(K)
		for i := range K {
			sc.H[i][j], sc.H[j][i] = 0, 0
		}
		sc.b[j] = 0
	case 2: // huge data
		sc.yy *= 1e200
		for i := range K {
			sc.b[i] *= 1e100
		}
	}
	return sc
}

// checkSlab runs slabDraw and its loops on the same problem and streams,
// and describes any difference.
func checkSlab(seed uint64, sc slabCase) error {
	st := &setup{}
	st.y[0] = sc.y
	r := &Run{}
	mk := func() *sampleWork {
		w := &sampleWork{st: st, src: newStream(seed, 99)}
		w.rng = rand.New(w.src)
		return w
	}
	w, w0 := mk(), mk()
	for draw := range 4 {
		H, b, c := sc.H, sc.b, sc.c
		var n, n0 vec6
		got := r.slabDraw(w, sc.K, &H, &b, sc.yy, &c, &n)
		H, b, c = sc.H, sc.b, sc.c
		want := r.loopSlabDraw(w0, sc.K, &H, &b, sc.yy, &c, &n0)
		if !same(got, want) {
			return fmt.Errorf("draw %d: log weight %v, loops %v", draw, got, want)
		}
		for j := range n {
			if !same(n[j], n0[j]) {
				return fmt.Errorf("draw %d: amounts %v, loops %v", draw, n, n0)
			}
		}
		if *w.src != *w0.src {
			return fmt.Errorf("draw %d: the streams differ after it", draw)
		}
	}
	return nil
}

func TestSlabDrawSameBits(t *testing.T) {
	for K := 1; K <= MaxEndMembers; K++ {
		for seed := range uint64(150) {
			if err := checkSlab(seed, randomSlabCase(seed, K)); err != nil {
				t.Fatalf("K %d, seed %d: %v", K, seed, err)
			}
		}
	}
}

// FuzzSlabDrawSameBits: slabDraw against its loops on problems made from
// the fuzzed seed, and on H, b and yy given outright.
func FuzzSlabDrawSameBits(f *testing.F) {
	f.Add(uint64(1), uint8(2), 0.0, 0.0, 0.0)
	f.Add(uint64(2), uint8(3), 1.0, -1.0, 5.0)
	f.Add(uint64(3), uint8(6), 1e300, 1e-300, math.Inf(1))
	f.Add(uint64(4), uint8(1), math.NaN(), 0.0, -1.0)
	f.Fuzz(func(t *testing.T, seed uint64, k uint8, h, b, yy float64) {
		K := 1 + int(k)%MaxEndMembers
		sc := randomSlabCase(seed, K)
		if err := checkSlab(seed, sc); err != nil {
			t.Fatal(err)
		}
		i, j := int(seed%uint64(K)), int(seed/7%uint64(K))
		sc.H[i][j], sc.b[i], sc.yy = h, b, yy
		if err := checkSlab(seed, sc); err != nil {
			t.Fatal(err)
		}
	})
}

func TestWeightsSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	for S := 0; S <= 6; S++ {
		for range 200 {
			n := S + 1 + rng.IntN(50)
			w := &sampleWork{n: n, d: 1, stride: 1 + oFrac, props: make([]proposal, S)}
			// Stage sizes adding up to n.
			w.nStage = make([]int, S+1)
			for range n {
				w.nStage[rng.IntN(S+1)]++
			}
			w.rec = make([]float64, n*w.stride)
			for k := range n {
				w.rec[k*w.stride+w.d+oLogL] = -math.Abs(odd(rng))
				if rng.IntN(10) == 0 {
					w.rec[k*w.stride+w.d+oLogL] = math.Inf(-1)
				}
			}
			w.ell = make([][]float64, S)
			for s := range S {
				w.ell[s] = make([]float64, n)
				for k := range n {
					w.ell[s][k] = odd(rng)
					if rng.IntN(20) == 0 {
						w.ell[s][k] = [3]float64{math.Inf(1), math.Inf(-1), math.NaN()}[rng.IntN(3)]
					}
				}
			}
			w.mixture()
			lq := make([]float64, n)
			loopMixture(w, lq)
			for k := range n {
				if !same(w.lq[k], lq[k]) {
					t.Fatalf("%d stages: mixture %v, loops %v", S, w.lq, lq)
				}
			}
			for _, beta := range []float64{1, 0.5, 1e-3, 0} {
				wt, wt0 := make([]float64, n), make([]float64, n)
				ess, ess0 := w.tempered(wt, beta), loopTempered(w, wt0, beta)
				if !same(ess, ess0) {
					t.Fatalf("%d stages, beta %g: ESS %v, loops %v", S, beta, ess, ess0)
				}
				for k := range n {
					if !same(wt[k], wt0[k]) {
						t.Fatalf("%d stages, beta %g: weights %v, loops %v", S, beta, wt, wt0)
					}
				}
			}
		}
	}
}

func TestEvalSumsSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(13, 14))
	for K := 0; K <= MaxEndMembers; K++ {
		for R := 1; R <= maxRows; R++ {
			for range 100 {
				var H mat6
				var b, n, b0, b1, b2 vec6
				var A, At [maxRows][MaxEndMembers]float64
				var eps [maxRows]float64
				for i := range K {
					for j := range K {
						H[i][j] = odd(rng)
					}
					b[i], n[i], b0[i] = odd(rng), odd(rng), odd(rng)
				}
				for p := range R {
					for j := range K {
						A[p][j], At[p][j] = odd(rng), odd(rng)
					}
					eps[p] = odd(rng)
				}
				yy := odd(rng)
				if got, want := residual(K, yy, &b, &H, &n), loopResidual(K, yy, &b, &H, &n); !same(got, want) {
					t.Fatalf("K %d: residual %v, loops %v", K, got, want)
				}
				perturbed(K, &At, &eps, &b0, &b1)
				for i := range K {
					s1 := 0.0
					for p := range R {
						s1 += float64(At[p][i] * eps[p])
					}
					b2[i] = b0[i] + s1
					if !same(b1[i], b2[i]) {
						t.Fatalf("K %d, R %d: perturbed %v, loops %v", K, R, b1, b2)
					}
				}
				pr := make([]float64, R)
				predicted(pr, &A, &n)
				for i := range R {
					s := 0.0
					for jj := range K {
						s += float64(A[i][jj] * n[jj])
					}
					if !same(pr[i], s) {
						t.Fatalf("K %d, R %d: predicted %v, loop %v", K, R, pr[i], s)
					}
				}
			}
		}
	}
}

func TestLanesSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(15, 16))
	for R := 1; R <= maxRows; R++ {
		for q := 0; q <= 20; q++ {
			st := &setup{r: R, q: q, m: make([]float64, R*q)}
			for i := range st.m {
				st.m[i] = odd(rng)
			}
			grad := func() []float64 {
				g := make([]float64, q)
				for i := range g {
					g[i] = odd(rng)
				}
				return g
			}
			for c := range NCations {
				st.atm[c].Value, st.atm[c].Grad = odd(rng), grad()
				st.evap[c].Value, st.evap[c].Grad = odd(rng), grad()
			}
			st.so4.Value, st.so4.Grad = odd(rng), grad()
			w := &sampleWork{st: st}
			w.z = make([]float64, q)
			w.setLanes()
			if !w.lanes {
				t.Fatalf("R %d, q %d: no lanes", R, q)
			}
			for range 20 {
				for i := range w.z {
					w.z[i] = odd(rng)
				}
				w.linearAt()
				want := loopLinear(st, w.z)
				for l := range nLanes {
					if l >= R && l < laneAtm {
						continue // rows beyond the data's
					}
					if !same(w.zl[l], want[l]) {
						t.Fatalf("R %d, q %d, lane %d: %v, loops %v", R, q, l, w.zl[l], want[l])
					}
				}
			}
		}
	}
}

func TestStreamIsPCG(t *testing.T) {
	for seed := range uint64(20) {
		s, p := newStream(seed, ^seed), rand.NewPCG(seed, ^seed)
		rp := rand.New(rand.NewPCG(seed, ^seed))
		for n := range 40 {
			u := make([]uint64, n)
			s.fill(u)
			for i := range u {
				if want := p.Uint64(); u[i] != want {
					t.Fatalf("seed %d: %#x, PCG %#x", seed, u[i], want)
				}
			}
			if got, want := s.Uint64(), p.Uint64(); got != want {
				t.Fatalf("seed %d: Uint64 %#x, PCG %#x", seed, got, want)
			}
			for range n + 1 { // the numbers above, on the rand.Rand's stream
				rp.Uint64()
			}
			z, v := make([]float64, n), make([]float64, n)
			normals(z, s)
			uniforms(v, s)
			for i := range z {
				if want := loopNormQuantile(uniform(rp)); !same(z[i], want) {
					t.Fatalf("seed %d: normal %v, loops %v", seed, z[i], want)
				}
			}
			for i := range v {
				if want := uniform(rp); !same(v[i], want) {
					t.Fatalf("seed %d: uniform %v, loops %v", seed, v[i], want)
				}
			}
			for range 2 * n {
				p.Uint64()
			}
		}
	}
}

func TestQuantileAndErfcSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(17, 18))
	for range 100000 {
		p := rng.Float64()
		if rng.IntN(10) == 0 {
			p = math.Ldexp(rng.Float64(), -rng.IntN(1000))
		}
		q := []float64{p}
		quantiles(q)
		if got, want := normQuantile(p), loopNormQuantile(p); !same(got, want) || !same(q[0], want) {
			t.Fatalf("normQuantile(%v) = %v, quantiles %v, loops %v", p, got, q[0], want)
		}
		x := odd(rng)
		if got, want := perfc(x), loopPerfc(x); !same(got, want) {
			t.Fatalf("perfc(%v) = %v, loops %v", x, got, want)
		}
	}
}

func TestPosAndAtLeastAreMax(t *testing.T) {
	rng := rand.New(rand.NewPCG(19, 20))
	for i := range 100000 {
		x := odd(rng)
		if i < 6 {
			x = []float64{math.NaN(), math.Inf(1), math.Inf(-1), 0, math.Copysign(0, -1), 1}[i]
		}
		if !same(pos(x), max(0, x)) || !same(pos(x), max(x, 0)) {
			t.Fatalf("pos(%v) = %v, max %v", x, pos(x), max(0, x))
		}
		for _, c := range []float64{slabLo, 1e-300, 5e-324, 1e300} {
			if !same(atLeast(x, c), max(x, c)) {
				t.Fatalf("atLeast(%v, %v) = %v, max %v", x, c, atLeast(x, c), max(x, c))
			}
		}
	}
}

func TestCorrsSameBits(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	for k := 1; k <= MaxEndMembers; k++ {
		for trial := range 100 {
			n := 1 + rng.IntN(60)
			w := &sampleWork{k: k, d: 0, stride: oFrac + k}
			w.rec = make([]float64, n*w.stride)
			var keep []int
			var kw []float64
			for i := range n {
				for a := range k {
					w.rec[i*w.stride+oFrac+a] = math.Abs(odd(rng))
					if trial%4 == 0 {
						w.rec[i*w.stride+oFrac+a] = 0 // an amount that does not vary
					}
				}
				if rng.IntN(5) > 0 {
					keep = append(keep, i)
					kw = append(kw, rng.Float64())
				}
			}
			var corr [MaxEndMembers][MaxEndMembers]float64
			w.corrs(keep, kw, &corr)
			for a := range k {
				for b := range k {
					if want := loopCorr(w, keep, kw, a, b); !same(corr[a][b], want) {
						t.Fatalf("k %d: corr(%d, %d) = %v, loops %v", k, a, b, corr[a][b], want)
					}
				}
			}
		}
	}
}
