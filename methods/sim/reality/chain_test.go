package reality_test

// Test-only imports of the tool's loader, adapters and fusion: this test
// runs the whole chain on days the independent simulator wrote.

import (
	"math"
	"path/filepath"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/checks"
	"liftfuse/methods/sim/reality"
)

// fuseDay loads, reduces, checks and fuses a written campaign as the CLI
// does (cmd/liftfuse, analyseChecked).
func fuseDay(t *testing.T, dir string) *fuse.Result {
	t.Helper()
	c, err := campaign.Load(filepath.Join(dir, reality.CampaignFile), campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ids := c.ConfigIDs()
	f, err := fuse.Run(fuse.Input{Evidence: r.Evidence(), Reference: c.Report.ReferenceConfig, SpeedsKmh: c.Report.SpeedsKmh,
		Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2, Warnings: r.Warnings, Checks: checks.Run(c, r),
		Settings: fuse.Settings{Configs: ids, PriorSD: c.Prior.CLASDM2, Linear: c.Prior.SpeedModel == campaign.SpeedLinear,
			Seed: uint64(c.Report.Seed), Credible: c.Report.Credible}})
	if err != nil {
		t.Fatal(err)
	}
	return f.Result
}

// figure is one fused figure beside its truth.
type figure struct {
	name  string
	est   fuse.Estimate
	truth float64
	delta bool // a configuration's difference to the reference
}

func figures(res *fuse.Result, tr *reality.Truth) []figure {
	truth := map[string]reality.ConfigTruth{}
	for _, c := range tr.Configs {
		truth[c.ID] = c
	}
	var out []figure
	for _, c := range res.Configs {
		tc := truth[c.ID]
		out = append(out, figure{c.ID + " front", c.Front.CLA, tc.Front, false},
			figure{c.ID + " rear", c.Rear.CLA, tc.Rear, false}, figure{c.ID + " total", c.Total.CLA, tc.Total, false})
	}
	for _, d := range res.Deltas {
		a, b := truth[d.Config], truth[d.Versus]
		out = append(out, figure{d.Config + "−" + d.Versus + " front", d.Front.CLA, a.Front - b.Front, true},
			figure{d.Config + "−" + d.Versus + " rear", d.Rear.CLA, a.Rear - b.Rear, true})
	}
	return out
}

// TestChainCleanDays runs the tool on clean days with v1 keys and reports
// how often its 90 % intervals cover the truth.
//
// Without suspension friction the day matches the tool's model, and the
// test fails when a figure lies beyond 4 sd of the truth (a physics
// disagreement between the tool and this simulator; chance alone gives
// P(|z| > 4) ≈ 6e-5 per figure) or when coverage falls below 70 % (with 8
// days of 8 figures at a true 90 %, below 70 % has probability < 1e-6 —
// binomial tail, common practice (no source)).
//
// With a 0.15 mm friction band the body sticks where the last load change
// left it: after braking to rest the rear sits high and the front low, so
// the standstill windows that pin the static offset are biased the same
// way on every pass, which biases each axle's lift (a gap of model v1: it
// adds f²/3 of independent variance per window). Road inputs at speed
// shake the band loose (Car.RoadMm), so the bias is about half what a
// band without them gives (measured: rear −0.007 m² with them, −0.013
// without, on the ballast pot). The bias is common to the
// configurations, so only the A/B differences are held to 4 sd there; the
// absolute figures and their coverage are logged.
func TestChainCleanDays(t *testing.T) {
	if testing.Short() {
		t.Skip("whole chain on simulated days: skipped with -short")
	}
	cases := []struct {
		name       string
		frictionMm float64
		deltasOnly bool
	}{
		{"no friction", 0, false},
		{"friction 0.15 mm", 0.15, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			const days = 8
			covered, total := 0, 0
			for seed := int64(1); seed <= days; seed++ {
				d := reality.Default()
				d.Keys = reality.KeysV1
				d.Car.Front.StictionMm, d.Car.Rear.StictionMm = tc.frictionMm, tc.frictionMm
				dir := t.TempDir()
				tr, err := d.Write(dir, seed)
				if err != nil {
					t.Fatal(err)
				}
				for _, f := range figures(fuseDay(t, dir), tr) {
					z := (f.est.Mean - f.truth) / f.est.SD
					total++
					if f.est.Lo <= f.truth && f.truth <= f.est.Hi {
						covered++
					}
					t.Logf("seed %d %-24s %+.4f ± %.4f  truth %+.4f  z %+.2f", seed, f.name, f.est.Mean, f.est.SD, f.truth, z)
					if math.Abs(z) > 4 && (!tc.deltasOnly || f.delta) {
						t.Errorf("seed %d %s: %+.4f ± %.4f is %.1f sd from the truth %+.4f", seed, f.name, f.est.Mean, f.est.SD, z, f.truth)
					}
				}
			}
			rate := float64(covered) / float64(total)
			t.Logf("coverage of the 90 %% intervals: %d of %d figures (%.0f %%)", covered, total, 100*rate)
			if !tc.deltasOnly && rate < 0.70 {
				t.Errorf("coverage %.2f below 0.70", rate)
			}
		})
	}
}
