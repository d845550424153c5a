package qc

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"lixiv/engine/chem"
	"lixiv/engine/sample"
)

func TestThresholds(t *testing.T) {
	// Defaults: |NICB| ≤ 5 % ok, 5-10 % flag, > 10 % reject (common practice).
	tests := []struct {
		th   Thresholds
		x    float64
		want Status
	}{
		{DefaultThresholds, 0, Accepted}, {DefaultThresholds, 3.3, Accepted}, {DefaultThresholds, -5, Accepted},
		{DefaultThresholds, 5.01, Flagged}, {DefaultThresholds, -7.5, Flagged}, {DefaultThresholds, 10, Flagged},
		{DefaultThresholds, 10.01, Rejected}, {DefaultThresholds, -25, Rejected}, {DefaultThresholds, math.NaN(), Unknown},
		{Thresholds{OK: 2, Reject: 4}, 3, Flagged}, {Thresholds{OK: 2, Reject: 4}, 4.5, Rejected},
		{Thresholds{OK: 10, Reject: 20}, 7.5, Accepted},
	}
	for _, tc := range tests {
		t.Run(fmt.Sprintf("%v/%g", tc.th, tc.x), func(t *testing.T) {
			if got := tc.th.Classify(tc.x); got != tc.want {
				t.Errorf("Classify(%g) = %v, want %v", tc.x, got, tc.want)
			}
		})
	}
}

// table builds samples from text through the importer, as a user would.
func table(t *testing.T, text string) []*sample.Sample {
	t.Helper()
	tb := sample.ParseText(text, "qc.csv", sample.Options{})
	if err := tb.Problems.Err(); err != nil {
		t.Fatal(err)
	}
	return tb.Samples
}

func TestCheckFlags(t *testing.T) {
	// Row 1 is docs/methods.md §13 item 4 (NICB +3.2787 %); row 2 has 40 µmol/L
	// less Cl; row 3 lacks K and SO4 and has NO3 below a 2 µmol/L limit (1
	// substituted): TZ+ 600, TZ- 501 from the ions present, but no NICB,
	// since two majors are missing; row 4 has no anions.
	text := "Sample,Na (µmol/L),K (µmol/L),Ca (µmol/L),Mg (µmol/L),Cl (µmol/L),SO4 (µmol/L),NO3 (µmol/L),Alk (µeq/L)\n" +
		"S1,100,10,200,50,50,40,10,450\n" +
		"S2,100,10,200,50,10,40,10,450\n" +
		"S3,100,,200,50,50,,<2,450\n" +
		"S4,100,10,200,50,,,,\n"
	rs := Check(table(t, text), Options{})
	// S2: TZ+ 610, TZ- 550, NICB = 60/610 = 9.836 % -> flagged with the
	// defaults, rejected with Thresholds{2, 8}.
	want := []struct {
		status   Status
		nicb     float64
		missing  int
		censored int
		warn     []error
	}{
		{Accepted, 3.2787, 0, 0, nil},
		{Flagged, 9.8361, 0, 0, []error{ErrImbalance}},
		{Incomplete, math.NaN(), 2, 1, []error{ErrMissingMajor, ErrCensored}},
		{Unknown, math.NaN(), 3, 0, []error{ErrNoBalance, ErrMissingMajor}},
	}
	for i, w := range want {
		r := rs[i]
		if r.Status != w.status || r.Censored != w.censored || len(r.Missing) != w.missing {
			t.Errorf("%s: status %v censored %d missing %v; want %v %d %d", r.ID, r.Status, r.Censored, r.Missing, w.status, w.censored, w.missing)
		}
		if !(math.Abs(r.Balance.NICB-w.nicb) < 1e-3 || math.IsNaN(w.nicb) && math.IsNaN(r.Balance.NICB)) {
			t.Errorf("%s: NICB %.4f, want %.4f (±1e-3)", r.ID, r.Balance.NICB, w.nicb)
		}
		for _, e := range w.warn {
			found := false
			for _, got := range r.Warnings {
				found = found || errors.Is(got, e)
			}
			if !found {
				t.Errorf("%s: warnings %v lack %v", r.ID, r.Warnings, e)
			}
		}
		if len(r.Warnings) != len(w.warn) {
			t.Errorf("%s: %d warnings %v, want %d", r.ID, len(r.Warnings), r.Warnings, len(w.warn))
		}
	}
	if rs[2].Balance.TZPlus != 600 || math.Abs(rs[2].Balance.TZMinus-501) > 1e-9 {
		t.Errorf("S3 sums %g %g, want 600 and 501 from the ions present", rs[2].Balance.TZPlus, rs[2].Balance.TZMinus)
	}
	if got := rs[2].Flag(); got != "missing major ion(s): K, SO4" {
		t.Errorf("S3 flag %q", got)
	}
	if rs[1].Warnings[0].Error() != "charge imbalance beyond the accepted limit: NICB +9.8 % (accepted within ±5 %)" {
		t.Errorf("message %q", rs[1].Warnings[0])
	}
	// User thresholds, and thresholds on CBE instead of NICB.
	rs = Check(table(t, text), Options{Thresholds: Thresholds{OK: 2, Reject: 8}})
	if rs[0].Status != Flagged || rs[1].Status != Rejected {
		t.Errorf("with {2, 8}: %v %v, want flag reject", rs[0].Status, rs[1].Status)
	}
	rs = Check(table(t, text), Options{Measure: CBE})
	if math.Abs(rs[1].Balance.CBE-60.0/1160*100) > 1e-9 {
		t.Errorf("CBE %v, want 60/1160 = 5.17 %%", rs[1].Balance.CBE)
	}
	if rs[0].Status != Accepted || rs[1].Status != Flagged {
		t.Errorf("CBE statuses %v %v, want ok flag (CBE 1.67 %%, 5.17 %%)", rs[0].Status, rs[1].Status)
	}
	// Wider limits for dilute water: S2 has TZ+ 610 µeq/L.
	rs = Check(table(t, text), Options{DiluteBelow: 700, Dilute: Thresholds{OK: 10, Reject: 20}})
	if rs[1].Status != Accepted {
		t.Errorf("dilute S2 status %v, want ok within ±10 %%", rs[1].Status)
	}
	rs = Check(table(t, text), Options{DiluteBelow: 500, Dilute: Thresholds{OK: 10, Reject: 20}})
	if rs[1].Status != Flagged {
		t.Errorf("S2 above the dilute limit: status %v, want flag", rs[1].Status)
	}
}

func TestCheckMissingMajor(t *testing.T) {
	// docs/methods.md §13 item 4 (TZ+ 610, TZ- 590 µeq/L, NICB +3.2787 %) with
	// one major ion blanked at a time. From the ions present a blank Na
	// would give (410 - 590)/410 = -43.9 %, a blank Ca -116 %: values that
	// say nothing about the analysis. Every such sample must have no NICB
	// or CBE and be Incomplete, naming the missing ion; a value below
	// detection counts as measured.
	head := "Sample,Na (µmol/L),K (µmol/L),Ca (µmol/L),Mg (µmol/L),Cl (µmol/L),SO4 (µmol/L),NO3 (µmol/L),Alk (µeq/L)\n"
	tests := []struct {
		row, flag string
		status    Status
	}{
		{"all,100,10,200,50,50,40,10,450", "", Accepted},
		{"noNa,,10,200,50,50,40,10,450", "missing major ion(s): Na", Incomplete},
		{"noCa,100,10,,50,50,40,10,450", "missing major ion(s): Ca", Incomplete},
		{"noCl,100,10,200,50,,40,10,450", "missing major ion(s): Cl", Incomplete},
		{"noAlk,100,10,200,50,50,40,10,", "missing major ion(s): alkalinity", Incomplete},
		{"noNaCa,,10,,50,50,40,10,450", "missing major ion(s): Na, Ca", Incomplete},
		{"noNO3,100,10,200,50,50,40,,450", "", Accepted},
		{"censNa,<5,10,200,50,50,40,10,450", "", Rejected},
	}
	for _, tc := range tests {
		t.Run(tc.row, func(t *testing.T) {
			r := Check(table(t, head+tc.row+"\n"), Options{})[0]
			if r.Status != tc.status || r.Flag() != tc.flag {
				t.Errorf("status %v flag %q, want %v %q", r.Status, r.Flag(), tc.status, tc.flag)
			}
			if incomplete := tc.status == Incomplete; incomplete != math.IsNaN(r.Balance.NICB) || incomplete != math.IsNaN(r.Balance.CBE) {
				t.Errorf("NICB %g CBE %g with status %v", r.Balance.NICB, r.Balance.CBE, r.Status)
			}
		})
	}
}

func TestCheckOutliers(t *testing.T) {
	// Ten samples with Na/Cl near the seawater 0.859 (Millero et al. 2008)
	// and one with five times as much Na: only that one is flagged.
	var b strings.Builder
	b.WriteString("Sample,Na (µmol/L),Cl (µmol/L),Ca (µmol/L)\n")
	for i := 0; i < 10; i++ {
		fmt.Fprintf(&b, "N%d,%g,100,%g\n", i, 85.9*(1+0.01*float64(i%5-2)), 50+float64(i))
	}
	b.WriteString("X,429.5,100,55\n")
	b.WriteString("C,<1,100,55\n") // censored Na is never an outlier
	rs := Check(table(t, b.String()), Options{})
	for _, r := range rs {
		flagged := len(r.Outliers) > 0
		if flagged != (r.ID == "X") {
			t.Errorf("%s: outliers %v", r.ID, r.Outliers)
		}
	}
	o := rs[10].Outliers[0]
	if o.Species != chem.Na || math.Abs(o.Ratio-4.295) > 1e-9 || o.Z < 3.5 {
		t.Errorf("outlier %+v, want Na/Cl 4.295 with z > 3.5", o)
	}
	// Too few samples: no test.
	rs = Check(table(t, "Sample,Na (µmol/L),Cl (µmol/L)\nA,86,100\nB,87,100\nX,430,100\n"), Options{})
	if len(rs[2].Outliers) != 0 {
		t.Errorf("outlier test ran on 3 samples: %v", rs[2].Outliers)
	}
	// A stricter limit flags more.
	rs = Check(table(t, b.String()), Options{OutlierZ: 0.5, Ratios: []chem.Species{chem.Na}})
	n := 0
	for _, r := range rs {
		n += len(r.Outliers)
	}
	if n < 2 {
		t.Errorf("z limit 0.5 flagged %d, want more than one", n)
	}
}
