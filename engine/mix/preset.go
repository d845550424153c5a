package mix

// Presets. Every value names its source; the flags "from memory" are those of
// docs/methods.md (§4.2, §6.2, §6.3) and must be verified
// against the cited tables before release. Prior widths not given by a source
// are marked "assumption". Sr/Na is the plain molar ratio (the literature
// often quotes 1000 Sr/Na).
//
// Every published "value ± range" is read the one way docs/methods.md
// §7.3 sets: the range is the 95 % interval of a log-normal prior
// with its median at the central value (Within). None of the sources at
// hand says its ± is one standard deviation, so none takes OneSigma.

// PresetRain is rain taken as sea salt: ratios from the Reference
// Composition of seawater, Millero, Feistel, Wright & McDougall (2008),
// Deep-Sea Res. I 55, table of molalities (docs/methods.md §4.2, confirmed);
// 87Sr/86Sr of seawater 0.709175 from McArthur, Howarth & Bailey (2001),
// J. Geol. 109 (from memory). Widths of 5 % for the ratios are an
// assumption that allows for non-marine dust; they are not from a source.
func PresetRain() EndMember {
	return EndMember{
		Name:   "rain (sea salt)",
		Source: Atmosphere,
		Ref:    "Millero et al. 2008 (ratios); McArthur et al. 2001 (87Sr/86Sr, from memory); 5 % widths assumed",
		Ratio: [NTracers]Prior{
			CaNa:     Spread(0.0219249, 0.05),
			MgNa:     Spread(0.112624, 0.05),
			KNa:      Spread(0.0217663, 0.05),
			HCO3Na:   Spread(0.00366272, 0.05),
			ClNa:     Spread(1.16398, 0.05),
			SrNa:     Spread(0.000193392, 0.05),
			Sr87Sr86: Spread(0.709175, 0.0001),
		},
	}
}

// PresetSilicate is the world-average silicate end-member of Gaillardet,
// Dupré, Louvat & Allègre (1999), Chem. Geol. 159, 3-30: Ca/Na 0.35 ± 0.15,
// Mg/Na 0.24 ± 0.12, HCO3/Na 2 ± 1, 1000 Sr/Na 3 ± 1 (central values
// confirmed through a secondary reproduction; the ± values and whether they
// are 1σ or a range are from memory; here they are read as the 95 % range,
// as every published ±). 87Sr/86Sr is "variable, fitted per river" in that
// source; the range 0.705-0.750 spans young basalts to old granites (Faure
// 1986, from memory). K/Na 0.05-0.5 is an assumption (no source in the
// docs/methods.md §6.2 gives none).
func PresetSilicate() EndMember {
	return EndMember{
		Name:   "silicate (global)",
		Source: Silicate,
		Ref:    "Gaillardet et al. 1999 (± from memory); 87Sr/86Sr after Faure 1986 (from memory); K/Na assumed",
		Ratio: [NTracers]Prior{
			CaNa:     Within(0.20, 0.35, 0.50),
			MgNa:     Within(0.12, 0.24, 0.36),
			KNa:      Within(0.05, 0.15, 0.5),
			HCO3Na:   Within(1, 2, 3),
			SrNa:     Within(0.002, 0.003, 0.004),
			Sr87Sr86: Within(0.705, 0.720, 0.750),
		},
	}
}

// PresetGranitic is a silicate end-member for granitic and gneissic
// catchments: Ca/Na and Mg/Na of order 0.2-0.5 and 87Sr/86Sr from 0.710 to
// above 0.75 (docs/methods.md §6.2, from memory; Faure 1986 for Sr). HCO3/Na,
// Sr/Na and K/Na follow PresetSilicate (K/Na an assumption).
func PresetGranitic() EndMember {
	e := PresetSilicate()
	e.Name = "silicate (granitic)"
	e.Ref = "granitic Ca/Na, Mg/Na: trade ranges from memory, no published source to hand (calibrate on local monolithologic streams); 87Sr/86Sr: Faure 1986 (from memory); K/Na assumed"
	e.Ratio[CaNa] = Within(0.15, 0.3, 0.5)
	e.Ratio[MgNa] = Within(0.1, 0.2, 0.5)
	e.Ratio[Sr87Sr86] = Within(0.710, 0.730, 0.760)
	return e
}

// PresetBasaltic is a silicate end-member for basaltic catchments: Ca/Na
// and Mg/Na of order 1 or more and 87Sr/86Sr about 0.703-0.706 (docs/methods.md
// §6.2, from memory; Faure 1986 for Sr). The upper bounds (3) and K/Na
// 0.02-0.3 are assumptions. HCO3/Na follows from the cation charge of the
// central ratios with Na and K counting once and Ca and Mg twice
// (carbonic-acid weathering, docs/methods.md §9.2): about 1 + 0.1 + 2(1 + 1) = 5.
func PresetBasaltic() EndMember {
	e := PresetSilicate()
	e.Name = "silicate (basaltic)"
	e.Ref = "basaltic Ca/Na, Mg/Na: trade ranges from memory, no published source to hand (calibrate on local monolithologic streams); 87Sr/86Sr: Faure 1986 (from memory); upper bounds and K/Na assumed"
	e.Ratio[CaNa] = Within(0.7, 1.0, 3)
	e.Ratio[MgNa] = Within(0.5, 1.0, 3)
	e.Ratio[KNa] = Within(0.02, 0.1, 0.3)
	e.Ratio[HCO3Na] = Within(3, 5, 10)
	e.Ratio[Sr87Sr86] = Within(0.703, 0.7045, 0.706)
	return e
}

// PresetCarbonate is the carbonate end-member of Gaillardet et al. (1999): Ca/Na
// ≈ 50, Mg/Na ≈ 10-20, HCO3/Na ≈ 120, 1000 Sr/Na ≈ 30-60, 87Sr/86Sr ≈
// 0.707-0.709 (all from memory, docs/methods.md §6.3). The Ca/Na and HCO3/Na
// ranges (a factor 2 either way) and K/Na 0.1-1 are assumptions. Every
// range is read as a 95 % log-normal interval.
func PresetCarbonate() EndMember {
	return EndMember{
		Name:   "carbonate",
		Source: Carbonate,
		Ref:    "Gaillardet et al. 1999 (from memory); ranges around Ca/Na and HCO3/Na and K/Na assumed",
		Ratio: [NTracers]Prior{
			CaNa:     Within(25, 50, 100),
			MgNa:     Within(10, 15, 20),
			KNa:      Within(0.1, 0.3, 1),
			HCO3Na:   Within(60, 120, 240),
			SrNa:     Within(0.03, 0.045, 0.06),
			Sr87Sr86: Within(0.707, 0.708, 0.709),
		},
	}
}

// PresetEvaporite is the evaporite end-member of Gaillardet et al. (1999): Ca/Na
// ≈ 0.1-0.2, Mg/Na ≈ 0.02, HCO3/Na ≈ 0.3, 1000 Sr/Na ≈ 1, 87Sr/86Sr ≈
// 0.707-0.709 (all from memory, docs/methods.md §6.3). Cl/Na = 1 is halite
// stoichiometry (docs/methods.md §5.1); K/Na = 0 because evaporitic K is
// neglected by default (docs/methods.md §5.2, common practice). Widths around
// the single values are assumptions. The inverse model lets this
// end-member take part only where a tracer can see it (Cl/Na; see
// Problem): elsewhere its Na cannot be told from silicate Na.
func PresetEvaporite() EndMember {
	return EndMember{
		Name:   "evaporite",
		Source: Evaporite,
		Ref:    "Gaillardet et al. 1999 (from memory); Cl/Na from halite stoichiometry; widths assumed",
		Ratio: [NTracers]Prior{
			CaNa:     Within(0.1, 0.15, 0.2),
			MgNa:     Within(0.01, 0.02, 0.04),
			HCO3Na:   Within(0.15, 0.3, 0.6),
			ClNa:     Spread(1, 0.02),
			SrNa:     Within(0.0005, 0.001, 0.002),
			Sr87Sr86: Within(0.707, 0.708, 0.709),
		},
	}
}

// DefaultEndMembers returns the preset end-members for an inversion. Pass
// raw = true for river chemistry that was not corrected for atmospheric
// input: rain then enters the inversion as an end-member of its own. For
// samples already corrected (engine/correct), rain is left out. The
// evaporite end-member takes part only with the Cl/Na tracer.
func DefaultEndMembers(raw bool) []EndMember {
	e := []EndMember{PresetEvaporite(), PresetSilicate(), PresetCarbonate()}
	if raw {
		e = append([]EndMember{PresetRain()}, e...)
	}
	return e
}
