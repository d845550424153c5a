package co2

import (
	"fmt"
	"slices"

	"lixiv/engine/internal/quantile"
	"lixiv/engine/mix"
)

// Spread summarises one CO2 figure over Monte Carlo draws, µmol/L: the
// 2.5, 50 and 97.5 % quantiles.
type Spread = quantile.Interval

// Interval holds the spread of each CO2 figure of Result over draws.
type Interval struct {
	PhiSil, PhiCarb, PhiTotal, NetLong, SinkSil Spread
}

// OverDraws runs Consumption on every draw of a forward Monte Carlo
// (mix.ForwardResult.Draws) with the same so4Sulf and options, and returns
// the 2.5, 50 and 97.5 % quantiles of each figure (type-7 quantiles, common
// practice). It returns an error for no draws or invalid input.
func OverDraws(draws []mix.Split, so4Sulf float64, opt *Options) (Interval, error) {
	var iv Interval
	n := len(draws)
	if n == 0 {
		return iv, fmt.Errorf("%w: no draws", ErrInput)
	}
	cols := make([][]float64, 5)
	for i := range cols {
		cols[i] = make([]float64, n)
	}
	for k := range draws {
		r, err := Consumption(&draws[k], so4Sulf, opt)
		if err != nil {
			return iv, err
		}
		cols[0][k], cols[1][k], cols[2][k], cols[3][k], cols[4][k] = r.PhiSil, r.PhiCarb, r.PhiTotal, r.NetLong, r.SinkSil
	}
	out := []*Spread{&iv.PhiSil, &iv.PhiCarb, &iv.PhiTotal, &iv.NetLong, &iv.SinkSil}
	for i, c := range cols {
		slices.Sort(c)
		*out[i] = quantile.SortedInterval(c)
	}
	return iv, nil
}
