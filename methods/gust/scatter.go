package gust

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// Point is one observation of a run for the scatter estimate: its residual
// R after the pilot fit, its noise variance Var (> 0), its sensitivity C
// to the run's wind deviation (units of R per m/s), and Base, a known
// variance (m²/s²) of the run's wind besides the gusts: the session wind's
// σ_w² when the direction of travel is unknown (its sign then changes from
// run to run like a gust). The points of one run share Base.
type Point struct {
	R, Var, C, Base float64
}

// gridN is the number of grid points of the posterior of σ_g.
const gridN = 400

// runLogLik returns log N(r; 0, D + (σ² + Base)·c·cᵀ) up to a constant, with D the
// diagonal of variances: by the matrix determinant lemma and the
// Sherman–Morrison formula (e.g. Golub & Van Loan, Matrix Computations,
// §2.1.4 — from memory), with a = Σc²/v, b = Σc·r/v,
//
//	log det = Σ log v + log(1 + σ²·a),   rᵀΣ⁻¹r = Σ r²/v − σ²·b²/(1 + σ²·a).
func runLogLik(ps []Point, s2 float64) float64 {
	if len(ps) > 0 {
		s2 += ps[0].Base
	}
	var ld, rr, a, b float64
	for _, p := range ps {
		ld += math.Log(p.Var)
		rr += p.R * p.R / p.Var
		a += p.C * p.C / p.Var
		b += p.C * p.R / p.Var
	}
	den := 1 + s2*a
	return -0.5 * (ld + math.Log(den) + rr - s2*b*b/den)
}

// Scatter returns the posterior mean of σ_g² (as its square root, m/s) and
// the posterior sd of σ_g, given the runs' points and the half-normal prior
// scale of σ_g. Runs whose points carry no sensitivity say nothing; with no
// informative run the prior mean of σ_g² (the scale²) is returned.
func Scatter(runs [][]Point, scale float64) (sd, sdOfSD float64) {
	return posterior(func(s2 float64) float64 {
		var ll float64
		for _, ps := range runs {
			ll += runLogLik(ps, s2)
		}
		return ll
	}, scale)
}

// Fit returns the coefficients b̂ and the residuals y − X·b̂ of the
// weighted least-squares fit with weights w (1/variance). A tiny ridge
// (1e-10 of each column's weighted sum of squares) keeps an unidentified
// column (one configuration seen at one speed only, say) from making the
// fit singular; a pilot needs no more. If the fit still fails, b̂ is zero
// and the residuals are y.
func Fit(X *mat.Dense, y, w []float64) (beta, resid []float64) {
	n, p := X.Dims()
	A := mat.NewSymDense(p, nil)
	rhs := mat.NewVecDense(p, nil)
	for i := range n {
		for a := range p {
			xa := X.At(i, a) * w[i]
			if xa == 0 {
				continue
			}
			rhs.SetVec(a, rhs.AtVec(a)+xa*y[i])
			for b := a; b < p; b++ {
				A.SetSym(a, b, A.At(a, b)+xa*X.At(i, b))
			}
		}
	}
	for a := range p {
		A.SetSym(a, a, A.At(a, a)*(1+1e-10)+1e-300)
	}
	beta = make([]float64, p)
	resid = append([]float64(nil), y...)
	var b mat.VecDense
	var ch mat.Cholesky
	if !ch.Factorize(A) || ch.SolveVecTo(&b, rhs) != nil {
		return beta, resid
	}
	for a := range p {
		beta[a] = b.AtVec(a)
	}
	for i := range n {
		for a := range p {
			resid[i] -= X.At(i, a) * beta[a]
		}
	}
	return beta, resid
}
