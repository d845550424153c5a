package mix

// Boundary minima for the kernels. When the unconstrained optimum of the
// reduced problem min_y F(y) = ½ yᵀ H y - bᵀ y lies outside the simplex
// (y >= 0, sum y <= 1), or H is singular, the constrained minimum lies on
// the simplex boundary: for a convex F, a minimiser outside the simplex
// pulls the constrained one onto the boundary, and a flat valley of
// minimisers that crosses the simplex also reaches its boundary. The
// boundary is the union of the faces, and each face's minimum is either its
// own unconstrained minimum, when that is inside the face, or lies on the
// face's edges. So the minimum over the boundary is the smallest of
//
//   - every edge minimum (a one-dimensional convex problem: clamp to [0, 1]),
//   - every two-dimensional face minimum that is inside its face,
//
// which the functions below enumerate in a fixed order. In y the misfit is
// chi2(y) = cc + yᵀ H y - 2 bᵀ y. The choice among candidates uses that
// expanded form; the kept draw's misfit is recomputed from its residuals.

// clamp1 minimises ½ den t² - num t over t in [0, 1].
func clamp1(num, den float64) float64 {
	if den > 0 {
		t := num / den
		if t < 0 {
			return 0
		}
		if t > 1 {
			return 1
		}
		return t
	}
	if num > 0 { // linear or concave: an end
		return 1
	}
	return 0
}

// boundary3 returns the minimiser over the boundary of the triangle y0, y1
// >= 0, y0 + y1 <= 1 (three end-members, the third as reference).
func boundary3(h00, h10, h11, b0, b1 float64) (y0, y1 float64) {
	q := func(y0, y1 float64) float64 {
		return h00*y0*y0 + 2*h10*y0*y1 + h11*y1*y1 - 2*(b0*y0+b1*y1)
	}
	// Edge a1 = 0 (y1 = 0), edge a0 = 0 (y0 = 0), edge a2 = 0 (y0 + y1 = 1).
	t := clamp1(b0, h00)
	y0, y1 = t, 0
	best := q(y0, y1)
	t = clamp1(b1, h11)
	if v := q(0, t); v < best {
		y0, y1, best = 0, t, v
	}
	t = clamp1(b0-b1-h10+h11, h00-2*h10+h11)
	if v := q(t, 1-t); v < best {
		y0, y1 = t, 1-t
	}
	return y0, y1
}

// solve2 solves [a c; c d] x = [p; q] and reports false when the matrix
// is not positive definite to working precision.
func solve2(a, c, d, p, q float64) (x0, x1 float64, ok bool) {
	det := a*d - c*c
	if !(a > 0 && d > 0 && det > pivotTol*a*d) {
		return 0, 0, false
	}
	return (d*p - c*q) / det, (a*q - c*p) / det, true
}

// boundary4 returns the minimiser over the boundary of the tetrahedron
// y0, y1, y2 >= 0, y0 + y1 + y2 <= 1 (four end-members, the fourth as
// reference).
func boundary4(h00, h10, h11, h20, h21, h22, b0, b1, b2 float64) (y0, y1, y2 float64) {
	q := func(y0, y1, y2 float64) float64 {
		return h00*y0*y0 + h11*y1*y1 + h22*y2*y2 + 2*(h10*y0*y1+h20*y0*y2+h21*y1*y2) - 2*(b0*y0+b1*y1+b2*y2)
	}
	best := 0.0
	have := false
	try := func(c0, c1, c2 float64) {
		if v := q(c0, c1, c2); !have || v < best {
			y0, y1, y2, best, have = c0, c1, c2, v, true
		}
	}
	// Edges to the reference vertex: one y free, the others 0.
	try(clamp1(b0, h00), 0, 0)
	try(0, clamp1(b1, h11), 0)
	try(0, 0, clamp1(b2, h22))
	// Edges between two of the first three: y_i = t, y_j = 1 - t.
	t := clamp1(b0-b1-h10+h11, h00-2*h10+h11)
	try(t, 1-t, 0)
	t = clamp1(b0-b2-h20+h22, h00-2*h20+h22)
	try(t, 0, 1-t)
	t = clamp1(b1-b2-h21+h22, h11-2*h21+h22)
	try(0, t, 1-t)
	// Faces through the reference vertex: one y is 0.
	if u, v, ok := solve2(h11, h21, h22, b1, b2); ok && u >= 0 && v >= 0 && u+v <= 1 {
		try(0, u, v)
	}
	if u, v, ok := solve2(h00, h20, h22, b0, b2); ok && u >= 0 && v >= 0 && u+v <= 1 {
		try(u, 0, v)
	}
	if u, v, ok := solve2(h00, h10, h11, b0, b1); ok && u >= 0 && v >= 0 && u+v <= 1 {
		try(u, v, 0)
	}
	// The face opposite the reference: y2 = 1 - y0 - y1, reduced with y2's
	// vertex as reference (as in simplexLS.face).
	a := h00 - 2*h20 + h22
	c := h10 - h20 - h21 + h22
	d := h11 - 2*h21 + h22
	p := (b0 - h20) - (b2 - h22)
	r := (b1 - h21) - (b2 - h22)
	if u, v, ok := solve2(a, c, d, p, r); ok && u >= 0 && v >= 0 && u+v <= 1 {
		try(u, v, 1-u-v)
	}
	return y0, y1, y2
}
