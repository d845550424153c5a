package quantile

import "math"

// StdDev returns the sample standard deviation of x (divisor n − 1; common
// practice), NaN for fewer than two values.
func StdDev(x []float64) float64 {
	if len(x) < 2 {
		return math.NaN()
	}
	m := 0.0
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	ss := 0.0
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return math.Sqrt(ss / float64(len(x)-1))
}
