package fuse

import (
	"gonum.org/v1/gonum/mat"
)

// The joint posterior over every parameter, linear ones first (θ: lift,
// speed slopes, additive nuisances) then the non-linear ones (φ: log scale
// factors, winds), as draws and as mean and covariance. Planning and the
// cross-check work in this space.

// dim returns the number of parameters, θ and φ.
func (m *model) dim() int { return len(m.lin) + len(m.phi) }

// jointDraws calls fn with every pooled draw of (θ, φ).
func (P *Posterior) jointDraws(fn func(theta, phi []float64)) {
	m := P.p.m
	p, d := len(m.lin), len(m.phi)
	if P.p.gaussian {
		P.seriesOf(nil) // make the closed form's draws
		for _, ch := range P.gdraws {
			for i := 0; i+p <= len(ch); i += p {
				fn(ch[i:i+p], nil)
			}
		}
		return
	}
	for c, ch := range P.p.draws {
		for i := range P.p.n {
			fn(ch[i*p:(i+1)*p], P.p.phiDraws[c][i*d:(i+1)*d])
		}
	}
}

// joint returns the posterior mean and covariance over (θ, φ). The closed
// form's covariance is exact; a sampled one is the draws' covariance.
func (P *Posterior) joint() ([]float64, *mat.SymDense) {
	m := P.p.m
	p, D := len(m.lin), m.dim()
	mean := make([]float64, D)
	cov := mat.NewSymDense(D, nil)
	if P.p.gaussian {
		copy(mean, P.p.cond.mean)
		e := make([]float64, p)
		for i := range p {
			clear(e)
			e[i] = 1
			col := P.p.cond.solve(e)
			for j := i; j < p; j++ {
				cov.SetSym(i, j, col[j])
			}
		}
		return mean, cov
	}
	n := 0
	x := make([]float64, D)
	P.jointDraws(func(theta, phi []float64) {
		n++
		copy(x, theta)
		copy(x[p:], phi)
		for i := range D {
			mean[i] += (x[i] - mean[i]) / float64(n)
		}
	})
	// Second pass for the covariance (two passes are stabler than one).
	acc := make([]float64, D*D)
	P.jointDraws(func(theta, phi []float64) {
		copy(x, theta)
		copy(x[p:], phi)
		for i := range D {
			di := x[i] - mean[i]
			for j := i; j < D; j++ {
				acc[i*D+j] += di * (x[j] - mean[j])
			}
		}
	})
	for i := range D {
		for j := i; j < D; j++ {
			cov.SetSym(i, j, acc[i*D+j]/float64(n-1))
		}
	}
	return mean, cov
}

// rowMean is the expected value of a row's observation at (θ, φ).
func (m *model) rowMean(r *row, theta, phi []float64, buf []entryRef) float64 {
	var y float64
	for _, e := range m.design(r, phi, buf[:0]) {
		y += e.v * theta[e.col]
	}
	return y
}
