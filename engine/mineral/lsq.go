package mineral

import "math"

// The least-squares machinery of the balance: small dense problems (at
// most NComponents rows), columns held as slices. Householder QR in plain
// Go, so that results are the same natively and in WebAssembly.

// qr is the Householder QR factorisation of the columns idx of a (m rows):
// r holds R above its diagonal and the Householder vectors below, by
// column; beta the reflector scales. With pivot set, columns are reordered
// by remaining norm (column pivoting), and perm gives the order.
type qr struct {
	m, n int
	r    [][]float64 // n columns of m
	beta []float64
	perm []int
}

func factor(a [][]float64, idx []int, m int, pivot bool) *qr {
	q := &qr{m: m, n: len(idx), r: make([][]float64, len(idx)), beta: make([]float64, len(idx)), perm: make([]int, len(idx))}
	for k, j := range idx {
		q.r[k] = append([]float64(nil), a[j]...)
		q.perm[k] = j
	}
	for k := 0; k < q.n && k < m; k++ {
		if pivot { // bring the column of largest remaining norm to k
			best, bn := k, -1.0
			for j := k; j < q.n; j++ {
				s := 0.0
				for i := k; i < m; i++ {
					s += q.r[j][i] * q.r[j][i]
				}
				if s > bn {
					best, bn = j, s
				}
			}
			q.r[k], q.r[best] = q.r[best], q.r[k]
			q.perm[k], q.perm[best] = q.perm[best], q.perm[k]
		}
		c := q.r[k]
		norm := 0.0
		for i := k; i < m; i++ {
			norm = math.Hypot(norm, c[i])
		}
		if norm == 0 {
			continue
		}
		if c[k] > 0 {
			norm = -norm
		}
		// v = c[k:] − norm e1, stored in c[k:]; R[k][k] = norm.
		c[k] -= norm
		vv := 0.0
		for i := k; i < m; i++ {
			vv += c[i] * c[i]
		}
		q.beta[k] = 2 / vv
		for j := k + 1; j < q.n; j++ {
			d := q.r[j]
			s := 0.0
			for i := k; i < m; i++ {
				s += c[i] * d[i]
			}
			s *= q.beta[k]
			for i := k; i < m; i++ {
				d[i] -= s * c[i]
			}
		}
		// Keep v in c[k+1:] scaled so that v[k] is implied: store v[k] in
		// a side slot by leaving it in c[k] and R's diagonal apart.
		q.r[k] = append(c, norm) // the diagonal of R at index m
	}
	return q
}

// diag returns R[k][k].
func (q *qr) diag(k int) float64 {
	if len(q.r[k]) > q.m {
		return q.r[k][q.m]
	}
	return 0
}

// rank counts the diagonal entries of R above tol times the largest.
func (q *qr) rank() int {
	big := 0.0
	for k := 0; k < q.n && k < q.m; k++ {
		big = math.Max(big, math.Abs(q.diag(k)))
	}
	r := 0
	for k := 0; k < q.n && k < q.m; k++ {
		if math.Abs(q.diag(k)) > 1e-10*big && big > 0 {
			r++
		}
	}
	return r
}

// solve returns the least-squares solution of the factored columns for the
// right-hand side b (in the columns' factored order), and false when R is
// singular.
func (q *qr) solve(b []float64) ([]float64, bool) {
	y := append([]float64(nil), b...)
	for k := 0; k < q.n && k < q.m; k++ {
		if q.beta[k] == 0 {
			continue
		}
		c := q.r[k]
		s := 0.0
		for i := k; i < q.m; i++ {
			s += c[i] * y[i]
		}
		s *= q.beta[k]
		for i := k; i < q.m; i++ {
			y[i] -= s * c[i]
		}
	}
	if q.n > q.m {
		return nil, false
	}
	x := make([]float64, q.n)
	for k := q.n - 1; k >= 0; k-- {
		d := q.diag(k)
		if d == 0 {
			return nil, false
		}
		s := y[k]
		for j := k + 1; j < q.n; j++ {
			s -= q.r[j][k] * x[j]
		}
		x[k] = s / d
	}
	return x, true
}

// lsq solves min ‖Σ_{j∈set} a_j x_j − b‖ over the columns with set[j],
// returning x with zeros outside the set.
func lsq(a [][]float64, b []float64, set []bool) ([]float64, bool) {
	var idx []int
	for j, in := range set {
		if in {
			idx = append(idx, j)
		}
	}
	x := make([]float64, len(a))
	if len(idx) == 0 {
		return x, true
	}
	q := factor(a, idx, len(b), false)
	z, ok := q.solve(b)
	if !ok {
		return nil, false
	}
	for k, j := range q.perm {
		x[j] = z[k]
	}
	return x, true
}

// gradient returns w = Aᵀ(b − A x).
func gradient(a [][]float64, b, x []float64) []float64 {
	r := append([]float64(nil), b...)
	for j, c := range a {
		for i := range r {
			r[i] -= c[i] * x[j]
		}
	}
	w := make([]float64, len(a))
	for j, c := range a {
		for i := range r {
			w[j] += c[i] * r[i]
		}
	}
	return w
}

// nnls minimises ‖A x − b‖ subject to x_j ≥ 0 for every j not free: the
// active-set method of Lawson & Hanson (1974, Solving Least Squares
// Problems, ch. 23), with free variables kept in the passive set from the
// start. The columns of A must be linearly independent. It returns x, the
// gradient w = Aᵀ(b − A x) at x (w_j < 0 at a bound says x_j would go
// below zero if it could), and false if it did not converge.
func nnls(a [][]float64, b []float64, free []bool) (x, w []float64, ok bool) {
	n := len(a)
	scale := 0.0
	for _, c := range a {
		for _, v := range c {
			scale = math.Max(scale, math.Abs(v))
		}
	}
	bmax := 0.0
	for _, v := range b {
		bmax = math.Max(bmax, math.Abs(v))
	}
	tol := 1e-12 * scale * math.Max(bmax, 1e-300) * float64(len(b)+1)
	passive := append([]bool(nil), free...)
	x = make([]float64, n)
	if z, ok := lsq(a, b, passive); ok {
		copy(x, z)
	} else {
		return nil, nil, false
	}
	for outer := 0; outer < 3*n+3; outer++ {
		w = gradient(a, b, x)
		banned := map[int]bool{}
		for {
			best, bw := -1, tol
			for j := 0; j < n; j++ {
				if !passive[j] && !banned[j] && w[j] > bw {
					best, bw = j, w[j]
				}
			}
			if best < 0 {
				return x, w, true
			}
			passive[best] = true
			z, ok := lsq(a, b, passive)
			if !ok {
				return nil, nil, false
			}
			if z[best] > 0 {
				break
			}
			passive[best] = false // rounding: it would not move; try another
			banned[best] = true
		}
		for inner := 0; inner < 3*n+3; inner++ {
			z, ok := lsq(a, b, passive)
			if !ok {
				return nil, nil, false
			}
			feasible, alpha := true, 1.0
			for j := 0; j < n; j++ {
				if passive[j] && !free[j] && z[j] <= 0 {
					feasible = false
					if d := x[j] - z[j]; d > 0 {
						alpha = math.Min(alpha, x[j]/d)
					} else {
						alpha = 0
					}
				}
			}
			if feasible {
				x = z
				break
			}
			for j := 0; j < n; j++ {
				if passive[j] {
					x[j] += alpha * (z[j] - x[j])
				}
			}
			big := 0.0
			for _, v := range x {
				big = math.Max(big, math.Abs(v))
			}
			for j := 0; j < n; j++ {
				if passive[j] && !free[j] && x[j] <= 1e-14*big {
					passive[j], x[j] = false, 0
				}
			}
		}
	}
	return x, gradient(a, b, x), false
}
