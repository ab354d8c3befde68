package fuse_test

import (
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// TestStandaloneFiguresConverged: every figure a method reports on its own
// (each quantity its entry informs) is held to the bar of issue 15 —
// R̂ ≤ 1.01 and bulk ESS ≥ 1000 (Vehtari et al. 2021, the diagnostics'
// definitions; the bar is the project's) — now that a standalone fit
// tracks those quantities alone, on the demo and on a 6-configuration day.
func TestStandaloneFiguresConverged(t *testing.T) {
	for _, tc := range []struct {
		name string
		in   func(testing.TB) fuse.Input
	}{
		{"demo", demoInput},
		{"6 configurations", func(tb testing.TB) fuse.Input { return scaleInput(tb, 6) }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			in := tc.in(t)
			F, err := fuse.Run(in)
			if err != nil {
				t.Fatal(err)
			}
			for _, ev := range in.Evidence {
				alone := F.Standalone[ev.Entry]
				for _, q := range ev.Informs {
					draws := alone.Draws(evidence.Term{Config: q.Config, Axle: q.Axle, W: 1})
					n := len(draws) / 4 // the sampler's four chains, one after another
					chains := [][]float64{draws[:n], draws[n : 2*n], draws[2*n : 3*n], draws[3*n : 4*n]}
					rhat, ess := fuse.RhatESS(chains)
					if rhat > 1.01 || ess < 1000 {
						t.Errorf("%s alone, %s %s: R̂ %.4f, bulk ESS %.0f; want ≤ 1.01 and ≥ 1000", ev.Entry, q.Config, q.Axle, rhat, ess)
					}
				}
			}
		})
	}
}
