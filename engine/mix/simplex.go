package mix

import "math/bits"

// MaxEndMembers is the largest number of end-members the inverse model
// takes. The constrained solver enumerates faces of the simplex, 2^n - 1 of
// them at worst, which stays cheap up to six.
const MaxEndMembers = 6

// simplexLS solves the small quadratic programme
//
//	minimise  f(a) = ½ aᵀ G a - gᵀ a
//	subject to sum_j a_j = 1, a_j >= 0,
//
// for G = Eᵀ W E and g = Eᵀ W d of a weighted least-squares problem
// ||W^½ (E a - d)||². It is exact: it solves the equality-constrained
// problem on faces of the simplex (the support of a), largest faces first,
// and stops at the first face whose solution is feasible and satisfies the
// Karush-Kuhn-Tucker conditions of the faces it leaves out. The problem is
// convex, so that point is a global minimum; when G is only semi-definite
// (fewer independent tracers than end-members minus one) it is one of the
// minima, chosen by the fixed enumeration order. Each face is solved in
// closed form after eliminating the closure: with r the last index of the
// face, a = e_r + P y, and the reduced system (Pᵀ G P) y = Pᵀ(g - G e_r)
// is factorised by Cholesky (docs/methods.md §7.3 step 2).
//
// The result is written to a (entries beyond n are zeroed); ok is false
// only if no face could be solved (G not finite).
//
// With c = dᵀ W d the misfit is chi2(a) = 2 f(a) + c. The minimum over the
// whole affine hull (the first face) is a lower bound of the constrained
// minimum, so when it already exceeds bound the draw cannot be accepted and
// solve stops early with pruned true (a is then not the minimiser).
type simplexLS struct {
	n int
	G [MaxEndMembers][MaxEndMembers]float64 // only the lower triangle i >= j is read
	g [MaxEndMembers]float64
}

// faceOrder[n] lists the non-empty subsets of n end-members, largest first.
var faceOrder [MaxEndMembers + 1][]uint8

func init() {
	for n := 1; n <= MaxEndMembers; n++ {
		full := 1<<n - 1
		for k := n; k >= 1; k-- {
			for m := full; m >= 1; m-- {
				if bits.OnesCount(uint(m)) == k {
					faceOrder[n] = append(faceOrder[n], uint8(m))
				}
			}
		}
	}
}

// sym fills the upper triangle of G from the lower one.
func (q *simplexLS) sym() {
	for i := 0; i < q.n; i++ {
		for j := 0; j < i; j++ {
			q.G[j][i] = q.G[i][j]
		}
	}
}

// solve finds the minimiser. G must be symmetric (call sym after filling the
// lower triangle).
func (q *simplexLS) solve(a *[MaxEndMembers]float64, c, bound float64) (ok, pruned bool) {
	n := q.n
	var best [MaxEndMembers]float64
	bestF := 0.0
	haveBest := false
	var y [MaxEndMembers]float64
	full := uint8(1<<n - 1)
	for _, mask := range faceOrder[n] {
		if !q.face(mask, &y) {
			continue
		}
		if mask == full {
			f := 0.0
			for i := 0; i < n; i++ {
				s := 0.0
				for j := 0; j < n; j++ {
					s += q.G[i][j] * y[j]
				}
				f += y[i] * (0.5*s - q.g[i])
			}
			// The margin covers the rounding of the expanded form.
			if lb := 2*f + c; lb-1e-9*(c+1) > bound {
				*a = y
				return true, true
			}
		}
		feasible := true
		for j := 0; j < n; j++ {
			if y[j] < 0 {
				if y[j] < -1e-12 {
					feasible = false
					break
				}
				y[j] = 0
			}
		}
		if !feasible {
			continue
		}
		// Gradient r = G a - g; KKT: r_j - r_ref >= 0 for j off the face,
		// up to a tolerance scaled by the size of the terms that make up
		// r_j and r_ref (their rounding error).
		var r, mag [MaxEndMembers]float64
		f := 0.0
		for i := 0; i < n; i++ {
			s, sa := 0.0, 0.0
			for j := 0; j < n; j++ {
				v := q.G[i][j] * y[j]
				s += v
				sa += abs(v)
			}
			r[i] = s - q.g[i]
			mag[i] = sa + abs(q.g[i])
			f += y[i] * (0.5*s - q.g[i])
		}
		ref := 31 - bits.LeadingZeros32(uint32(mask))
		kkt := true
		for j := 0; j < n; j++ {
			if mask&(1<<j) == 0 && r[j]-r[ref] < -1e-13*(mag[j]+mag[ref]) {
				kkt = false
				break
			}
		}
		if kkt {
			*a = y
			return true, false
		}
		if !haveBest || f < bestF {
			best, bestF, haveBest = y, f, true
		}
	}
	if haveBest {
		*a = best
		return true, false
	}
	*a = [MaxEndMembers]float64{}
	return false, false
}

// face solves the equality-constrained problem on the face given by mask and
// writes the full-length solution to a. It returns false when the reduced
// system is singular.
func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

func (q *simplexLS) face(mask uint8, a *[MaxEndMembers]float64) bool {
	var idx [MaxEndMembers]int
	k := 0
	for j := 0; j < q.n; j++ {
		if mask&(1<<j) != 0 {
			idx[k] = j
			k++
		}
	}
	*a = [MaxEndMembers]float64{}
	r := idx[k-1]
	m := k - 1 // reduced dimension
	if m == 0 {
		a[r] = 1
		return true
	}
	// Reduced Hessian H = Pᵀ G P and right-hand side b = Pᵀ (g - G e_r).
	var H [MaxEndMembers - 1][MaxEndMembers - 1]float64
	var b [MaxEndMembers - 1]float64
	grr := q.G[r][r]
	br := q.g[r] - grr
	hmax := 0.0
	for i := 0; i < m; i++ {
		si := idx[i]
		gir := q.G[si][r]
		for j := 0; j <= i; j++ {
			sj := idx[j]
			H[i][j] = q.G[si][sj] - gir - q.G[sj][r] + grr
		}
		b[i] = (q.g[si] - gir) - br
		if H[i][i] > hmax {
			hmax = H[i][i]
		}
	}
	if !(hmax > 0) || hmax > 1e300 {
		return false
	}
	// Cholesky H = L Lᵀ in place (lower triangle), then two triangular solves.
	tol := 1e-13 * hmax
	for j := 0; j < m; j++ {
		d := H[j][j]
		for p := 0; p < j; p++ {
			d -= H[j][p] * H[j][p]
		}
		if d <= tol {
			return false
		}
		d = sqrt(d)
		H[j][j] = d
		for i := j + 1; i < m; i++ {
			s := H[i][j]
			for p := 0; p < j; p++ {
				s -= H[i][p] * H[j][p]
			}
			H[i][j] = s / d
		}
	}
	for i := 0; i < m; i++ {
		s := b[i]
		for p := 0; p < i; p++ {
			s -= H[i][p] * b[p]
		}
		b[i] = s / H[i][i]
	}
	sum := 0.0
	for i := m - 1; i >= 0; i-- {
		s := b[i]
		for p := i + 1; p < m; p++ {
			s -= H[p][i] * b[p]
		}
		b[i] = s / H[i][i]
		a[idx[i]] = b[i]
		sum += b[i]
	}
	a[r] = 1 - sum
	return true
}
