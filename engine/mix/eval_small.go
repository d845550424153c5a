package mix

// eval's sums over the draw's rows and amounts, written out (see
// proposal_small.go for why), each the same, bit for bit, as the loop it
// replaces (eval_small_test.go).

// residual returns yy − 2 bᵀn + nᵀHn for k amounts (dot and quad), written
// out for each k: the same sums in the same order as the loops.
func residual(k int, yy float64, b *vec6, H *mat6, n *vec6) float64 {
	switch k {
	case 1:
		d := 0.0 + float64(b[0]*n[0])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0])))
		return yy - 2*d + q
	case 2:
		d := 0.0 + float64(b[0]*n[0]) + float64(b[1]*n[1])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0]) + float64(H[0][1]*n[1])))
		q += float64(n[1] * (0.0 + float64(H[1][0]*n[0]) + float64(H[1][1]*n[1])))
		return yy - 2*d + q
	case 3:
		d := 0.0 + float64(b[0]*n[0]) + float64(b[1]*n[1]) + float64(b[2]*n[2])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0]) + float64(H[0][1]*n[1]) + float64(H[0][2]*n[2])))
		q += float64(n[1] * (0.0 + float64(H[1][0]*n[0]) + float64(H[1][1]*n[1]) + float64(H[1][2]*n[2])))
		q += float64(n[2] * (0.0 + float64(H[2][0]*n[0]) + float64(H[2][1]*n[1]) + float64(H[2][2]*n[2])))
		return yy - 2*d + q
	case 4:
		d := 0.0 + float64(b[0]*n[0]) + float64(b[1]*n[1]) + float64(b[2]*n[2]) + float64(b[3]*n[3])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0]) + float64(H[0][1]*n[1]) + float64(H[0][2]*n[2]) + float64(H[0][3]*n[3])))
		q += float64(n[1] * (0.0 + float64(H[1][0]*n[0]) + float64(H[1][1]*n[1]) + float64(H[1][2]*n[2]) + float64(H[1][3]*n[3])))
		q += float64(n[2] * (0.0 + float64(H[2][0]*n[0]) + float64(H[2][1]*n[1]) + float64(H[2][2]*n[2]) + float64(H[2][3]*n[3])))
		q += float64(n[3] * (0.0 + float64(H[3][0]*n[0]) + float64(H[3][1]*n[1]) + float64(H[3][2]*n[2]) + float64(H[3][3]*n[3])))
		return yy - 2*d + q
	case 5:
		d := 0.0 + float64(b[0]*n[0]) + float64(b[1]*n[1]) + float64(b[2]*n[2]) + float64(b[3]*n[3]) + float64(b[4]*n[4])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0]) + float64(H[0][1]*n[1]) + float64(H[0][2]*n[2]) + float64(H[0][3]*n[3]) + float64(H[0][4]*n[4])))
		q += float64(n[1] * (0.0 + float64(H[1][0]*n[0]) + float64(H[1][1]*n[1]) + float64(H[1][2]*n[2]) + float64(H[1][3]*n[3]) + float64(H[1][4]*n[4])))
		q += float64(n[2] * (0.0 + float64(H[2][0]*n[0]) + float64(H[2][1]*n[1]) + float64(H[2][2]*n[2]) + float64(H[2][3]*n[3]) + float64(H[2][4]*n[4])))
		q += float64(n[3] * (0.0 + float64(H[3][0]*n[0]) + float64(H[3][1]*n[1]) + float64(H[3][2]*n[2]) + float64(H[3][3]*n[3]) + float64(H[3][4]*n[4])))
		q += float64(n[4] * (0.0 + float64(H[4][0]*n[0]) + float64(H[4][1]*n[1]) + float64(H[4][2]*n[2]) + float64(H[4][3]*n[3]) + float64(H[4][4]*n[4])))
		return yy - 2*d + q
	case 6:
		d := 0.0 + float64(b[0]*n[0]) + float64(b[1]*n[1]) + float64(b[2]*n[2]) + float64(b[3]*n[3]) + float64(b[4]*n[4]) + float64(b[5]*n[5])
		q := 0.0
		q += float64(n[0] * (0.0 + float64(H[0][0]*n[0]) + float64(H[0][1]*n[1]) + float64(H[0][2]*n[2]) + float64(H[0][3]*n[3]) + float64(H[0][4]*n[4]) + float64(H[0][5]*n[5])))
		q += float64(n[1] * (0.0 + float64(H[1][0]*n[0]) + float64(H[1][1]*n[1]) + float64(H[1][2]*n[2]) + float64(H[1][3]*n[3]) + float64(H[1][4]*n[4]) + float64(H[1][5]*n[5])))
		q += float64(n[2] * (0.0 + float64(H[2][0]*n[0]) + float64(H[2][1]*n[1]) + float64(H[2][2]*n[2]) + float64(H[2][3]*n[3]) + float64(H[2][4]*n[4]) + float64(H[2][5]*n[5])))
		q += float64(n[3] * (0.0 + float64(H[3][0]*n[0]) + float64(H[3][1]*n[1]) + float64(H[3][2]*n[2]) + float64(H[3][3]*n[3]) + float64(H[3][4]*n[4]) + float64(H[3][5]*n[5])))
		q += float64(n[4] * (0.0 + float64(H[4][0]*n[0]) + float64(H[4][1]*n[1]) + float64(H[4][2]*n[2]) + float64(H[4][3]*n[3]) + float64(H[4][4]*n[4]) + float64(H[4][5]*n[5])))
		q += float64(n[5] * (0.0 + float64(H[5][0]*n[0]) + float64(H[5][1]*n[1]) + float64(H[5][2]*n[2]) + float64(H[5][3]*n[3]) + float64(H[5][4]*n[4]) + float64(H[5][5]*n[5])))
		return yy - 2*d + q
	}
	return yy - 2*dot(k, b, n) + quad(k, H, n)
}

// perturbed sets b1 = b0 + Ãᵀε̃ for k columns over all maxRows rows (the
// rows beyond the data's are zero in Ã and ε̃, and add +0).
func perturbed(k int, At *[maxRows][MaxEndMembers]float64, eps *[maxRows]float64, b0, b1 *vec6) {
	for i := 0; i < k; i++ {
		b1[i] = b0[i] + (0.0 + float64(At[0][i]*eps[0]) + float64(At[1][i]*eps[1]) + float64(At[2][i]*eps[2]) + float64(At[3][i]*eps[3]) + float64(At[4][i]*eps[4]) + float64(At[5][i]*eps[5]) + float64(At[6][i]*eps[6]) + float64(At[7][i]*eps[7]))
	}
}

// predicted sets pr = A n over all MaxEndMembers columns (the columns
// beyond the end-members taking part are zero in A and n, and add +0).
func predicted(pr []float64, A *[maxRows][MaxEndMembers]float64, n *vec6) {
	for i := range pr {
		a := &A[i]
		pr[i] = 0.0 + float64(a[0]*n[0]) + float64(a[1]*n[1]) + float64(a[2]*n[2]) + float64(a[3]*n[3]) + float64(a[4]*n[4]) + float64(a[5]*n[5])
	}
}
