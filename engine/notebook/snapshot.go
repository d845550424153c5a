package notebook

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Snapshot is a stored copy of a budget's results: the headline figures,
// for a reader of the file, and a SHA-256 checksum over every output table
// and figure, so that a rerun can be checked against it.
//
// The checksum covers numbers rounded to 12 significant digits, so that the
// same engine verifies on any machine (natively or in WebAssembly) even
// where the last bit of a transcendental function differs.
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

// SnapshotDigits is the number of significant digits the checksum covers.
const SnapshotDigits = 12

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
		if round(o.Median) != round(f.Median) || round(o.Low) != round(f.Low) || round(o.High) != round(f.High) {
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

// round formats x at SnapshotDigits significant digits.
func round(x float64) string {
	if math.IsNaN(x) {
		return "NaN"
	}
	if x == 0 {
		return "0" // +0 and -0 alike
	}
	return strconv.FormatFloat(x, 'g', SnapshotDigits, 64)
}

// checksum hashes the canonical text of every cell's outputs.
func (d *Document) checksum() string {
	h := sha256.New()
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
				fmt.Fprintf(&b, "figure %s|%s|%s|%s|%s\n", f.Name, f.Unit, round(f.Median), round(f.Low), round(f.High))
			}
			for _, w := range o.Warnings {
				fmt.Fprintf(&b, "warning %s\n", w)
			}
			for _, t := range o.Tables {
				fmt.Fprintf(&b, "table %s\n", t.Name)
				for _, col := range t.Columns {
					fmt.Fprintf(&b, "column %s|%s|", col.Name, col.Unit)
					for _, x := range col.Num {
						b.WriteString(round(x))
						b.WriteByte(' ')
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
	return hex.EncodeToString(h.Sum(nil))
}
