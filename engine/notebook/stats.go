package notebook

import (
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/internal/quantile"
)

// parseNum reads a number typed in a table cell (a decimal comma is accepted).
func parseNum(s string) (float64, error) {
	t := strings.TrimSpace(strings.ReplaceAll(s, ",", "."))
	x, err := strconv.ParseFloat(t, 64)
	if err != nil || !finite(x) {
		return 0, fmt.Errorf("%q is not a number", s)
	}
	return x, nil
}

// median returns the median of the finite values of x (NaN when none).
func median(x []float64) float64 {
	var b quantile.Buf
	return b.Midpoints(x, nil, 0.5)[0]
}
