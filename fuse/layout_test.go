package fuse

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods"
	"liftfuse/methods/evidence"
	"liftfuse/methods/sim"
)

// scaleModel simulates, reduces and indexes the n-configuration campaign
// of scaleSpec.
func scaleModel(t *testing.T, n int, linear bool) *model {
	t.Helper()
	evs, ids := scaleEvidence(t, n)
	m, err := newModel(evs, Settings{Configs: ids, Seed: 1, Linear: linear})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

// scaleEvidence simulates and reduces the n-configuration campaign of
// scaleSpec and returns its evidence and configuration ids.
func scaleEvidence(tb testing.TB, n int) ([]evidence.Evidence, []string) {
	tb.Helper()
	c, _, err := sim.Build(strings.NewReader(scaleSpec(tb, n)), "scale.yaml", tb.TempDir())
	if err != nil {
		tb.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	var ids []string
	for _, cf := range c.Configurations {
		ids = append(ids, cf.ID)
	}
	return r.Evidence(), ids
}

// denseCond is the reference for cond: Λ = Λ₀ + Xᵀ Σ⁻¹ X and
// Λ m = Λ₀ μ₀ + Xᵀ Σ⁻¹ (y − o) assembled row by row from the design
// vectors in the columns' own order (o the rows' log-normal terms, each
// c·M·e^φ·q(w)/q0 or c·M·e^φ), factorised by gonum's dense Cholesky (the
// reference library), with no layout, groups or envelope; and the log
// marginal likelihood of cond's doc comment from those pieces, with
// (y − o)ᵀΣ⁻¹(y − o) and log|Σ| from the blocks' own matrices. scale is
// the size of its largest terms, ½(y − o)ᵀΣ⁻¹(y − o) and ½bᵀm, which
// cancel: rounding is relative to it.
func denseCond(t *testing.T, m *model, phi []float64) (ch *mat.Cholesky, b []float64, logML, scale float64) {
	t.Helper()
	p := len(m.lin)
	lam := mat.NewSymDense(p, nil)
	b = make([]float64, p)
	pr := m.priorTerms()
	var logDet0 float64
	for i := range p {
		lam.SetSym(i, i, pr.prec[i])
		b[i] = pr.prec[i] * m.lin[i].mean
		logML -= 0.5 * pr.prec[i] * m.lin[i].mean * m.lin[i].mean
		if pr.prec[i] > 0 {
			logDet0 += math.Log(pr.prec[i])
		}
	}
	for _, bl := range m.blocks {
		n := len(bl.rows)
		X := mat.NewDense(n, p, nil)
		y := make([]float64, n)
		for i, ri := range bl.rows {
			r := &m.rows[ri]
			for _, e := range m.design(r, phi, nil) {
				X.Set(i, e.col, X.At(i, e.col)+e.v)
			}
			q := r.q0
			if r.wind >= 0 {
				q += r.a*phi[r.wind] + r.c*phi[r.wind]*phi[r.wind]
			}
			y[i] = r.y
			for _, o := range r.offs {
				g := 1.0
				if o.idx >= 0 {
					g = math.Exp(phi[o.idx])
				}
				if o.perQ {
					g *= q
				}
				y[i] -= o.v * g
			}
		}
		P := mat.NewDense(n, n, nil)
		for i := range n {
			if bl.diag != nil {
				P.Set(i, i, bl.diag[i])
				continue
			}
			for j := range n {
				P.Set(i, j, bl.precD[i*n+j])
			}
		}
		var PX mat.Dense
		PX.Mul(P, X)
		for a := range p {
			for c := a; c < p; c++ {
				var s float64
				for i := range n {
					s += X.At(i, a) * PX.At(i, c)
				}
				lam.SetSym(a, c, lam.At(a, c)+s)
			}
			for i := range n {
				b[a] += PX.At(i, a) * y[i]
			}
		}
		yv := mat.NewVecDense(n, y)
		var Py mat.VecDense
		Py.MulVec(P, yv)
		var lu mat.LU
		lu.Factorize(P)
		logP, _ := lu.LogDet()
		// −½ log|Σ| = ½ log|Σ⁻¹|
		logML += -0.5*mat.Dot(yv, &Py) + 0.5*logP - 0.5*float64(n)*math.Log(2*math.Pi)
		scale += 0.5 * mat.Dot(yv, &Py)
	}
	ch = &mat.Cholesky{}
	if !ch.Factorize(lam) {
		t.Fatal("reference Λ not positive definite")
	}
	mean := mat.NewVecDense(p, nil)
	if err := ch.SolveVecTo(mean, mat.NewVecDense(p, b)); err != nil {
		t.Fatal(err)
	}
	bm := mat.Dot(mean, mat.NewVecDense(p, b))
	logML += 0.5*bm - 0.5*ch.LogDet() + 0.5*logDet0
	return ch, b, logML, math.Max(scale, 0.5*math.Abs(bm))
}

// TestLayoutConditioning: the conditional posterior computed in the
// arrowhead layout with grouped statistics and the envelope Cholesky
// equals the dense reference (gonum) to 1e-9 relative — its mean, log|Λ|,
// the log marginal likelihood, Λ⁻¹ applied to a vector, aᵀΛ⁻¹a of every
// sign and a draw's map z ↦ θ — on campaigns of 2 and 7 configurations
// (whose taps carry the log-normal pitch of drag), with both speed
// models, and on offsetModel's log-normal nuisances (through the term
// table and row by row), at φ = 0 and at a random φ.
func TestLayoutConditioning(t *testing.T) {
	for _, tc := range []struct {
		name   string
		n      int
		linear bool
	}{
		{"2-constant", 2, false},
		{"7-constant", 7, false},
		{"7-linear", 7, true},
		{"offsets", 0, false},
		{"offsets-row-by-row", -1, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var m *model
			switch tc.n {
			case 0:
				m = offsetModel(t, 2, false)
				checkOffsetPaths(t, m)
			case -1:
				m = offsetModel(t, 2, true)
				if len(m.fullBlocks) == 0 {
					t.Fatal("no block conditioned row by row")
				}
			default:
				m = scaleModel(t, tc.n, tc.linear)
			}
			if m.lay.shared() == len(m.lin) {
				t.Fatal("no shared nuisances: the test would not exercise the arrowhead")
			}
			rng := rand.New(rand.NewPCG(3, uint64(tc.n)))
			for trial := range 2 {
				phi := make([]float64, len(m.phi)) // the prior's mode first
				if trial > 0 {
					phi = randomPhi(m, 0.5, rng)
				}
				checkConditioning(t, m, phi, rng)
			}
		})
	}
}

func checkConditioning(t *testing.T, m *model, phi []float64, rng *rand.Rand) {
	t.Helper()
	var c cond
	if err := m.condition(phi, &c); err != nil {
		t.Fatal(err)
	}
	ref, b, logML, mlScale := denseCond(t, m, phi)
	p := len(m.lin)
	want := mat.NewVecDense(p, nil)
	if err := ref.SolveVecTo(want, mat.NewVecDense(p, b)); err != nil {
		t.Fatal(err)
	}
	near := func(what string, got, want, scale float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-9*math.Max(scale, 1e-300) {
			t.Errorf("%s: %.15g, want %.15g", what, got, want)
		}
	}
	var scale float64
	for i := range p {
		scale = math.Max(scale, math.Abs(want.AtVec(i)))
	}
	for i := range p {
		near(fmt.Sprintf("mean[%s]", m.linName(i)), c.mean[i], want.AtVec(i), scale)
	}
	near("log|Λ|", logDetChol(c.l, c.lay), ref.LogDet(), math.Abs(ref.LogDet()))
	near("log p(y | φ)", c.logML, logML, mlScale)
	a := make([]float64, p)
	for i := range a {
		a[i] = rng.NormFloat64()
	}
	x := c.solve(a)
	wx := mat.NewVecDense(p, nil)
	if err := ref.SolveVecTo(wx, mat.NewVecDense(p, a)); err != nil {
		t.Fatal(err)
	}
	for i := range p {
		near(fmt.Sprintf("Λ⁻¹a[%d]", i), x[i], wx.AtVec(i), mat.Norm(wx, math.Inf(1)))
	}
	for si := range m.signs {
		clear(a)
		for _, r := range m.signs[si].refs() {
			a[r.col] += r.v
		}
		wv := mat.NewVecDense(p, nil)
		if err := ref.SolveVecTo(wv, mat.NewVecDense(p, a)); err != nil {
			t.Fatal(err)
		}
		wq := mat.Dot(mat.NewVecDense(p, a), wv)
		near(fmt.Sprintf("sign %d aᵀΛ⁻¹a", si), m.signVar(si, &c), wq, wq)
	}
	// θ − m = L⁻ᵀz has covariance Λ⁻¹: Λ(θ − m) = L z, so ‖L⁻¹Λ(θ−m)‖ = ‖z‖.
	z := make([]float64, p)
	for i := range z {
		z[i] = rng.NormFloat64()
	}
	var zz float64
	for _, v := range z {
		zz += v * v
	}
	theta := make([]float64, p)
	c.draw(cloneFloats(z), theta)
	for i := range theta {
		theta[i] -= c.mean[i]
	}
	var lamRef mat.SymDense
	ref.ToSym(&lamRef)
	lv := mat.NewVecDense(p, nil)
	lv.MulVec(&lamRef, mat.NewVecDense(p, theta))
	near("‖z‖² from a draw", mat.Dot(mat.NewVecDense(p, theta), lv), zz, zz)
}

func cloneFloats(x []float64) []float64 { return append([]float64(nil), x...) }

// randomPhi draws φ about the prior's centre, each parameter at k times
// its prior sd.
func randomPhi(m *model, k float64, rng *rand.Rand) []float64 {
	phi := make([]float64, len(m.phi))
	for i, p := range m.phi {
		phi[i] = k * p.sd * rng.NormFloat64()
	}
	return phi
}
