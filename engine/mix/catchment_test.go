package mix

import (
	"context"
	"testing"
)

func TestCatchmentExplore(t *testing.T) {
	for _, n := range []int{2, 3, 4} {
		sc := makeCatchment(60, n, uint64(n))
		res, err := InvertCatchment(context.Background(), sc.prob, &Options{Seed: 1}, nil)
		if err != nil {
			t.Fatal(err)
		}
		c := res.Catchment
		t.Logf("n=%d check %+v fallback %q steps %d acc %.2f maxR %.3f minESS %.0f conv %v", n, c.Check, c.Fallback, c.Steps, c.Acceptance, c.MaxRHat, c.MinESS, c.Converged)
		for _, r := range c.Ratios {
			t.Logf("  %s %s truth %.4g prior [%.3g %.3g] post %.4g [%.4g %.4g] R %.3f ESS %.0f", sc.prob.EndMembers[r.EndMember].Name, r.Tracer, sc.theta[r.Tracer][r.EndMember], r.Prior.Lo, r.Prior.Hi, r.Posterior.Median, r.Posterior.Lo, r.Posterior.Hi, r.RHat, r.ESS)
		}
		for _, s := range c.Scatter {
			t.Logf("  tau %d truth %.3f post %.3f [%.3f %.3f]", s.EndMember, sc.tau[s.EndMember], s.Posterior.Median, s.Posterior.Lo, s.Posterior.Hi)
		}
		st := map[string]int{}
		for _, s := range res.Samples {
			st[s.Verdict]++
		}
		t.Log(st)
	}
}
