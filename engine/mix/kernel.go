package mix

import "math"

// The kernels below are the hot loop of the inverse model for two, three and
// four end-members, written out with scalar variables: WebAssembly runs
// Go's loops over small arrays several times slower than native code, but
// straight-line scalar code at close to native speed.
//
// Eliminating the closure with the last end-member r as reference, a = e_r
// + P y, the weighted least-squares problem on the whole affine hull reads
// min_y sum_k w_k (u_kᵀ y - t_k)² with u_kj = E_kj - E_kr and t_k = d_k -
// E_kr. Its normal equations H y = b (H = sum w u uᵀ, b = sum w t u) are
// solved by an unrolled Cholesky factorisation H = L Lᵀ; with z = L⁻¹ b
// the minimum misfit is sum w t² - zᵀz. That minimum bounds the constrained
// one from below, so most draws are rejected right there. When y is
// feasible (all a >= 0) it is the constrained minimum; otherwise, or when H
// is singular, the minimum lies on the simplex boundary (boundary.go).

// reduceTable returns, for every draw and tracer, E_j - E_r for j < r and
// E_r in the last place (r = n - 1).
func reduceTable(tab []float64, n int) []float64 {
	rt := make([]float64, len(tab))
	for o := 0; o < len(tab); o += n {
		er := tab[o+n-1]
		for j := 0; j < n-1; j++ {
			rt[o+j] = tab[o+j] - er
		}
		rt[o+n-1] = er
	}
	return rt
}

// pivotTol is the relative size below which a Cholesky pivot counts as zero
// (the same as in simplexLS.face).
const pivotTol = 1e-13

func (r *Run) draws4(sr *SampleResult, pr *prep, from, to int, bound float64) {
	const n = 4
	const stride = int(NTracers) * n
	rt, tab := r.rtab, r.table
	rows := pr.rows
	var a [MaxEndMembers]float64
	for d := from; d < to; d++ {
		base := d * stride
		var h00, h10, h11, h20, h21, h22, b0, b1, b2, cc float64
		for _, rw := range rows {
			o := base + rw.off
			u := (*[n]float64)(rt[o : o+n])
			w := rw.w
			t := rw.d - u[3]
			cc += w * t * t
			v := w * u[2]
			h22 += v * u[2]
			h21 += v * u[1]
			h20 += v * u[0]
			b2 += v * t
			v = w * u[1]
			h11 += v * u[1]
			h10 += v * u[0]
			b1 += v * t
			v = w * u[0]
			h00 += v * u[0]
			b0 += v * t
		}
		if pr.iso >= 0 {
			o := base + int(SrNa)*n
			s := (*[n]float64)(tab[o : o+n])
			o = base + int(Sr87Sr86)*n
			R := (*[n]float64)(tab[o : o+n])
			rm := pr.riso
			e3 := s[3] * (R[3] - rm)
			u0, u1, u2 := s[0]*(R[0]-rm)-e3, s[1]*(R[1]-rm)-e3, s[2]*(R[2]-rm)-e3
			w := pr.w[pr.iso]
			t := -e3
			v := w * u0
			h00 += v * u0
			b0 += v * t
			v = w * u1
			h10 += v * u0
			h11 += v * u1
			b1 += v * t
			v = w * u2
			h20 += v * u0
			h21 += v * u1
			h22 += v * u2
			b2 += v * t
			cc += w * t * t
		}
		hm := h00
		if h11 > hm {
			hm = h11
		}
		if h22 > hm {
			hm = h22
		}
		tol := pivotTol * hm
		if h00 > tol && tol > 0 {
			l00 := sqrt(h00)
			l10, l20 := h10/l00, h20/l00
			if d1 := h11 - l10*l10; d1 > tol {
				l11 := sqrt(d1)
				l21 := (h21 - l20*l10) / l11
				if d2 := h22 - l20*l20 - l21*l21; d2 > tol {
					l22 := sqrt(d2)
					z0 := b0 / l00
					z1 := (b1 - l10*z0) / l11
					z2 := (b2 - l20*z0 - l21*z1) / l22
					if cc-(z0*z0+z1*z1+z2*z2)-1e-9*(cc+1) > bound {
						continue // even the unconstrained optimum misfits
					}
					y2 := z2 / l22
					y1 := (z1 - l21*y2) / l11
					y0 := (z0 - l10*y1 - l20*y2) / l00
					y3 := 1 - y0 - y1 - y2
					if y0 >= 0 && y1 >= 0 && y2 >= 0 && y3 >= 0 {
						a = [MaxEndMembers]float64{y0, y1, y2, y3}
						if chi2 := r.misfit4(pr, d, &a); chi2 <= bound {
							sr.keep(d, chi2, a[:n])
						}
						continue
					}
				}
			}
		}
		y0, y1, y2 := boundary4(h00, h10, h11, h20, h21, h22, b0, b1, b2)
		a = [MaxEndMembers]float64{y0, y1, y2, max(0, 1-y0-y1-y2)}
		if chi2 := r.misfit4(pr, d, &a); chi2 <= bound {
			sr.keep(d, chi2, a[:n])
		}
	}
}

func (r *Run) draws3(sr *SampleResult, pr *prep, from, to int, bound float64) {
	const n = 3
	const stride = int(NTracers) * n
	rt, tab := r.rtab, r.table
	rows := pr.rows
	var a [MaxEndMembers]float64
	for d := from; d < to; d++ {
		base := d * stride
		var h00, h10, h11, b0, b1, cc float64
		for _, rw := range rows {
			o := base + rw.off
			u := (*[n]float64)(rt[o : o+n])
			u0, u1 := u[0], u[1]
			w := rw.w
			t := rw.d - u[2]
			v := w * u0
			h00 += v * u0
			b0 += v * t
			v = w * u1
			h10 += v * u0
			h11 += v * u1
			b1 += v * t
			cc += w * t * t
		}
		if pr.iso >= 0 {
			o := base + int(SrNa)*n
			s := (*[n]float64)(tab[o : o+n])
			o = base + int(Sr87Sr86)*n
			R := (*[n]float64)(tab[o : o+n])
			rm := pr.riso
			e2 := s[2] * (R[2] - rm)
			u0, u1 := s[0]*(R[0]-rm)-e2, s[1]*(R[1]-rm)-e2
			w := pr.w[pr.iso]
			t := -e2
			v := w * u0
			h00 += v * u0
			b0 += v * t
			v = w * u1
			h10 += v * u0
			h11 += v * u1
			b1 += v * t
			cc += w * t * t
		}
		hm := h00
		if h11 > hm {
			hm = h11
		}
		tol := pivotTol * hm
		if h00 > tol && tol > 0 {
			l00 := sqrt(h00)
			l10 := h10 / l00
			if d1 := h11 - l10*l10; d1 > tol {
				l11 := sqrt(d1)
				z0 := b0 / l00
				z1 := (b1 - l10*z0) / l11
				if cc-(z0*z0+z1*z1)-1e-9*(cc+1) > bound {
					continue
				}
				y1 := z1 / l11
				y0 := (z0 - l10*y1) / l00
				y2 := 1 - y0 - y1
				if y0 >= 0 && y1 >= 0 && y2 >= 0 {
					a = [MaxEndMembers]float64{y0, y1, y2}
					if chi2 := r.misfit3(pr, d, &a); chi2 <= bound {
						sr.keep(d, chi2, a[:n])
					}
					continue
				}
			}
		}
		y0, y1 := boundary3(h00, h10, h11, b0, b1)
		a = [MaxEndMembers]float64{y0, y1, max(0, 1-y0-y1)}
		if chi2 := r.misfit3(pr, d, &a); chi2 <= bound {
			sr.keep(d, chi2, a[:n])
		}
	}
}

// misfit4 is Run.misfit for four end-members, from the reduced rows:
// E_k a - d_k = u_kᵀ y + E_kr - d_k, with the isotope row from the drawn
// ratios.
func (r *Run) misfit4(pr *prep, d int, a *[MaxEndMembers]float64) float64 {
	const n = 4
	base := d * int(NTracers) * n
	a0, a1, a2, a3 := a[0], a[1], a[2], a[3]
	chi2 := 0.0
	if pr.iso >= 0 {
		o := base + int(SrNa)*n
		s := (*[n]float64)(r.table[o : o+n])
		o = base + int(Sr87Sr86)*n
		R := (*[n]float64)(r.table[o : o+n])
		rm := pr.riso
		v := s[0]*(R[0]-rm)*a0 + s[1]*(R[1]-rm)*a1 + s[2]*(R[2]-rm)*a2 + s[3]*(R[3]-rm)*a3
		chi2 = pr.w[pr.iso] * v * v
	}
	for _, rw := range pr.rows {
		o := base + rw.off
		u := (*[n]float64)(r.rtab[o : o+n])
		v := u[0]*a0 + u[1]*a1 + u[2]*a2 + (u[3] - rw.d)
		chi2 += rw.w * v * v
	}
	return chi2
}

// misfit3 is misfit4 for three end-members.
func (r *Run) misfit3(pr *prep, d int, a *[MaxEndMembers]float64) float64 {
	const n = 3
	base := d * int(NTracers) * n
	a0, a1, a2 := a[0], a[1], a[2]
	chi2 := 0.0
	if pr.iso >= 0 {
		o := base + int(SrNa)*n
		s := (*[n]float64)(r.table[o : o+n])
		o = base + int(Sr87Sr86)*n
		R := (*[n]float64)(r.table[o : o+n])
		rm := pr.riso
		v := s[0]*(R[0]-rm)*a0 + s[1]*(R[1]-rm)*a1 + s[2]*(R[2]-rm)*a2
		chi2 = pr.w[pr.iso] * v * v
	}
	for _, rw := range pr.rows {
		o := base + rw.off
		u := (*[n]float64)(r.rtab[o : o+n])
		v := u[0]*a0 + u[1]*a1 + (u[2] - rw.d)
		chi2 += rw.w * v * v
	}
	return chi2
}

// draws2 is the kernel for two end-members: one free fraction y = a_0,
// whose constrained minimum is the unconstrained one clamped to [0, 1].
func (r *Run) draws2(sr *SampleResult, pr *prep, from, to int, bound float64) {
	const n = 2
	const stride = int(NTracers) * n
	rt, tab := r.rtab, r.table
	rows := pr.rows
	var a [MaxEndMembers]float64
	for d := from; d < to; d++ {
		base := d * stride
		var h, b, cc float64
		for _, rw := range rows {
			o := base + rw.off
			u := (*[n]float64)(rt[o : o+n])
			t := rw.d - u[1]
			v := rw.w * u[0]
			h += v * u[0]
			b += v * t
			cc += rw.w * t * t
		}
		if pr.iso >= 0 {
			o := base + int(SrNa)*n
			s := (*[n]float64)(tab[o : o+n])
			o = base + int(Sr87Sr86)*n
			R := (*[n]float64)(tab[o : o+n])
			rm := pr.riso
			e1 := s[1] * (R[1] - rm)
			u0 := s[0]*(R[0]-rm) - e1
			t := -e1
			w := pr.w[pr.iso]
			v := w * u0
			h += v * u0
			b += v * t
			cc += w * t * t
		}
		if h > 0 && cc-b*b/h-1e-9*(cc+1) > bound {
			continue // even the unconstrained optimum misfits
		}
		y := clamp1(b, h)
		a = [MaxEndMembers]float64{y, 1 - y}
		if chi2 := r.misfit2(pr, d, &a); chi2 <= bound {
			sr.keep(d, chi2, a[:n])
		}
	}
}

// misfit2 is misfit4 for two end-members.
func (r *Run) misfit2(pr *prep, d int, a *[MaxEndMembers]float64) float64 {
	const n = 2
	base := d * int(NTracers) * n
	a0, a1 := a[0], a[1]
	chi2 := 0.0
	if pr.iso >= 0 {
		o := base + int(SrNa)*n
		s := (*[n]float64)(r.table[o : o+n])
		o = base + int(Sr87Sr86)*n
		R := (*[n]float64)(r.table[o : o+n])
		rm := pr.riso
		v := s[0]*(R[0]-rm)*a0 + s[1]*(R[1]-rm)*a1
		chi2 = pr.w[pr.iso] * v * v
	}
	for _, rw := range pr.rows {
		o := base + rw.off
		u := (*[n]float64)(r.rtab[o : o+n])
		v := u[0]*a0 + (u[1] - rw.d)
		chi2 += rw.w * v * v
	}
	return chi2
}

// drawsN is the kernel for five or six end-members, with loops instead of
// scalars: the same reduced normal equations, Cholesky factorisation and
// misfit bound as draws4. Draws whose unconstrained optimum leaves the
// simplex go to the general face-enumerating solver.
func (r *Run) drawsN(sr *SampleResult, pr *prep, from, to int, bound float64) {
	n := r.n
	m1 := n - 1
	stride := int(NTracers) * n
	rt, tab := r.rtab, r.table
	var H [MaxEndMembers - 1][MaxEndMembers - 1]float64
	var b, u [MaxEndMembers - 1]float64
	var a [MaxEndMembers]float64
	for d := from; d < to; d++ {
		base := d * stride
		for i := 0; i < m1; i++ {
			b[i] = 0
			for j := 0; j <= i; j++ {
				H[i][j] = 0
			}
		}
		cc := 0.0
		add := func(w, t float64) {
			for i := 0; i < m1; i++ {
				v := w * u[i]
				b[i] += v * t
				Hi := &H[i]
				for j := 0; j <= i; j++ {
					Hi[j] += v * u[j]
				}
			}
			cc += w * t * t
		}
		for _, rw := range pr.rows {
			row := rt[base+rw.off : base+rw.off+n]
			copy(u[:m1], row)
			add(rw.w, rw.d-row[m1])
		}
		if pr.iso >= 0 {
			s := tab[base+int(SrNa)*n : base+int(SrNa)*n+n]
			R := tab[base+int(Sr87Sr86)*n : base+int(Sr87Sr86)*n+n]
			rm := pr.riso
			er := s[m1] * (R[m1] - rm)
			for j := 0; j < m1; j++ {
				u[j] = s[j]*(R[j]-rm) - er
			}
			add(pr.w[pr.iso], -er)
		}
		if r.reducedSolve(&H, &b, m1, cc, bound, &a) {
			continue // pruned
		}
		feasible := true
		for j := 0; j < n; j++ {
			if !(a[j] >= 0) {
				feasible = false
			}
		}
		if feasible {
			if chi2 := r.misfit(pr, d, &a); chi2 <= bound {
				sr.keep(d, chi2, a[:n])
			}
			continue
		}
		if chi2, ok := r.general(pr, d, bound, &a); ok {
			sr.keep(d, chi2, a[:n])
		}
	}
}

// reducedSolve factorises H (lower triangle, m1 x m1) by Cholesky, and
// reports true when the unconstrained minimum cc - zᵀz exceeds bound. It
// writes the unconstrained solution to a (a_n-1 = 1 - sum y), or NaNs when
// H is singular, so that the caller takes the general solver.
func (r *Run) reducedSolve(H *[MaxEndMembers - 1][MaxEndMembers - 1]float64, b *[MaxEndMembers - 1]float64, m1 int, cc, bound float64, a *[MaxEndMembers]float64) (pruned bool) {
	hm := 0.0
	for i := 0; i < m1; i++ {
		if H[i][i] > hm {
			hm = H[i][i]
		}
	}
	tol := pivotTol * hm
	*a = [MaxEndMembers]float64{}
	for j := 0; j < m1; j++ {
		dj := H[j][j]
		for p := 0; p < j; p++ {
			dj -= H[j][p] * H[j][p]
		}
		if !(dj > tol) || !(tol > 0) {
			a[0] = math.NaN()
			return false
		}
		dj = sqrt(dj)
		H[j][j] = dj
		for i := j + 1; i < m1; i++ {
			s := H[i][j]
			for p := 0; p < j; p++ {
				s -= H[i][p] * H[j][p]
			}
			H[i][j] = s / dj
		}
	}
	var z [MaxEndMembers - 1]float64
	zz := 0.0
	for i := 0; i < m1; i++ {
		s := b[i]
		for p := 0; p < i; p++ {
			s -= H[i][p] * z[p]
		}
		z[i] = s / H[i][i]
		zz += z[i] * z[i]
	}
	if cc-zz-1e-9*(cc+1) > bound {
		return true
	}
	sum := 0.0
	for i := m1 - 1; i >= 0; i-- {
		s := z[i]
		for p := i + 1; p < m1; p++ {
			s -= H[p][i] * a[p]
		}
		a[i] = s / H[i][i]
		sum += a[i]
	}
	a[m1] = 1 - sum
	return false
}
