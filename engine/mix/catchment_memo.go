package mix

// Searches is what the mode searches of a catchment-wide run's chains
// reached (Catchment.Searches), for a later run of the same problem, seed
// and options but for the lengths of its chains to take over
// (CatchmentOptions.Searches) instead of searching again: the page's full
// pass after its quick pass. A search depends only on the log posterior and
// the chain's start, so the later run's results are the same bits as if it
// had searched itself.
type Searches struct {
	// What the log posterior depends on: the run's options, the chains
	// and the scatters' prior, the end-members, tracers and samples (names
	// and setups), and the samples in the joint likelihood.
	opt     Options
	chains  int
	scatter float64
	ems     []EndMember
	tracers []Tracer
	names   []string
	setups  []*setup
	used    []int

	starts [][]float64 // each chain's start
	lps    []float64   // and its log posterior there
	ended  []search    // each chain's search as it ended
}

// record keeps the chains' ended searches (before propose drops them) in
// the run's Catchment.
func (c *CatchmentRun) record() {
	r := c.base
	s := &Searches{opt: r.opt, chains: c.co.Chains, scatter: c.co.Scatter, ems: r.prob.EndMembers, tracers: r.prob.Tracers, used: c.used}
	for i := range r.res.Samples {
		s.names = append(s.names, r.res.Samples[i].Name)
		s.setups = append(s.setups, &r.res.Samples[i].setup)
	}
	for _, ch := range c.chains {
		e := *ch.search
		e.x, e.g, e.binv = clone(e.x), clone(e.g), clone(e.binv)
		s.starts = append(s.starts, clone(ch.x))
		s.lps = append(s.lps, ch.lp)
		s.ended = append(s.ended, e)
	}
	c.cat.searches = s
}

// Searches returns what the run's mode searches reached, once they are
// done (nil before, and after a fall back to the per-sample model).
func (c *Catchment) Searches() *Searches { return c.searches }

// SearchesTaken reports whether the run took over an earlier run's mode
// searches (CatchmentOptions.Searches) rather than searching itself.
func (c *Catchment) SearchesTaken() bool { return c.taken }

// takeSearches gives the chains the searches of s, made by an earlier run,
// when everything the searches depend on is the same bit for bit (all
// options but the lengths of the chains and the draws, which the searches
// do not read), and reports whether it did.
func (c *CatchmentRun) takeSearches(s *Searches) bool {
	r := c.base
	if s == nil || len(s.ended) != len(c.chains) || s.chains != c.co.Chains || len(s.setups) != len(r.res.Samples) ||
		!sameSearchOptions(&s.opt, &r.opt) || !sameBits(s.scatter, c.co.Scatter) || !sameBits(s.ems, r.prob.EndMembers) ||
		!sameBits(s.tracers, r.prob.Tracers) || !sameBits(s.used, c.used) {
		return false
	}
	for i := range r.res.Samples {
		if s.names[i] != r.res.Samples[i].Name || !sameBits(*s.setups[i], r.res.Samples[i].setup) {
			return false
		}
	}
	for k, ch := range c.chains {
		if !sameBits(s.starts[k], ch.x) || !sameBits(s.lps[k], ch.lp) {
			return false
		}
	}
	for k, ch := range c.chains {
		e := s.ended[k]
		e.x, e.g, e.binv = clone(e.x), clone(e.g), clone(e.binv)
		ch.search = &e
	}
	c.cat.taken = true
	return true
}

// sameSearchOptions reports whether two catchment-wide runs' options give
// the same mode searches: all but those sameRunOptions leaves aside and the
// numbers of draws, which the searches do not read.
func sameSearchOptions(a, b *Options) bool {
	x, y := *a, *b
	x.Draws, y.Draws = 0, 0
	x.TargetESS, y.TargetESS = 0, 0
	x.MaxDraws, y.MaxDraws = 0, 0
	return sameRunOptions(&x, &y)
}

// clone returns a copy of v.
func clone(v []float64) []float64 { return append([]float64(nil), v...) }
