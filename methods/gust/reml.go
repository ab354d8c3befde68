package gust

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// Group is a set of observations with the fixed effects of their pilot
// fit: the design X, the observations Y (known terms removed), their noise
// variances Var, each observation's sensitivity C to its run's wind
// deviation, the runs (positions in Y) and each run's Base variance (see
// Point).
type Group struct {
	X         *mat.Dense
	Y, Var, C []float64
	Runs      [][]int
	Base      []float64
}

// restrictedLogLik returns the restricted (REML) log-likelihood of σ_g²,
// up to a constant: the likelihood of the residuals with the fixed effects
// integrated out under a flat prior (Patterson & Thompson, Biometrika 58,
// 1971; Harville, JASA 72, 1977 — from memory),
//
//	−½·[log det V + log det XᵀV⁻¹X + yᵀV⁻¹y − bᵀ(XᵀV⁻¹X)⁻¹b],  b = XᵀV⁻¹y
//
// with V = diag(Var) + Σ_runs (σ_g² + Base)·c·cᵀ. Unlike the plain
// likelihood of pilot residuals it does not lose the run-to-run variance
// that the fitted offsets, slopes and wind absorb. Columns of X that are
// all zero are left out; ok is false when V or XᵀV⁻¹X is singular.
func (g Group) restrictedLogLik(s2 float64) (ll float64, ok bool) {
	n, p := g.X.Dims()
	V := mat.NewSymDense(n, nil)
	for i := range n {
		V.SetSym(i, i, g.Var[i])
	}
	for r, run := range g.Runs {
		v := s2
		if r < len(g.Base) {
			v += g.Base[r]
		}
		for a, i := range run {
			for _, j := range run[a:] {
				V.SetSym(i, j, V.At(i, j)+v*g.C[i]*g.C[j])
			}
		}
	}
	var cv mat.Cholesky
	if !cv.Factorize(V) {
		return 0, false
	}
	X := nonZeroColumns(g.X, n, p)
	var vx mat.Dense
	if err := cv.SolveTo(&vx, X); err != nil {
		return 0, false
	}
	y := mat.NewVecDense(n, g.Y)
	var vy mat.VecDense
	if err := cv.SolveVecTo(&vy, y); err != nil {
		return 0, false
	}
	var A mat.Dense
	A.Mul(X.T(), &vx)
	As := mat.NewSymDense(A.RawMatrix().Rows, nil)
	for i := range As.SymmetricDim() {
		for j := i; j < As.SymmetricDim(); j++ {
			As.SetSym(i, j, (A.At(i, j)+A.At(j, i))/2)
		}
	}
	var ca mat.Cholesky
	if !ca.Factorize(As) {
		return 0, false
	}
	var b mat.VecDense
	b.MulVec(X.T(), &vy)
	var ab mat.VecDense
	if err := ca.SolveVecTo(&ab, &b); err != nil {
		return 0, false
	}
	quad := mat.Dot(y, &vy) - mat.Dot(&b, &ab)
	return -0.5 * (cv.LogDet() + ca.LogDet() + quad), true
}

// nonZeroColumns returns X without its all-zero columns.
func nonZeroColumns(X *mat.Dense, n, p int) *mat.Dense {
	var keep []int
	for j := range p {
		for i := range n {
			if X.At(i, j) != 0 {
				keep = append(keep, j)
				break
			}
		}
	}
	out := mat.NewDense(n, max(len(keep), 1), nil)
	for k, j := range keep {
		for i := range n {
			out.Set(i, k, X.At(i, j))
		}
	}
	return out
}

// ScatterREML is Scatter with the groups' restricted likelihood in place of
// the runs' plain one: the posterior mean of σ_g² (as its square root, m/s)
// and the posterior sd of σ_g under the half-normal prior of the given
// scale. A group whose likelihood cannot be formed is left out.
func ScatterREML(groups []Group, scale float64) (sd, sdOfSD float64) {
	return posteriorN(func(s2 float64) float64 {
		var ll float64
		for _, g := range groups {
			if v, ok := g.restrictedLogLik(s2); ok {
				ll += v
			}
		}
		return ll
	}, scale, gridREML)
}

// gridREML is the grid of the restricted likelihood, each point of which
// factors the groups' covariances.
const gridREML = 120

// posterior returns √E[σ²] and sd(σ) on a grid for a log-likelihood of σ²
// and a half-normal prior of the given scale.
func posterior(loglik func(s2 float64) float64, scale float64) (sd, sdOfSD float64) {
	return posteriorN(loglik, scale, gridN)
}

// posteriorN is posterior on a grid of n points.
func posteriorN(loglik func(s2 float64) float64, scale float64, n int) (sd, sdOfSD float64) {
	if scale <= 0 {
		return 0, 0
	}
	top := 5 * scale
	lp := make([]float64, n)
	best := math.Inf(-1)
	for k := range n {
		s := top * (float64(k) + 0.5) / float64(n)
		lp[k] = -0.5*s*s/(scale*scale) + loglik(s*s)
		best = math.Max(best, lp[k])
	}
	var z, m1, m2 float64
	for k := range n {
		s := top * (float64(k) + 0.5) / float64(n)
		w := math.Exp(lp[k] - best)
		z += w
		m1 += w * s
		m2 += w * s * s
	}
	m1, m2 = m1/z, m2/z
	return math.Sqrt(m2), math.Sqrt(math.Max(0, m2-m1*m1))
}
