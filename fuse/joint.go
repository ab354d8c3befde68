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
// the slices, which are reused. A compacted posterior has no draws of most
// of its nuisances: they come from its refit (see compact).
func (P *Posterior) jointDraws(fn func(theta, phi []float64)) {
	P.drawsOf(nil, fn)
}

// nDraws is how many draws jointDraws and drawsOf pass to their callers.
func (P *Posterior) nDraws() int {
	if P.p.gaussian {
		P.seriesOf(nil) // make the closed form's draws
		n := 0
		for _, ch := range P.gdraws {
			n += ch.n
		}
		return n
	}
	return len(P.p.draws) * P.p.n
}

// drawsOf is jointDraws for a caller that reads only the columns need of
// θ (nil: all of them): a compacted posterior that kept those columns
// serves them without its refit, the others' columns NaN.
func (P *Posterior) drawsOf(need []int, fn func(theta, phi []float64)) {
	var theta, phi []float64
	if P.compacted {
		P.mu.Lock()
		var W *Posterior
		if need == nil || !P.keeps(need) {
			W = P.wholeLocked()
		}
		P.mu.Unlock()
		if W != nil {
			W.jointDraws(fn)
			return
		}
		full := make([]float64, len(P.p.m.lin)) // the columns not kept come as NaN
		for i := range full {
			full[i] = math.NaN()
		}
		inner, kept := fn, P.kept
		fn = func(th, ph []float64) {
			for j, col := range kept {
				full[col] = th[j]
			}
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

// keeps reports whether a compacted posterior kept the draws of every
// column of θ in cols.
func (P *Posterior) keeps(cols []int) bool {
	for _, c := range cols {
		if _, ok := slices.BinarySearch(P.kept, c); !ok {
			return false
		}
	}
	return true
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
	return mean, P.drawCov(firstCols(D), mean)
}

// jointCov returns the posterior covariance of the parameters cols of
// (θ, φ) (in that order): the joint covariance's, restricted, when it was
// computed or the posterior is a closed form or compacted; else from the
// draws of those parameters alone, as jointMoments computes it over all.
func (P *Posterior) jointCov(cols []int) *mat.SymDense {
	P.mu.Lock()
	whole := P.jcov != nil || P.p.gaussian || P.compacted
	P.mu.Unlock()
	out := mat.NewSymDense(max(len(cols), 1), nil)
	if len(cols) == 0 {
		return out
	}
	if whole {
		_, c := P.joint()
		for a, i := range cols {
			for b := a; b < len(cols); b++ {
				out.SetSym(a, b, c.At(i, cols[b]))
			}
		}
		return out
	}
	return P.drawCov(cols, P.jointMean())
}

// drawCov is the draws' covariance of the parameters cols of (θ, φ)
// about mean (over all of them), in a second pass (two passes are stabler
// than one): blocks of centred draws as the columns of X (len(cols) × k),
// and C += X Xᵀ by the BLAS rank-k update (gonum's Dsyrk: dot products of
// contiguous rows, not one scattered update per draw and pair).
func (P *Posterior) drawCov(cols []int, mean []float64) *mat.SymDense {
	return P.drawCovOf(cols, mean, nil)
}

// drawCovOf is drawCov of L·x, L (r × len(cols)) applied to the draws'
// parameters cols: L C Lᵀ (r×r) from the draws L·X, which costs r·len(cols)
// per draw instead of len(cols)²/2 when r is the smaller; nil L is the
// identity (drawCov).
func (P *Posterior) drawCovOf(cols []int, mean []float64, L *mat.Dense) *mat.SymDense {
	m := P.p.m
	p := len(m.lin)
	k, nr := 0, len(cols)
	nout := nr
	if L != nil {
		nout, _ = L.Dims()
	}
	out := mat.NewSymDense(nout, nil)
	X := mat.NewDense(nr, jointBlock, nil)
	raw := X.RawMatrix()
	var LX mat.Dense
	flush := func() {
		if k == 0 {
			return
		}
		Xk := X.Slice(0, nr, 0, k)
		if L != nil {
			LX.Reset()
			LX.Mul(L, Xk)
			Xk = &LX
		}
		out.SymRankK(out, 1, Xk)
		k = 0
	}
	for c := range P.p.draws {
		for b := 0; b*storeBlock < P.p.n; b++ {
			tb, nb, ts := P.p.draws[c].span(b, P.p.n)
			var fb []float64
			fs := 0
			if len(m.phi) > 0 {
				fb, _, fs = P.p.phiDraws[c].span(b, P.p.n)
			}
			for a, j := range cols {
				var src []float64
				if j < p {
					src = tb[j*ts:]
				} else {
					src = fb[(j-p)*fs:]
				}
				row := raw.Data[a*raw.Stride+k : a*raw.Stride+k+nb]
				for i := range row {
					row[i] = src[i] - mean[j]
				}
			}
			if k += nb; k+storeBlock > jointBlock {
				flush()
			}
		}
	}
	flush()
	out.ScaleSym(1/float64(nChains*P.p.n-1), out)
	return out
}

// jointCovOf is L C Lᵀ for C = jointCov(cols): from the draws projected by
// L (drawCovOf) when jointCov would compute C from them, else from C. The
// draws are read after P.mu is let go: safe because a posterior is
// compacted only after its agreement, in the same goroutine (fitOthers),
// or before the agreements start (compactRefitted, then agreements).
func (P *Posterior) jointCovOf(cols []int, L *mat.Dense) *mat.SymDense {
	P.mu.Lock()
	whole := P.jcov != nil || P.p.gaussian || P.compacted
	P.mu.Unlock()
	r, _ := L.Dims()
	if len(cols) == 0 {
		return mat.NewSymDense(r, nil)
	}
	if !whole {
		return P.drawCovOf(cols, P.jointMean(), L)
	}
	var LC mat.Dense
	LC.Mul(L, P.jointCov(cols))
	out := mat.NewSymDense(r, nil)
	for i := range r {
		for j := i; j < r; j++ {
			out.SetSym(i, j, mat.Dot(LC.RowView(i), L.RowView(j)))
		}
	}
	return out
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

// compact drops the draws of the nuisance columns of θ but those of
// extra (columns of θ), keeping those of the lift columns (β, γ: the first
// columns of θ, see indexLift) and of φ, after computing the joint mean
// (and keeping the joint covariance if it was computed): a standalone or
// others' posterior is used after its fit for its figures, the agreement
// (whose replicates read the nuisances the entry shares with the others,
// kept as extra) and the fitted lines of the charts. At 48 configurations
// the nuisances — each run's wind above all — hold four fifths of the
// draws. What needs the dropped draws (the planner's discrimination and the
// diagnosis of a flagged entry) gets those of refit, the same seeded fit
// made again, once.
func (P *Posterior) compact(refit func() (*Posterior, error), extra []int) {
	P.mu.Lock()
	defer P.mu.Unlock()
	if P.p.gaussian || P.compacted {
		return
	}
	P.keptMean()
	m := P.p.m
	var kept []int
	for i := range m.lin {
		if m.lin[i].kind != kindNuisance {
			kept = append(kept, i)
		}
	}
	for _, c := range extra {
		if m.lin[c].kind == kindNuisance {
			kept = append(kept, c)
		}
	}
	slices.Sort(kept)
	kept = slices.Compact(kept)
	for _, st := range P.p.draws {
		st.pick(kept)
	}
	P.compacted, P.refit, P.kept = true, refit, kept
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
	f, q := m.liftFactor(r, phi)
	y := r.offset(phi, q)
	for _, e := range designAt(r, f, q, buf[:0]) {
		y += e.v * theta[e.col]
	}
	return y
}
