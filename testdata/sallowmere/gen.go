//go:build ignore

// Gen writes the invented Sallowmere Water files of this folder (see
// README.md): go run testdata/sallowmere/gen.go. The numbers are made up
// from the simple rules below, not measured, and come out the same on
// every run.
package main

import (
	"fmt"
	"math"
	"os"
	"strings"
	"time"
)

// rng is a small linear congruential generator (Knuth's MMIX constants),
// so that the files do not depend on Go's math/rand.
type rng uint64

func (r *rng) float() float64 {
	*r = *r*6364136223846793005 + 1442695040888963407
	return float64(uint64(*r)>>11) / (1 << 53)
}

func (r *rng) normal() float64 {
	u, v := r.float(), r.float()
	return math.Sqrt(-2*math.Log(1-u)) * math.Cos(2*math.Pi*v)
}

const (
	areaKm2 = 250.0 // the fictional catchment above the gauge
	meanQ   = 4.1   // m³/s: the mean discharge the concentrations are scaled to
)

func main() {
	r := rng(20240611)
	start := time.Date(2021, 1, 1, 0, 0, 0, 0, time.UTC)
	end := time.Date(2023, 12, 31, 0, 0, 0, 0, time.UTC)
	q := map[string]float64{}
	var b strings.Builder
	b.WriteString("Date,Discharge (m3/s),Quality\n")
	storm := 0.0
	for d := start; !d.After(end); d = d.AddDate(0, 0, 1) {
		season := math.Exp(0.55 * math.Cos(2*math.Pi*(float64(d.YearDay())-25)/365.25))
		if r.float() < 0.06 {
			storm += 3 + 6*r.float()
		}
		storm *= 0.72
		v := meanQ * 0.51 * season * (1 + storm) * math.Exp(0.08*r.normal())
		day := d.Format("2006-01-02")
		q[day] = v
		quality := "good"
		if storm > 2 {
			quality = "estimated"
		}
		fmt.Fprintf(&b, "%s,%.3f,%s\n", day, v, quality)
	}
	write("sallowmere-discharge.csv", b.String())

	// Stream samples about monthly, concentrations falling with discharge
	// (C = a (Q/meanQ)^b), HCO3 set so that the charge balances within a
	// few per cent.
	type ion struct {
		name  string
		a, b  float64 // mg/L at the mean discharge, exponent
		molar float64 // g/mol
		z     float64 // charge
	}
	ions := []ion{
		{"Na", 6.0, -0.15, 22.990, 1}, {"K", 1.0, -0.10, 39.098, 1}, {"Ca", 12.0, -0.22, 40.078, 2},
		{"Mg", 2.6, -0.20, 24.305, 2}, {"Cl", 4.0, -0.05, 35.45, -1}, {"SO4", 2.5, -0.20, 96.06, -2},
		{"NO3", 2.0, 0, 62.004, -1}, {"SiO2", 8.0, -0.10, 60.08, 0},
	}
	b.Reset()
	b.WriteString("Sample,Date,Lab,Na (mg/L),K (mg/L),Ca (mg/L),Mg (mg/L),Cl (mg/L),SO4 (mg/L),NO3 (mg/L),HCO3 (mg/L),SiO2 (mg/L),Remarks\n")
	n := 0
	for m := 0; m < 36; m++ {
		d := time.Date(2021, time.Month(1+m), 8+int(12*r.float()), 0, 0, 0, 0, time.UTC)
		day := d.Format("2006-01-02")
		rel := q[day] / meanQ
		vals := map[string]string{}
		charge := 0.0
		for _, x := range ions {
			c := x.a * math.Pow(rel, x.b) * math.Exp(0.025*r.normal())
			vals[x.name] = fmt.Sprintf("%.2f", c)
			charge += x.z * c / x.molar * 1000 // µeq/L
		}
		hco3 := charge * (1 + 0.02*r.normal()) * 61.016 / 1000 // mg/L
		vals["HCO3"] = fmt.Sprintf("%.1f", hco3)
		lab := "North lab"
		if m%2 == 1 {
			lab = "River lab"
		}
		remark := ""
		switch m {
		case 4:
			vals["NO3"], remark = "<0.05", "nitrate below detection"
		case 6:
			vals["K"], remark = "O.95", "typed from the field sheet" // a letter O for a zero, as a typist might
		case 11:
			remark = "high flow"
		}
		n++
		fmt.Fprintf(&b, "SM-%02d,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s,%s\n", n, day, lab,
			vals["Na"], vals["K"], vals["Ca"], vals["Mg"], vals["Cl"], vals["SO4"], vals["NO3"], vals["HCO3"], vals["SiO2"], remark)
	}
	write("sallowmere-samples.csv", b.String())
}

func write(name, text string) {
	if err := os.WriteFile("testdata/sallowmere/"+name, []byte(text), 0o644); err != nil {
		fmt.Fprintln(os.Stderr, err)
		os.Exit(1)
	}
}
