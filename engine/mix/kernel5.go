package mix

// draws5 is drawsN for five end-members written out with scalar variables,
// bit for bit the same arithmetic as drawsN and reducedSolve: WebAssembly
// runs the loops over small arrays of drawsN several times slower than
// straight-line code.
func (r *Run) draws5(sr *SampleResult, pr *prep, from, to int, bound float64) {
	const n = 5
	const stride = int(NTracers) * n
	rt, tab := r.rtab, r.table
	rows := pr.rows
	var a [MaxEndMembers]float64
	var iso [n]float64
	for d := from; d < to; d++ {
		base := d * stride
		var h00, h10, h11, h20, h21, h22, h30, h31, h32, h33, b0, b1, b2, b3, cc float64
		// The ratio rows, then the isotope row (u in iso, t = -e_r).
		for k := 0; k <= len(rows); k++ {
			var u *[n]float64
			var w, t float64
			if k < len(rows) {
				rw := &rows[k]
				o := base + rw.off
				u = (*[n]float64)(rt[o : o+n])
				w = rw.w
				t = rw.d - u[4]
			} else {
				if pr.iso < 0 {
					break
				}
				o := base + int(SrNa)*n
				s := (*[n]float64)(tab[o : o+n])
				o = base + int(Sr87Sr86)*n
				R := (*[n]float64)(tab[o : o+n])
				rm := pr.riso
				er := s[4] * (R[4] - rm)
				iso = [n]float64{s[0]*(R[0]-rm) - er, s[1]*(R[1]-rm) - er, s[2]*(R[2]-rm) - er, s[3]*(R[3]-rm) - er}
				u = &iso
				w = pr.w[pr.iso]
				t = -er
			}
			v := w * u[0]
			b0 += v * t
			h00 += v * u[0]
			v = w * u[1]
			b1 += v * t
			h10 += v * u[0]
			h11 += v * u[1]
			v = w * u[2]
			b2 += v * t
			h20 += v * u[0]
			h21 += v * u[1]
			h22 += v * u[2]
			v = w * u[3]
			b3 += v * t
			h30 += v * u[0]
			h31 += v * u[1]
			h32 += v * u[2]
			h33 += v * u[3]
			cc += w * t * t
		}
		hm := diagMax(h00, h11, h22, h33)
		tol := pivotTol * hm
		if h00 > tol && tol > 0 {
			l00 := sqrt(h00)
			l10, l20, l30 := h10/l00, h20/l00, h30/l00
			if d1 := h11 - l10*l10; d1 > tol {
				l11 := sqrt(d1)
				l21 := (h21 - l20*l10) / l11
				l31 := (h31 - l30*l10) / l11
				if d2 := h22 - l20*l20 - l21*l21; d2 > tol {
					l22 := sqrt(d2)
					l32 := (h32 - l30*l20 - l31*l21) / l22
					if d3 := h33 - l30*l30 - l31*l31 - l32*l32; d3 > tol {
						l33 := sqrt(d3)
						z0 := b0 / l00
						z1 := (b1 - l10*z0) / l11
						z2 := (b2 - l20*z0 - l21*z1) / l22
						z3 := (b3 - l30*z0 - l31*z1 - l32*z2) / l33
						if cc-(z0*z0+z1*z1+z2*z2+z3*z3)-1e-9*(cc+1) > bound {
							continue // even the unconstrained optimum misfits
						}
						y3 := z3 / l33
						y2 := (z2 - l32*y3) / l22
						y1 := (z1 - l21*y2 - l31*y3) / l11
						y0 := (z0 - l10*y1 - l20*y2 - l30*y3) / l00
						sum := 0.0
						sum += y3
						sum += y2
						sum += y1
						sum += y0
						y4 := 1 - sum
						a = [MaxEndMembers]float64{y0, y1, y2, y3, y4}
						if y0 >= 0 && y1 >= 0 && y2 >= 0 && y3 >= 0 && y4 >= 0 {
							if chi2 := r.misfit(pr, d, &a); chi2 <= bound {
								sr.keep(d, chi2, a[:n])
							}
							continue
						}
					}
				}
			}
		}
		if chi2, ok := r.general(pr, d, bound, &a); ok {
			sr.keep(d, chi2, a[:n])
		}
	}
}

// diagMax returns the largest of 0 and the diagonal entries that are
// greater than it, as reducedSolve scans them (NaNs are passed over).
func diagMax(h00, h11, h22, h33 float64) float64 {
	hm := 0.0
	for _, h := range [...]float64{h00, h11, h22, h33} {
		if h > hm {
			hm = h
		}
	}
	return hm
}
