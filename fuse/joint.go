package fuse

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// The joint posterior over every parameter, linear ones first (θ: lift,
// speed slopes, additive nuisances) then the non-linear ones (φ: log scale
// factors, winds), as draws and as mean and covariance. Planning and the
// cross-check work in this space.

// dim returns the number of parameters, θ and φ.
func (m *model) dim() int { return len(m.lin) + len(m.phi) }

// jointDraws calls fn with every pooled draw of (θ, φ); fn must not keep
// the slices, which are reused. A compacted posterior has no draws of its
// nuisances: they come from its refit (see compact).
func (P *Posterior) jointDraws(fn func(theta, phi []float64)) {
	var theta, phi []float64
	if P.compacted {
		P.mu.Lock()
		W := P.wholeLocked()
		P.mu.Unlock()
		if W != nil {
			W.jointDraws(fn)
			return
		}
		p := len(P.p.m.lin) // no refit: the nuisances come as NaN
		full := make([]float64, p)
		for i := range full {
			full[i] = math.NaN()
		}
		inner := fn
		fn = func(th, ph []float64) {
			copy(full, th)
			inner(full, ph)
		}
	}
	if P.p.gaussian {
		P.seriesOf(nil) // make the closed form's draws
		for _, ch := range P.gdraws {
			for i := range ch.n {
				theta = ch.at(i, theta)
				fn(theta, nil)
			}
		}
		return
	}
	for c, ch := range P.p.draws {
		for i := range P.p.n {
			theta, phi = ch.at(i, theta), P.p.phiDraws[c].at(i, phi)
			fn(theta, phi)
		}
	}
}

// joint returns the posterior mean and covariance over (θ, φ). The closed
// form's covariance is exact; a sampled one is the draws' covariance. Both
// are computed once and kept (the covariance is shared: not to be
// modified).
func (P *Posterior) joint() ([]float64, *mat.SymDense) {
	P.mu.Lock()
	defer P.mu.Unlock()
	if P.jcov == nil {
		P.jmean, P.jcov = P.jointMoments()
	}
	return slices.Clone(P.jmean), P.jcov
}

// jointMoments computes what joint returns (see there).
func (P *Posterior) jointMoments() ([]float64, *mat.SymDense) {
	m := P.p.m
	p, D := len(m.lin), m.dim()
	cov := mat.NewSymDense(D, nil)
	if P.compacted {
		if W := P.wholeLocked(); W != nil {
			_, c := W.joint()
			return P.keptMean(), c
		}
		for i := range D { // no refit: nothing sound to return
			cov.SetSym(i, i, math.NaN())
		}
		return P.keptMean(), cov
	}
	if P.p.gaussian {
		mean := make([]float64, D)
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
	mean := P.drawMean()
	// Second pass for the covariance (two passes are stabler than one):
	// blocks of centred draws as the columns of X (D × k), and
	// C += X Xᵀ by the BLAS rank-k update (gonum's Dsyrk: dot products of
	// contiguous rows, not one scattered update per draw and pair).
	X := mat.NewDense(D, jointBlock, nil)
	raw := X.RawMatrix()
	k := 0 // draws in X
	flush := func() {
		if k > 0 {
			cov.SymRankK(cov, 1, X.Slice(0, D, 0, k))
			k = 0
		}
	}
	for c := range P.p.draws {
		for b := 0; b*storeBlock < P.p.n; b++ {
			tb, nb, ts := P.p.draws[c].span(b, P.p.n)
			var fb []float64
			fs := 0
			if len(m.phi) > 0 {
				fb, _, fs = P.p.phiDraws[c].span(b, P.p.n)
			}
			for j := range D {
				var src []float64
				if j < p {
					src = tb[j*ts:]
				} else {
					src = fb[(j-p)*fs:]
				}
				mj := mean[j]
				row := raw.Data[j*raw.Stride+k : j*raw.Stride+k+nb]
				for i := range row {
					row[i] = src[i] - mj
				}
			}
			if k += nb; k+storeBlock > jointBlock {
				flush()
			}
		}
	}
	flush()
	cov.ScaleSym(1/float64(nChains*P.p.n-1), cov)
	return mean, cov
}

// jointBlock is how many draws one rank-k update of the covariance takes
// (dot products of that length; a store block alone is too short for them).
const jointBlock = 8 * storeBlock

// jointMean returns the posterior mean over (θ, φ): the draws' mean, or
// the closed form's, kept once computed.
func (P *Posterior) jointMean() []float64 {
	P.mu.Lock()
	defer P.mu.Unlock()
	return slices.Clone(P.keptMean())
}

// keptMean is jointMean with P.mu held, not copied.
func (P *Posterior) keptMean() []float64 {
	if P.jmean == nil {
		P.jmean = P.drawMean()
	}
	return P.jmean
}

// drawMean computes the mean over (θ, φ) of the draws (or the closed
// form's).
func (P *Posterior) drawMean() []float64 {
	m := P.p.m
	p, D := len(m.lin), m.dim()
	mean := make([]float64, D)
	if P.p.gaussian {
		copy(mean, P.p.cond.mean)
		return mean
	}
	for c := range P.p.draws {
		for b := 0; b*storeBlock < P.p.n; b++ {
			tb, k, ts := P.p.draws[c].span(b, P.p.n)
			for j := range p {
				for _, v := range tb[j*ts : j*ts+k] {
					mean[j] += v
				}
			}
			if len(m.phi) == 0 {
				continue
			}
			fb, _, fs := P.p.phiDraws[c].span(b, P.p.n)
			for j := range len(m.phi) {
				for _, v := range fb[j*fs : j*fs+k] {
					mean[p+j] += v
				}
			}
		}
	}
	for j := range mean {
		mean[j] /= float64(len(P.p.draws) * P.p.n)
	}
	return mean
}

// compact drops the draws of the nuisance columns of θ, keeping those of
// the lift columns (β, γ: the first columns of θ, see indexLift) and of φ,
// after computing the joint mean (and keeping the joint covariance if it
// was computed): a standalone or others' posterior is used after its fit
// for its figures, the agreement and the fitted lines of the charts. At 48
// configurations the nuisances — each run's wind above all — hold four
// fifths of the draws. What needs the dropped draws (the planner's
// discrimination and the diagnosis of a flagged entry) gets those of
// refit, the same seeded fit made again, once.
func (P *Posterior) compact(refit func() (*Posterior, error)) {
	P.mu.Lock()
	defer P.mu.Unlock()
	if P.p.gaussian || P.compacted {
		return
	}
	P.keptMean()
	nLift := 0
	for nLift < len(P.p.m.lin) && P.p.m.lin[nLift].kind != kindNuisance {
		nLift++
	}
	for _, st := range P.p.draws {
		st.narrow(nLift)
	}
	P.compacted, P.refit = true, refit
}

// wholeLocked returns the posterior with every draw: P, or the refit of a
// compacted P (nil if that fails). P.mu must be held.
func (P *Posterior) wholeLocked() *Posterior {
	if !P.compacted {
		return P
	}
	if P.whole == nil && P.refit != nil {
		W, err := P.refit()
		if err != nil {
			return nil
		}
		P.whole = W
	}
	return P.whole
}

// rowMean is the expected value of a row's observation at (θ, φ), the
// log-normal nuisances' terms included.
func (m *model) rowMean(r *row, theta, phi []float64, buf []entryRef) float64 {
	y := m.rowOffset(r, phi)
	for _, e := range m.design(r, phi, buf[:0]) {
		y += e.v * theta[e.col]
	}
	return y
}
