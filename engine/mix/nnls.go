package mix

import "math/bits"

// mat6 and vec6 hold the small normal equations of one draw.
type (
	mat6 = [MaxEndMembers][MaxEndMembers]float64
	vec6 = [MaxEndMembers]float64
)

// faceOrder[k] lists the subsets of k unknowns, largest first, ending with
// the empty one.
var faceOrder [MaxEndMembers + 1][]uint8

func init() {
	for k := 1; k <= MaxEndMembers; k++ {
		full := 1<<k - 1
		for size := k; size >= 0; size-- {
			for m := full; m >= 0; m-- {
				if bits.OnesCount(uint(m)) == size {
					faceOrder[k] = append(faceOrder[k], uint8(m))
				}
			}
		}
	}
}

// nnls solves the small quadratic programme
//
//	minimise ½ nᵀ H n − bᵀ n  subject to n_j >= 0
//
// for the normal equations H = ÃᵀÃ, b = Ãᵀỹ of a whitened least-squares
// problem ||ỹ − Ã n||² in k <= MaxEndMembers unknowns (the concentrations
// contributed by the end-members). It is exact: it solves the
// equality-constrained problem on faces of the orthant (the set of
// unknowns left free), the full face first, then the face of the positive
// part of that solution, then every face largest first, and returns the
// first solution that is feasible and meets the Karush-Kuhn-Tucker
// conditions of the unknowns held at zero (common practice; Lawson &
// Hanson 1974 for the conditions). The problem is convex, so that point is
// a global minimum; when H is only semi-definite it is one of the minima,
// chosen by the fixed order. Unknowns held at zero are exactly 0, so a
// source can be absent from a draw.
func nnls(k int, H *mat6, b *vec6, n *vec6) {
	full := uint8(1<<k - 1)
	if face(k, full, H, b, n) && feasible(k, n) {
		return // interior: no KKT check needed
	}
	var pos uint8
	for j := 0; j < k; j++ {
		if n[j] > 0 {
			pos |= 1 << j
		}
	}
	if pos != full && pos != 0 && face(k, pos, H, b, n) && feasible(k, n) && kkt(k, pos, H, b, n) {
		return
	}
	var best vec6
	bestF := 0.0 // the empty face: n = 0, objective 0
	for _, mask := range faceOrder[k][1:] {
		if mask == pos {
			continue
		}
		if !face(k, mask, H, b, n) || !feasible(k, n) {
			continue
		}
		if kkt(k, mask, H, b, n) {
			return
		}
		if f := objective(k, H, b, n); f < bestF {
			best, bestF = *n, f
		}
	}
	*n = best // rounding left no face meeting the conditions: the best feasible one
}

// feasible reports whether n >= 0, setting tiny negatives to 0.
func feasible(k int, n *vec6) bool {
	for j := 0; j < k; j++ {
		if n[j] < 0 {
			if n[j] < -1e-12 {
				return false
			}
			n[j] = 0
		}
	}
	return true
}

// kkt reports whether the gradient H n − b is not negative (up to
// rounding) for every unknown off the face.
func kkt(k int, mask uint8, H *mat6, b *vec6, n *vec6) bool {
	for j := 0; j < k; j++ {
		if mask&(1<<j) != 0 {
			continue
		}
		g, mag := -b[j], abs(b[j])
		for i := 0; i < k; i++ {
			v := H[j][i] * n[i]
			g += v
			mag += abs(v)
		}
		if g < -1e-12*mag {
			return false
		}
	}
	return true
}

func objective(k int, H *mat6, b *vec6, n *vec6) float64 {
	f := 0.0
	for i := 0; i < k; i++ {
		s := 0.0
		for j := 0; j < k; j++ {
			s += H[i][j] * n[j]
		}
		f += n[i] * (0.5*s - b[i])
	}
	return f
}

// face solves H_FF n_F = b_F on the face F given by mask (its bits below
// k), by Cholesky, and writes the full-length solution (zeros off the
// face) to n. It returns false when H_FF is singular to working precision.
func face(k int, mask uint8, H *mat6, b *vec6, n *vec6) bool {
	mask &= 1<<k - 1
	m := faceCount[mask]
	*n = vec6{}
	if m == 0 {
		return true
	}
	var G, L mat6
	var g, y, x vec6
	idx := &faceMembers[mask]
	hf, bf, xf := H, b, n // the whole: H and b as they are
	if m < k {
		// The face's rows of H (every column, the face's in order first)
		// and of b; what lies past m is not read.
		i0, i1, i2, i3, i4, i5 := idx[0], idx[1], idx[2], idx[3], idx[4], idx[5]
		for i := 0; i < m; i++ {
			h := &H[idx[i]]
			G[i] = vec6{h[i0], h[i1], h[i2], h[i3], h[i4], h[i5]}
			g[i] = b[idx[i]]
		}
		hf, bf, xf = &G, &g, &x
	}
	hmax := 0.0
	for i := 0; i < m; i++ {
		if d := hf[i][i]; d > hmax {
			hmax = d
		}
	}
	if !(hmax > 0) || hmax > 1e300 {
		return false
	}
	t := 1e-13 * hmax
	tol := vec6{t, t, t, t, t, t}
	if !cholSolve(m, hf, &tol, false, &L, bf, &y, xf) {
		return false
	}
	if m < k {
		for i := 0; i < m; i++ {
			n[idx[i]] = x[i]
		}
	}
	return true
}

// logDetChol returns ½ log det H of the k×k matrix H by Cholesky, and false
// when H is singular to working precision.
func logDetChol(k int, H *mat6) (float64, bool) {
	var L [MaxEndMembers][MaxEndMembers]float64
	hmax := 0.0
	for i := 0; i < k; i++ {
		hmax = max(hmax, H[i][i])
	}
	tol := 1e-13 * hmax
	s := 0.0
	for j := 0; j < k; j++ {
		d := H[j][j]
		for p := 0; p < j; p++ {
			d -= L[j][p] * L[j][p]
		}
		if !(d > tol) {
			return 0, false
		}
		d = sqrt(d)
		L[j][j] = d
		s += plog(d)
		for i := j + 1; i < k; i++ {
			v := H[i][j]
			for p := 0; p < j; p++ {
				v -= L[i][p] * L[j][p]
			}
			L[i][j] = v / d
		}
	}
	return s, true
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}
