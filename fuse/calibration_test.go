package fuse_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// Calibration tests that fail when the intervals are too wide as well as
// when they are too narrow (issue 11): the posterior sd against the exact
// conjugate posterior, and simulation-based calibration.

// Tolerances of TestWidthAgainstExactPosterior.
const (
	// exactRelTol is the relative error allowed when fusion takes the closed
	// form: both sides are the same algebra done two ways, so only rounding
	// differs.
	exactRelTol = 1e-9
	// sampledRelTol is the relative error allowed on an sd estimated from
	// the chains: the relative sd of a sample sd is about 1/√(2·ESS)
	// (common practice (no source)), 0.016 at ESS 2000, so 0.06 is ~4 of
	// them. A 30 % error in either direction is far outside it.
	sampledRelTol = 0.06
	// sampledMeanTol is the error allowed on a mean estimated from the
	// chains, in posterior sd: the Monte Carlo sd of a mean is 1/√ESS sd,
	// 0.022 at ESS 2000, so 0.1 is ~4.5 of them.
	sampledMeanTol = 0.1
	// sampledEndTol is the error allowed on an end of the 90 % interval from
	// the chains, in posterior sd: the Monte Carlo sd of a 5 % quantile of a
	// normal is √(0.05·0.95)/(φ(1.645)·√ESS) ≈ 0.047 sd at ESS 2000 (the
	// asymptotic variance of a sample quantile, common practice (no
	// source)), so 0.2 is ~4 of them. A 30 % error in the sd moves an end
	// by 0.49 sd.
	sampledEndTol = 0.2
)

// window is one steady window of a direct-lift observation in a linear
// test evidence set: y = s·w·β(V)·q + c·ν + ε.
type window struct {
	config, axle string
	kmh          float64
}

// linearEntry builds an entry whose windows see one axle each at q = ½ρV²
// (ρ = 1.2), with w = 1/50 (the order of a ride-height gain), an offset
// nuisance with coefficient 1 and errors that are AR(1)-correlated between
// consecutive windows (a full covariance block): Σ_ij = sd²·ρ^|i−j|.
// y(i, o) gives the value of window i's observation o; scale, when not
// nil, multiplies the lift term of every window.
func linearEntry(t *testing.T, id string, ws []window, off evidence.Nuisance, sd, rho float64, y func(i int, o evidence.Obs) float64, scale *evidence.ScaleGroup) evidence.Evidence {
	t.Helper()
	var obs []evidence.Obs
	qs := map[evidence.Quantity]bool{}
	var informs []evidence.Quantity
	for i, w := range ws {
		v := w.kmh / 3.6
		o := evidence.Obs{Terms: []evidence.Term{{Config: w.config, Axle: w.axle, W: 1.0 / 50}},
			Air: evidence.Airspeed{Q: 0.5 * 1.2 * v * v, V: v, Rho: 1.2}, Nuis: []evidence.Coef{{Name: off.Name, C: 1}},
			Label: fmt.Sprintf("%s window %d", id, i+1)}
		if scale != nil {
			o.Scales = []evidence.ScaleRef{{Name: scale.Name, Pow: 1}}
		}
		o.Y = y(i, o)
		obs = append(obs, o)
		if q := (evidence.Quantity{Config: w.config, Axle: w.axle}); !qs[q] {
			qs[q] = true
			informs = append(informs, q)
		}
	}
	cov := mat.NewSymDense(len(ws), nil)
	for i := range ws {
		for j := i; j < len(ws); j++ {
			cov.SetSym(i, j, sd*sd*math.Pow(rho, float64(j-i)))
		}
	}
	b, err := evidence.NewBlock(obs, cov)
	if err != nil {
		t.Fatal(err)
	}
	ev := evidence.Evidence{Entry: id, Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b},
		Nuisances: []evidence.Nuisance{off}, Informs: informs}
	if scale != nil {
		ev.Scales = []evidence.ScaleGroup{*scale}
	}
	if err := ev.Check(); err != nil {
		t.Fatal(err)
	}
	return ev
}

// exactPosterior is the conjugate Gaussian posterior of a linear-Gaussian
// evidence set, computed here from the model equation in the doc comment of
// evidence.Evidence and nothing of package fuse. With θ the lift
// parameters β (and γ under the linear speed model, β(V) = β + γ·(V −
// V_ref)/V_ref) followed by the additive nuisances, prior N(μ₀, Λ₀⁻¹) (a
// flat nuisance has precision 0), and y = Xθ + ε, ε ~ N(0, R):
//
//	Λ = Λ₀ + XᵀR⁻¹X,  μ = Λ⁻¹(Λ₀μ₀ + XᵀR⁻¹y)
//
// (Bayesian linear regression with known noise covariance: Bishop, Pattern
// Recognition and Machine Learning (2006), eqs. 3.50–3.51 with a general
// noise precision; Gelman et al., Bayesian Data Analysis, 3rd ed., §14.7 —
// from memory). Scale factors are taken at their median 1.
type exactPosterior struct {
	col  map[string]int // "config/axle" (β), "γ config/axle", "ν name" → column
	mean *mat.VecDense
	cov  *mat.SymDense
}

func newExactPosterior(t *testing.T, evs []evidence.Evidence, configs []string, priorSD float64, linear bool) *exactPosterior {
	t.Helper()
	ep := &exactPosterior{col: map[string]int{}}
	var mu0, prec0 []float64
	add := func(name string, m, p float64) {
		if _, ok := ep.col[name]; !ok {
			ep.col[name] = len(mu0)
			mu0, prec0 = append(mu0, m), append(prec0, p)
		}
	}
	for _, c := range configs {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
			add(c+"/"+ax, 0, 1/(priorSD*priorSD))
			if linear {
				add("γ "+c+"/"+ax, 0, 1/(priorSD*priorSD))
			}
		}
	}
	for _, ev := range evs {
		for _, n := range ev.Nuisances {
			p := 0.0
			if !n.Flat {
				p = 1 / (n.SD * n.SD)
			}
			add("ν "+n.Name, n.Mean, p)
		}
	}
	n := len(mu0)
	lam := mat.NewSymDense(n, nil)
	rhs := mat.NewVecDense(n, nil)
	for i := range n {
		lam.SetSym(i, i, prec0[i])
		rhs.SetVec(i, prec0[i]*mu0[i])
	}
	for _, ev := range evs {
		for _, b := range ev.Blocks {
			ep.addBlock(t, lam, rhs, b, linear)
		}
	}
	var lc mat.Cholesky
	if !lc.Factorize(lam) {
		t.Fatal("posterior precision is not positive definite")
	}
	ep.mean = mat.NewVecDense(n, nil)
	if err := lc.SolveVecTo(ep.mean, rhs); err != nil {
		t.Fatal(err)
	}
	ep.cov = mat.NewSymDense(n, nil)
	if err := lc.InverseTo(ep.cov); err != nil {
		t.Fatal(err)
	}
	return ep
}

// addBlock adds a block's information XᵀR⁻¹X to lam and XᵀR⁻¹y to rhs.
func (ep *exactPosterior) addBlock(t *testing.T, lam *mat.SymDense, rhs *mat.VecDense, b evidence.Block, linear bool) {
	t.Helper()
	n := rhs.Len()
	vref := evidence.RefSpeedKmh / 3.6
	k := len(b.Obs)
	X := mat.NewDense(k, n, nil)
	y := mat.NewVecDense(k, nil)
	R := mat.NewSymDense(k, nil)
	for i, o := range b.Obs {
		y.SetVec(i, o.Y)
		for _, tm := range o.Terms {
			c := ep.col[tm.Config+"/"+tm.Axle]
			X.Set(i, c, X.At(i, c)+tm.W*o.Air.Q)
			if linear {
				g := ep.col["γ "+tm.Config+"/"+tm.Axle]
				X.Set(i, g, X.At(i, g)+tm.W*o.Air.Q*(o.Air.V-vref)/vref)
			}
		}
		for _, cf := range o.Nuis {
			c := ep.col["ν "+cf.Name]
			X.Set(i, c, X.At(i, c)+cf.C)
		}
		for j := i; j < k; j++ {
			R.SetSym(i, j, b.At(i, j))
		}
	}
	var rc mat.Cholesky
	if !rc.Factorize(R) {
		t.Fatal("block covariance is not positive definite")
	}
	var RiX mat.Dense
	if err := rc.SolveTo(&RiX, X); err != nil {
		t.Fatal(err)
	}
	var info mat.Dense
	info.Mul(X.T(), &RiX)
	var Riy mat.VecDense
	if err := rc.SolveVecTo(&Riy, y); err != nil {
		t.Fatal(err)
	}
	var xr mat.VecDense
	xr.MulVec(X.T(), &Riy)
	for i := range n {
		for j := i; j < n; j++ {
			lam.SetSym(i, j, lam.At(i, j)+info.At(i, j))
		}
	}
	rhs.AddVec(rhs, &xr)
}

// linear returns the exact mean and sd of Σ a_name·θ_name.
func (ep *exactPosterior) linear(a map[string]float64) (float64, float64) {
	n := ep.mean.Len()
	v := mat.NewVecDense(n, nil)
	for name, w := range a {
		v.SetVec(ep.col[name], v.AtVec(ep.col[name])+w)
	}
	var cv mat.VecDense
	cv.MulVec(ep.cov, v)
	return mat.Dot(v, ep.mean), math.Sqrt(mat.Dot(v, &cv))
}

// widthCase is one evidence set of TestWidthAgainstExactPosterior.
type widthCase struct {
	name    string
	priorSD float64
	linear  bool
	// scaleSD > 0 gives the first entry a log-normal scale group of that sd,
	// which sends fusion to the sampler (exact only as scaleSD → 0).
	scaleSD float64
	// noise multiplies every observation's error sd (0 means 1).
	noise float64
	// tol is the relative tolerance on the sd; meanTol and endTol those on
	// the mean and the interval's ends, in posterior sd.
	tol, meanTol, endTol float64
}

// TestWidthAgainstExactPosterior: for linear-Gaussian evidence (two
// configurations, three entries with offsets — one flat —, AR(1)-correlated
// windows and known q) the fused mean and sd of every axle, total, delta and
// β at 150 km/h must equal the exact conjugate posterior's to a stated
// relative tolerance: an interval too wide fails as surely as one too
// narrow. The sampler case adds a scale factor of sd 10⁻³, which moves the
// exact posterior by far less than its tolerance.
func TestWidthAgainstExactPosterior(t *testing.T) {
	cases := []widthCase{
		{name: "closed form, constant speed", priorSD: 0.5, tol: exactRelTol, meanTol: exactRelTol, endTol: exactRelTol},
		{name: "closed form, linear speed model", priorSD: 0.5, linear: true, tol: exactRelTol, meanTol: exactRelTol, endTol: exactRelTol},
		{name: "closed form, noisy data, tight prior", priorSD: 0.05, noise: 30, tol: exactRelTol, meanTol: exactRelTol, endTol: exactRelTol},
		{name: "sampler, tiny scale factor", priorSD: 0.5, scaleSD: 1e-3, tol: sampledRelTol, meanTol: sampledMeanTol, endTol: sampledEndTol},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) { checkWidth(t, tc) })
	}
}

// widthEvidence returns the evidence of a width case: a front pot and a
// rear pot (windows at 60–170 km/h, AR(1) errors, a Gaussian and a flat
// offset) and taps on both axles at 90 and 150 km/h, for two configurations.
func widthEvidence(t *testing.T, tc widthCase, configs []string) []evidence.Evidence {
	truth := map[string]float64{"base/front": 0.10, "base/rear": 0.06, "wing/front": 0.13, "wing/rear": -0.05,
		"γ base/front": 0.02, "γ base/rear": 0, "γ wing/front": 0.01, "γ wing/rear": -0.08}
	rng := rand.New(rand.NewPCG(11, 1))
	nx := tc.noise
	if nx == 0 {
		nx = 1
	}
	// gen makes y from the truth with an offset off and noise of sd.
	gen := func(off, sd float64) func(int, evidence.Obs) float64 {
		return func(_ int, o evidence.Obs) float64 {
			tm := o.Terms[0]
			vr := evidence.RefSpeedKmh / 3.6
			b := truth[tm.Config+"/"+tm.Axle] + truth["γ "+tm.Config+"/"+tm.Axle]*(o.Air.V-vr)/vr
			return tm.W*b*o.Air.Q + off + sd*rng.NormFloat64()
		}
	}
	var front, rear, taps []window
	for _, c := range configs {
		for _, v := range []float64{60, 100, 140, 170} {
			front = append(front, window{c, evidence.AxleFront, v})
			rear = append(rear, window{c, evidence.AxleRear, v})
		}
		for _, v := range []float64{90, 150} {
			taps = append(taps, window{c, evidence.AxleFront, v}, window{c, evidence.AxleRear, v})
		}
	}
	var scale *evidence.ScaleGroup
	if tc.scaleSD > 0 {
		scale = &evidence.ScaleGroup{Name: "fpot gain", Label: "front pot gain", SD: tc.scaleSD}
	}
	return []evidence.Evidence{
		linearEntry(t, "fpot", front, evidence.Nuisance{Name: "fpot h0", Label: "front offset", Mean: 0.3, SD: 0.5}, 0.05*nx, 0.6, gen(0.4, 0.05*nx), scale),
		linearEntry(t, "rpot", rear, evidence.Nuisance{Name: "rpot h0", Label: "rear offset", Flat: true}, 0.05*nx, 0.3, gen(-1.2, 0.05*nx), nil),
		linearEntry(t, "taps", taps, evidence.Nuisance{Name: "taps ref", Label: "reference", SD: 0.2}, 0.08*nx, 0, gen(0, 0.08*nx), nil),
	}
}

// widthCheck is a linear quantity compared by checkWidth.
type widthCheck struct {
	name  string
	terms []evidence.Term
	atKmh float64 // 0: at V_ref
}

// widthChecks lists every axle and total, the differences to "base" and
// the rear of "wing" at 150 km/h.
func widthChecks(configs []string) []widthCheck {
	var checks []widthCheck
	for _, c := range configs {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
			checks = append(checks, widthCheck{c + " " + ax, []evidence.Term{{Config: c, Axle: ax, W: 1}}, 0})
		}
	}
	for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
		checks = append(checks, widthCheck{"wing − base " + ax, []evidence.Term{{Config: "wing", Axle: ax, W: 1}, {Config: "base", Axle: ax, W: -1}}, 0})
	}
	return append(checks, widthCheck{"wing rear at 150 km/h", []evidence.Term{{Config: "wing", Axle: evidence.AxleRear, W: 1}}, 150})
}

func checkWidth(t *testing.T, tc widthCase) {
	configs := []string{"base", "wing"}
	evs := widthEvidence(t, tc, configs)
	P, err := fuse.Fit(evs, fuse.Settings{Configs: configs, PriorSD: tc.priorSD, Linear: tc.linear, Seed: 5, Credible: 0.9})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("sampler: %s", P.Diagnostics().Sampler)
	ex := newExactPosterior(t, evs, configs, tc.priorSD, tc.linear)

	for _, ck := range widthChecks(configs) {
		a := map[string]float64{}
		for _, tm := range ck.terms {
			axes := []string{tm.Axle}
			if tm.Axle == evidence.AxleTotal {
				axes = []string{evidence.AxleFront, evidence.AxleRear}
			}
			for _, ax := range axes {
				a[tm.Config+"/"+ax] += tm.W
				if tc.linear && ck.atKmh != 0 {
					a["γ "+tm.Config+"/"+ax] += tm.W * (ck.atKmh - evidence.RefSpeedKmh) / evidence.RefSpeedKmh
				}
			}
		}
		wantMean, wantSD := ex.linear(a)
		v := ck.atKmh
		if v == 0 {
			v = evidence.RefSpeedKmh
		}
		got, _ := P.At(v, ck.terms...)
		t.Logf("%-24s fused %+.5f ± %.5f, exact %+.5f ± %.5f (sd ratio %.4f)", ck.name, got.Mean, got.SD, wantMean, wantSD, got.SD/wantSD)
		if r := got.SD / wantSD; math.Abs(r-1) > tc.tol || math.IsNaN(r) {
			t.Errorf("%s: fused sd %.6g, exact %.6g: ratio %.4f is outside 1 ± %g (interval too %s)", ck.name, got.SD, wantSD, r, tc.tol, map[bool]string{true: "wide", false: "narrow"}[r > 1])
		}
		// The 90 % interval of the exact (normal) posterior: mean ± z·sd.
		z := distuv.UnitNormal.Quantile(0.95)
		for _, end := range []struct {
			name      string
			got, want float64
		}{{"lower", got.Lo, wantMean - z*wantSD}, {"upper", got.Hi, wantMean + z*wantSD}} {
			if d := math.Abs(end.got - end.want); d > tc.endTol*wantSD || math.IsNaN(d) {
				t.Errorf("%s: %s end of the 90 %% interval %.6g, exact %.6g: off by %.3g sd (tolerance %g sd)", ck.name, end.name, end.got, end.want, d/wantSD, tc.endTol)
			}
		}
		if d := math.Abs(got.Mean - wantMean); d > tc.meanTol*wantSD || math.IsNaN(d) {
			t.Errorf("%s: fused mean %.6g, exact %.6g: off by %.3g sd (tolerance %g sd)", ck.name, got.Mean, wantMean, d/wantSD, tc.meanTol)
		}
	}
}

// SBC settings of TestSBCRankUniformity.
const (
	sbcReps  = 500 // replications drawn from the prior
	sbcDraws = 99  // L: posterior draws the truth is ranked among (ranks 0…L)
	sbcBins  = 10  // rank histogram bins, (L+1)/bins ranks each
	// sbcAlpha is the family-wise level of the χ² tests, split evenly over
	// the tracked quantities (Bonferroni): a calibrated fusion fails the
	// test 1 % of the time, at most.
	sbcAlpha = 0.01
)

// sbcDay draws one replication from the prior of a two-configuration model
// that takes the sampler: two ride-height entries with log-normal gains
// (sd 0.1), Gaussian offsets and AR(1)-correlated windows, a pressure entry
// with its own scale (sd 0.2) and reference offset on both axles, and a
// tuft's signs on the total of "wing". It returns the true β by
// "config/axle" and the evidence.
func sbcDay(t *testing.T, rng *rand.Rand, priorSD float64) (map[string]float64, []evidence.Evidence) {
	truth := map[string]float64{}
	for _, c := range []string{"base", "wing"} {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
			truth[c+"/"+ax] = priorSD * rng.NormFloat64()
		}
	}
	gen := func(scale, off, sd float64) func(int, evidence.Obs) float64 {
		return func(_ int, o evidence.Obs) float64 {
			tm := o.Terms[0]
			return scale*tm.W*truth[tm.Config+"/"+tm.Axle]*o.Air.Q + off + sd*rng.NormFloat64()
		}
	}
	// gen adds independent noise; the AR(1) blocks get correlated noise
	// from ar1 instead.
	ar1 := func(g func(int, evidence.Obs) float64, rho, sd float64) func(int, evidence.Obs) float64 {
		e := 0.0
		return func(i int, o evidence.Obs) float64 {
			z := sd * rng.NormFloat64()
			if i == 0 {
				e = z
			} else {
				e = rho*e + math.Sqrt(1-rho*rho)*z
			}
			return g(i, o) + e
		}
	}
	var front, rear, taps []window
	for _, c := range []string{"base", "wing"} {
		for _, v := range []float64{60, 100, 140} {
			front = append(front, window{c, evidence.AxleFront, v})
			rear = append(rear, window{c, evidence.AxleRear, v})
		}
		for _, v := range []float64{90, 150} {
			taps = append(taps, window{c, evidence.AxleFront, v}, window{c, evidence.AxleRear, v})
		}
	}
	lognormal := func(sd float64) float64 { return math.Exp(sd * rng.NormFloat64()) }
	kF, kR, kP := &evidence.ScaleGroup{Name: "kF", SD: 0.1}, &evidence.ScaleGroup{Name: "kR", SD: 0.1}, &evidence.ScaleGroup{Name: "kP", SD: 0.2}
	hF, hR, ref := 0.5*rng.NormFloat64(), 0.5*rng.NormFloat64(), 0.2*rng.NormFloat64()
	evs := []evidence.Evidence{
		linearEntry(t, "fpot", front, evidence.Nuisance{Name: "hF", SD: 0.5}, 0.05, 0.5, ar1(gen(lognormal(kF.SD), hF, 0), 0.5, 0.05), kF),
		linearEntry(t, "rpot", rear, evidence.Nuisance{Name: "hR", SD: 0.5}, 0.05, 0.5, ar1(gen(lognormal(kR.SD), hR, 0), 0.5, 0.05), kR),
		linearEntry(t, "taps", taps, evidence.Nuisance{Name: "ref", SD: 0.2}, 0.08, 0, gen(lognormal(kP.SD), ref, 0.08), kP),
	}
	evs[2].Kind = evidence.KindPressure
	const eps, tau = 0.05, 0.03
	var signs []evidence.Sign
	for range 3 {
		p := eps + (1-2*eps)*distuv.UnitNormal.CDF((truth["wing/front"]+truth["wing/rear"])/tau)
		signs = append(signs, evidence.Sign{Terms: []evidence.Term{{Config: "wing", Axle: evidence.AxleFront, W: 1}, {Config: "wing", Axle: evidence.AxleRear, W: 1}},
			Air: evidence.Airspeed{V: 20}, Lift: rng.Float64() < p, Misread: eps, Softness: tau, Label: "tuft"})
	}
	evs = append(evs, evidence.Evidence{Entry: "tuft", Kind: evidence.KindVortex, Signs: signs,
		Informs: []evidence.Quantity{{Config: "wing", Axle: evidence.AxleTotal}}})
	return truth, evs
}

// sbcQuantity is a tracked quantity: Σ W·β over its terms.
type sbcQuantity struct {
	name  string
	terms []evidence.Term
}

func (q sbcQuantity) value(truth map[string]float64) float64 {
	var v float64
	for _, tm := range q.terms {
		if tm.Axle == evidence.AxleTotal {
			v += tm.W * (truth[tm.Config+"/front"] + truth[tm.Config+"/rear"])
		} else {
			v += tm.W * truth[tm.Config+"/"+tm.Axle]
		}
	}
	return v
}

// TestSBCRankUniformity is simulation-based calibration (Talts, Betancourt,
// Simpson, Vehtari & Gelman 2018, "Validating Bayesian inference algorithms
// with simulation-based calibration", arXiv:1804.06788; its Algorithm 1,
// the number from memory): with the truth drawn from the prior and the data
// from the model, the rank of the truth among L posterior draws is uniform
// on 0…L whatever the model.
// Intervals too wide pile the ranks in the middle, too narrow at the ends;
// either fails the χ² test of the rank histogram (Pearson, 9 degrees of
// freedom for 10 bins) at sbcAlpha, Bonferroni-split over the four tracked
// quantities (correlated within a replication, so each has its own
// histogram). A second check on the same replications: the mean of
// z² = ((truth − posterior mean)/posterior sd)² is exactly 1 for any
// correct posterior (E[(θ−E[θ|y])²/Var(θ|y)] = 1, by the tower rule), and
// must lie within 1 ± 5·√(2/reps) (the sd of a mean of χ²₁ values; common
// practice (no source)); a 30 % error in the sd moves it to 0.59 or 2.04.
func TestSBCRankUniformity(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation-based calibration takes a few hundred fits; skipped with -short")
	}
	const priorSD = 0.2
	qs := []sbcQuantity{
		{"base front", []evidence.Term{{Config: "base", Axle: evidence.AxleFront, W: 1}}},
		{"wing rear", []evidence.Term{{Config: "wing", Axle: evidence.AxleRear, W: 1}}},
		{"wing − base rear", []evidence.Term{{Config: "wing", Axle: evidence.AxleRear, W: 1}, {Config: "base", Axle: evidence.AxleRear, W: -1}}},
		{"wing total", []evidence.Term{{Config: "wing", Axle: evidence.AxleTotal, W: 1}}},
	}
	rng := rand.New(rand.NewPCG(1804, 6788))
	hist := make([][]float64, len(qs))
	z2 := make([]float64, len(qs))
	for k := range hist {
		hist[k] = make([]float64, sbcBins)
	}
	for rep := range sbcReps {
		truth, evs := sbcDay(t, rng, priorSD)
		P, err := fuse.Fit(evs, fuse.Settings{Configs: []string{"base", "wing"}, PriorSD: priorSD, Seed: uint64(rep + 1), Credible: 0.9, MinESS: 1000})
		if err != nil {
			t.Fatalf("replication %d: %v", rep, err)
		}
		for k, q := range qs {
			v := q.value(truth)
			draws := P.Draws(q.terms...)
			rank := 0
			for i := range sbcDraws {
				if draws[(i*len(draws))/sbcDraws] < v {
					rank++
				}
			}
			hist[k][rank*sbcBins/(sbcDraws+1)]++
			e, _ := P.Linear(q.terms...)
			z := (v - e.Mean) / e.SD
			z2[k] += z * z / sbcReps
		}
	}
	crit := distuv.ChiSquared{K: sbcBins - 1}.Quantile(1 - sbcAlpha/float64(len(qs)))
	band := 5 * math.Sqrt(2.0/sbcReps)
	for k, q := range qs {
		var chi2 float64
		want := float64(sbcReps) / sbcBins
		for _, h := range hist[k] {
			chi2 += (h - want) * (h - want) / want
		}
		t.Logf("%-16s ranks %v: χ² = %5.1f (critical %.1f, p = %.3f); mean z² = %.3f (1 ± %.3f)", q.name, hist[k], chi2, crit,
			distuv.ChiSquared{K: sbcBins - 1}.Survival(chi2), z2[k], band)
		if chi2 > crit {
			t.Errorf("%s: the rank histogram %v is not uniform: χ² = %.1f > %.1f", q.name, hist[k], chi2, crit)
		}
		if math.Abs(z2[k]-1) > band {
			t.Errorf("%s: mean z² = %.3f, want 1 ± %.3f (below 1: intervals too wide; above: too narrow)", q.name, z2[k], band)
		}
	}
}
