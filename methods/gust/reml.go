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

// reml holds a group's sums for its restricted likelihood: with D the
// diagonal of variances and, per run r, a_r = c_rᵀD⁻¹c_r, u_r = XᵀD⁻¹c_r
// and w_r = c_rᵀD⁻¹y, every grid point costs O(runs·p²), not O(n³).
type reml struct {
	logDetD float64
	xdx     *mat.SymDense // XᵀD⁻¹X
	xdy     *mat.VecDense // XᵀD⁻¹y
	ydy     float64       // yᵀD⁻¹y
	a, w    []float64
	u       []*mat.VecDense
	base    []float64
}

func (g Group) prepare() reml {
	n, p := g.X.Dims()
	X := nonZeroColumns(g.X, n, p)
	_, p = X.Dims()
	r := reml{xdx: mat.NewSymDense(p, nil), xdy: mat.NewVecDense(p, nil)}
	for i := range n {
		d := 1 / g.Var[i]
		r.logDetD += math.Log(g.Var[i])
		r.ydy += g.Y[i] * g.Y[i] * d
		for a := range p {
			r.xdy.SetVec(a, r.xdy.AtVec(a)+X.At(i, a)*d*g.Y[i])
			for b := a; b < p; b++ {
				r.xdx.SetSym(a, b, r.xdx.At(a, b)+X.At(i, a)*d*X.At(i, b))
			}
		}
	}
	for k, run := range g.Runs {
		u := mat.NewVecDense(p, nil)
		var a, w float64
		for _, i := range run {
			d := 1 / g.Var[i]
			a += g.C[i] * g.C[i] * d
			w += g.C[i] * d * g.Y[i]
			for b := range p {
				u.SetVec(b, u.AtVec(b)+X.At(i, b)*d*g.C[i])
			}
		}
		base := 0.0
		if k < len(g.Base) {
			base = g.Base[k]
		}
		r.a, r.w, r.u, r.base = append(r.a, a), append(r.w, w), append(r.u, u), append(r.base, base)
	}
	return r
}

// logLik returns the restricted (REML) log-likelihood of σ_g²,
// up to a constant: the likelihood of the residuals with the fixed effects
// integrated out under a flat prior (Patterson & Thompson, Biometrika 58,
// 1971; Harville, JASA 72, 1977 — from memory),
//
//	−½·[log det V + log det XᵀV⁻¹X + yᵀV⁻¹y − bᵀ(XᵀV⁻¹X)⁻¹b],  b = XᵀV⁻¹y
//
// with V = D + Σ_runs s_r·c_r·c_rᵀ, s_r = σ_g² + Base_r. The runs are
// disjoint, so by Sherman–Morrison V⁻¹ = D⁻¹ − Σ_r k_r·D⁻¹c_r·c_rᵀD⁻¹ with
// k_r = s_r/(1 + s_r·a_r), and log det V = log det D + Σ log(1 + s_r·a_r).
// Unlike the plain likelihood of pilot residuals it does not lose the
// run-to-run variance the fitted offsets, slopes and wind absorb. Columns
// of X that are all zero are left out; ok is false when XᵀV⁻¹X is singular.
func (r reml) logLik(s2 float64) (ll float64, ok bool) {
	p := r.xdy.Len()
	A := mat.NewSymDense(p, nil)
	A.CopySym(r.xdx)
	b := mat.VecDenseCopyOf(r.xdy)
	ldv, quad := r.logDetD, r.ydy
	for k := range r.a {
		s := s2 + r.base[k]
		ldv += math.Log1p(s * r.a[k])
		kr := s / (1 + s*r.a[k])
		quad -= kr * r.w[k] * r.w[k]
		A.SymRankOne(A, -kr, r.u[k])
		b.AddScaledVec(b, -kr*r.w[k], r.u[k])
	}
	var ca mat.Cholesky
	if !ca.Factorize(A) {
		return 0, false
	}
	var ab mat.VecDense
	if err := ca.SolveVecTo(&ab, b); err != nil {
		return 0, false
	}
	return -0.5 * (ldv + ca.LogDet() + quad - mat.Dot(b, &ab)), true
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
	rs := make([]reml, len(groups))
	for i, g := range groups {
		rs[i] = g.prepare()
	}
	return posteriorN(func(s2 float64) float64 {
		var ll float64
		for _, r := range rs {
			if v, ok := r.logLik(s2); ok {
				ll += v
			}
		}
		return ll
	}, scale, gridN)
}

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
