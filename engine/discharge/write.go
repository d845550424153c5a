package discharge

import (
	"bufio"
	"io"
	"math"
	"strconv"
)

// WriteCSV writes the record as a comma-separated table with the header
// "Date,Q (m3/s)", one row per day, ISO dates, the shortest decimal that
// reads back to the same float64, and an empty cell for a gap. Read gives
// back the same days and values (Filled flags are not written).
func (r *Record) WriteCSV(w io.Writer) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("Date,Q (m3/s)\n")
	var buf []byte
	for i, d := range r.Days {
		buf = append(buf[:0], d.String()...)
		buf = append(buf, ',')
		if q := r.Q[i]; !math.IsNaN(q) {
			buf = strconv.AppendFloat(buf, q, 'g', -1, 64)
		}
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	return bw.Flush()
}
