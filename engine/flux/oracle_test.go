package flux

import (
	"math"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/discharge"
)

// slowLoads is a literal transcription of the docs/methods.md §8.1, §8.2
// and §8.4 formulas for one year of samples, written for clarity, not
// speed, as an oracle for the fast estimators.
func slowLoads(rec *discharge.Record, days []discharge.Day, c []float64) (fw, pw, beale float64) {
	n := len(days)
	q := make([]float64, n)
	for i, d := range days {
		q[i], _ = rec.At(d)
	}
	var sumQd float64
	for _, v := range rec.Q {
		sumQd += v
	}
	// §8.1: C_fw = Σ C_i Q_i / Σ Q_i; L = C_fw Σ Q_d 86.4.
	var cq, sq float64
	for i := range c {
		cq += c[i] * q[i]
		sq += q[i]
	}
	fw = cq / sq * sumQd * 86.4
	// §8.2: flow-normalised concentrations C_i Q_i^-b interpolated between
	// samples, held at the ends, times Q_d^b; b the least-squares slope of
	// ln C on ln Q.
	var mx, my float64
	for i := range c {
		mx += math.Log(q[i]) / float64(n)
		my += math.Log(c[i]) / float64(n)
	}
	var sxy, sxx float64
	for i := range c {
		sxy += (math.Log(q[i]) - mx) * (math.Log(c[i]) - my)
		sxx += (math.Log(q[i]) - mx) * (math.Log(q[i]) - mx)
	}
	b := sxy / sxx
	cn := make([]float64, n)
	for i := range c {
		cn[i] = c[i] * math.Pow(q[i], -b)
	}
	for k, d := range rec.Days {
		var cd float64
		switch {
		case d <= days[0]:
			cd = cn[0]
		case d >= days[n-1]:
			cd = cn[n-1]
		default:
			j := 1
			for days[j] < d {
				j++
			}
			f := float64(d-days[j-1]) / float64(days[j]-days[j-1])
			cd = cn[j-1] + f*(cn[j]-cn[j-1])
		}
		pw += cd * math.Pow(rec.Q[k], b) * rec.Q[k] * 86.4
	}
	// §8.4: Beale.
	l := make([]float64, n)
	var lbar, qbar float64
	for i := range c {
		l[i] = c[i] * q[i] * 86.4
		lbar += l[i] / float64(n)
		qbar += q[i] / float64(n)
	}
	var slq, sqq float64
	for i := range c {
		slq += (l[i] - lbar) * (q[i] - qbar) / float64(n-1)
		sqq += (q[i] - qbar) * (q[i] - qbar) / float64(n-1)
	}
	N := float64(rec.Len())
	muq := sumQd / N
	nn := float64(n)
	beale = N * muq * (lbar / qbar) * (1 + slq/(nn*lbar*qbar)) / (1 + sqq/(nn*qbar*qbar))
	return fw, pw, beale
}

func TestOracle(t *testing.T) {
	cv := newCorrieVale()
	// The first calendar year of the synthetic catchment, as its own record.
	rec := discharge.NewRecord("2021", cv.gauge.First(), cv.gauge.Q[:365])
	var days []discharge.Day
	var c []float64
	for i, d := range cv.series.Days {
		if d <= rec.Last() {
			days = append(days, d)
			c = append(c, cv.series.C[i])
		}
	}
	fw, pw, beale := slowLoads(rec, days, c)
	s := ForSpecies(chem.Na, days, c)
	for _, tt := range []struct {
		m    Method
		want float64
	}{{FlowWeighted, fw}, {PeriodWeighted, pw}, {Beale, beale}} {
		res, err := Estimate(rec, s, Options{Method: tt.m})
		if err != nil {
			t.Fatal(err)
		}
		if got := res.Years[0].Mol; math.Abs(got-tt.want) > 1e-12*tt.want {
			t.Errorf("%v: %.15g mol, oracle %.15g (1e-12 relative)", tt.m, got, tt.want)
		}
	}
}
