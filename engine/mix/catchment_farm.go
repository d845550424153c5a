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

// RoundProgress returns the run's progress, as Progress, when the share f
// of the current round's work is done.
func (c *CatchmentRun) RoundProgress(f float64) float64 {
	if c.phase < 2 && c.roundWork > 0 {
		_, t := c.work()
		c.shown = max(c.shown, min(0.999, (c.roundDone+min(max(f, 0), 1)*c.roundWork)/t))
	}
	return c.Progress()
}

// chainState encodes a round of the chains: its kind, the proposal and
// every chain's state.
func (c *CatchmentRun) chainState(kind int) []byte {
	w := &wireWriter{}
	w.int(kind)
	w.bool(c.prop != nil)
	if q := c.prop; q != nil {
		w.int(len(q.comps))
		for k := range q.comps {
			m := &q.comps[k]
			w.floats(m.mu)
			w.floats(m.m)
			w.float(m.logW)
			w.float(m.logDet)
		}
		w.int(c.heavy)
		w.float(c.full)
		w.float(c.block)
		w.int(c.refitted)
	}
	w.int(len(c.chains))
	for _, ch := range c.chains {
		writeChain(w, ch)
	}
	return w.b
}

// writeChain writes a chain's state: its stream, point, counters and mode
// search (not its kept steps or warm-up draws).
func writeChain(w *wireWriter, ch *chain) {
	b, _ := ch.src.MarshalBinary()
	w.string(string(b))
	w.floats(ch.x)
	w.float(ch.lp)
	w.float(ch.lq)
	w.int(ch.t)
	w.int(ch.goal)
	w.int(ch.accepted)
	w.int(ch.indTried)
	w.int(ch.indTaken)
	w.bool(ch.search != nil)
	if s := ch.search; s != nil {
		w.floats(s.x)
		w.floats(s.g)
		w.float(s.f)
		w.floats(s.binv)
		w.int(s.iter)
		w.int(s.calm)
		w.bool(s.done)
		w.int(s.evals)
	}
}

// readChain reads what writeChain wrote into ch, whose slices have the
// run's sizes.
func (c *CatchmentRun) readChain(r *wireReader, ch *chain) error {
	if err := ch.src.UnmarshalBinary([]byte(r.string())); err != nil && r.err == nil {
		return err
	}
	x := r.floats()
	ch.lp, ch.lq = r.float(), r.float()
	ch.t, ch.goal, ch.accepted, ch.indTried, ch.indTaken = r.int(), r.int(), r.int(), r.int(), r.int()
	if len(x) != c.np {
		r.fail()
	}
	copy(ch.x, x)
	ch.search = nil
	if r.bool() {
		s := &search{x: r.floats(), g: r.floats(), f: r.float(), binv: r.floats()}
		s.iter, s.calm, s.done, s.evals = r.int(), r.int(), r.bool(), r.int()
		if len(s.x) != c.np || len(s.g) != c.np || len(s.binv) != c.np*c.np {
			r.fail()
		}
		ch.search = s
	}
	return r.err
}

// sampleState encodes the round of the samples' summaries: the joint
// draws, the ratios drawn from the prior per joint draw and the chains'
// convergence.
func (c *CatchmentRun) sampleState() []byte {
	w := &wireWriter{}
	w.int(roundSamples)
	w.int(len(c.keep))
	for _, x := range c.keep {
		for _, v := range x {
			w.float(v)
		}
	}
	w.floats(c.extra)
	w.bool(c.cat.Converged)
	w.float(c.cat.MinESS)
	w.float(c.cat.MaxRHat)
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
	r := &wireReader{b: state}
	kind := r.int()
	switch kind {
	case roundSearch, roundChains:
		c.prop = nil
		if r.bool() {
			q := &chainProposal{np: c.np, fold: c.nd}
			q.comps = make([]tComp, max(0, min(r.int(), maxModes)))
			for k := range q.comps {
				m := &q.comps[k]
				m.mu, m.m, m.logW, m.logDet = r.floats(), r.floats(), r.float(), r.float()
				if len(m.mu) != c.np || len(m.m) != c.np*c.np {
					r.fail()
				}
			}
			c.heavy, c.full, c.block, c.refitted = r.int(), r.float(), r.float(), r.int()
			if r.err != nil || len(q.comps) == 0 || c.heavy < 0 || c.heavy >= len(q.comps) {
				return errWire
			}
			c.prop = q
			c.makeBlocks()
		}
		if r.int() != len(c.chains) || (kind == roundChains) != (c.prop != nil) {
			return errWire
		}
		for _, ch := range c.chains {
			if err := c.readChain(r, ch); err != nil {
				return err
			}
			ch.hist, ch.warmY, ch.warmW = nil, nil, nil
		}
		c.phase = 0
	case roundSamples:
		n := r.int()
		if n < 0 || n*c.np*8 > len(r.b) {
			return errWire
		}
		flat := make([]float64, n*c.np)
		for i := range flat {
			flat[i] = r.float()
		}
		c.keep = make([][]float64, n)
		for d := range c.keep {
			c.keep[d] = flat[d*c.np : (d+1)*c.np]
		}
		c.extra = r.floats()
		c.cat.Converged, c.cat.MinESS, c.cat.MaxRHat = r.bool(), r.float(), r.float()
		if r.err != nil || n != c.co.Keep || len(c.extra) != c.co.Keep*int(NTracers)*c.base.n {
			return errWire
		}
		c.phase = 1
	default:
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
		ch.hist, ch.warmY, ch.warmW = nil, nil, nil
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
		writeChain(w, ch)
		w.floats(ch.hist)
		w.floats(ch.warmY)
		w.floats(ch.warmW)
		ch.hist, ch.warmY, ch.warmW = nil, nil, nil
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
		if err := c.readChain(r, ch); err != nil {
			return fmt.Errorf("mix: chain %d: %v", unit+1, err)
		}
		hist, wy, ww := r.floats(), r.floats(), r.floats()
		if r.err != nil || len(hist)%c.np != 0 || len(wy) != len(ww)*c.np {
			return fmt.Errorf("mix: chain %d: %v", unit+1, errWire)
		}
		ch.hist = append(ch.hist, hist...)
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
