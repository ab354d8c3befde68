package gust

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distmv"
)

// TestRestrictedLogLik: the restricted likelihood equals, up to a
// constant, the log-density of the residuals' contrasts: for a full-rank
// K (n−p × n) with KX = 0, log N(Ky; 0, KVKᵀ) differs from it by a
// constant independent of σ² (Harville 1977 — from memory). Checked
// against gonum's distmv at two values of σ².
func TestRestrictedLogLik(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	n := 8
	X := mat.NewDense(n, 2, nil)
	g := Group{X: X, Y: make([]float64, n), Var: make([]float64, n), C: make([]float64, n), Runs: [][]int{{0, 1, 2, 3}, {4, 5, 6, 7}}, Base: []float64{0, 0.3}}
	for i := range n {
		X.Set(i, 0, 1)
		X.Set(i, 1, float64(i%4))
		g.Y[i] = rng.NormFloat64()
		g.Var[i] = 0.5 + 0.1*float64(i)
		g.C[i] = 0.2 + 0.1*float64(i%4)
	}
	// K: rows spanning the orthogonal complement of X's columns.
	var svd mat.SVD
	svd.Factorize(X, mat.SVDFull)
	var U mat.Dense
	svd.UTo(&U)
	K := U.Slice(0, n, 2, n).(*mat.Dense).T()
	contrast := func(s2 float64) float64 {
		V := mat.NewDense(n, n, nil)
		for i := range n {
			V.Set(i, i, g.Var[i])
		}
		for r, run := range g.Runs {
			for _, i := range run {
				for _, j := range run {
					V.Set(i, j, V.At(i, j)+(s2+g.Base[r])*g.C[i]*g.C[j])
				}
			}
		}
		var KV, KVK mat.Dense
		KV.Mul(K, V)
		KVK.Mul(&KV, K.T())
		S := mat.NewSymDense(n-2, nil)
		for i := range n - 2 {
			for j := i; j < n-2; j++ {
				S.SetSym(i, j, KVK.At(i, j))
			}
		}
		var ky mat.VecDense
		ky.MulVec(K, mat.NewVecDense(n, g.Y))
		d, ok := distmv.NewNormal(make([]float64, n-2), S, nil)
		if !ok {
			t.Fatal("contrast covariance not positive definite")
		}
		return d.LogProb(ky.RawVector().Data)
	}
	a, _ := g.restrictedLogLik(0.2)
	b, _ := g.restrictedLogLik(3)
	if got, want := a-b, contrast(0.2)-contrast(3); math.Abs(got-want) > 1e-9 {
		t.Errorf("restricted log-likelihood difference %.12f, contrasts give %.12f", got, want)
	}
}

// TestScatterREML: days of eight runs with fitted offsets, slopes and
// wind per configuration give back the run-to-run scatter on average,
// where the plain likelihood of the pilot residuals would shrink it by the
// degrees of freedom the fit takes.
func TestScatterREML(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 9))
	const days, truth = 40, 2.0
	var sum float64
	for range days {
		var groups []Group
		n := 8 * 5
		X := mat.NewDense(n, 5, nil)
		g := Group{X: X, Y: make([]float64, n), Var: make([]float64, n), C: make([]float64, n)}
		for r := range 8 {
			cfg, dir := r/4, 1-2*(r%2)
			d := truth * rng.NormFloat64()
			var run []int
			for k, v := range []float64{0, 22, 31, 39, 44} {
				i := 5*r + k
				q := 0.6 * v * v
				X.Set(i, 0, 1)
				X.Set(i, 1+2*cfg, q)
				X.Set(i, 2+2*cfg, 1.2*float64(dir)*v)
				p := 0.0018
				g.Var[i] = 0.03
				if v > 0 {
					g.C[i] = p * 1.2 * v * float64(dir)
					run = append(run, i)
				}
				g.Y[i] = 35 + p*q + g.C[i]*(d+1.2) + math.Sqrt(g.Var[i])*rng.NormFloat64()
			}
			g.Runs = append(g.Runs, run)
			g.Base = append(g.Base, 0)
		}
		groups = append(groups, g)
		est, _ := ScatterREML(groups, 1.5)
		sum += est / days
	}
	t.Logf("mean estimate %.2f m/s (true %.1f)", sum, truth)
	if math.Abs(sum-truth) > 0.4 {
		t.Errorf("mean estimate %.2f, true %.1f", sum, truth)
	}
}

// restrictedLogLik is the group's restricted log-likelihood of σ_g².
func (g Group) restrictedLogLik(s2 float64) (float64, bool) { return g.prepare().logLik(s2) }
