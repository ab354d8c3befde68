package fuse_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// obs is a direct observation of one axle's β: y = β + ν·c + ε.
func obs(config, axle string, y float64, nuis ...evidence.Coef) evidence.Obs {
	return evidence.Obs{Y: y, Terms: []evidence.Term{{Config: config, Axle: axle, W: 1}}, Air: evidence.Airspeed{Q: 1}, Nuis: nuis, Label: "o"}
}

func entry(t testing.TB, id string, o []evidence.Obs, sd []float64, nuis ...evidence.Nuisance) evidence.Evidence {
	t.Helper()
	b, err := evidence.Diagonal(o, sd)
	if err != nil {
		t.Fatal(err)
	}
	var qs []evidence.Quantity
	seen := map[evidence.Quantity]bool{}
	for _, x := range o {
		q := evidence.Quantity{Config: x.Terms[0].Config, Axle: x.Terms[0].Axle}
		if !seen[q] {
			seen[q] = true
			qs = append(qs, q)
		}
	}
	return evidence.Evidence{Entry: id, Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b}, Nuisances: nuis, Informs: qs}
}

// TestInverseVarianceWeighting: three measurements 11 ± 1, 12 ± 1 and
// 10 ± 3 of one quantity with a flat prior combine to 11.42 ± 0.69
// (Taylor, An Introduction to Error Analysis, 2nd ed., ch. 7).
func TestInverseVarianceWeighting(t *testing.T) {
	evs := []evidence.Evidence{
		entry(t, "a", []evidence.Obs{obs("c", "front", 11)}, []float64{1}),
		entry(t, "b", []evidence.Obs{obs("c", "front", 12)}, []float64{1}),
		entry(t, "c", []evidence.Obs{obs("c", "front", 10)}, []float64{3}),
	}
	// A prior of sd 10⁶ is flat at this scale.
	P, err := fuse.Fit(evs, fuse.Settings{Configs: []string{"c"}, PriorSD: 1e6, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	e, _ := P.Quantity(evidence.Quantity{Config: "c", Axle: "front"})
	if math.Abs(e.Mean-11.42) > 0.005 || math.Abs(e.SD-0.69) > 0.005 {
		t.Errorf("combined %.4f ± %.4f, want 11.42 ± 0.69", e.Mean, e.SD)
	}
	if d := P.Diagnostics(); !strings.Contains(d.Sampler, "closed form") {
		t.Errorf("a linear-Gaussian campaign must take the closed form, took %q", d.Sampler)
	}
}

// TestConjugateWithNuisances: two entries sharing a nuisance (one with a
// flat-prior offset too) against the conjugate posterior computed here by
// hand over the augmented parameter vector (β_f, β_r, ν, h0).
func TestConjugateWithNuisances(t *testing.T) {
	const priorSD = 0.5
	g := evidence.Nuisance{Name: "shared", Label: "shared", Mean: 0.2, SD: 0.3}
	h0 := evidence.Nuisance{Name: "h0", Label: "offset", Flat: true}
	type row struct {
		axle    string
		q, y    float64
		cNu, cH float64
		sd      float64
	}
	rowsA := []row{{"front", 0, 5.0, 0, 1, 0.1}, {"front", 300, 5.9, 0.4, 1, 0.1}, {"front", 600, 6.7, 1.3, 1, 0.15}}
	rowsB := []row{{"rear", 400, 0.1, 1, 0, 0.2}, {"rear", 700, 0.05, 1.5, 0, 0.2}, {"front", 500, 0.2, 0, 0, 0.3}}
	mk := func(id string, rs []row, nuis ...evidence.Nuisance) evidence.Evidence {
		var o []evidence.Obs
		var sd []float64
		for _, r := range rs {
			x := evidence.Obs{Y: r.y, Terms: []evidence.Term{{Config: "c", Axle: r.axle, W: 0.01}}, Air: evidence.Airspeed{Q: r.q}, Label: "o"}
			if r.cNu != 0 {
				x.Nuis = append(x.Nuis, evidence.Coef{Name: "shared", C: r.cNu})
			}
			if r.cH != 0 {
				x.Nuis = append(x.Nuis, evidence.Coef{Name: "h0", C: r.cH})
			}
			o, sd = append(o, x), append(sd, r.sd)
		}
		return entry(t, id, o, sd, nuis...)
	}
	P, err := fuse.Fit([]evidence.Evidence{mk("a", rowsA, g, h0), mk("b", rowsB, g)}, fuse.Settings{Configs: []string{"c"}, PriorSD: priorSD, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	// By hand: Λ = Λ0 + Σ x xᵀ/σ², Λm = Λ0 μ0 + Σ x y/σ².
	lam := mat.NewSymDense(4, nil)
	lam.SetSym(0, 0, 1/(priorSD*priorSD))
	lam.SetSym(1, 1, 1/(priorSD*priorSD))
	lam.SetSym(2, 2, 1/(0.3*0.3)) // h0 is flat: 0 at (3,3)
	rhs := mat.NewVecDense(4, []float64{0, 0, 0.2 / (0.3 * 0.3), 0})
	for _, r := range append(append([]row(nil), rowsA...), rowsB...) {
		x := make([]float64, 4)
		if r.axle == "front" {
			x[0] = 0.01 * r.q
		} else {
			x[1] = 0.01 * r.q
		}
		x[2], x[3] = r.cNu, r.cH
		for i := range 4 {
			for j := i; j < 4; j++ {
				lam.SetSym(i, j, lam.At(i, j)+x[i]*x[j]/(r.sd*r.sd))
			}
			rhs.SetVec(i, rhs.AtVec(i)+x[i]*r.y/(r.sd*r.sd))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(lam) {
		t.Fatal("not positive definite")
	}
	var m mat.VecDense
	ch.SolveVecTo(&m, rhs)
	var cov mat.SymDense
	ch.InverseTo(&cov)
	for i, ax := range []string{"front", "rear"} {
		e, _ := P.Quantity(evidence.Quantity{Config: "c", Axle: ax})
		if math.Abs(e.Mean-m.AtVec(i)) > 1e-9 || math.Abs(e.SD-math.Sqrt(cov.At(i, i))) > 1e-9 {
			t.Errorf("%s: %v ± %v, by hand %v ± %v", ax, e.Mean, e.SD, m.AtVec(i), math.Sqrt(cov.At(i, i)))
		}
	}
	tot, _ := P.Quantity(evidence.Quantity{Config: "c", Axle: "total"})
	wantSD := math.Sqrt(cov.At(0, 0) + cov.At(1, 1) + 2*cov.At(0, 1))
	if math.Abs(tot.SD-wantSD) > 1e-9 {
		t.Errorf("total sd %v, by hand %v (the covariance must enter)", tot.SD, wantSD)
	}
}

// sbcModel draws one replication of a small model with every kind of
// evidence: a height-like entry with a log-normal scale and a Gaussian
// offset, a pressure-like entry with its own scale seeing both axles, and
// sign observations. It returns the truth and the evidence.
func sbcModel(rng *rand.Rand, priorSD float64) ([2]float64, []evidence.Evidence) {
	var beta [2]float64
	for i := range beta {
		beta[i] = priorSD * rng.NormFloat64()
	}
	const sdScaleA, sdScaleB = 0.1, 0.2
	sA := math.Exp(sdScaleA * rng.NormFloat64())
	sB := math.Exp(sdScaleB * rng.NormFloat64())
	off := rng.NormFloat64()
	var oa []evidence.Obs
	var sda []float64
	for _, q := range []float64{0, 200, 500, 800, 1000} {
		y := sA*q*beta[0]/50 + off + 0.05*rng.NormFloat64()
		oa = append(oa, evidence.Obs{Y: y, Terms: []evidence.Term{{Config: "c", Axle: "front", W: 1.0 / 50}}, Air: evidence.Airspeed{Q: q},
			Scales: []evidence.ScaleRef{{Name: "kA", Pow: 1}}, Nuis: []evidence.Coef{{Name: "off", C: 1}}, Label: "a"})
		sda = append(sda, 0.05)
	}
	bA, _ := evidence.Diagonal(oa, sda)
	var ob []evidence.Obs
	var sdb []float64
	for _, q := range []float64{400, 700} {
		for k, ax := range []string{"front", "rear"} {
			ob = append(ob, evidence.Obs{Y: sB*q*beta[k] + 4*rng.NormFloat64(), Terms: []evidence.Term{{Config: "c", Axle: ax, W: 1}},
				Air: evidence.Airspeed{Q: q}, Scales: []evidence.ScaleRef{{Name: "kB", Pow: 1}}, Label: "b"})
			sdb = append(sdb, 4)
		}
	}
	bB, _ := evidence.Diagonal(ob, sdb)
	var signs []evidence.Sign
	for range 3 {
		const eps, tau = 0.05, 0.03
		p := eps + (1-2*eps)*distuv.UnitNormal.CDF((beta[0]+beta[1])/tau)
		signs = append(signs, evidence.Sign{Terms: []evidence.Term{{Config: "c", Axle: "front", W: 1}, {Config: "c", Axle: "rear", W: 1}},
			Air: evidence.Airspeed{V: 20}, Lift: rng.Float64() < p, Misread: eps, Softness: tau, Label: "s"})
	}
	total := evidence.Quantity{Config: "c", Axle: "total"}
	return beta, []evidence.Evidence{
		{Entry: "a", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{bA}, Scales: []evidence.ScaleGroup{{Name: "kA", SD: sdScaleA}},
			Nuisances: []evidence.Nuisance{{Name: "off", SD: 1}}, Informs: []evidence.Quantity{{Config: "c", Axle: "front"}}},
		{Entry: "b", Kind: evidence.KindPressure, Blocks: []evidence.Block{bB}, Scales: []evidence.ScaleGroup{{Name: "kB", SD: sdScaleB}},
			Informs: []evidence.Quantity{{Config: "c", Axle: "front"}, {Config: "c", Axle: "rear"}}},
		{Entry: "v", Kind: evidence.KindVortex, Signs: signs, Informs: []evidence.Quantity{total}},
	}
}

// TestSimulationBasedCalibration (Talts, Betancourt, Simpson, Vehtari &
// Gelman 2018, "Validating Bayesian inference algorithms with
// simulation-based calibration"): with the truth drawn from the prior and
// the data from the model, the rank of the truth among L posterior draws is
// uniform on 0…L. The front and rear ranks of one replication are
// correlated (shared scale factors and signs), so each axle has its own
// rank histogram (10 bins), and each must pass a χ² test at the 0.5 % level
// (1 % for the pair, Bonferroni); the 90 % intervals must cover the truth
// 85–95 % of the time.
func TestSimulationBasedCalibration(t *testing.T) {
	reps := 400
	if testing.Short() {
		reps = 40
	}
	const priorSD, L, bins = 0.3, 99, 10
	rng := rand.New(rand.NewPCG(2018, 1))
	hist := [2][]float64{make([]float64, bins), make([]float64, bins)}
	covered, n := 0, 0
	for rep := range reps {
		beta, evs := sbcModel(rng, priorSD)
		P, err := fuse.Fit(evs, fuse.Settings{Configs: []string{"c"}, PriorSD: priorSD, Seed: uint64(rep + 1), Credible: 0.9, MinESS: 2000})
		if err != nil {
			t.Fatal(err)
		}
		for k, ax := range []string{"front", "rear"} {
			draws := P.Draws(evidence.Term{Config: "c", Axle: ax, W: 1})
			rank := 0
			for i := range L {
				if draws[(i*len(draws))/L] < beta[k] {
					rank++
				}
			}
			hist[k][rank*bins/(L+1)]++
			e, _ := P.Quantity(evidence.Quantity{Config: "c", Axle: ax})
			n++
			if e.Lo <= beta[k] && beta[k] <= e.Hi {
				covered++
			}
		}
	}
	for k, ax := range []string{"front", "rear"} {
		var chi2 float64
		want := float64(reps) / bins
		for _, h := range hist[k] {
			chi2 += (h - want) * (h - want) / want
		}
		p := distuv.ChiSquared{K: bins - 1}.Survival(chi2)
		t.Logf("SBC %s: %d ranks, histogram %v, χ² = %.1f (p = %.3f)", ax, reps, hist[k], chi2, p)
		if p < 0.005 {
			t.Errorf("%s rank histogram is not uniform: χ² = %.1f, p = %.4f", ax, chi2, p)
		}
	}
	rate := float64(covered) / float64(n)
	t.Logf("90%% intervals cover %.1f %% of %d", 100*rate, n)
	if !testing.Short() && (rate < 0.85 || rate > 0.95) {
		t.Errorf("90%% intervals cover %.3f of the time, want 0.85–0.95", rate)
	}
}

func TestDegenerateInputs(t *testing.T) {
	one := entry(t, "a", []evidence.Obs{obs("x", "front", 0.1)}, []float64{0.05})
	two := entry(t, "b", []evidence.Obs{obs("x", "front", 0.12), obs("x", "rear", 0.02)}, []float64{0.05, 0.05})
	in := fuse.Input{Evidence: []evidence.Evidence{one, two}, Settings: fuse.Settings{Configs: []string{"x", "idle"}, Seed: 1},
		Reference: "x", SpeedsKmh: []float64{100}, Rho: 1.2}
	f, err := fuse.Run(in)
	if err != nil {
		t.Fatal(err)
	}
	res := f.Result
	idle := res.Configs[1]
	if !idle.PriorOnly || math.Abs(idle.Front.CLA.SD-1) > 1e-9 || !containsText(res.Warnings, `"idle"`) {
		t.Errorf("an uninformed configuration must be the prior (sd 1) with a warning: %+v %v", idle.Front, res.Warnings)
	}
	for _, m := range res.Methods {
		if m.Agreement == nil || math.IsNaN(m.Agreement.PValue) || math.IsNaN(m.Agreement.Distance) {
			t.Errorf("%s: agreement %+v", m.ID, m.Agreement)
		}
	}
	// A single entry, and an entry with a single observation.
	in.Evidence = []evidence.Evidence{one}
	f, err = fuse.Run(in)
	if err != nil {
		t.Fatal(err)
	}
	if f.Result.Methods[0].Agreement != nil || !containsText(f.Result.Warnings, "single evidence entry") {
		t.Errorf("one entry cannot be checked against others: %+v %v", f.Result.Methods[0].Agreement, f.Result.Warnings)
	}
	if e := f.Result.Configs[0].Front.CLA; math.IsNaN(e.Mean) || math.IsNaN(e.SD) || e.SD <= 0 {
		t.Errorf("one window gave %+v", e)
	}
	// A flat offset seen by nothing is an error that names it.
	lost := entry(t, "c", []evidence.Obs{obs("x", "front", 0.1)}, []float64{0.05}, evidence.Nuisance{Name: "h0", Label: "c static offset", Flat: true})
	if _, err := fuse.Fit([]evidence.Evidence{lost}, fuse.Settings{Configs: []string{"x"}}); err == nil || !strings.Contains(err.Error(), "c static offset") {
		t.Errorf("want an error naming the unidentified offset, got %v", err)
	}
}

func containsText(ss []string, sub string) bool {
	for _, s := range ss {
		if strings.Contains(s, sub) {
			return true
		}
	}
	return false
}

func ExampleFit() {
	// Two sensors see the front C_L·A of one configuration directly:
	// 0.12 ± 0.02 and 0.10 ± 0.01 (m²); the prior is N(0, 1).
	ev := func(id string, y, sd float64) evidence.Evidence {
		b, _ := evidence.Diagonal([]evidence.Obs{{Y: y, Terms: []evidence.Term{{Config: "c", Axle: "front", W: 1}}, Air: evidence.Airspeed{Q: 1}}}, []float64{sd})
		return evidence.Evidence{Entry: id, Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b}, Informs: []evidence.Quantity{{Config: "c", Axle: "front"}}}
	}
	P, err := fuse.Fit([]evidence.Evidence{ev("a", 0.12, 0.02), ev("b", 0.10, 0.01)}, fuse.Settings{Configs: []string{"c"}, Credible: 0.9})
	if err != nil {
		panic(err)
	}
	e, pDown := P.Quantity(evidence.Quantity{Config: "c", Axle: "front"})
	fmt.Printf("front C_L·A %.4f ± %.4f m², 90 %% interval [%.4f, %.4f], P(downforce) %.3f\n", e.Mean, e.SD, e.Lo, e.Hi, pDown)
	// Output: front C_L·A 0.1040 ± 0.0089 m², 90 % interval [0.0893, 0.1187], P(downforce) 0.000
}

// TestUndirectedRuns: runs whose travel direction was not logged cannot
// separate the wind from the lift, so their q carries an extra scatter of
// about ρ·V·σ_w and the interval must widen (model.md, "Air and speed").
func TestUndirectedRuns(t *testing.T) {
	mk := func(dirs []float64) evidence.Evidence {
		var o []evidence.Obs
		var sd []float64
		for i, v := range []float64{30, 35, 40, 30, 35, 40} {
			q := 0.5 * 1.2 * v * v
			o = append(o, evidence.Obs{Y: 0.2 * q / 50, Terms: []evidence.Term{{Config: "c", Axle: "front", W: 1.0 / 50}},
				Air: evidence.Airspeed{Q: q, V: v, Rho: 1.2, Dir: dirs[i], Wind: evidence.WindName}, Label: "w"})
			sd = append(sd, 0.05)
		}
		b, err := evidence.Diagonal(o, sd)
		if err != nil {
			t.Fatal(err)
		}
		return evidence.Evidence{Entry: "pot", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b},
			Nuisances: []evidence.Nuisance{{Name: evidence.WindName, Label: "wind", SD: 2, PerRun: true}},
			Informs:   []evidence.Quantity{{Config: "c", Axle: "front"}}}
	}
	set := fuse.Settings{Configs: []string{"c"}, Seed: 1, Credible: 0.9}
	both, err := fuse.Fit([]evidence.Evidence{mk([]float64{1, 1, 1, -1, -1, -1})}, set)
	if err != nil {
		t.Fatal(err)
	}
	none, err := fuse.Fit([]evidence.Evidence{mk(make([]float64, 6))}, set)
	if err != nil {
		t.Fatal(err)
	}
	eb, _ := both.Quantity(evidence.Quantity{Config: "c", Axle: "front"})
	en, _ := none.Quantity(evidence.Quantity{Config: "c", Axle: "front"})
	t.Logf("both directions %.4f ± %.4f; direction unknown %.4f ± %.4f", eb.Mean, eb.SD, en.Mean, en.SD)
	if !(en.SD > 1.5*eb.SD) || !(en.Lo <= 0.2 && 0.2 <= en.Hi) {
		t.Errorf("unknown directions should widen the interval and still cover 0.2: %+v vs %+v", en, eb)
	}
}
