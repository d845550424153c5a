package mix

// The least-squares problem of one face of slabDraw, written out for each
// size m of the face (see proposal_small.go for why): the Cholesky factor of
// H_F + λI column by column, the solution μ, and the Laplace estimate's
// sums t = sum c_i max(μ_i, 0), χ² and the log Jacobian, the same
// operations in the same order as the loops they replace
// (slab_small_test.go holds those loops).

// solve1 is solve for m = 1.
func (f *faceFit) solve1(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0 := f.idx[0]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	y0 := (b[i0]) / l[0][0]
	mu0 := (y0) / l[0][0]
	f.mu[0] = mu0
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	return t, chi2, jac, true
}

// solve2 is solve for m = 2.
func (f *faceFit) solve2(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0, i1 := f.idx[0], f.idx[1]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	l[1][0] = (H[i1][i0]) / d0
	d1 := H[i1][i1] + lambda - float64(l[1][0]*l[1][0])
	if !(d1 > 0) {
		return 0, 0, 0, false
	}
	d1 = sqrt(d1)
	l[1][1] = d1
	y0 := (b[i0]) / l[0][0]
	y1 := (b[i1] - float64(l[1][0]*y0)) / l[1][1]
	mu1 := (y1) / l[1][1]
	mu0 := (y0 - float64(l[1][0]*mu1)) / l[0][0]
	f.mu[0], f.mu[1] = mu0, mu1
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	chi2 += float64(mu0 * H[i0][i1] * mu1)
	t += float64(c[i1] * pos(mu1))
	jac += logc[i1]
	chi2 -= float64(2 * b[i1] * mu1)
	chi2 += float64(mu1 * H[i1][i0] * mu0)
	chi2 += float64(mu1 * H[i1][i1] * mu1)
	return t, chi2, jac, true
}

// solve3 is solve for m = 3.
func (f *faceFit) solve3(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0, i1, i2 := f.idx[0], f.idx[1], f.idx[2]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	l[1][0] = (H[i1][i0]) / d0
	l[2][0] = (H[i2][i0]) / d0
	d1 := H[i1][i1] + lambda - float64(l[1][0]*l[1][0])
	if !(d1 > 0) {
		return 0, 0, 0, false
	}
	d1 = sqrt(d1)
	l[1][1] = d1
	l[2][1] = (H[i2][i1] - float64(l[2][0]*l[1][0])) / d1
	d2 := H[i2][i2] + lambda - float64(l[2][0]*l[2][0]) - float64(l[2][1]*l[2][1])
	if !(d2 > 0) {
		return 0, 0, 0, false
	}
	d2 = sqrt(d2)
	l[2][2] = d2
	y0 := (b[i0]) / l[0][0]
	y1 := (b[i1] - float64(l[1][0]*y0)) / l[1][1]
	y2 := (b[i2] - float64(l[2][0]*y0) - float64(l[2][1]*y1)) / l[2][2]
	mu2 := (y2) / l[2][2]
	mu1 := (y1 - float64(l[2][1]*mu2)) / l[1][1]
	mu0 := (y0 - float64(l[1][0]*mu1) - float64(l[2][0]*mu2)) / l[0][0]
	f.mu[0], f.mu[1], f.mu[2] = mu0, mu1, mu2
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	chi2 += float64(mu0 * H[i0][i1] * mu1)
	chi2 += float64(mu0 * H[i0][i2] * mu2)
	t += float64(c[i1] * pos(mu1))
	jac += logc[i1]
	chi2 -= float64(2 * b[i1] * mu1)
	chi2 += float64(mu1 * H[i1][i0] * mu0)
	chi2 += float64(mu1 * H[i1][i1] * mu1)
	chi2 += float64(mu1 * H[i1][i2] * mu2)
	t += float64(c[i2] * pos(mu2))
	jac += logc[i2]
	chi2 -= float64(2 * b[i2] * mu2)
	chi2 += float64(mu2 * H[i2][i0] * mu0)
	chi2 += float64(mu2 * H[i2][i1] * mu1)
	chi2 += float64(mu2 * H[i2][i2] * mu2)
	return t, chi2, jac, true
}

// solve4 is solve for m = 4.
func (f *faceFit) solve4(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0, i1, i2, i3 := f.idx[0], f.idx[1], f.idx[2], f.idx[3]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	l[1][0] = (H[i1][i0]) / d0
	l[2][0] = (H[i2][i0]) / d0
	l[3][0] = (H[i3][i0]) / d0
	d1 := H[i1][i1] + lambda - float64(l[1][0]*l[1][0])
	if !(d1 > 0) {
		return 0, 0, 0, false
	}
	d1 = sqrt(d1)
	l[1][1] = d1
	l[2][1] = (H[i2][i1] - float64(l[2][0]*l[1][0])) / d1
	l[3][1] = (H[i3][i1] - float64(l[3][0]*l[1][0])) / d1
	d2 := H[i2][i2] + lambda - float64(l[2][0]*l[2][0]) - float64(l[2][1]*l[2][1])
	if !(d2 > 0) {
		return 0, 0, 0, false
	}
	d2 = sqrt(d2)
	l[2][2] = d2
	l[3][2] = (H[i3][i2] - float64(l[3][0]*l[2][0]) - float64(l[3][1]*l[2][1])) / d2
	d3 := H[i3][i3] + lambda - float64(l[3][0]*l[3][0]) - float64(l[3][1]*l[3][1]) - float64(l[3][2]*l[3][2])
	if !(d3 > 0) {
		return 0, 0, 0, false
	}
	d3 = sqrt(d3)
	l[3][3] = d3
	y0 := (b[i0]) / l[0][0]
	y1 := (b[i1] - float64(l[1][0]*y0)) / l[1][1]
	y2 := (b[i2] - float64(l[2][0]*y0) - float64(l[2][1]*y1)) / l[2][2]
	y3 := (b[i3] - float64(l[3][0]*y0) - float64(l[3][1]*y1) - float64(l[3][2]*y2)) / l[3][3]
	mu3 := (y3) / l[3][3]
	mu2 := (y2 - float64(l[3][2]*mu3)) / l[2][2]
	mu1 := (y1 - float64(l[2][1]*mu2) - float64(l[3][1]*mu3)) / l[1][1]
	mu0 := (y0 - float64(l[1][0]*mu1) - float64(l[2][0]*mu2) - float64(l[3][0]*mu3)) / l[0][0]
	f.mu[0], f.mu[1], f.mu[2], f.mu[3] = mu0, mu1, mu2, mu3
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	chi2 += float64(mu0 * H[i0][i1] * mu1)
	chi2 += float64(mu0 * H[i0][i2] * mu2)
	chi2 += float64(mu0 * H[i0][i3] * mu3)
	t += float64(c[i1] * pos(mu1))
	jac += logc[i1]
	chi2 -= float64(2 * b[i1] * mu1)
	chi2 += float64(mu1 * H[i1][i0] * mu0)
	chi2 += float64(mu1 * H[i1][i1] * mu1)
	chi2 += float64(mu1 * H[i1][i2] * mu2)
	chi2 += float64(mu1 * H[i1][i3] * mu3)
	t += float64(c[i2] * pos(mu2))
	jac += logc[i2]
	chi2 -= float64(2 * b[i2] * mu2)
	chi2 += float64(mu2 * H[i2][i0] * mu0)
	chi2 += float64(mu2 * H[i2][i1] * mu1)
	chi2 += float64(mu2 * H[i2][i2] * mu2)
	chi2 += float64(mu2 * H[i2][i3] * mu3)
	t += float64(c[i3] * pos(mu3))
	jac += logc[i3]
	chi2 -= float64(2 * b[i3] * mu3)
	chi2 += float64(mu3 * H[i3][i0] * mu0)
	chi2 += float64(mu3 * H[i3][i1] * mu1)
	chi2 += float64(mu3 * H[i3][i2] * mu2)
	chi2 += float64(mu3 * H[i3][i3] * mu3)
	return t, chi2, jac, true
}

// solve5 is solve for m = 5.
func (f *faceFit) solve5(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0, i1, i2, i3, i4 := f.idx[0], f.idx[1], f.idx[2], f.idx[3], f.idx[4]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	l[1][0] = (H[i1][i0]) / d0
	l[2][0] = (H[i2][i0]) / d0
	l[3][0] = (H[i3][i0]) / d0
	l[4][0] = (H[i4][i0]) / d0
	d1 := H[i1][i1] + lambda - float64(l[1][0]*l[1][0])
	if !(d1 > 0) {
		return 0, 0, 0, false
	}
	d1 = sqrt(d1)
	l[1][1] = d1
	l[2][1] = (H[i2][i1] - float64(l[2][0]*l[1][0])) / d1
	l[3][1] = (H[i3][i1] - float64(l[3][0]*l[1][0])) / d1
	l[4][1] = (H[i4][i1] - float64(l[4][0]*l[1][0])) / d1
	d2 := H[i2][i2] + lambda - float64(l[2][0]*l[2][0]) - float64(l[2][1]*l[2][1])
	if !(d2 > 0) {
		return 0, 0, 0, false
	}
	d2 = sqrt(d2)
	l[2][2] = d2
	l[3][2] = (H[i3][i2] - float64(l[3][0]*l[2][0]) - float64(l[3][1]*l[2][1])) / d2
	l[4][2] = (H[i4][i2] - float64(l[4][0]*l[2][0]) - float64(l[4][1]*l[2][1])) / d2
	d3 := H[i3][i3] + lambda - float64(l[3][0]*l[3][0]) - float64(l[3][1]*l[3][1]) - float64(l[3][2]*l[3][2])
	if !(d3 > 0) {
		return 0, 0, 0, false
	}
	d3 = sqrt(d3)
	l[3][3] = d3
	l[4][3] = (H[i4][i3] - float64(l[4][0]*l[3][0]) - float64(l[4][1]*l[3][1]) - float64(l[4][2]*l[3][2])) / d3
	d4 := H[i4][i4] + lambda - float64(l[4][0]*l[4][0]) - float64(l[4][1]*l[4][1]) - float64(l[4][2]*l[4][2]) - float64(l[4][3]*l[4][3])
	if !(d4 > 0) {
		return 0, 0, 0, false
	}
	d4 = sqrt(d4)
	l[4][4] = d4
	y0 := (b[i0]) / l[0][0]
	y1 := (b[i1] - float64(l[1][0]*y0)) / l[1][1]
	y2 := (b[i2] - float64(l[2][0]*y0) - float64(l[2][1]*y1)) / l[2][2]
	y3 := (b[i3] - float64(l[3][0]*y0) - float64(l[3][1]*y1) - float64(l[3][2]*y2)) / l[3][3]
	y4 := (b[i4] - float64(l[4][0]*y0) - float64(l[4][1]*y1) - float64(l[4][2]*y2) - float64(l[4][3]*y3)) / l[4][4]
	mu4 := (y4) / l[4][4]
	mu3 := (y3 - float64(l[4][3]*mu4)) / l[3][3]
	mu2 := (y2 - float64(l[3][2]*mu3) - float64(l[4][2]*mu4)) / l[2][2]
	mu1 := (y1 - float64(l[2][1]*mu2) - float64(l[3][1]*mu3) - float64(l[4][1]*mu4)) / l[1][1]
	mu0 := (y0 - float64(l[1][0]*mu1) - float64(l[2][0]*mu2) - float64(l[3][0]*mu3) - float64(l[4][0]*mu4)) / l[0][0]
	f.mu[0], f.mu[1], f.mu[2], f.mu[3], f.mu[4] = mu0, mu1, mu2, mu3, mu4
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	chi2 += float64(mu0 * H[i0][i1] * mu1)
	chi2 += float64(mu0 * H[i0][i2] * mu2)
	chi2 += float64(mu0 * H[i0][i3] * mu3)
	chi2 += float64(mu0 * H[i0][i4] * mu4)
	t += float64(c[i1] * pos(mu1))
	jac += logc[i1]
	chi2 -= float64(2 * b[i1] * mu1)
	chi2 += float64(mu1 * H[i1][i0] * mu0)
	chi2 += float64(mu1 * H[i1][i1] * mu1)
	chi2 += float64(mu1 * H[i1][i2] * mu2)
	chi2 += float64(mu1 * H[i1][i3] * mu3)
	chi2 += float64(mu1 * H[i1][i4] * mu4)
	t += float64(c[i2] * pos(mu2))
	jac += logc[i2]
	chi2 -= float64(2 * b[i2] * mu2)
	chi2 += float64(mu2 * H[i2][i0] * mu0)
	chi2 += float64(mu2 * H[i2][i1] * mu1)
	chi2 += float64(mu2 * H[i2][i2] * mu2)
	chi2 += float64(mu2 * H[i2][i3] * mu3)
	chi2 += float64(mu2 * H[i2][i4] * mu4)
	t += float64(c[i3] * pos(mu3))
	jac += logc[i3]
	chi2 -= float64(2 * b[i3] * mu3)
	chi2 += float64(mu3 * H[i3][i0] * mu0)
	chi2 += float64(mu3 * H[i3][i1] * mu1)
	chi2 += float64(mu3 * H[i3][i2] * mu2)
	chi2 += float64(mu3 * H[i3][i3] * mu3)
	chi2 += float64(mu3 * H[i3][i4] * mu4)
	t += float64(c[i4] * pos(mu4))
	jac += logc[i4]
	chi2 -= float64(2 * b[i4] * mu4)
	chi2 += float64(mu4 * H[i4][i0] * mu0)
	chi2 += float64(mu4 * H[i4][i1] * mu1)
	chi2 += float64(mu4 * H[i4][i2] * mu2)
	chi2 += float64(mu4 * H[i4][i3] * mu3)
	chi2 += float64(mu4 * H[i4][i4] * mu4)
	return t, chi2, jac, true
}

// solve6 is solve for m = 6.
func (f *faceFit) solve6(H *mat6, b, c *vec6, logc *[MaxEndMembers]float64, yy, lambda float64) (t, chi2, jac float64, ok bool) {
	l := &f.l
	i0, i1, i2, i3, i4, i5 := f.idx[0], f.idx[1], f.idx[2], f.idx[3], f.idx[4], f.idx[5]
	d0 := H[i0][i0] + lambda
	if !(d0 > 0) {
		return 0, 0, 0, false
	}
	d0 = sqrt(d0)
	l[0][0] = d0
	l[1][0] = (H[i1][i0]) / d0
	l[2][0] = (H[i2][i0]) / d0
	l[3][0] = (H[i3][i0]) / d0
	l[4][0] = (H[i4][i0]) / d0
	l[5][0] = (H[i5][i0]) / d0
	d1 := H[i1][i1] + lambda - float64(l[1][0]*l[1][0])
	if !(d1 > 0) {
		return 0, 0, 0, false
	}
	d1 = sqrt(d1)
	l[1][1] = d1
	l[2][1] = (H[i2][i1] - float64(l[2][0]*l[1][0])) / d1
	l[3][1] = (H[i3][i1] - float64(l[3][0]*l[1][0])) / d1
	l[4][1] = (H[i4][i1] - float64(l[4][0]*l[1][0])) / d1
	l[5][1] = (H[i5][i1] - float64(l[5][0]*l[1][0])) / d1
	d2 := H[i2][i2] + lambda - float64(l[2][0]*l[2][0]) - float64(l[2][1]*l[2][1])
	if !(d2 > 0) {
		return 0, 0, 0, false
	}
	d2 = sqrt(d2)
	l[2][2] = d2
	l[3][2] = (H[i3][i2] - float64(l[3][0]*l[2][0]) - float64(l[3][1]*l[2][1])) / d2
	l[4][2] = (H[i4][i2] - float64(l[4][0]*l[2][0]) - float64(l[4][1]*l[2][1])) / d2
	l[5][2] = (H[i5][i2] - float64(l[5][0]*l[2][0]) - float64(l[5][1]*l[2][1])) / d2
	d3 := H[i3][i3] + lambda - float64(l[3][0]*l[3][0]) - float64(l[3][1]*l[3][1]) - float64(l[3][2]*l[3][2])
	if !(d3 > 0) {
		return 0, 0, 0, false
	}
	d3 = sqrt(d3)
	l[3][3] = d3
	l[4][3] = (H[i4][i3] - float64(l[4][0]*l[3][0]) - float64(l[4][1]*l[3][1]) - float64(l[4][2]*l[3][2])) / d3
	l[5][3] = (H[i5][i3] - float64(l[5][0]*l[3][0]) - float64(l[5][1]*l[3][1]) - float64(l[5][2]*l[3][2])) / d3
	d4 := H[i4][i4] + lambda - float64(l[4][0]*l[4][0]) - float64(l[4][1]*l[4][1]) - float64(l[4][2]*l[4][2]) - float64(l[4][3]*l[4][3])
	if !(d4 > 0) {
		return 0, 0, 0, false
	}
	d4 = sqrt(d4)
	l[4][4] = d4
	l[5][4] = (H[i5][i4] - float64(l[5][0]*l[4][0]) - float64(l[5][1]*l[4][1]) - float64(l[5][2]*l[4][2]) - float64(l[5][3]*l[4][3])) / d4
	d5 := H[i5][i5] + lambda - float64(l[5][0]*l[5][0]) - float64(l[5][1]*l[5][1]) - float64(l[5][2]*l[5][2]) - float64(l[5][3]*l[5][3]) - float64(l[5][4]*l[5][4])
	if !(d5 > 0) {
		return 0, 0, 0, false
	}
	d5 = sqrt(d5)
	l[5][5] = d5
	y0 := (b[i0]) / l[0][0]
	y1 := (b[i1] - float64(l[1][0]*y0)) / l[1][1]
	y2 := (b[i2] - float64(l[2][0]*y0) - float64(l[2][1]*y1)) / l[2][2]
	y3 := (b[i3] - float64(l[3][0]*y0) - float64(l[3][1]*y1) - float64(l[3][2]*y2)) / l[3][3]
	y4 := (b[i4] - float64(l[4][0]*y0) - float64(l[4][1]*y1) - float64(l[4][2]*y2) - float64(l[4][3]*y3)) / l[4][4]
	y5 := (b[i5] - float64(l[5][0]*y0) - float64(l[5][1]*y1) - float64(l[5][2]*y2) - float64(l[5][3]*y3) - float64(l[5][4]*y4)) / l[5][5]
	mu5 := (y5) / l[5][5]
	mu4 := (y4 - float64(l[5][4]*mu5)) / l[4][4]
	mu3 := (y3 - float64(l[4][3]*mu4) - float64(l[5][3]*mu5)) / l[3][3]
	mu2 := (y2 - float64(l[3][2]*mu3) - float64(l[4][2]*mu4) - float64(l[5][2]*mu5)) / l[2][2]
	mu1 := (y1 - float64(l[2][1]*mu2) - float64(l[3][1]*mu3) - float64(l[4][1]*mu4) - float64(l[5][1]*mu5)) / l[1][1]
	mu0 := (y0 - float64(l[1][0]*mu1) - float64(l[2][0]*mu2) - float64(l[3][0]*mu3) - float64(l[4][0]*mu4) - float64(l[5][0]*mu5)) / l[0][0]
	f.mu[0], f.mu[1], f.mu[2], f.mu[3], f.mu[4], f.mu[5] = mu0, mu1, mu2, mu3, mu4, mu5
	t, chi2, jac = 0.0, yy, 0.0
	t += float64(c[i0] * pos(mu0))
	jac += logc[i0]
	chi2 -= float64(2 * b[i0] * mu0)
	chi2 += float64(mu0 * H[i0][i0] * mu0)
	chi2 += float64(mu0 * H[i0][i1] * mu1)
	chi2 += float64(mu0 * H[i0][i2] * mu2)
	chi2 += float64(mu0 * H[i0][i3] * mu3)
	chi2 += float64(mu0 * H[i0][i4] * mu4)
	chi2 += float64(mu0 * H[i0][i5] * mu5)
	t += float64(c[i1] * pos(mu1))
	jac += logc[i1]
	chi2 -= float64(2 * b[i1] * mu1)
	chi2 += float64(mu1 * H[i1][i0] * mu0)
	chi2 += float64(mu1 * H[i1][i1] * mu1)
	chi2 += float64(mu1 * H[i1][i2] * mu2)
	chi2 += float64(mu1 * H[i1][i3] * mu3)
	chi2 += float64(mu1 * H[i1][i4] * mu4)
	chi2 += float64(mu1 * H[i1][i5] * mu5)
	t += float64(c[i2] * pos(mu2))
	jac += logc[i2]
	chi2 -= float64(2 * b[i2] * mu2)
	chi2 += float64(mu2 * H[i2][i0] * mu0)
	chi2 += float64(mu2 * H[i2][i1] * mu1)
	chi2 += float64(mu2 * H[i2][i2] * mu2)
	chi2 += float64(mu2 * H[i2][i3] * mu3)
	chi2 += float64(mu2 * H[i2][i4] * mu4)
	chi2 += float64(mu2 * H[i2][i5] * mu5)
	t += float64(c[i3] * pos(mu3))
	jac += logc[i3]
	chi2 -= float64(2 * b[i3] * mu3)
	chi2 += float64(mu3 * H[i3][i0] * mu0)
	chi2 += float64(mu3 * H[i3][i1] * mu1)
	chi2 += float64(mu3 * H[i3][i2] * mu2)
	chi2 += float64(mu3 * H[i3][i3] * mu3)
	chi2 += float64(mu3 * H[i3][i4] * mu4)
	chi2 += float64(mu3 * H[i3][i5] * mu5)
	t += float64(c[i4] * pos(mu4))
	jac += logc[i4]
	chi2 -= float64(2 * b[i4] * mu4)
	chi2 += float64(mu4 * H[i4][i0] * mu0)
	chi2 += float64(mu4 * H[i4][i1] * mu1)
	chi2 += float64(mu4 * H[i4][i2] * mu2)
	chi2 += float64(mu4 * H[i4][i3] * mu3)
	chi2 += float64(mu4 * H[i4][i4] * mu4)
	chi2 += float64(mu4 * H[i4][i5] * mu5)
	t += float64(c[i5] * pos(mu5))
	jac += logc[i5]
	chi2 -= float64(2 * b[i5] * mu5)
	chi2 += float64(mu5 * H[i5][i0] * mu0)
	chi2 += float64(mu5 * H[i5][i1] * mu1)
	chi2 += float64(mu5 * H[i5][i2] * mu2)
	chi2 += float64(mu5 * H[i5][i3] * mu3)
	chi2 += float64(mu5 * H[i5][i4] * mu4)
	chi2 += float64(mu5 * H[i5][i5] * mu5)
	return t, chi2, jac, true
}
