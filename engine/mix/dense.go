package mix

import "math"

// The small dense kernels of both models' likelihoods: a sample's design
// has at most maxRows rows and MaxEndMembers columns. Go's WebAssembly
// sends every jump of a function, and so every turn of a loop, through one
// dispatch, which costs several times the arithmetic of a short loop's
// body; these kernels therefore unroll their loops over the rows and the
// end-members, either over the fixed sizes with zero padding or row by row
// with a test of the size between rows. The bits are those of the plain
// loops (kernels_ref_test.go keeps them, kernels_test.go compares): the
// same products, added in the same order, and a padded product is 0·0 =
// +0, which leaves unchanged a sum that started at +0 (and so is never
// −0) or a difference.

// The unrolled code is written for these sizes.
var (
	_ = [1]struct{}{}[maxRows-8]
	_ = [1]struct{}{}[MaxEndMembers-6]
)

// gram forms H = ÃᵀÃ and b = Ãᵀỹ for the K columns of At's R rows. The
// sums run over the first six rows, and over the last two too when R > 6
// (afterwards, in the same order), so At and yt must be zero past R; H's
// upper triangle is copied from its lower one whole, so H must be zero past
// K to stay so.
func gram(R, K int, At *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
	y0, y1, y2, y3, y4, y5 := yt[0], yt[1], yt[2], yt[3], yt[4], yt[5]
	for i := 0; i < K; i++ {
		a0, a1, a2, a3, a4, a5 := At[0][i], At[1][i], At[2][i], At[3][i], At[4][i], At[5][i]
		h := &H[i]
		// Row i from column i down to 0.
		switch i {
		case 5:
			h[5] = 0.0 + float64(a0*At[0][5]) + float64(a1*At[1][5]) + float64(a2*At[2][5]) + float64(a3*At[3][5]) + float64(a4*At[4][5]) + float64(a5*At[5][5])
			fallthrough
		case 4:
			h[4] = 0.0 + float64(a0*At[0][4]) + float64(a1*At[1][4]) + float64(a2*At[2][4]) + float64(a3*At[3][4]) + float64(a4*At[4][4]) + float64(a5*At[5][4])
			fallthrough
		case 3:
			h[3] = 0.0 + float64(a0*At[0][3]) + float64(a1*At[1][3]) + float64(a2*At[2][3]) + float64(a3*At[3][3]) + float64(a4*At[4][3]) + float64(a5*At[5][3])
			fallthrough
		case 2:
			h[2] = 0.0 + float64(a0*At[0][2]) + float64(a1*At[1][2]) + float64(a2*At[2][2]) + float64(a3*At[3][2]) + float64(a4*At[4][2]) + float64(a5*At[5][2])
			fallthrough
		case 1:
			h[1] = 0.0 + float64(a0*At[0][1]) + float64(a1*At[1][1]) + float64(a2*At[2][1]) + float64(a3*At[3][1]) + float64(a4*At[4][1]) + float64(a5*At[5][1])
			fallthrough
		default:
			h[0] = 0.0 + float64(a0*At[0][0]) + float64(a1*At[1][0]) + float64(a2*At[2][0]) + float64(a3*At[3][0]) + float64(a4*At[4][0]) + float64(a5*At[5][0])
		}
		b[i] = 0.0 + float64(a0*y0) + float64(a1*y1) + float64(a2*y2) + float64(a3*y3) + float64(a4*y4) + float64(a5*y5)
	}
	if R > 6 {
		for i := 0; i < K; i++ {
			a6, a7 := At[6][i], At[7][i]
			for j := 0; j <= i; j++ {
				H[i][j] = H[i][j] + float64(a6*At[6][j]) + float64(a7*At[7][j])
			}
			b[i] = b[i] + float64(a6*yt[6]) + float64(a7*yt[7])
		}
	}
	// The upper triangle (past K, zeros stay zeros).
	H[0][1], H[0][2], H[0][3], H[0][4], H[0][5] = H[1][0], H[2][0], H[3][0], H[4][0], H[5][0]
	H[1][2], H[1][3], H[1][4], H[1][5] = H[2][1], H[3][1], H[4][1], H[5][1]
	H[2][3], H[2][4], H[2][5] = H[3][2], H[4][2], H[5][2]
	H[3][4], H[3][5] = H[4][3], H[5][3]
	H[4][5] = H[5][4]
}

// whiten sets At = w A for the lower-triangular w of R rows, over K
// columns; At's rows from R on are left as they are.
func whiten(R, K int, w *[maxRows][maxRows]float64, A, At *[maxRows][MaxEndMembers]float64) {
	for jj := 0; jj < K; jj++ {
		a0, a1, a2, a3, a4, a5, a6, a7 := A[0][jj], A[1][jj], A[2][jj], A[3][jj], A[4][jj], A[5][jj], A[6][jj], A[7][jj]
		At[0][jj] = 0.0 + float64(w[0][0]*a0)
		if R < 2 {
			continue
		}
		At[1][jj] = 0.0 + float64(w[1][0]*a0) + float64(w[1][1]*a1)
		if R < 3 {
			continue
		}
		At[2][jj] = 0.0 + float64(w[2][0]*a0) + float64(w[2][1]*a1) + float64(w[2][2]*a2)
		if R < 4 {
			continue
		}
		At[3][jj] = 0.0 + float64(w[3][0]*a0) + float64(w[3][1]*a1) + float64(w[3][2]*a2) + float64(w[3][3]*a3)
		if R < 5 {
			continue
		}
		w4 := &w[4]
		At[4][jj] = 0.0 + float64(w4[0]*a0) + float64(w4[1]*a1) + float64(w4[2]*a2) + float64(w4[3]*a3) + float64(w4[4]*a4)
		if R < 6 {
			continue
		}
		w5 := &w[5]
		At[5][jj] = 0.0 + float64(w5[0]*a0) + float64(w5[1]*a1) + float64(w5[2]*a2) + float64(w5[3]*a3) + float64(w5[4]*a4) +
			float64(w5[5]*a5)
		if R < 7 {
			continue
		}
		w6 := &w[6]
		At[6][jj] = 0.0 + float64(w6[0]*a0) + float64(w6[1]*a1) + float64(w6[2]*a2) + float64(w6[3]*a3) + float64(w6[4]*a4) +
			float64(w6[5]*a5) + float64(w6[6]*a6)
		if R < 8 {
			continue
		}
		w7 := &w[7]
		At[7][jj] = 0.0 + float64(w7[0]*a0) + float64(w7[1]*a1) + float64(w7[2]*a2) + float64(w7[3]*a3) + float64(w7[4]*a4) +
			float64(w7[5]*a5) + float64(w7[6]*a6) + float64(w7[7]*a7)
	}
}

// normal forms the normal equations H = ÃᵀÃ, b = Ãᵀỹ of the design A
// whitened by the lower-triangular w (Ã = w A), with ỹ given whitened (zero
// past the R rows).
func normal(R, K int, w *[maxRows][maxRows]float64, A *[maxRows][MaxEndMembers]float64, yt *[maxRows]float64, H *mat6, b *vec6) {
	var At [maxRows][MaxEndMembers]float64
	whiten(R, K, w, A, &At)
	gram(R, K, &At, yt, H, b)
}

// diagonal reports whether the covariance c (lower triangle read, zero past
// the data's rows) is diagonal: whether every entry below the diagonal is
// ±0 (shifting out the sign bit leaves 0 for them alone).
func diagonal(c *[maxRows][maxRows]float64) bool {
	u := fbits(c[1][0]) |
		fbits(c[2][0]) | fbits(c[2][1]) |
		fbits(c[3][0]) | fbits(c[3][1]) | fbits(c[3][2]) |
		fbits(c[4][0]) | fbits(c[4][1]) | fbits(c[4][2]) | fbits(c[4][3]) |
		fbits(c[5][0]) | fbits(c[5][1]) | fbits(c[5][2]) | fbits(c[5][3]) | fbits(c[5][4]) |
		fbits(c[6][0]) | fbits(c[6][1]) | fbits(c[6][2]) | fbits(c[6][3]) | fbits(c[6][4]) | fbits(c[6][5]) |
		fbits(c[7][0]) | fbits(c[7][1]) | fbits(c[7][2]) | fbits(c[7][3]) | fbits(c[7][4]) | fbits(c[7][5]) | fbits(c[7][6])
	return u<<1 == 0
}

func fbits(x float64) uint64 { return math.Float64bits(x) }

// cholSolve factors the leading k×k block of H = L Lᵀ (lower triangle
// read), row by row, into L, whose other entries it leaves as they are, and
// solves L Lᵀ x = b through y = L⁻¹ b. It returns false at the first pivot
// d (in order) that is no larger than its tolerance tol[j], or NaN when
// nanFails: the outcome of the factor column by column, since each entry
// is the same expression of the others. L must be zero past its k rows,
// and x past its k entries (the back substitution's padded products are
// then 0·0).
func cholSolve(k int, H *mat6, tol *vec6, nanFails bool, L *mat6, b, y, x *vec6) bool {
	var h *vec6
	var l10, l11, l20, l21, l22, l30, l31, l32, l33, l40, l41, l42, l43, l44, l50, l51, l52, l53, l54 float64
	d := H[0][0]
	if d <= tol[0] || nanFails && d != d {
		return false
	}
	l00 := sqrt(d)
	L[0][0] = l00
	if k < 2 {
		goto solve
	}
	h = &H[1]
	l10 = h[0] / l00
	d = h[1] - l10*l10
	if d <= tol[1] || nanFails && d != d {
		return false
	}
	l11 = sqrt(d)
	L[1][0], L[1][1] = l10, l11
	if k < 3 {
		goto solve
	}
	h = &H[2]
	l20 = h[0] / l00
	l21 = (h[1] - l20*l10) / l11
	d = h[2] - l20*l20 - l21*l21
	if d <= tol[2] || nanFails && d != d {
		return false
	}
	l22 = sqrt(d)
	L[2][0], L[2][1], L[2][2] = l20, l21, l22
	if k < 4 {
		goto solve
	}
	h = &H[3]
	l30 = h[0] / l00
	l31 = (h[1] - l30*l10) / l11
	l32 = (h[2] - l30*l20 - l31*l21) / l22
	d = h[3] - l30*l30 - l31*l31 - l32*l32
	if d <= tol[3] || nanFails && d != d {
		return false
	}
	l33 = sqrt(d)
	L[3][0], L[3][1], L[3][2], L[3][3] = l30, l31, l32, l33
	if k < 5 {
		goto solve
	}
	h = &H[4]
	l40 = h[0] / l00
	l41 = (h[1] - l40*l10) / l11
	l42 = (h[2] - l40*l20 - l41*l21) / l22
	l43 = (h[3] - l40*l30 - l41*l31 - l42*l32) / l33
	d = h[4] - l40*l40 - l41*l41 - l42*l42 - l43*l43
	if d <= tol[4] || nanFails && d != d {
		return false
	}
	l44 = sqrt(d)
	L[4][0], L[4][1], L[4][2], L[4][3], L[4][4] = l40, l41, l42, l43, l44
	if k < 6 {
		goto solve
	}
	h = &H[5]
	l50 = h[0] / l00
	l51 = (h[1] - l50*l10) / l11
	l52 = (h[2] - l50*l20 - l51*l21) / l22
	l53 = (h[3] - l50*l30 - l51*l31 - l52*l32) / l33
	l54 = (h[4] - l50*l40 - l51*l41 - l52*l42 - l53*l43) / l44
	d = h[5] - l50*l50 - l51*l51 - l52*l52 - l53*l53 - l54*l54
	if d <= tol[5] || nanFails && d != d {
		return false
	}
	L[5][0], L[5][1], L[5][2], L[5][3], L[5][4], L[5][5] = l50, l51, l52, l53, l54, sqrt(d)
solve:
	y[0] = b[0] / L[0][0]
	if k > 1 {
		y[1] = (b[1] - L[1][0]*y[0]) / L[1][1]
	}
	if k > 2 {
		y[2] = (b[2] - L[2][0]*y[0] - L[2][1]*y[1]) / L[2][2]
	}
	if k > 3 {
		y[3] = (b[3] - L[3][0]*y[0] - L[3][1]*y[1] - L[3][2]*y[2]) / L[3][3]
	}
	if k > 4 {
		y[4] = (b[4] - L[4][0]*y[0] - L[4][1]*y[1] - L[4][2]*y[2] - L[4][3]*y[3]) / L[4][4]
	}
	if k > 5 {
		y[5] = (b[5] - L[5][0]*y[0] - L[5][1]*y[1] - L[5][2]*y[2] - L[5][3]*y[3] - L[5][4]*y[4]) / L[5][5]
		x[5] = y[5] / L[5][5]
	}
	if k > 4 {
		x[4] = (y[4] - L[5][4]*x[5]) / L[4][4]
	}
	if k > 3 {
		x[3] = (y[3] - L[4][3]*x[4] - L[5][3]*x[5]) / L[3][3]
	}
	if k > 2 {
		x[2] = (y[2] - L[3][2]*x[3] - L[4][2]*x[4] - L[5][2]*x[5]) / L[2][2]
	}
	if k > 1 {
		x[1] = (y[1] - L[2][1]*x[2] - L[3][1]*x[3] - L[4][1]*x[4] - L[5][1]*x[5]) / L[1][1]
	}
	x[0] = (y[0] - L[1][0]*x[1] - L[2][0]*x[2] - L[3][0]*x[3] - L[4][0]*x[4] - L[5][0]*x[5]) / L[0][0]
	return true
}
