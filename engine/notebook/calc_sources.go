package notebook

import (
	"fmt"
	"strconv"
	"strings"

	"lixiv/engine/mix"
)

func init() { Register(KindSources, computeSources) }

// sourcesColumns is the layout of an end-member table: one row per ratio of
// an end-member.
var sourcesColumns = []string{"end-member", "source", "ratio", "low", "central", "high", "shape", "reference"}

// Presets lists the names SourcesTable accepts.
var Presets = []string{"global", "granite", "basalt"}

// SourcesTable returns the end-member table of a preset: "global" (world
// silicate, carbonate and evaporite of Gaillardet et al. 1999), "granite" or
// "basalt" (the lithology-specific silicate with the same carbonate, and no
// evaporite, which crystalline catchments seldom hold). The values and their
// sources come from package mix.
func SourcesTable(preset string) (*Table, error) {
	var ems []mix.EndMember
	switch preset {
	case "global":
		ems = []mix.EndMember{mix.PresetSilicate(), mix.PresetCarbonate(), mix.PresetEvaporite()}
	case "granite":
		ems = []mix.EndMember{mix.PresetGranitic(), mix.PresetCarbonate()}
	case "basalt":
		ems = []mix.EndMember{mix.PresetBasaltic(), mix.PresetCarbonate()}
	default:
		return nil, fmt.Errorf("unknown preset %q (want one of %s)", preset, strings.Join(Presets, ", "))
	}
	return EndMemberTable(ems), nil
}

// EndMemberTable writes end-members as a sources table.
func EndMemberTable(ems []mix.EndMember) *Table {
	t := &Table{Columns: append([]string(nil), sourcesColumns...), Units: []string{"", "", "", "mol/mol", "mol/mol", "mol/mol", "", ""}}
	f := func(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }
	eachPrior(ems, func(em *mix.EndMember, tr mix.Tracer, lo, hi float64) {
		p := em.Ratio[tr]
		t.Rows = append(t.Rows, []string{em.Name, em.Source.String(), tr.String(), f(lo), f(p.Value), f(hi), p.Dist.String(), em.Ref})
	})
	return t
}

// eachPrior calls f for each ratio prior of ems that is not a fixed zero,
// in order of end-member then tracer, with the prior's range (a fixed
// value's range is the value).
func eachPrior(ems []mix.EndMember, f func(em *mix.EndMember, tr mix.Tracer, lo, hi float64)) {
	for i := range ems {
		em := &ems[i]
		for tr := mix.Tracer(0); tr < mix.NTracers; tr++ {
			p := em.Ratio[tr]
			if p.Dist == mix.Fixed && p.Value == 0 {
				continue
			}
			lo, hi := p.Lo, p.Hi
			if p.Dist == mix.Fixed {
				lo, hi = p.Value, p.Value
			}
			f(em, tr, lo, hi)
		}
	}
}

var sourceByName = map[string]mix.Source{"atmosphere": mix.Atmosphere, "evaporite": mix.Evaporite, "silicate": mix.Silicate, "carbonate": mix.Carbonate}

// parseEndMembers reads a sources table, naming the row and column of any
// problem.
func parseEndMembers(t *Table) ([]mix.EndMember, error) {
	col := map[string]int{}
	for _, c := range sourcesColumns {
		col[c] = t.Column(c)
		if col[c] < 0 && c != "reference" {
			return nil, fmt.Errorf("the end-member table needs a column %q", c)
		}
	}
	var ems []mix.EndMember
	at := map[string]int{}
	for r := range t.Rows {
		cell := func(c string) string { return strings.TrimSpace(t.Cell(r, col[c])) }
		where := func(c string) string { return fmt.Sprintf("row %d, column %s", r+1, c) }
		name := cell("end-member")
		if name == "" {
			return nil, fmt.Errorf("%s: the end-member needs a name", where("end-member"))
		}
		src, ok := sourceByName[strings.ToLower(cell("source"))]
		if !ok {
			return nil, fmt.Errorf("%s: %q is not atmosphere, evaporite, silicate or carbonate", where("source"), cell("source"))
		}
		tr, err := mix.ParseTracer(cell("ratio"))
		if err != nil {
			return nil, fmt.Errorf("%s: %v", where("ratio"), err)
		}
		var v [3]float64
		for k, c := range []string{"low", "central", "high"} {
			if v[k], err = parseNum(cell(c)); err != nil {
				return nil, fmt.Errorf("%s: %v", where(c), err)
			}
		}
		var p mix.Prior
		switch strings.ToLower(cell("shape")) {
		case "fixed":
			p = mix.FixedRatio(v[1])
		case "log-uniform", "loguniform":
			p = mix.Range(v[0], v[1], v[2])
		case "log-normal", "lognormal":
			p = mix.Prior{Dist: mix.LogNormal, Value: v[1], Lo: v[0], Hi: v[2]}
		default:
			return nil, fmt.Errorf("%s: %q is not fixed, log-uniform or log-normal", where("shape"), cell("shape"))
		}
		if err := p.Validate(); err != nil {
			return nil, fmt.Errorf("row %d (%s %s): %v", r+1, name, tr, err)
		}
		i, seen := at[name]
		if !seen {
			i = len(ems)
			at[name] = i
			ems = append(ems, mix.EndMember{Name: name, Source: src})
			if col["reference"] >= 0 {
				ems[i].Ref = cell("reference")
			}
		} else if ems[i].Source != src {
			return nil, fmt.Errorf("%s: end-member %q was booked to %s above", where("source"), name, ems[i].Source)
		}
		ems[i].Ratio[tr] = p
	}
	if len(ems) == 0 {
		return nil, fmt.Errorf("the end-member table is empty: choose a preset or type the end-members")
	}
	if len(ems) > mix.MaxEndMembers {
		return nil, fmt.Errorf("at most %d end-members, the table has %d", mix.MaxEndMembers, len(ems))
	}
	for i := range ems {
		if err := ems[i].Validate(); err != nil {
			return nil, fmt.Errorf("end-member %q: %v", ems[i].Name, err)
		}
	}
	return ems, nil
}

func computeSources(e *Env) (*Output, error) {
	ems, err := parseEndMembers(e.Cell.Table)
	if err != nil {
		return nil, err
	}
	var name, src, ratio []string
	var lo, mid, hi []float64
	eachPrior(ems, func(em *mix.EndMember, tr mix.Tracer, l, h float64) {
		name, src, ratio = append(name, em.Name), append(src, em.Source.String()), append(ratio, tr.String())
		lo, mid, hi = append(lo, l), append(mid, em.Ratio[tr].Value), append(hi, h)
	})
	return &Output{Value: ems, Tables: []*ResultTable{{Name: "priors", Title: "End-member priors", Columns: []*Column{
		TextColumn("end-member", name), TextColumn("source", src), TextColumn("ratio", ratio),
		NumColumn("low", "mol/mol", lo), NumColumn("central", "mol/mol", mid), NumColumn("high", "mol/mol", hi)}}}}, nil
}
