package sample

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"lixiv/engine/internal/watchdog"
)

// FuzzRead feeds arbitrary bytes to the importer: it must never panic,
// every problem must carry a sentinel, concentrations must never be negative
// or infinite, and the normalised output must read back to the same table.
func FuzzRead(f *testing.F) {
	for _, s := range []string{
		"Sample,Ca (mg/L),Date\nA,1,2024-01-02\n",
		"Site;Na (mg/L);K_umol_L\nX;0,5;<0,1\n",
		"Sample\tDate\tNO3-N\n\t\tmg/L\nA\t03/04/2024\tbdl\n",
		"\"a\",\"b\nc\"\n1,2\n",
		"Date,Time,Q (cfs),pH\n5-Mar-2024,10:30,12,7.1\n",
	} {
		f.Add([]byte(s))
	}
	if b, err := os.ReadFile("../../testdata/samples-messy.csv"); err == nil {
		f.Add(b)
	}
	for _, b := range awkwardFiles(f) {
		f.Add(b)
	}
	sentinels := []error{ErrNotTable, ErrNoColumn, ErrNotNumber, ErrNegative, ErrOutOfRange, ErrDuplicateColumn, ErrUnitConflict,
		ErrUnknownUnit, ErrNoUnit, ErrUnitMismatch, ErrBadDate, ErrAmbiguousDate, ErrFieldCount, ErrQuote, ErrTooMany}
	noteSentinels := []error{ErrCensored, ErrMissingValue, ErrDateOrder, ErrDecimalComma, ErrUnits, ErrDefaultUnit, ErrCellUnit,
		ErrComment, ErrChosenColumn}
	f.Fuzz(func(t *testing.T, in []byte) {
		defer watchdog.Start(in)()
		tb, err := Read(bytes.NewReader(in), "fuzz.csv", Options{})
		if err != nil {
			t.Fatalf("read error from memory: %v", err)
		}
		for _, p := range tb.Problems {
			known := false
			for _, s := range sentinels {
				known = known || errors.Is(p, s)
			}
			if !known || p.File != "fuzz.csv" {
				t.Fatalf("problem without a sentinel or file: %v", p)
			}
		}
		for _, p := range tb.Notes {
			known := false
			for _, s := range noteSentinels {
				known = known || errors.Is(p, s)
			}
			if !known || p.File != "fuzz.csv" || p.Line < 0 || p.Detail == "" {
				t.Fatalf("note without a sentinel, file, line or detail: %#v", p)
			}
		}
		for _, s := range tb.Samples {
			for _, v := range s.C {
				if v < 0 || math.IsInf(v, 0) {
					t.Fatalf("concentration %v", v)
				}
			}
		}
		var buf bytes.Buffer
		if err := tb.WriteCSV(&buf); err != nil {
			t.Fatal(err)
		}
		again := ParseText(buf.String(), "again.csv", Options{})
		if n, m := nonEmpty(tb), nonEmpty(again); tb.Problems.Err() == nil && n != m {
			t.Fatalf("round trip: %d samples became %d\n%q", n, m, buf.String())
		}
	})
}

// nonEmpty counts samples that hold anything.
func nonEmpty(t *Table) int {
	n := 0
	for _, s := range t.Samples {
		has := s.ID != "" || s.Site != "" || s.HasTime || len(s.Meta) > 0 || len(s.Censored) > 0
		for _, v := range append(s.C[:], s.Q, s.PH, s.Temp, s.Cond, s.Sr87Sr86) {
			has = has || !math.IsNaN(v)
		}
		if has {
			n++
		}
	}
	return n
}

// awkwardFiles returns the awkward laboratory files of testdata/awkward,
// the seeds of the importer's fuzz targets.
func awkwardFiles(f *testing.F) [][]byte {
	names, err := filepath.Glob("testdata/awkward/*")
	if err != nil {
		f.Fatal(err)
	}
	var out [][]byte
	for _, n := range names {
		if strings.HasSuffix(n, ".md") {
			continue
		}
		b, err := os.ReadFile(n)
		if err != nil {
			f.Fatal(err)
		}
		out = append(out, b)
	}
	return out
}
