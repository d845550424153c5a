package mix

import (
	"math"

	"lixiv/engine/internal/portable"
)

// The proposal's kernels for up to smallDim latent dimensions, written out
// row by row. Compiled to WebAssembly, every iteration of a loop goes back
// through the function's dispatch on its basic blocks, so the short loops
// over d cost several times native; straight-line code costs about what
// the arithmetic does. Each result is the same, bit for bit, as the loops'
// (ellLoop, and the loops of draw and moments): the same operations in the
// same order, products rounded before they are added (float64()), and the
// padding beyond d exact zeros that are never read or only added as +0 to
// sums that cannot be −0 (proposal_small_test.go).

// smallDim is the largest latent dimension the unrolled kernels take.
const smallDim = 8

// pad copies μ and L into the component's padded arrays (d <= smallDim).
func (c *component) pad(d int) {
	if d > smallDim {
		return
	}
	c.mu8, c.l8 = [smallDim]float64{}, [smallDim][smallDim]float64{}
	copy(c.mu8[:], c.mu[:d])
	for i := range d {
		copy(c.l8[i][:i+1], c.l[i*d:i*d+i+1])
	}
	for i := d; i < smallDim; i++ {
		c.l8[i][i] = 1 // so that rows beyond d give +0 where ell reads them (d = 0)
	}
}

// ell returns log of the mixture density at eta over the prior density
// N(eta; 0, I). u is working space of length d.
//
// For d <= smallDim the forward substitution of each component is
// written out row by row and the exponentials of the components taken in
// one call; beyond, ellLoop. (One function rather than a switch between
// two, so that a call to it is one call in WebAssembly.)
func (p *proposal) ell(eta, u []float64) float64 {
	if p.d > smallDim {
		return p.ellLoop(eta, u)
	}
	d := p.d
	var xs [smallDim]float64
	x := &xs
	if d > 0 && cap(eta) >= smallDim {
		x = (*[smallDim]float64)(eta[:smallDim]) // lanes beyond d are not read
	} else {
		copy(xs[:], eta[:d]) // zero lanes beyond d, whose rows give +0
	}
	e := 0.0
	{
		e += float64(x[0] * x[0])
		if d == 1 {
			goto summed
		}
		e += float64(x[1] * x[1])
		if d == 2 {
			goto summed
		}
		e += float64(x[2] * x[2])
		if d == 3 {
			goto summed
		}
		e += float64(x[3] * x[3])
		if d == 4 {
			goto summed
		}
		e += float64(x[4] * x[4])
		if d == 5 {
			goto summed
		}
		e += float64(x[5] * x[5])
		if d == 6 {
			goto summed
		}
		e += float64(x[6] * x[6])
		if d == 7 {
			goto summed
		}
		e += float64(x[7] * x[7])
	}
summed:
	if len(p.lc) < len(p.comp) {
		p.lc = make([]float64, len(p.comp))
	}
	lc := p.lc[:len(p.comp)]
	top := math.Inf(-1)
	for ci := range p.comp {
		c := &p.comp[ci]
		l, m := &c.l8, &c.mu8
		q := 0.0
		{
			u0 := (x[0] - m[0]) / l[0][0]
			q += float64(u0 * u0)
			if d == 1 {
				goto solved
			}
			u1 := (x[1] - m[1] - float64(l[1][0]*u0)) / l[1][1]
			q += float64(u1 * u1)
			if d == 2 {
				goto solved
			}
			u2 := (x[2] - m[2] - float64(l[2][0]*u0) - float64(l[2][1]*u1)) / l[2][2]
			q += float64(u2 * u2)
			if d == 3 {
				goto solved
			}
			u3 := (x[3] - m[3] - float64(l[3][0]*u0) - float64(l[3][1]*u1) - float64(l[3][2]*u2)) / l[3][3]
			q += float64(u3 * u3)
			if d == 4 {
				goto solved
			}
			u4 := (x[4] - m[4] - float64(l[4][0]*u0) - float64(l[4][1]*u1) - float64(l[4][2]*u2) - float64(l[4][3]*u3)) / l[4][4]
			q += float64(u4 * u4)
			if d == 5 {
				goto solved
			}
			u5 := (x[5] - m[5] - float64(l[5][0]*u0) - float64(l[5][1]*u1) - float64(l[5][2]*u2) - float64(l[5][3]*u3) - float64(l[5][4]*u4)) / l[5][5]
			q += float64(u5 * u5)
			if d == 6 {
				goto solved
			}
			u6 := (x[6] - m[6] - float64(l[6][0]*u0) - float64(l[6][1]*u1) - float64(l[6][2]*u2) - float64(l[6][3]*u3) - float64(l[6][4]*u4) - float64(l[6][5]*u5)) / l[6][6]
			q += float64(u6 * u6)
			if d == 7 {
				goto solved
			}
			u7 := (x[7] - m[7] - float64(l[7][0]*u0) - float64(l[7][1]*u1) - float64(l[7][2]*u2) - float64(l[7][3]*u3) - float64(l[7][4]*u4) - float64(l[7][5]*u5) - float64(l[7][6]*u6)) / l[7][7]
			q += float64(u7 * u7)
		}
	solved:
		lc[ci] = p.lpi[ci] - 0.5*q - c.halfDet
		top = fmax(top, lc[ci])
	}
	if len(lc) == 1 && top-top == 0 {
		// One component: ell is 0.5 e + lc + log(exp(lc − lc)), and
		// exp(0) = 1, log(1) = +0, added to a sum that cannot be −0, so
		// the last term changes nothing while lc is finite.
		return 0.5*e + top
	}
	if len(p.lx) < len(lc) {
		p.lx = make([]float64, len(lc))
	}
	ex := p.lx[:len(lc)]
	for ci, v := range lc {
		ex[ci] = v - top
	}
	portable.ExpAll(ex)
	sum := 0.0
	for _, v := range ex {
		sum += v
	}
	return 0.5*e + top + plog(sum)
}

// affine sets y = μ + L z on the first d rows, each row summed in the
// order of the loop it replaces (lanes of z beyond d are not read, nor
// those of y written).
func (c *component) affine(d int, z, y *[smallDim]float64) {
	l, m := &c.l8, &c.mu8
	y[0] = m[0] + float64(l[0][0]*z[0])
	if d == 1 {
		return
	}
	y[1] = m[1] + float64(l[1][0]*z[0]) + float64(l[1][1]*z[1])
	if d == 2 {
		return
	}
	y[2] = m[2] + float64(l[2][0]*z[0]) + float64(l[2][1]*z[1]) + float64(l[2][2]*z[2])
	if d == 3 {
		return
	}
	y[3] = m[3] + float64(l[3][0]*z[0]) + float64(l[3][1]*z[1]) + float64(l[3][2]*z[2]) + float64(l[3][3]*z[3])
	if d == 4 {
		return
	}
	y[4] = m[4] + float64(l[4][0]*z[0]) + float64(l[4][1]*z[1]) + float64(l[4][2]*z[2]) + float64(l[4][3]*z[3]) + float64(l[4][4]*z[4])
	if d == 5 {
		return
	}
	y[5] = m[5] + float64(l[5][0]*z[0]) + float64(l[5][1]*z[1]) + float64(l[5][2]*z[2]) + float64(l[5][3]*z[3]) + float64(l[5][4]*z[4]) + float64(l[5][5]*z[5])
	if d == 6 {
		return
	}
	y[6] = m[6] + float64(l[6][0]*z[0]) + float64(l[6][1]*z[1]) + float64(l[6][2]*z[2]) + float64(l[6][3]*z[3]) + float64(l[6][4]*z[4]) + float64(l[6][5]*z[5]) + float64(l[6][6]*z[6])
	if d == 7 {
		return
	}
	y[7] = m[7] + float64(l[7][0]*z[0]) + float64(l[7][1]*z[1]) + float64(l[7][2]*z[2]) + float64(l[7][3]*z[3]) + float64(l[7][4]*z[4]) + float64(l[7][5]*z[5]) + float64(l[7][6]*z[6]) + float64(l[7][7]*z[7])
}

// momentsSmall is moments for d <= smallDim over records of at least
// smallDim floats: the same sums, element by element in draw order (the
// padded lanes of the mean read other fields of the record and are
// dropped).
func momentsSmall(d int, ds *draws, w []float64, in []bool, g gaussian) (float64, bool) {
	var m [smallDim]float64
	tw := 0.0
	for k := range ds.n {
		if !in[k] {
			continue
		}
		wk := w[k]
		tw += wk
		e := (*[smallDim]float64)(ds.rec[k*ds.stride:])
		m[0] += wk * e[0]
		m[1] += wk * e[1]
		m[2] += wk * e[2]
		m[3] += wk * e[3]
		m[4] += wk * e[4]
		m[5] += wk * e[5]
		m[6] += wk * e[6]
		m[7] += wk * e[7]
	}
	if !(tw > 0) {
		return 0, false
	}
	for i := range d {
		m[i] /= tw
		g.mu[i] = m[i]
	}
	var cv [smallDim * (smallDim + 1) / 2]float64
	for k := range ds.n {
		if !in[k] {
			continue
		}
		wk := w[k]
		e := (*[smallDim]float64)(ds.rec[k*ds.stride:])
		d0 := e[0] - m[0]
		cv[0] += wk * d0 * d0
		if d == 1 {
			continue
		}
		d1 := e[1] - m[1]
		cv[1] += wk * d1 * d0
		cv[2] += wk * d1 * d1
		if d == 2 {
			continue
		}
		d2 := e[2] - m[2]
		cv[3] += wk * d2 * d0
		cv[4] += wk * d2 * d1
		cv[5] += wk * d2 * d2
		if d == 3 {
			continue
		}
		d3 := e[3] - m[3]
		cv[6] += wk * d3 * d0
		cv[7] += wk * d3 * d1
		cv[8] += wk * d3 * d2
		cv[9] += wk * d3 * d3
		if d == 4 {
			continue
		}
		d4 := e[4] - m[4]
		cv[10] += wk * d4 * d0
		cv[11] += wk * d4 * d1
		cv[12] += wk * d4 * d2
		cv[13] += wk * d4 * d3
		cv[14] += wk * d4 * d4
		if d == 5 {
			continue
		}
		d5 := e[5] - m[5]
		cv[15] += wk * d5 * d0
		cv[16] += wk * d5 * d1
		cv[17] += wk * d5 * d2
		cv[18] += wk * d5 * d3
		cv[19] += wk * d5 * d4
		cv[20] += wk * d5 * d5
		if d == 6 {
			continue
		}
		d6 := e[6] - m[6]
		cv[21] += wk * d6 * d0
		cv[22] += wk * d6 * d1
		cv[23] += wk * d6 * d2
		cv[24] += wk * d6 * d3
		cv[25] += wk * d6 * d4
		cv[26] += wk * d6 * d5
		cv[27] += wk * d6 * d6
		if d == 7 {
			continue
		}
		d7 := e[7] - m[7]
		cv[28] += wk * d7 * d0
		cv[29] += wk * d7 * d1
		cv[30] += wk * d7 * d2
		cv[31] += wk * d7 * d3
		cv[32] += wk * d7 * d4
		cv[33] += wk * d7 * d5
		cv[34] += wk * d7 * d6
		cv[35] += wk * d7 * d7
	}
	for i := range d {
		for j := 0; j <= i; j++ {
			g.cov[i*d+j] = cv[i*(i+1)/2+j] / tw
		}
	}
	return tw, true
}
