package checks

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// errRank is returned when a design matrix has too few rows or dependent
// columns.
var errRank = errors.New("design matrix is rank deficient")

// wlsFit is a weighted least-squares fit y = Xβ + ε, var ε_i = σ_i²:
// β̂ = (XᵀWX)⁻¹XᵀWy with W = diag(1/σ²), RSS = Σ w_i r_i², and leverages
// h_ii = w_i x_iᵀ(XᵀWX)⁻¹x_i (Draper & Smith, Applied Regression Analysis,
// 3rd ed., §9.2).
type wlsFit struct {
	Beta  []float64
	Cov   *mat.SymDense // (XᵀWX)⁻¹
	Resid []float64     // y − Xβ̂
	Lev   []float64
	W     []float64 // weights 1/σ²
	RSS   float64
	DF    int // n − p
}

// wls fits rows x (each of length p) to y with weights w.
func wls(x [][]float64, y, w []float64) (*wlsFit, error) {
	n := len(y)
	if n == 0 {
		return nil, errRank
	}
	p := len(x[0])
	if n <= p {
		return nil, errRank
	}
	a := mat.NewSymDense(p, nil)
	b := make([]float64, p)
	for i := range n {
		for j := range p {
			b[j] += w[i] * x[i][j] * y[i]
			for k := j; k < p; k++ {
				a.SetSym(j, k, a.At(j, k)+w[i]*x[i][j]*x[i][k])
			}
		}
	}
	// Scale to unit diagonal before factorising, so that columns of very
	// different size (1, q, q²) do not spoil the condition test.
	d := make([]float64, p)
	for j := range p {
		if a.At(j, j) <= 0 {
			return nil, errRank
		}
		d[j] = 1 / math.Sqrt(a.At(j, j))
	}
	s := mat.NewSymDense(p, nil)
	for j := range p {
		for k := j; k < p; k++ {
			s.SetSym(j, k, a.At(j, k)*d[j]*d[k])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(s) || ch.Cond() > 1e12 {
		return nil, errRank
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		return nil, errRank
	}
	cov := mat.NewSymDense(p, nil)
	for j := range p {
		for k := j; k < p; k++ {
			cov.SetSym(j, k, inv.At(j, k)*d[j]*d[k])
		}
	}
	f := &wlsFit{Beta: make([]float64, p), Cov: cov, Resid: make([]float64, n), Lev: make([]float64, n), W: w, DF: n - p}
	for j := range p {
		for k := range p {
			f.Beta[j] += cov.At(j, k) * b[k]
		}
	}
	for i := range n {
		var fit, h float64
		for j := range p {
			fit += x[i][j] * f.Beta[j]
			for k := range p {
				h += x[i][j] * cov.At(j, k) * x[i][k]
			}
		}
		f.Resid[i] = y[i] - fit
		f.Lev[i] = w[i] * h
		f.RSS += w[i] * f.Resid[i] * f.Resid[i]
	}
	return f, nil
}

// fTest returns the p-value of the extra-sum-of-squares F test of a
// restricted fit (fewer columns) against a full one:
// F = ((RSS_r − RSS_f)/(df_r − df_f)) / (RSS_f/df_f) ~ F(df_r − df_f, df_f)
// under the restricted model (Draper & Smith, §6.2).
func fTest(restricted, full *wlsFit) float64 {
	k := restricted.DF - full.DF
	if k <= 0 || full.DF <= 0 || full.RSS <= 0 {
		return 1
	}
	f := ((restricted.RSS - full.RSS) / float64(k)) / (full.RSS / float64(full.DF))
	if f <= 0 {
		return 1
	}
	return distuv.F{D1: float64(k), D2: float64(full.DF)}.Survival(f)
}

// chi2Survival is P(χ²_k > x).
func chi2Survival(x float64, k int) float64 {
	if k <= 0 {
		return 1
	}
	return distuv.ChiSquared{K: float64(k)}.Survival(x)
}

// normTwoSided is P(|Z| > |z|) for a standard normal Z.
func normTwoSided(z float64) float64 {
	return 2 * distuv.UnitNormal.Survival(math.Abs(z))
}

// extraTest is the p-value of a restricted fit against a full one when the
// weights may be right or may be too large: the larger of the F test
// (whose scale comes from the residuals) and the χ² test of the extra sum
// of squares on the stated variances, RSS_r − RSS_f ~ χ²_k when the
// weights are the inverse variances (Draper & Smith, §6.2). Under the
// restricted model each p-value is uniform when its scale is the right
// one, so the larger is valid in either case (an intersection–union test;
// Casella & Berger, Statistical Inference, 2nd ed., §8.2.3). A departure
// smaller than the errors the fusion is told the windows have then does
// not trip, however well the residuals repeat it: a steady window that
// catches the edge of a ramp carries a little of its pitch that the
// window's mean acceleration models only to about one sample.
func extraTest(restricted, full *wlsFit) float64 {
	pf := fTest(restricted, full)
	k := restricted.DF - full.DF
	if k <= 0 {
		return 1
	}
	return math.Max(pf, chi2Survival(math.Max(0, restricted.RSS-full.RSS), k))
}
