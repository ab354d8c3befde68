package fuse

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"liftfuse/methods/evidence"
)

// offsetModel indexes invented evidence (two configurations) in which
// log-normal nuisances reach every path of the fusion: a shared pitch of
// drag ∝ q(w) on a diagonal block with a scale group and a wind (grouped
// by row structure) and on full 2×2 blocks (grouped as a block), a second
// log-normal nuisance not ∝ q on the same diagonal rows (two factors G in
// one row), one stated exactly (log-sd 0), additive nuisances beside them,
// and signs. With rowByRow the taps' rear rows carry a scale group their
// front rows do not, so their blocks are conditioned row by row
// (addFullRows) instead of through the term table.
func offsetModel(t *testing.T, seed uint64, rowByRow bool) *model {
	t.Helper()
	evs, set := offsetEvidence(t, seed, rowByRow)
	m, err := newModel(evs, set)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// offsetEvidence is offsetModel's evidence and settings.
func offsetEvidence(t *testing.T, seed uint64, rowByRow bool) ([]evidence.Evidence, Settings) {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 11))
	configs := []string{"a", "b"}
	wind := evidence.Nuisance{Name: evidence.WindName, Label: "wind", Unit: "m/s", SD: 1.5, PerRun: true}
	pitch := evidence.Nuisance{Name: "pitch", Label: "pitch of drag", Unit: "m²", Mean: 0.12, SD: 0.2, LogNormal: true}
	mount := evidence.Nuisance{Name: "mount", Label: "mount lever", Unit: "mm", Mean: 0.8, SD: 0.3, LogNormal: true}
	exact := evidence.Nuisance{Name: "exact", Label: "known shift", Unit: "N", Mean: 2, LogNormal: true}
	off := evidence.Nuisance{Name: "pots/offset", Label: "offset", Unit: "mm", SD: 3}
	rho := 1.2
	var potObs []evidence.Obs
	var potSD []float64
	var taps []evidence.Block
	for ci, cfg := range configs {
		for k, kmh := range []float64{60, 100, 140, 100} {
			v := kmh / 3.6
			air := evidence.Airspeed{Q: 0.5 * rho * v * v, V: v, Rho: rho, Dir: float64(1 - 2*(k%2)), Wind: evidence.WindName}
			q := air.Q
			potObs = append(potObs, evidence.Obs{Y: -0.3*q + 0.1*float64(ci)*q + rng.NormFloat64()*5,
				Terms: []evidence.Term{{Config: cfg, Axle: evidence.AxleFront, W: 1}}, Air: air,
				Scales: []evidence.ScaleRef{{Name: "gain", Pow: 1}},
				Nuis:   []evidence.Coef{{Name: "pitch", C: -q, PerQ: true}, {Name: "mount", C: 7}, {Name: "pots/offset", C: 1}},
				Label:  fmt.Sprintf("pot %s %g", cfg, kmh)})
			potSD = append(potSD, 5)
			obs := make([]evidence.Obs, 2)
			for a, axle := range []string{evidence.AxleFront, evidence.AxleRear} {
				sgn := float64(2*a - 1)
				obs[a] = evidence.Obs{Y: -0.2*q + rng.NormFloat64()*4, Terms: []evidence.Term{{Config: cfg, Axle: axle, W: 1}}, Air: air,
					Nuis:  []evidence.Coef{{Name: "pitch", C: sgn * q, PerQ: true}, {Name: "exact", C: sgn}},
					Label: fmt.Sprintf("taps %s %g %s", cfg, kmh, axle)}
				if rowByRow && a == 1 {
					obs[a].Scales = []evidence.ScaleRef{{Name: "taps/rear", Pow: 1}}
				}
			}
			b, err := evidence.NewBlock(obs, mat.NewSymDense(2, []float64{16, 6, 6, 16}))
			if err != nil {
				t.Fatal(err)
			}
			taps = append(taps, b)
		}
	}
	pb, err := evidence.Diagonal(potObs, potSD)
	if err != nil {
		t.Fatal(err)
	}
	var signs []evidence.Sign
	for _, cfg := range configs {
		signs = append(signs, evidence.Sign{Terms: []evidence.Term{{Config: cfg, Axle: evidence.AxleFront, W: 1}, {Config: cfg, Axle: evidence.AxleRear, W: 1}},
			Air: evidence.Airspeed{V: 100 / 3.6}, Misread: 0.05, Softness: 0.03, Label: "sense " + cfg})
	}
	evs := []evidence.Evidence{
		{Entry: "pots", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{pb}, Nuisances: []evidence.Nuisance{wind, pitch, mount, off},
			Scales: []evidence.ScaleGroup{{Name: "gain", Label: "gain", SD: 0.05}}},
		{Entry: "taps", Kind: evidence.KindPressure, Blocks: taps, Nuisances: []evidence.Nuisance{wind, pitch, exact},
			Scales: []evidence.ScaleGroup{{Name: "taps/rear", Label: "rear", SD: 0.1}}},
		{Entry: "sense", Kind: evidence.KindVortex, Signs: signs},
	}
	return evs, Settings{Configs: configs, Seed: 1}
}

// checkOffsetPaths fails unless offsetModel's model exercises what it
// claims: two log-normal φ, offsets in grouped diagonal rows and in
// grouped full blocks, two factors G in one row, and no block left to the
// row-by-row path (so the gradient covers the model).
func checkOffsetPaths(t *testing.T, m *model) {
	t.Helper()
	logn := 0
	for _, p := range m.phi {
		if p.median > 0 {
			logn++
		}
	}
	twoG, diag, full := false, false, false
	rowByRow := map[int]bool{}
	for _, bi := range m.fullBlocks {
		rowByRow[bi] = true
	}
	for bi, bl := range m.blocks {
		for _, ri := range bl.rows {
			n := 0
			for _, o := range m.rows[ri].offs {
				if o.set >= 0 {
					n++
				}
			}
			twoG = twoG || n >= 2
			diag = diag || n > 0 && bl.diag != nil
			full = full || n > 0 && bl.diag == nil && !rowByRow[bi]
		}
	}
	if logn != 2 || !twoG || !diag || !full || !m.hasGradient() || len(m.signs) == 0 {
		t.Fatalf("log-normal φ %d (want 2), two factors in a row %v, diagonal %v, full %v, gradient %v, signs %d",
			logn, twoG, diag, full, m.hasGradient(), len(m.signs))
	}
}

// TestLogNormalPosterior: the posterior of a log-normal nuisance through
// the whole fusion (Laplace fit, sampler) against one-dimensional
// quadrature (gonum integrate.Simpsons) of gonum's log-normal density
// (distuv.LogNormal, the reference library) times the exact Gaussian
// likelihood with the lift integrated out. One observation pins β, the
// other sees β + c·ν; with a wide error the posterior is the prior and
// its mean is the log-normal mean M·e^{s²/2}; with a sharp one it is
// pulled towards what the data say. The mean and sd must agree within
// 4 Monte Carlo standard errors (MC se of the mean sd/√ESS, of the sd
// about sd/√(2·ESS) for a near-normal shape — from memory; doubled for
// the skew).
func TestLogNormalPosterior(t *testing.T) {
	const M, s, c, beta = 0.12, 0.3, -1.0, 0.4
	for _, tc := range []struct {
		name   string
		y2, sd float64 // y2 = β + c·ν + ε, ε ~ N(0, sd²)
	}{
		{"prior only", beta, 100},
		{"pulled by the data", beta - 0.2, 0.04},
	} {
		t.Run(tc.name, func(t *testing.T) {
			const sd1, sdBeta = 0.001, 1.0
			o := func(y float64, nuis ...evidence.Coef) evidence.Obs {
				return evidence.Obs{Y: y, Terms: []evidence.Term{{Config: "a", Axle: evidence.AxleFront, W: 1}}, Air: evidence.Airspeed{Q: 1}, Nuis: nuis, Label: "o"}
			}
			b, err := evidence.Diagonal([]evidence.Obs{o(beta), o(tc.y2, evidence.Coef{Name: "nu", C: c})}, []float64{sd1, tc.sd})
			if err != nil {
				t.Fatal(err)
			}
			ev := evidence.Evidence{Entry: "e", Kind: evidence.KindPressure, Blocks: []evidence.Block{b},
				Nuisances: []evidence.Nuisance{{Name: "nu", Label: "ν", Mean: M, SD: s, LogNormal: true}}}
			P, err := Fit([]evidence.Evidence{ev}, Settings{Configs: []string{"a"}, PriorSD: sdBeta, Seed: 5})
			if err != nil {
				t.Fatal(err)
			}
			var nu []float64
			var chains [][]float64
			var buf []float64
			for _, st := range P.p.phiDraws {
				var ch []float64
				for i := range st.n {
					buf = st.at(i, buf)
					ch = append(ch, M*math.Exp(buf[0]))
				}
				chains, nu = append(chains, ch), append(nu, ch...)
			}
			_, ess := RhatESS(chains)
			gotMean, gotSD := stat.MeanStdDev(nu, nil)
			wantMean, wantSD := lognormalPosterior(M, s, c, beta, tc.y2, sd1, tc.sd, sdBeta)
			if tc.sd == 100 {
				ln := distuv.LogNormal{Mu: math.Log(M), Sigma: s}
				if math.Abs(wantMean-ln.Mean()) > 1e-6*ln.Mean() || math.Abs(wantSD-ln.StdDev()) > 1e-4*ln.StdDev() {
					t.Fatalf("quadrature %g ± %g, log-normal moments %g ± %g", wantMean, wantSD, ln.Mean(), ln.StdDev())
				}
			}
			seMean, seSD := wantSD/math.Sqrt(ess), 2*wantSD/math.Sqrt(2*ess)
			t.Logf("ν: fusion %.5f ± %.5f, quadrature %.5f ± %.5f (ESS %.0f)", gotMean, gotSD, wantMean, wantSD, ess)
			if math.Abs(gotMean-wantMean) > 4*seMean || math.Abs(gotSD-wantSD) > 4*seSD {
				t.Errorf("ν = %.5f ± %.5f, want %.5f ± %.5f (4 MC se: %.5f, %.5f)", gotMean, gotSD, wantMean, wantSD, 4*seMean, 4*seSD)
			}
		})
	}
}

// lognormalPosterior returns the posterior mean and sd of ν by quadrature
// on u = log ν: the prior density distuv.LogNormal.Prob(ν)·ν (the Jacobian
// of ν = e^u) times the likelihood of (y1, y2) = (β + ε1, β + c·ν + ε2)
// with β ~ N(0, sdBeta²) integrated out, a bivariate normal.
func lognormalPosterior(M, s, c, y1Beta, y2, sd1, sd2, sdBeta float64) (float64, float64) {
	prior := distuv.LogNormal{Mu: math.Log(M), Sigma: s}
	cov := mat.NewSymDense(2, []float64{sdBeta*sdBeta + sd1*sd1, sdBeta * sdBeta, sdBeta * sdBeta, sdBeta*sdBeta + sd2*sd2})
	var ch mat.Cholesky
	ch.Factorize(cov)
	const n = 4001
	us := make([]float64, n)
	w0, w1, w2 := make([]float64, n), make([]float64, n), make([]float64, n)
	lo, hi := math.Log(M)-10*s, math.Log(M)+10*s
	for i := range n {
		u := lo + (hi-lo)*float64(i)/(n-1)
		nu := math.Exp(u)
		d := mat.NewVecDense(2, []float64{y1Beta, y2 - c*nu})
		x := mat.NewVecDense(2, nil)
		_ = ch.SolveVecTo(x, d)
		like := math.Exp(-0.5 * mat.Dot(d, x))
		p := prior.Prob(nu) * nu * like
		us[i], w0[i], w1[i], w2[i] = u, p, p*nu, p*nu*nu
	}
	z := integrate.Simpsons(us, w0)
	mean := integrate.Simpsons(us, w1) / z
	return mean, math.Sqrt(integrate.Simpsons(us, w2)/z - mean*mean)
}

// TestMixedDeclarations: a nuisance name declared log-normal by one entry
// and Gaussian by another, or a log-normal nuisance that shares its name
// with a scale group, is refused with both priors named; it used to be
// merged silently, the Gaussian entry's rows read as offsets of the other
// entry's log-normal.
func TestMixedDeclarations(t *testing.T) {
	gauss := evidence.Nuisance{Name: "m", Label: "m", Mean: 0.12, SD: 0.02}
	logn := evidence.Nuisance{Name: "m", Label: "m", Mean: 0.12, SD: 0.2, LogNormal: true}
	entry := func(id string, n evidence.Nuisance, scale bool) evidence.Evidence {
		o := evidence.Obs{Y: 1, Terms: []evidence.Term{{Config: "a", Axle: evidence.AxleFront, W: 1}},
			Air: evidence.Airspeed{Q: 500, V: 28, Rho: 1.2}, Nuis: []evidence.Coef{{Name: "m", C: 1}}}
		ev := evidence.Evidence{Entry: id, Kind: evidence.KindRideHeight, Nuisances: []evidence.Nuisance{n},
			Informs: []evidence.Quantity{{Config: "a", Axle: evidence.AxleFront}}}
		if scale {
			o.Nuis, ev.Nuisances = nil, nil
			o.Scales = []evidence.ScaleRef{{Name: "m", Pow: 1}}
			ev.Scales = []evidence.ScaleGroup{{Name: "m", Label: "m", SD: 0.2}}
		}
		b, err := evidence.Diagonal([]evidence.Obs{o}, []float64{1})
		if err != nil {
			t.Fatal(err)
		}
		ev.Blocks = []evidence.Block{b}
		return ev
	}
	cases := []struct {
		name string
		a, b evidence.Evidence
		want string
	}{
		{"Gaussian, then log-normal", entry("x", gauss, false), entry("y", logn, false), "log-normal by one entry and not by another"},
		{"log-normal, then Gaussian", entry("x", logn, false), entry("y", gauss, false), "log-normal by one entry and not by another"},
		{"scale group, then log-normal", entry("x", logn, true), entry("y", logn, false), "a scale factor of log-sd 0.2 and log-normal of median 0.12"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := newModel([]evidence.Evidence{tc.a, tc.b}, Settings{Configs: []string{"a"}})
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("err = %v, want one containing %q", err, tc.want)
			}
		})
	}
}
