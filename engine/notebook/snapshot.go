package notebook

import (
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"lixiv/engine/internal/digest"
)

// Snapshot is a stored copy of a budget's results: the headline figures,
// for a reader of the file, and a SHA-256 checksum over every output table
// and figure, so that a rerun can be checked against it.
//
// The checksum covers numbers rounded to SnapshotDigits significant digits
// of the largest value in their column (or figure), so that the same
// results verify on any machine (natively or in WebAssembly) and after a
// change that only reorders a sum: a last-bit difference, and float noise
// around zero, stay below the rounding step.
type Snapshot struct {
	Engine   string         // engine version that computed the results
	Checksum string         // hex SHA-256 of the canonical results text
	Figures  []StoredFigure // headline figures of every cell, in document order
}

// StoredFigure is a headline figure as written to the file.
type StoredFigure struct {
	Cell string // id of the cell it comes from
	Figure
}

// SnapshotDigits is the number of significant digits, relative to the
// largest value of each column or figure, that the checksum covers.
const SnapshotDigits = 10

// ErrNotComputed is returned when results are asked of a budget with stale cells.
var ErrNotComputed = errors.New("the budget has cells that are not computed")

// Snapshot returns the results of the computed document. Every cell must be
// computed; cells with a problem enter the checksum with their message.
func (d *Document) Snapshot() (*Snapshot, error) {
	if len(d.Pending()) > 0 {
		return nil, ErrNotComputed
	}
	s := &Snapshot{Engine: EngineVersion, Checksum: d.checksum()}
	for _, c := range d.Cells {
		if o := d.Output(c.ID); o != nil {
			for _, f := range o.Figures {
				s.Figures = append(s.Figures, StoredFigure{Cell: c.ID, Figure: f})
			}
		}
	}
	return s, nil
}

// Keep stores the current results in the document so that Save writes them.
func (d *Document) Keep() error {
	s, err := d.Snapshot()
	if err != nil {
		return err
	}
	d.Stored = s
	return nil
}

// Verification is the outcome of comparing a rerun with a stored snapshot.
type Verification struct {
	Match  bool     // the rerun has the stored checksum
	Stored string   // stored checksum ("" when the file has none)
	Rerun  string   // checksum of the rerun
	Engine string   // engine version of the stored results
	Differ []string // headline figures that differ, as "cell: name stored → rerun"
}

// Verify compares the computed results with the stored snapshot.
func (d *Document) Verify() (*Verification, error) {
	now, err := d.Snapshot()
	if err != nil {
		return nil, err
	}
	v := &Verification{Rerun: now.Checksum}
	if d.Stored == nil {
		return v, nil
	}
	v.Stored, v.Engine = d.Stored.Checksum, d.Stored.Engine
	v.Match = v.Stored == v.Rerun
	old := map[string]StoredFigure{}
	for _, f := range d.Stored.Figures {
		old[f.Cell+"\x00"+f.Name] = f
	}
	for _, f := range now.Figures {
		o, ok := old[f.Cell+"\x00"+f.Name]
		if !ok {
			v.Differ = append(v.Differ, fmt.Sprintf("%s: %s is new (%s)", f.Cell, f.Name, fmtFig(f.Figure)))
			continue
		}
		if figText(o.Figure) != figText(f.Figure) {
			v.Differ = append(v.Differ, fmt.Sprintf("%s: %s stored %s, rerun %s", f.Cell, f.Name, fmtFig(o.Figure), fmtFig(f.Figure)))
		}
	}
	return v, nil
}

func fmtFig(f Figure) string {
	if math.IsNaN(f.Low) {
		return fmt.Sprintf("%.4g %s", f.Median, f.Unit)
	}
	return fmt.Sprintf("%.4g [%.4g, %.4g] %s", f.Median, f.Low, f.High, f.Unit)
}

// figText is the canonical text of a figure's three numbers.
func figText(f Figure) string {
	var b strings.Builder
	q := quantum(maxAbs(f.Median, f.Low, f.High))
	canon(&b, f.Median, q)
	canon(&b, f.Low, q)
	canon(&b, f.High, q)
	return b.String()
}

// round formats x at SnapshotDigits significant digits (for messages).
func round(x float64) string {
	if math.IsNaN(x) {
		return "NaN"
	}
	if x == 0 {
		return "0" // +0 and -0 alike
	}
	return strconv.FormatFloat(x, 'g', SnapshotDigits, 64)
}

// quantum returns the rounding step for values whose largest magnitude is
// scale: a power of ten, SnapshotDigits digits below the leading one.
func quantum(scale float64) float64 {
	if !(scale > 0) || math.IsInf(scale, 0) {
		return 0
	}
	return math.Pow10(int(math.Floor(math.Log10(scale))) - (SnapshotDigits - 1))
}

// canon writes x as a whole number of steps q (the canonical text of the
// checksum); NaN and infinities are written by name.
func canon(b *strings.Builder, x, q float64) {
	switch {
	case math.IsNaN(x):
		b.WriteString("NaN")
	case math.IsInf(x, 0):
		b.WriteString(strconv.FormatFloat(x, 'g', -1, 64))
	case q == 0:
		b.WriteString("0")
	default:
		n := math.Round(x / q)
		if n == 0 {
			n = 0 // no -0
		}
		b.WriteString(strconv.FormatFloat(n, 'f', 0, 64))
	}
	b.WriteByte(' ')
}

func maxAbs(xs ...float64) float64 {
	m := 0.0
	for _, x := range xs {
		if a := math.Abs(x); a > m && !math.IsInf(a, 0) {
			m = a
		}
	}
	return m
}

// checksum hashes the canonical text of every cell's outputs.
func (d *Document) checksum() string {
	h := digest.New()
	var b strings.Builder
	for _, c := range d.Cells {
		b.Reset()
		fmt.Fprintf(&b, "cell %s %s\n", c.ID, c.Kind)
		st, err := d.Status(c.ID)
		if st != UpToDate {
			fmt.Fprintf(&b, "state %s: %v\n", st, err)
		}
		o := d.Output(c.ID)
		if o != nil {
			for _, f := range o.Figures {
				fmt.Fprintf(&b, "figure %s|%s|", f.Name, f.Unit)
				q := quantum(maxAbs(f.Median, f.Low, f.High))
				canon(&b, f.Median, q)
				canon(&b, f.Low, q)
				canon(&b, f.High, q)
				b.WriteByte('\n')
			}
			for _, w := range o.Warnings {
				fmt.Fprintf(&b, "warning %s\n", w)
			}
			for _, t := range o.Tables {
				fmt.Fprintf(&b, "table %s\n", t.Name)
				for _, col := range t.Columns {
					fmt.Fprintf(&b, "column %s|%s|", col.Name, col.Unit)
					q := quantum(maxAbs(col.Num...))
					for _, x := range col.Num {
						canon(&b, x, q)
					}
					for _, x := range col.Text {
						b.WriteString(strconv.Quote(x))
						b.WriteByte(' ')
					}
					b.WriteByte('\n')
				}
			}
		}
		h.Write([]byte(b.String()))
	}
	sum := h.Sum()
	return hex.EncodeToString(sum[:])
}
