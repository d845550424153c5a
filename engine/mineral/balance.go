package mineral

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Phase is a mineral of a balance and its role.
type Phase struct {
	Mineral
	// Secondary lets the phase take either sign (formed, below zero, or
	// dissolved); a primary phase only dissolves (zero or above).
	Secondary bool
}

// Balance is the inverse mass balance of a set of phases (docs/methods.md
// §16; Garrels & Mackenzie 1967): for a water, the moles of each phase per
// litre that best give its composition. Build it with NewBalance and call
// Solve for each water.
type Balance struct {
	Phases []Phase
	// Checks are the water components reported as residuals but left out
	// of the fit.
	Checks []Component
	// Relative and Floor, when Relative is above zero, weight each
	// component of a least-squares fit by 1/σ with σ = Relative × |value|
	// + Floor (in the water's unit): the analytical uncertainty of each
	// measured value, so that a large, loosely known value (alkalinity)
	// does not outweigh a small, well known one. Zero Relative weights
	// every component alike. Weights do not change an exact solution.
	Relative, Floor float64
	cols            [][NComponents]float64 // per phase
	pivot           int                    // the secondary phase Al is solved into; −1 without Al
	// reduced[j] is phase j's column with Al carried by the pivot phase
	// (nil for the pivot).
	reduced [][NWater]float64
}

// NewBalance prepares the balance of phases. Al, which the water does not
// carry, must end in the secondary phases: when any phase holds Al, the
// secondary phase with the most Al per mole takes the Al balance exactly
// (its amount follows from the others), and a balance whose phases hold Al
// with no secondary phase to take it is refused. checks are the water
// components left out of the fit and reported as residuals only (the
// Garrels & Mackenzie 1967 sequence checks SiO2 and HCO3 this way).
func NewBalance(phases []Phase, checks ...Component) (*Balance, error) {
	if len(phases) == 0 {
		return nil, fmt.Errorf("no minerals to balance")
	}
	b := &Balance{Phases: phases, Checks: checks, pivot: -1}
	seen := map[string]bool{}
	var alPrimary []string
	for _, p := range phases {
		k := strings.ToLower(p.Key)
		if seen[k] {
			return nil, fmt.Errorf("%s is named twice", p.Key)
		}
		seen[k] = true
		if err := p.check(); err != nil {
			return nil, err
		}
		c := p.Column()
		b.cols = append(b.cols, c)
		if c[Al] != 0 && !p.Secondary {
			alPrimary = append(alPrimary, p.Key)
		}
	}
	for j, p := range phases {
		if p.Secondary && b.cols[j][Al] > 0 && (b.pivot < 0 || b.cols[j][Al] > b.cols[b.pivot][Al]) {
			b.pivot = j
		}
	}
	if b.pivot < 0 && len(alPrimary) > 0 {
		return nil, fmt.Errorf("the Al of %s has nowhere to go: add a secondary mineral that holds Al (kaolinite, gibbsite or smectite)",
			strings.Join(alPrimary, ", "))
	}
	for _, c := range checks {
		if c < 0 || c >= NWater {
			return nil, fmt.Errorf("%v is not a water component to check", c)
		}
	}
	b.reduced = make([][NWater]float64, len(phases))
	for j := range phases {
		if j == b.pivot {
			continue
		}
		for i := Component(0); i < NWater; i++ {
			b.reduced[j][i] = b.cols[j][i]
			if b.pivot >= 0 {
				b.reduced[j][i] -= b.cols[b.pivot][i] * b.cols[j][Al] / b.cols[b.pivot][Al]
			}
		}
	}
	return b, nil
}

// Fit says how a water was balanced.
type Fit int

// How a water was balanced.
const (
	NoFit           Fit = iota // not solved: under-determined, or no component to fit
	Exact                      // square: as many phases as components, solved exactly
	LeastSquares               // over-determined: least squares, with residuals
	UnderDetermined            // more phases than the components can tell apart
)

var fitNames = [...]string{"not solved", "exact", "least squares", "under-determined"}

// String describes the fit.
func (f Fit) String() string { return fitNames[f] }

// Solution is the balance of one water.
type Solution struct {
	// Amount is the moles of each phase per litre, in the water's unit
	// (µmol/L for a water in µmol/L): above zero dissolved, below zero
	// formed. NaN when not solved.
	Amount []float64
	// CO2 is the CO2 each phase consumed (Amount × CO2PerMole), in the
	// same unit; below zero, released.
	CO2 []float64
	// Residual is the water less what the phases give it, by water
	// component (NaN where the water has no value, or not solved).
	Residual [NWater]float64
	Fit      Fit
	Rows     int // components fitted
	Unknowns int // phases fitted (the Al phase follows from the others)
	// HeldAtZero lists the primary phases that would have to form, not
	// dissolve, to fit the water better: the balance holds them at zero.
	HeldAtZero []int
	// Backwards lists the secondary phases that dissolve rather than form.
	Backwards []int
	// Message says in plain words why the water is not solved, or what in
	// its solution runs against the phases' roles; "" when nothing does.
	Message string
}

// Solve balances water (by water component, in one unit such as µmol/L;
// NaN where not measured). Rows are the components some phase gives (with
// Al carried into the secondary phase), that the water has a value for
// and that are not checks. When the phases outnumber what those rows can
// tell apart, the water is not solved and Message says which phases
// cannot be told apart. Otherwise the amounts minimise the sum of squared
// residuals, each weighted as Relative and Floor say, primary phases held
// at zero or above (non-negative least squares, Lawson & Hanson 1974) and
// secondary phases free: exact when square.
func (b *Balance) Solve(water [NWater]float64) Solution {
	n := len(b.Phases)
	s := Solution{Amount: make([]float64, n), CO2: make([]float64, n)}
	nan := func() Solution {
		for j := range s.Amount {
			s.Amount[j], s.CO2[j] = math.NaN(), math.NaN()
		}
		for i := range s.Residual {
			s.Residual[i] = math.NaN()
		}
		return s
	}
	var rows []Component
	var missing []string
	for i := Component(0); i < NWater; i++ {
		switch {
		case !b.Fitted(i):
		case math.IsNaN(water[i]):
			missing = append(missing, i.String())
		default:
			rows = append(rows, i)
		}
	}
	var unk []int
	for j := range b.Phases {
		if j != b.pivot {
			unk = append(unk, j)
		}
	}
	s.Rows, s.Unknowns = len(rows), len(unk)
	a := make([][]float64, len(unk))
	for k, j := range unk {
		a[k] = make([]float64, len(rows))
		for i, c := range rows {
			a[k][i] = b.reduced[j][c]
		}
	}
	rhs := make([]float64, len(rows))
	for i, c := range rows {
		rhs[i] = water[c]
		if b.Relative > 0 {
			w := 1 / (b.Relative*math.Abs(water[c]) + b.Floor)
			rhs[i] *= w
			for k := range a {
				a[k][i] *= w
			}
		}
	}
	lack := ""
	if len(missing) > 0 {
		lack = " (the water has no " + strings.Join(missing, ", ") + ")"
	}
	if len(rows) == 0 {
		s = nan()
		s.Fit, s.Message = NoFit, "no component to balance"+lack
		return s
	}
	if len(unk) > 0 {
		q := factor(a, seq(len(unk)), len(rows), true)
		if r := q.rank(); r < len(unk) {
			s = nan()
			s.Fit = UnderDetermined
			if len(unk) > len(rows) {
				s.Message = fmt.Sprintf("under-determined: %d minerals to find from %d components%s; choose fewer minerals", len(unk), len(rows), lack)
			} else {
				s.Message = "under-determined: " + b.dependence(a, unk, q.perm, r) + lack + "; leave one of them out"
			}
			return s
		}
	}
	free := make([]bool, len(unk))
	for k, j := range unk {
		free[k] = b.Phases[j].Secondary
	}
	x, w, ok := nnls(a, rhs, free)
	if !ok {
		s = nan()
		s.Message = "the least-squares solution did not converge"
		return s
	}
	for k, j := range unk {
		s.Amount[j] = x[k]
	}
	if b.pivot >= 0 {
		al := 0.0
		for k, j := range unk {
			al += b.cols[j][Al] * x[k]
		}
		s.Amount[b.pivot] = -al / b.cols[b.pivot][Al]
	}
	for i := Component(0); i < NWater; i++ {
		s.Residual[i] = water[i]
		for j := range b.Phases {
			s.Residual[i] -= b.cols[j][i] * s.Amount[j]
		}
	}
	for j := range b.Phases {
		if c := b.Phases[j].CO2PerMole(); c != 0 { // 0, not −0, for a phase that consumes none
			s.CO2[j] = s.Amount[j] * c
		}
	}
	s.Fit = LeastSquares
	if len(rows) == len(unk) {
		s.Fit = Exact
	}
	scale := 0.0
	for _, v := range rhs {
		scale = math.Max(scale, math.Abs(v))
	}
	var msgs []string
	for k, j := range unk {
		if !b.Phases[j].Secondary && x[k] == 0 && w[k] < -1e-9*scale {
			s.HeldAtZero = append(s.HeldAtZero, j)
		}
	}
	big := 0.0
	for _, c := range rows {
		big = math.Max(big, math.Abs(water[c]))
	}
	for j := range b.Phases {
		if b.Phases[j].Secondary && s.Amount[j] > 1e-9*big {
			s.Backwards = append(s.Backwards, j)
		}
	}
	if len(s.HeldAtZero) > 0 {
		s.Fit = LeastSquares // an exact solution would need a primary phase to form
		msgs = append(msgs, fmt.Sprintf("%s would have to form, not dissolve, to balance this water; held at zero, which leaves residuals", b.names(s.HeldAtZero)))
	}
	if len(s.Backwards) > 0 {
		msgs = append(msgs, fmt.Sprintf("%s dissolves rather than forms", b.names(s.Backwards)))
	}
	if len(missing) > 0 {
		msgs = append(msgs, "balanced without "+strings.Join(missing, ", ")+", which the water has no value for")
	}
	s.Message = strings.Join(msgs, "; ")
	return s
}

// dependence says which phases the balance cannot tell apart: each column
// left out of the first r of the pivoted factorisation, written as the
// combination of the others that gives the water the same.
func (b *Balance) dependence(a [][]float64, unk, perm []int, r int) string {
	set := make([]bool, len(a))
	for _, k := range perm[:r] {
		set[k] = true
	}
	var parts []string
	for _, k := range perm[r:] {
		x, ok := lsq(a, a[k], set)
		if !ok {
			continue
		}
		var terms []string
		for j, c := range x {
			if math.Abs(c) < 1e-9 {
				continue
			}
			sign := " + "
			if c < 0 {
				sign = " − "
			}
			if len(terms) == 0 {
				sign = map[bool]string{true: "−", false: ""}[c < 0]
			}
			coef := ""
			if math.Abs(math.Abs(c)-1) > 1e-9 {
				coef = strconv.FormatFloat(math.Abs(c), 'g', 3, 64) + " "
			}
			terms = append(terms, sign+coef+b.Phases[unk[j]].Key)
		}
		parts = append(parts, fmt.Sprintf("%s gives the water what %s give, so they cannot be told apart by the components balanced",
			b.Phases[unk[k]].Key, strings.Join(terms, "")))
	}
	return strings.Join(parts, "; ")
}

// AlBalanced reports whether a secondary phase takes the Al balance (some
// phase holds Al).
func (b *Balance) AlBalanced() bool { return b.pivot >= 0 }

// Fitted reports whether water component c is fitted: some phase gives
// it (Al carried into the secondary phase) and it is not a check.
func (b *Balance) Fitted(c Component) bool {
	for _, k := range b.Checks {
		if k == c {
			return false
		}
	}
	for j := range b.Phases {
		if j != b.pivot && math.Abs(b.reduced[j][c]) > 1e-12 {
			return true
		}
	}
	return false
}

func (b *Balance) names(idx []int) string {
	n := make([]string, len(idx))
	for i, j := range idx {
		n[i] = b.Phases[j].Key
	}
	return strings.Join(n, ", ")
}

func seq(n int) []int {
	s := make([]int, n)
	for i := range s {
		s[i] = i
	}
	return s
}

// Water returns the water the phases give when amount[j] moles of each
// dissolve (below zero: form), by water component; with every amount from
// a balanced set (Al conserved) it is the water a Solve of this balance
// gives back exactly.
func (b *Balance) Water(amount []float64) [NWater]float64 {
	var w [NWater]float64
	for j := range b.Phases {
		for i := Component(0); i < NWater; i++ {
			w[i] += b.cols[j][i] * amount[j]
		}
	}
	return w
}

// AlCarried returns the Al (mol per mol of the water's unit) that the
// amounts leave in the solids: zero for a solution.
func (b *Balance) AlCarried(amount []float64) float64 {
	al := 0.0
	for j := range b.Phases {
		al += b.cols[j][Al] * amount[j]
	}
	return al
}
