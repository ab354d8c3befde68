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
// against gonum's distmv at two values of σ², for one dense block and for
// an arrowhead of shared columns and three configurations' local ones
// (whose blocks the likelihood factorises one at a time).
func TestRestrictedLogLik(t *testing.T) {
	tests := []struct {
		name string
		g    Group
	}{
		{"one block", oneBlockGroup()},
		{"shared and local columns", arrowheadGroup()},
		{"a run across local columns", runJoinGroup()},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			a, okA := tt.g.restrictedLogLik(0.2)
			b, okB := tt.g.restrictedLogLik(3)
			if !okA || !okB {
				t.Fatal("restricted likelihood not formed")
			}
			want := contrastLogLik(t, tt.g, 0.2) - contrastLogLik(t, tt.g, 3)
			if got := a - b; math.Abs(got-want) > 1e-9 {
				t.Errorf("restricted log-likelihood difference %.12f, contrasts give %.12f", got, want)
			}
		})
	}
}

// oneBlockGroup is eight observations in two runs, an offset and a slope.
func oneBlockGroup() Group {
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
	return g
}

// arrowheadGroup is three configurations of two runs of four observations
// and a standstill row each: an offset and a drift shared, and per
// configuration a slope and a wind column; one run of the last
// configuration sees its slope only, the standstill rows make one run that
// sees the shared columns only, and an all-zero column is left out.
func arrowheadGroup() Group {
	rng := rand.New(rand.NewPCG(7, 8))
	const cfgs, per = 3, 9
	n := cfgs * per
	X := mat.NewDense(n, 2+2*cfgs+1, nil)
	g := Group{X: X, Y: make([]float64, n), Var: make([]float64, n), C: make([]float64, n), Shared: 2}
	for c := range cfgs {
		for r := range 2 {
			var run []int
			for k := range 4 {
				i := c*per + 4*r + k
				X.Set(i, 2+2*c, 1+float64(k))
				if c < cfgs-1 || r == 0 {
					X.Set(i, 3+2*c, float64(1-2*r)*(0.5+0.3*float64(k)))
				}
				g.C[i] = 0.3 + 0.2*float64(k)
				run = append(run, i)
			}
			g.Runs = append(g.Runs, run)
			g.Base = append(g.Base, 0.2*float64(r))
		}
	}
	var still []int
	for c := range cfgs {
		i := c*per + per - 1
		g.C[i] = 0.1 + 0.1*float64(c)
		still = append(still, i)
	}
	g.Runs = append(g.Runs, still)
	g.Base = append(g.Base, 0.5)
	for i := range n {
		X.Set(i, 0, 1)
		X.Set(i, 1, float64(i)/float64(n)-0.5)
		g.Y[i] = rng.NormFloat64()
		g.Var[i] = 0.4 + 0.05*float64(i%7)
	}
	return g
}

// runJoinGroup is an offset shared and two local slopes that no row
// carries together, one run covering rows of both: the run alone puts the
// two slopes in one block.
func runJoinGroup() Group {
	rng := rand.New(rand.NewPCG(9, 10))
	n := 12
	X := mat.NewDense(n, 3, nil)
	g := Group{X: X, Y: make([]float64, n), Var: make([]float64, n), C: make([]float64, n), Shared: 1,
		Runs: [][]int{{2, 3, 8, 9}, {0, 1, 4}, {6, 7, 10}}, Base: []float64{0, 0.1, 0.4}}
	for i := range n {
		X.Set(i, 0, 1)
		X.Set(i, 1+i/6, 1+float64(i%6))
		g.Y[i] = rng.NormFloat64()
		g.Var[i] = 0.3 + 0.04*float64(i)
		g.C[i] = 0.2 + 0.15*float64(i%5)
	}
	return g
}

// contrastLogLik is log N(Ky; 0, KVKᵀ) for K spanning the complement of
// X's non-zero columns.
func contrastLogLik(t *testing.T, g Group, s2 float64) float64 {
	X, _ := nonZeroColumns(g.X, g.X.RawMatrix().Rows, g.X.RawMatrix().Cols, 0)
	n, p := X.Dims()
	var svd mat.SVD
	svd.Factorize(X, mat.SVDFull)
	var U mat.Dense
	svd.UTo(&U)
	K := U.Slice(0, n, p, n).(*mat.Dense).T()
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
	S := mat.NewSymDense(n-p, nil)
	for i := range n - p {
		for j := i; j < n-p; j++ {
			S.SetSym(i, j, KVK.At(i, j))
		}
	}
	var ky mat.VecDense
	ky.MulVec(K, mat.NewVecDense(n, g.Y))
	d, ok := distmv.NewNormal(make([]float64, n-p), S, nil)
	if !ok {
		t.Fatal("contrast covariance not positive definite")
	}
	return d.LogProb(ky.RawVector().Data)
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

// TestGridWorkers: the grid shared by two goroutines, or by three (points
// left over at the end), gives the serial grid's result to the bit, as
// posteriorGrid says (each point computed alike, summed in one order).
func TestGridWorkers(t *testing.T) {
	groups := []Group{arrowheadGroup(), runJoinGroup(), oneBlockGroup()}
	serial := func(s2 float64) float64 {
		var ll float64
		for _, g := range groups {
			if v, ok := g.restrictedLogLik(s2); ok {
				ll += v
			}
		}
		return ll
	}
	wantSD, wantSDSD := posteriorN(serial, 1.5, gridN)
	for _, workers := range []int{2, 3} {
		sd, sdsd := posteriorGrid(1.5, gridN+1, workers, func() func(float64) float64 { return serial })
		sd1, sdsd1 := posteriorN(serial, 1.5, gridN+1)
		if sd != sd1 || sdsd != sdsd1 {
			t.Errorf("%d workers on %d points: (%v, %v), serial (%v, %v)", workers, gridN+1, sd, sdsd, sd1, sdsd1)
		}
	}
	if sd, sdsd := ScatterREML(groups, 1.5); sd != wantSD || sdsd != wantSDSD {
		t.Errorf("ScatterREML = (%v, %v), the serial grid (%v, %v)", sd, sdsd, wantSD, wantSDSD)
	}
}
