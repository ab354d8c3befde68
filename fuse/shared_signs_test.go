package fuse_test

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// TestSharedNuisanceWithSigns: a chain with no φ but a nuisance shared by
// two configurations (one offset in every window of a ride-height entry)
// must keep its joint step, which alone moves the offset; only a chain with
// neither may leave the moving to the component steps (proposal.still).
// The signs here say nothing (misread ε just under ½: each probability is
// ½ to within 10⁻⁶), so the sampled posterior must be the conjugate
// Gaussian of the Gaussian entry alone, which the closed form gives
// exactly. One speed per configuration leaves the offset to its prior,
// so the lifts' spread is mostly the offset's: were the offset held at
// its first draw, each chain's sd would be a fraction of the exact one.
// Tolerances in posterior sd as in TestSignsAloneAgainstQuadrature.
func TestSharedNuisanceWithSigns(t *testing.T) {
	const eps = 0.5 - 1e-6
	off := evidence.Nuisance{Name: "h0", Label: "offset", SD: 0.5}
	var obs []evidence.Obs
	var vars []float64
	for i, c := range []string{"a", "a", "b", "b"} {
		v := 40.0
		q := 0.5 * 1.2 * v * v
		o := evidence.Obs{Y: 0.3 + 0.01*float64(i), Terms: []evidence.Term{{Config: c, Axle: evidence.AxleFront, W: 1.0 / 1000}},
			Air: evidence.Airspeed{Q: q, V: v, Rho: 1.2}, Nuis: []evidence.Coef{{Name: off.Name, C: 1}}, Label: "window"}
		obs = append(obs, o)
		vars = append(vars, 0.05*0.05)
	}
	cov := mat.NewSymDense(len(vars), nil)
	for i, v := range vars {
		cov.SetSym(i, i, v)
	}
	b, err := evidence.NewBlock(obs, cov)
	if err != nil {
		t.Fatal(err)
	}
	qa, qb := evidence.Quantity{Config: "a", Axle: evidence.AxleFront}, evidence.Quantity{Config: "b", Axle: evidence.AxleFront}
	gauss := evidence.Evidence{Entry: "pot", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b},
		Nuisances: []evidence.Nuisance{off}, Informs: []evidence.Quantity{qa, qb}}
	var signs []evidence.Sign
	for _, c := range []string{"a", "b"} {
		signs = append(signs, evidence.Sign{Terms: []evidence.Term{{Config: c, Axle: evidence.AxleFront, W: 1}},
			Air: evidence.Airspeed{V: 30}, Lift: true, Misread: eps, Softness: 0.05, Label: "s"})
	}
	vortex := evidence.Evidence{Entry: "v", Kind: evidence.KindVortex, Signs: signs, Informs: []evidence.Quantity{qa, qb}}
	set := fuse.Settings{Configs: []string{"a", "b"}, PriorSD: 1, Seed: 3, Credible: 0.9}
	exact, err := fuse.Fit([]evidence.Evidence{gauss}, set)
	if err != nil {
		t.Fatal(err)
	}
	sampled, err := fuse.Fit([]evidence.Evidence{gauss, vortex}, set)
	if err != nil {
		t.Fatal(err)
	}
	for _, q := range []evidence.Quantity{qa, qb} {
		want, _ := exact.Quantity(q)
		got, _ := sampled.Quantity(q)
		t.Logf("%s: sampled %.4f ± %.4f, exact %.4f ± %.4f", q.Config, got.Mean, got.SD, want.Mean, want.SD)
		if d := math.Abs(got.Mean-want.Mean) / want.SD; d > 0.15 {
			t.Errorf("%s: mean %.4f, exact %.4f (%.2f sd off)", q.Config, got.Mean, want.Mean, d)
		}
		if r := got.SD / want.SD; math.Abs(r-1) > 0.1 {
			t.Errorf("%s: sd %.4f, exact %.4f (ratio %.3f)", q.Config, got.SD, want.SD, r)
		}
	}
}
