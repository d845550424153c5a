package mix

import (
	"math"
	"math/rand/v2"

	"lixiv/engine/chem"
)

// synthCatchment is a fictional catchment with known end-members: its
// shared ratios, each sample's scatter about them and amounts, and the
// waters as measured.
type synthCatchment struct {
	prob  Problem
	theta [NTracers][MaxEndMembers]float64 // the shared ratios
	tau   []float64                        // each end-member's scatter (σ of ln ratio)
	sil   float64                          // the catchment's mean silicate cation charge, µeq/L
}

// catchmentEndMembers returns the end-members and tracers of a catchment
// with n sources (2: silicate and carbonate; 3: and evaporite, seen by
// Cl/Na; 4: and a basaltic silicate).
func catchmentEndMembers(n int) ([]EndMember, []Tracer) {
	switch n {
	case 2:
		return []EndMember{PresetSilicate(), PresetCarbonate()}, []Tracer{CaNa, MgNa, HCO3Na}
	case 3:
		return []EndMember{PresetSilicate(), PresetCarbonate(), PresetEvaporite()}, []Tracer{CaNa, MgNa, HCO3Na, ClNa}
	}
	b := PresetBasaltic()
	b.Name = "basalt"
	return []EndMember{PresetSilicate(), b, PresetCarbonate(), PresetEvaporite()}, []Tracer{CaNa, MgNa, HCO3Na, ClNa}
}

// makeCatchment draws a catchment of ns samples mixed from n sources: the
// shared ratios from their priors (the model's own, as simulation-based
// calibration wants), each end-member's scatter from the half-normal
// prior of scale 0.1, each sample's ratios scattered about the shared ones,
// the sources' shares of the cation charge uniform on the simplex (so the
// samples spread along the mixing space), a total charge log-uniform
// between 100 and 2000 µeq/L, measured at the default precision.
func makeCatchment(ns, n int, seed uint64) *synthCatchment {
	rng := rand.New(rand.NewPCG(seed, 0x63617463))
	ems, trs := catchmentEndMembers(n)
	sc := &synthCatchment{prob: Problem{EndMembers: ems, Tracers: trs}, tau: make([]float64, n)}
	for j := range ems {
		for t := range NTracers {
			s := newSampler(ems[j].Ratio[t])
			if s.constant {
				sc.theta[t][j] = s.v
				continue
			}
			sc.theta[t][j] = pexp(s.fromLatent(normal01(rng)))
		}
		sc.tau[j] = math.Abs(0.1 * normal01(rng))
	}
	prec := DefaultPrecision()
	for i := range ns {
		var c [chem.NSpecies]float64
		g := make([]float64, n)
		sum := 0.0
		for j := range g {
			g[j] = -plog(uniform(rng))
			sum += g[j]
		}
		total := 100 * pexp(rng.Float64()*plog(20))
		for j := range ems {
			var r [NTracers]float64
			for t := range NTracers {
				r[t] = sc.theta[t][j]
				if !newSampler(ems[j].Ratio[t]).constant && Tracer(t) != Sr87Sr86 {
					r[t] *= pexp(sc.tau[j] * normal01(rng))
				}
			}
			charge := 1 + r[KNa] + 2*r[CaNa] + 2*r[MgNa]
			na := total * g[j] / sum / charge
			c[chem.Na] += na
			c[chem.K] += na * r[KNa]
			c[chem.Ca] += na * r[CaNa]
			c[chem.Mg] += na * r[MgNa]
			c[chem.Alk] += na * r[HCO3Na]
			c[chem.Cl] += na * r[ClNa]
			if ems[j].Source == Silicate {
				sc.sil += na * charge / float64(ns)
			}
		}
		meas := chem.NewComposition()
		for _, sp := range []chem.Species{chem.Na, chem.K, chem.Ca, chem.Mg, chem.Cl, chem.Alk} {
			meas[sp] = c[sp] + prec.Sigma(sp, c[sp])*normal01(rng)
		}
		sc.prob.Waters = append(sc.prob.Waters, Water{Name: "s" + itoa(i+1), Conc: meas, Sr87Sr86: math.NaN()})
	}
	return sc
}

// normal01 is a standard normal number computed the same on every target
// (the generator's data must not differ between the native and the
// WebAssembly runs; rand's NormFloat64 uses the math package's exp).
func normal01(rng *rand.Rand) float64 { return normQuantile(uniform(rng)) }

func itoa(i int) string {
	if i < 10 {
		return string(rune('0' + i))
	}
	return itoa(i/10) + string(rune('0'+i%10))
}

// silicateCharge returns the catchment's mean silicate cation charge
// (µeq/L: Na + K + 2 Ca + 2 Mg from silicate) in the draws of res: for
// joint draws, draw k of every sample together; otherwise one draw of each
// sample picked by weight, reps times.
func silicateCharge(res *Result, reps int, rng *rand.Rand) []float64 {
	charge := func(s, k int) float64 {
		_, sp, _ := res.Draw(s, k)
		v := sp[Silicate]
		return v[0] + v[1] + 2*v[2] + 2*v[3]
	}
	ns := len(res.Samples)
	var out []float64
	if res.Joint {
		for k := range res.Kept(0) {
			t := 0.0
			for s := range ns {
				t += charge(s, k)
			}
			out = append(out, t/float64(ns))
		}
		return out
	}
	cum := make([][]float64, ns)
	for s := range ns {
		t := 0.0
		for k := range res.Kept(s) {
			_, _, w := res.Draw(s, k)
			t += w
			cum[s] = append(cum[s], t)
		}
	}
	for range reps {
		t := 0.0
		for s := range ns {
			c := cum[s]
			x := rng.Float64() * c[len(c)-1]
			k := 0
			for k < len(c)-1 && c[k] <= x {
				k++
			}
			t += charge(s, k)
		}
		out = append(out, t/float64(ns))
	}
	return out
}
