package mix

import (
	"bytes"
	"context"
	"errors"
	"fmt"
)

// A catchment-wide run's chains and samples may be worked apart from the
// run that drives it: in other WebAssembly instances (the page's Web
// Workers), each with a CatchmentRun of its own for the same problem,
// options and seed. The driving run's work comes in rounds (Round): the
// chains' mode searches; then, between two points at which every chain
// waits for the others (a refit of the proposal in the warm-up, a
// convergence check after it), each chain's steps; then each sample's
// summary. Within a round the units (chains or samples) are independent:
// each reads the round's state, which Round encodes (the proposal, every
// chain's state, or the joint draws), and draws from its own stream, so a
// copy of the engine that sets the state and works the unit (WorkUnit)
// returns what the driving run would have computed; PutUnit takes it in.
// What lies between rounds (the proposal, its refits, the checks) the
// driving run does itself. The result is bit for bit the one Step and
// InvertCatchment give.

// The kinds of round.
const (
	roundSearch  = 1 // the chains' mode searches, one unit per chain
	roundChains  = 2 // the chains' steps to their next stop, one unit per chain
	roundSamples = 3 // the samples' summaries, one unit per sample
)

// Round returns the next round of work that copies of the engine may
// share out, after doing what comes before it on the calling goroutine:
// the state every copy needs (WorkUnit) and the units to work (chain or
// sample numbers). It returns no units when the run is done, and none for
// a run that fell back to the per-sample model (Result().Catchment.Fallback),
// whose samples are worked as the per-sample model's are.
func (c *CatchmentRun) Round() (state []byte, units []int) {
	c.roundDone, c.roundWork = 0, 0
	for {
		switch {
		case c.phase >= 2:
			return nil, nil
		case c.phase == 0 && c.prop == nil:
			d0, _ := c.work()
			for i, ch := range c.chains {
				if !ch.search.done {
					units = append(units, i)
				}
			}
			if len(units) > 0 {
				c.roundDone = d0
				per := float64(max(len(c.used), 1))
				for _, i := range units {
					c.roundWork += max(0, plannedSearch*float64(c.np)-float64(c.chains[i].search.evals)) * per
				}
				return c.chainState(roundSearch), units
			}
			c.propose()
		case c.phase == 0:
			if c.checkAt == 0 && c.refitted >= c.co.Warmup && c.chains[0].t == c.co.Warmup {
				c.runAhead()
			}
			d0, _ := c.work()
			per := float64(max(len(c.used), 1))
			for i, ch := range c.chains {
				if s := c.stopAt(ch); ch.t < s {
					units = append(units, i)
					c.roundWork += float64(s-ch.t) * per
				}
			}
			if len(units) > 0 {
				c.roundDone = d0
				return c.chainState(roundChains), units
			}
			c.sync()
		case c.next == len(c.base.prob.Waters):
			c.finishAll()
		default:
			d0, t := c.work()
			c.roundDone, c.roundWork = d0, t-d0
			if c.putSeen == nil {
				c.putSeen = make([]bool, len(c.base.prob.Waters))
			}
			for s, seen := range c.putSeen {
				if !seen {
					units = append(units, s)
				}
			}
			return c.sampleState(), units
		}
	}
}

// aheadChecks is how many convergence checks' worth of steps (Batch
// each) a round of the chains runs past the next check: a round costs the
// page a message to each worker and back, far more than a check.
const aheadChecks = 5

// runAhead sets the chains' goal, at the end of the warm-up, past their
// first check (checkpoint makes the checks within, and sets the goals
// after).
func (c *CatchmentRun) runAhead() {
	c.ahead, c.checkAt = aheadChecks*c.co.Batch, c.chains[0].goal
	goal := min(c.co.MaxSteps, max(c.checkAt, c.ahead))
	for _, ch := range c.chains {
		ch.goal = goal
	}
}

// RoundProgress returns the run's progress, as Progress, when the share f
// of the current round's work is done.
func (c *CatchmentRun) RoundProgress(f float64) float64 {
	if c.phase < 2 && c.roundWork > 0 {
		_, t := c.work()
		c.shown = max(c.shown, min(0.999, (c.roundDone+min(max(f, 0), 1)*c.roundWork)/t))
	}
	return c.Progress()
}

// A round's state travels as its kind (one byte), the chains' streams as
// their bytes, and the rest as numbers (wire.go's floats; counts are exact
// in a float64); a unit's result likewise: few lines of code, for a small
// module.

// numbers reads a list of numbers in order; reading past its end, or a
// count out of range, sets bad.
type numbers struct {
	v   []float64
	bad bool
}

// take returns the next k numbers, a copy (not inlined: it is called in
// many places, and each inlined copy weighs on the page's module).
//
//go:noinline
func (n *numbers) take(k int) []float64 {
	if k < 0 || k > len(n.v) {
		n.bad, n.v = true, nil
		return make([]float64, max(k, 0))
	}
	out := append([]float64(nil), n.v[:k]...)
	n.v = n.v[k:]
	return out
}

// next returns the next number.
//
//go:noinline
func (n *numbers) next() float64 {
	if len(n.v) == 0 {
		n.bad = true
		return 0
	}
	x := n.v[0]
	n.v = n.v[1:]
	return x
}

// int returns the next number as an int.
func (n *numbers) int() int { return int(n.next()) }

// count reads a count of at most most.
//
//go:noinline
func (n *numbers) count(most int) int {
	x := n.next()
	if !(x >= 0 && x <= float64(most)) || x != float64(int(x)) {
		n.bad = true
		return 0
	}
	return int(x)
}

// chainState encodes a round of the chains: its kind, the proposal and
// every chain's state.
func (c *CatchmentRun) chainState(kind int) []byte {
	v := []float64{float64(len(c.chains))}
	if q := c.prop; q != nil {
		v = append(v, float64(len(q.comps)), float64(c.heavy), c.full, c.block, float64(c.refitted))
		for _, m := range q.comps {
			v = append(v, m.logW, m.logDet)
			v = append(v, m.mu...)
			v = append(v, m.m...)
		}
	} else {
		v = append(v, 0)
	}
	w := wireWriter{b: []byte{byte(kind)}}
	for _, ch := range c.chains {
		v = chainNumbers(v, ch)
		b, _ := ch.src.MarshalBinary()
		w.string(string(b))
	}
	w.floats(v)
	return w.b
}

// chainNumbers appends a chain's state to v: its counters, point and mode
// search (not its stream, kept steps or warm-up draws).
func chainNumbers(v []float64, ch *chain) []float64 {
	v = append(v, float64(ch.t), float64(ch.goal), float64(ch.accepted), float64(ch.indTried), float64(ch.indTaken), ch.lp, ch.lq)
	v = append(v, ch.x...)
	s := ch.search
	if s == nil {
		return append(v, 0)
	}
	done := 0.0
	if s.done {
		done = 1
	}
	v = append(v, 1, s.f, float64(s.iter), float64(s.calm), done, float64(s.evals))
	v = append(v, s.x...)
	v = append(v, s.g...)
	return append(v, s.binv...)
}

// readChain sets ch from what chainNumbers wrote and from its stream's
// bytes.
func (c *CatchmentRun) readChain(n *numbers, stream string, ch *chain) error {
	if err := ch.src.UnmarshalBinary([]byte(stream)); err != nil {
		return err
	}
	ch.t, ch.goal, ch.accepted, ch.indTried, ch.indTaken = n.int(), n.int(), n.int(), n.int(), n.int()
	ch.lp, ch.lq = n.next(), n.next()
	copy(ch.x, n.take(c.np))
	ch.search = nil
	if n.count(1) == 1 {
		s := &search{f: n.next(), iter: n.int(), calm: n.int(), done: n.next() == 1, evals: n.int()}
		s.x = n.take(c.np)
		s.g = n.take(c.np)
		s.binv = n.take(c.np * c.np)
		ch.search = s
	}
	if n.bad {
		return errWire
	}
	return nil
}

// sampleState encodes the round of the samples' summaries: the joint
// draws, the ratios drawn from the prior per joint draw and the chains'
// convergence.
func (c *CatchmentRun) sampleState() []byte {
	conv := 0.0
	if c.cat.Converged {
		conv = 1
	}
	v := []float64{float64(len(c.keep)), conv, c.cat.MinESS, c.cat.MaxRHat}
	for _, x := range c.keep {
		v = append(v, x...)
	}
	v = append(v, c.extra...)
	w := wireWriter{b: []byte{roundSamples}}
	w.floats(v)
	return w.b
}

// errUnit is the error of a unit asked of a run that cannot work it.
var errUnit = errors.New("mix: not a unit of this catchment-wide run")

// setState sets the round's state, read from what Round returned in a run
// of the same problem, options and seed.
func (c *CatchmentRun) setState(state []byte) error {
	if len(state) == 0 {
		return errWire
	}
	if bytes.Equal(state, c.applied) {
		return nil
	}
	c.applied = nil
	kind := int(state[0])
	r := &wireReader{b: state[1:]}
	var streams []string
	if kind != roundSamples { // a chains' round: the streams first
		for range c.chains {
			streams = append(streams, r.string())
		}
	}
	n := &numbers{v: r.floats()}
	if r.err != nil || len(r.b) != 0 {
		return errWire
	}
	switch kind {
	case roundSearch, roundChains:
		if n.count(len(c.chains)) != len(c.chains) || len(streams) != len(c.chains) {
			return errWire
		}
		c.prop = nil
		if k := n.count(maxModes); k > 0 {
			q := &chainProposal{np: c.np, fold: c.nd, comps: make([]tComp, k)}
			c.heavy, c.full, c.block, c.refitted = n.int(), n.next(), n.next(), n.int()
			for i := range q.comps {
				m := &q.comps[i]
				m.logW, m.logDet = n.next(), n.next()
				m.mu = n.take(c.np)
				m.m = n.take(c.np * c.np)
			}
			if n.bad || c.heavy < 0 || c.heavy >= k {
				return errWire
			}
			c.prop = q
			c.makeBlocks()
		}
		if (kind == roundChains) != (c.prop != nil) {
			return errWire
		}
		for i, ch := range c.chains {
			if err := c.readChain(n, streams[i], ch); err != nil {
				return err
			}
			ch.hist, ch.warmY, ch.warmW = nil, nil, nil
		}
		c.phase = 0
	case roundSamples:
		keep := n.count(c.co.Keep)
		c.cat.Converged, c.cat.MinESS, c.cat.MaxRHat = n.next() == 1, n.next(), n.next()
		flat := n.take(keep * c.np)
		c.keep = make([][]float64, keep)
		for d := range c.keep {
			c.keep[d] = flat[d*c.np : (d+1)*c.np]
		}
		c.extra = n.take(c.co.Keep * int(NTracers) * c.base.n)
		if n.bad || keep != c.co.Keep {
			return errWire
		}
		c.phase = 1
	default:
		return errWire
	}
	if n.bad || len(n.v) != 0 {
		return errWire
	}
	c.kind = kind
	c.applied = append([]byte(nil), state...)
	return nil
}

// WorkUnit works one unit of a round (chain or sample number) on the
// calling goroutine, after setting the round's state (what Round returned
// in the driving run), calling progress (when set) with the share of the
// unit done, and returns its result for PutUnit. A cancelled context
// returns its error.
func (c *CatchmentRun) WorkUnit(ctx context.Context, state []byte, unit int, progress func(float64)) ([]byte, error) {
	if c.phase == 3 {
		return nil, errors.New("mix: the catchment-wide model fell back to the per-sample model")
	}
	if err := c.setState(state); err != nil {
		return nil, fmt.Errorf("mix: the catchment-wide round's state: %v", err)
	}
	w := &wireWriter{}
	switch c.kind {
	case roundSearch, roundChains:
		if unit < 0 || unit >= len(c.chains) {
			return nil, errUnit
		}
		ch := c.chains[unit]
		ch.hist, ch.acc, ch.warmY, ch.warmW = nil, nil, nil, nil
		if c.kind == roundSearch {
			for ch.search != nil && !ch.search.done {
				if err := ctx.Err(); err != nil {
					return nil, err
				}
				c.iterate(ch)
				if progress != nil {
					progress(min(1, float64(ch.search.evals)/(plannedSearch*float64(c.np))))
				}
			}
		} else {
			t0, stop := ch.t, c.stopAt(ch)
			for ch.t < stop {
				if ch.t%64 == 0 {
					if err := ctx.Err(); err != nil {
						return nil, err
					}
					if progress != nil {
						progress(float64(ch.t-t0) / float64(stop-t0))
					}
				}
				c.step(ch)
			}
		}
		b, _ := ch.src.MarshalBinary()
		w.string(string(b))
		w.floats(chainNumbers(nil, ch))
		w.floats(ch.hist)
		w.floats(ch.warmY)
		w.floats(ch.warmW)
		w.floats(ch.acc)
		ch.hist, ch.acc, ch.warmY, ch.warmW = nil, nil, nil, nil
		// The next round's state sets this chain anew.
		c.applied = nil
	case roundSamples:
		if unit < 0 || unit >= len(c.base.prob.Waters) {
			return nil, errUnit
		}
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		c.summarise(unit)
		return encodeSample(&c.base.res.Samples[unit]), nil
	}
	return w.b, nil
}

// PutUnit takes in what WorkUnit returned for a unit of the current round
// (the one Round last returned).
func (c *CatchmentRun) PutUnit(unit int, b []byte) error {
	switch {
	case c.phase == 0 && unit >= 0 && unit < len(c.chains):
		ch := c.chains[unit]
		r := &wireReader{b: b}
		stream := r.string()
		n := &numbers{v: r.floats()}
		hist, wy, ww, acc := r.floats(), r.floats(), r.floats(), r.floats()
		if r.err != nil || len(hist)%c.np != 0 || len(wy) != len(ww)*c.np || len(acc)*c.np != len(hist) {
			return fmt.Errorf("mix: chain %d: %v", unit+1, errWire)
		}
		if err := c.readChain(n, stream, ch); err != nil || len(n.v) != 0 {
			return fmt.Errorf("mix: chain %d: %v", unit+1, errWire)
		}
		ch.hist = append(ch.hist, hist...)
		ch.acc = append(ch.acc, acc...)
		ch.warmY = append(ch.warmY, wy...)
		ch.warmW = append(ch.warmW, ww...)
		return nil
	case c.phase == 1 && unit >= 0 && unit < len(c.putSeen) && !c.putSeen[unit]:
		if err := c.base.PutSample(unit, b); err != nil {
			return err
		}
		c.putSeen[unit] = true
		c.next++
		return nil
	}
	return fmt.Errorf("mix: unit %d is not one of the round's", unit)
}
