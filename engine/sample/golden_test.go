package sample

import (
	"bytes"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"text/tabwriter"

	"lixiv/engine/chem"
	"lixiv/engine/internal/golden"
)

// dump prints a table as tabwriter text at fixed precision: the columns and
// what they were read as, the samples in µmol/L (µeq/L for Alk), and the
// problems.
func dump(t *Table) string {
	var b bytes.Buffer
	w := tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
	fmt.Fprintf(w, "file\t%s\n", t.Name)
	fmt.Fprintf(w, "delimiter\t%q\n", t.Comma)
	fmt.Fprintf(w, "decimal mark\t%q\n", t.Decimal)
	fmt.Fprintf(w, "censored values\t%s\n", t.Policy)
	for _, p := range t.Preamble {
		fmt.Fprintf(w, "preamble\t%s\n", p)
	}
	w.Flush()
	fmt.Fprintln(&b, "\ncolumns")
	fmt.Fprintln(w, "#\theader\tunits row\tread as\tnote")
	for _, c := range t.Columns {
		fmt.Fprintf(w, "%d\t%s\t%s\t%s\t%s\n", c.Index+1, c.Header, c.UnitText, c.Mapping(), c.Note)
	}
	w.Flush()
	fmt.Fprintln(&b, "\nsamples (µmol/L, Alk µeq/L, Q m³/s, T °C, EC µS/cm; <limit = below detection)")
	sp := t.Species()
	fmt.Fprint(w, "line\tid\tsite\ttime\tQ\tpH\tT\tEC\t87Sr/86Sr")
	for _, s := range sp {
		fmt.Fprintf(w, "\t%s", s)
	}
	fmt.Fprintln(w, "\tmeta")
	f := func(format string, v float64) string {
		if math.IsNaN(v) {
			return "-"
		}
		return fmt.Sprintf(format, v)
	}
	for _, s := range t.Samples {
		tm := "-"
		switch {
		case s.HasTime && s.DateOnly:
			tm = s.Time.Format("2006-01-02")
		case s.HasTime:
			tm = s.Time.Format("2006-01-02T15:04Z")
		}
		fmt.Fprintf(w, "%d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s", s.Line, s.ID, s.Site, tm,
			f("%.5f", s.Q), f("%.2f", s.PH), f("%.1f", s.Temp), f("%.1f", s.Cond), f("%.5f", s.Sr87Sr86))
		for _, x := range sp {
			if lim, ok := s.Limit(x); ok {
				fmt.Fprintf(w, "\t<%s", strings.Replace(f("%.3f", lim), "-", "DL", 1))
				continue
			}
			fmt.Fprintf(w, "\t%s", f("%.3f", s.C[x]))
		}
		var meta []string
		for _, k := range t.metaKeys() {
			if v, ok := s.Meta[k]; ok {
				meta = append(meta, fmt.Sprintf("%s=%q", k, v))
			}
		}
		fmt.Fprintf(w, "\t%s\n", strings.Join(meta, " "))
	}
	w.Flush()
	fmt.Fprintln(&b, "\nproblems")
	for _, p := range t.Problems {
		fmt.Fprintf(&b, "%s: %s\n", p.Severity, p)
	}
	fmt.Fprintln(&b, "\nnotes")
	for _, p := range t.Notes {
		fmt.Fprintf(&b, "%s (%s): %s\n", p.Severity, p.Effect, p)
	}
	return b.String()
}

func readFile(t *testing.T, path string, opt Options) *Table {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	tb, err := Read(f, filepath.Base(path), opt)
	if err != nil {
		t.Fatal(err)
	}
	return tb
}

func TestGolden(t *testing.T) {
	for _, name := range []string{"samples-messy.csv", "samples-messy-decimal-comma.csv"} {
		t.Run(name, func(t *testing.T) {
			tb := readFile(t, filepath.Join("..", "..", "testdata", name), Options{})
			golden.Check(t, strings.TrimSuffix(name, ".csv")+".golden", []byte(dump(tb)))
		})
	}
}

// The two messy files hold the same samples in two labs' conventions, so
// they must give the same normalised table.
func TestMessyVariantsAgree(t *testing.T) {
	a := readFile(t, "../../testdata/samples-messy.csv", Options{})
	b := readFile(t, "../../testdata/samples-messy-decimal-comma.csv", Options{})
	if len(a.Samples) != len(b.Samples) || len(a.Samples) != 8 {
		t.Fatalf("got %d and %d samples, want 8 each", len(a.Samples), len(b.Samples))
	}
	for i := range a.Samples {
		sa, sb := a.Samples[i], b.Samples[i]
		for _, sp := range chem.All() {
			x, y := sa.C[sp], sb.C[sp]
			if math.IsNaN(x) != math.IsNaN(y) || !math.IsNaN(x) && math.Abs(x-y) > 1e-9*math.Abs(x) {
				t.Errorf("sample %s %s: %v vs %v", sa.ID, sp, x, y)
			}
			if sa.IsCensored(sp) != sb.IsCensored(sp) {
				t.Errorf("sample %s %s: censored %v vs %v", sa.ID, sp, sa.IsCensored(sp), sb.IsCensored(sp))
			}
		}
		if !sa.Time.Equal(sb.Time) || sa.HasTime != sb.HasTime {
			t.Errorf("sample %s: time %v vs %v", sa.ID, sa.Time, sb.Time)
		}
		for _, q := range [][2]float64{{sa.Q, sb.Q}, {sa.PH, sb.PH}, {sa.Temp, sb.Temp}, {sa.Cond, sb.Cond}, {sa.Sr87Sr86, sb.Sr87Sr86}} {
			if math.IsNaN(q[0]) != math.IsNaN(q[1]) || !math.IsNaN(q[0]) && math.Abs(q[0]-q[1]) > 1e-12 {
				t.Errorf("sample %s: field %v vs %v", sa.ID, q[0], q[1])
			}
		}
	}
	if len(a.Problems) != len(b.Problems) {
		t.Errorf("problems: %d vs %d\n%v\n%v", len(a.Problems), len(b.Problems), a.Problems, b.Problems)
	}
}
