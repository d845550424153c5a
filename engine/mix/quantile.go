package mix

import "lixiv/engine/internal/quantile"

// interval returns the type-7 2.5 %, 50 % and 97.5 % quantiles of v
// (quantile.Of95); it reorders v.
func interval(v []float64) Interval { return quantile.Of95(v) }

// wpair is a value with its weight.
type wpair = quantile.Pair

// weightedInterval returns the weighted 2.5 %, 50 % and 97.5 % quantiles of
// v (quantile.Lower95); buf is working space.
func weightedInterval(v, w []float64, buf *[]wpair) Interval { return quantile.Lower95(v, w, buf) }
