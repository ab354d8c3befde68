package fuse

import (
	"fmt"
	"math"
)

// cond is the posterior of the linear parameters given the non-linear ones
// φ: Gaussian with precision Λ and mean m, by the conjugate update
//
//	Λ = Λ₀ + Xᵀ Σ⁻¹ X,   Λ m = Λ₀ μ₀ + Xᵀ Σ⁻¹ y
//
// (Gelman et al., Bayesian Data Analysis, 3rd ed., §14.8 — from memory),
// together with the log marginal likelihood of the Gaussian data
//
//	log p(y | φ) = −½ yᵀΣ⁻¹y − ½ μ₀ᵀΛ₀μ₀ + ½ mᵀΛm − ½ log|Λ| + ½ log|Λ₀|₊ − ½ log|Σ| − (n/2) log 2π
//
// where |Λ₀|₊ is the product of the proper prior precisions (flat priors
// add the same constant to every φ), and y is the data less the known
// terms o(φ) of the log-normal nuisances (see offRef): given φ they are a
// shift, and the update stays exact.
//
// Λ is factorised in the order of the model's layout (see layout), so l,
// lam and b are in that order; mean is in the order of the columns of θ.
type cond struct {
	l     []float64 // Cholesky factor of Λ, row-major lower triangle, layout order
	p     int
	lay   *layout
	mean  []float64
	logML float64

	lam, b []float64 // buffers, reused between calls
	fs     []float64 // s(φ) of the model's scale sets
	vals   []float64 // the basis values at φ (terms.go)
	a, x   []float64
	xs     [][]entryRef
	ys     []float64 // a full block's y − o(φ)
}

// toLayout writes a (in column order) into x in layout order.
func (c *cond) toLayout(a, x []float64) {
	for col, v := range a {
		x[c.lay.pos[col]] = v
	}
}

// solve returns Λ⁻¹a.
func (c *cond) solve(a []float64) []float64 {
	x := make([]float64, c.p)
	c.toLayout(a, x)
	forward(c.l, x, c.lay)
	backward(c.l, x, c.lay)
	out := make([]float64, c.p)
	for i, v := range x {
		out[c.lay.col[i]] = v
	}
	return out
}

// quad returns aᵀΛ⁻¹a = ‖L⁻¹a‖².
func (c *cond) quad(a []float64) float64 {
	return c.quadInto(a, make([]float64, c.p))
}

// quadInto is quad with a buffer x of length p.
func (c *cond) quadInto(a, x []float64) float64 {
	c.toLayout(a, x)
	forward(c.l, x, c.lay)
	var s float64
	for _, v := range x {
		s += v * v
	}
	return s
}

// signVar returns aᵀΛ⁻¹a = ‖L⁻¹a‖² for a sign's weights a. They lie in one
// component of the layout (or a few), so L⁻¹a is non-zero only on the
// positions of the touched components and of the shared nuisances; the
// rest are skipped.
func (m *model) signVar(si int, c *cond) float64 {
	s, lay, x, l := &m.signs[si], c.lay, c.x, c.l
	spans := m.signSpans[si] // ascending, the shared positions last
	for _, sp := range spans {
		clear(x[sp[0]:sp[1]])
	}
	for _, t := range s.all {
		x[lay.pos[t.col]] += t.v
	}
	var sum float64
	for si, sp := range spans {
		for i := sp[0]; i < sp[1]; i++ {
			v := x[i]
			li := l[lay.base[i]:]
			for _, sq := range spans[:si+1] {
				for q := max(lay.first[i], sq[0]); q < min(sq[1], i); q++ {
					v -= li[q] * x[q]
				}
			}
			v /= li[i]
			x[i] = v
			sum += v * v
		}
	}
	return sum
}

// liftFactor returns the factors s(φ)·q(w) and q(w) of a row.
func (m *model) liftFactor(r *row, phi []float64) (float64, float64) {
	s := 0.0
	for _, sc := range r.scales {
		s += sc.pow * phi[sc.idx]
	}
	q := r.q0
	if r.wind >= 0 {
		w := phi[r.wind]
		q += r.a*w + r.c*w*w
	}
	return math.Exp(s) * q, q
}

// factorAt is liftFactor with the scale factors fs of the model's scale
// sets at φ given.
func (m *model) factorAt(r *row, phi, fs []float64) (float64, float64) {
	q := r.q0
	if r.wind >= 0 {
		w := phi[r.wind]
		q += r.a*w + r.c*w*w
	}
	return fs[r.scaleSet] * q, q
}

// inflation returns how much an entry-owned prior is widened: κ when every
// owner of the parameter has its systematic errors inflated, else 1.
func (m *model) inflation(owners map[int]bool) float64 {
	k := 1.0
	for e := range owners {
		if m.inflateSys[e] == 1 {
			return 1
		}
		k = m.inflateSys[e]
	}
	return k
}

// prior holds what the prior and the error covariances contribute to every
// conditioning, which depends on the inflation of entries but not on φ.
type prior struct {
	prec                     []float64
	mu0, logDet, logDetSigma float64
	n                        int
	phiNorm                  float64   // Σ −log(sd) − ½log 2π of the φ priors
	phiSD                    []float64 // prior sd of each φ, inflated where owned
	// lam0 and b0 are where every conditioning starts Λ (envelope
	// storage) and b (layout order): the prior, then the terms that do
	// not change with φ (see splitConstant)
	lam0, b0 []float64
}

// priorTerms returns the model's prior terms, computing them on first use
// (a model's inflation is fixed once it samples).
func (m *model) priorTerms() *prior {
	m.priorOnce.Do(func() {
		pr := &prior{prec: make([]float64, len(m.lin))}
		for i, lp := range m.lin {
			prec := lp.prec
			if lp.kind == kindNuisance && prec > 0 {
				k := m.inflation(lp.owners)
				prec /= k * k
			}
			pr.prec[i] = prec
			pr.mu0 += prec * lp.mean * lp.mean
			if prec > 0 {
				pr.logDet += math.Log(prec)
			}
		}
		for _, p := range m.phi {
			sd := p.sd * m.inflation(p.owners)
			pr.phiSD = append(pr.phiSD, sd)
			pr.phiNorm -= math.Log(sd) + 0.5*math.Log(2*math.Pi)
		}
		for bi := range m.blocks {
			bl := &m.blocks[bi]
			k := m.inflate[bl.entry]
			pr.logDetSigma += bl.logdet + 2*float64(len(bl.rows))*math.Log(k)
			pr.n += len(bl.rows)
		}
		m.startTerms(pr)
		m.prior = pr
	})
	return m.prior
}

// startTerms computes the prior's lam0 and b0: the prior precisions on
// Λ's diagonal and Λ₀μ₀ in b, then the pairs of the constant bases that
// come first in their elements' sums (splitConstant), at the basis values
// a conditioning computes.
func (m *model) startTerms(pr *prior) {
	lay := m.lay
	pr.lam0, pr.b0 = make([]float64, lay.size), make([]float64, len(m.lin))
	for i := range m.lin {
		at := lay.pos[i]
		pr.lam0[lay.base[at]+at] = pr.prec[i]
		pr.b0[at] = pr.prec[i] * m.lin[i].mean
	}
	// The constant bases read neither φ nor the factors.
	phi := make([]float64, len(m.phi))
	vals := m.basisValues(phi, m.scaleFactors(phi, nil), nil)
	m.addConstant(vals, pr.lam0, pr.b0)
}

// condition computes the conditional posterior at φ into c, reusing c's
// buffers.
func (m *model) condition(phi []float64, c *cond) error {
	p, lay := len(m.lin), m.lay
	if len(c.lam) != lay.size || len(c.b) != p {
		c.lam, c.l = make([]float64, lay.size), make([]float64, lay.size)
		c.b, c.mean = make([]float64, p), make([]float64, p)
		c.p = p
	}
	c.lay = lay
	lam, b := c.lam, c.b
	pr := m.priorTerms()
	copy(lam, pr.lam0)
	copy(b, pr.b0)
	yWy, mu0, logDetPrior, logDetSigma, n := 0.0, pr.mu0, pr.logDet, pr.logDetSigma, pr.n
	c.fs = m.scaleFactors(phi, c.fs)
	// Diagonal blocks through their merged sufficient statistics.
	c.vals = m.basisValues(phi, c.fs, c.vals)
	yWy += m.addTerms(c.vals, lam, b)
	// Full blocks row by row.
	for _, bi := range m.fullBlocks {
		yWy += m.addFullRows(&m.blocks[bi], phi, c)
	}
	if !cholesky(lam, c.l, lay) {
		return m.unidentified(lam)
	}
	if len(c.x) != p {
		c.a, c.x = make([]float64, p), make([]float64, p)
	}
	mp := c.x
	copy(mp, b)
	forward(c.l, mp, lay)
	backward(c.l, mp, lay)
	var bm float64
	for i := range p {
		bm += b[i] * mp[i]
		c.mean[lay.col[i]] = mp[i]
	}
	c.logML = -0.5*yWy - 0.5*mu0 + 0.5*bm - 0.5*logDetChol(c.l, lay) + 0.5*logDetPrior -
		0.5*logDetSigma - 0.5*float64(n)*math.Log(2*math.Pi)
	return nil
}

// addFullRows adds a full block outside the term table to c.lam and c.b
// row by row at φ and returns its (y − o)ᵀΣ⁻¹(y − o).
func (m *model) addFullRows(bl *block, phi []float64, c *cond) float64 {
	lay, lam, b := c.lay, c.lam, c.b
	k := m.inflate[bl.entry]
	w := 1 / (k * k)
	for len(c.xs) < len(bl.rows) {
		c.xs = append(c.xs, nil)
	}
	c.ys = grow(c.ys, len(bl.rows))
	f, q := m.factorAt(&m.rows[bl.rows[0]], phi, c.fs)
	for i, ri := range bl.rows {
		r := &m.rows[ri]
		if i > 0 && !bl.uniform {
			f, q = m.factorAt(r, phi, c.fs)
		}
		c.xs[i] = designAt(r, f, q, c.xs[i][:0])
		c.ys[i] = r.y - r.offset(phi, q)
	}
	var yWy float64
	for i := range bl.rows {
		for j := range bl.rows {
			wt := w * bl.precD[i*len(bl.rows)+j]
			yj := c.ys[j]
			yWy += wt * c.ys[i] * yj
			for _, a := range c.xs[i] {
				at := lay.pos[a.col]
				b[at] += wt * a.v * yj
				for _, bb := range c.xs[j] {
					// Every off-diagonal term comes in both orders
					// (i, a, j, bb) and (j, bb, i, a) onto one element
					// of the lower triangle: half of it each time.
					bt := lay.pos[bb.col]
					v := wt * a.v * bb.v
					if bt != at {
						v *= 0.5
					}
					lam[lay.sym(at, bt)] += v
				}
			}
		}
	}
	return yWy
}

// design appends the non-zero entries of a row's design vector at φ.
func (m *model) design(r *row, phi []float64, dst []entryRef) []entryRef {
	f, q := m.liftFactor(r, phi)
	return designAt(r, f, q, dst)
}

// designAt is design with the row's factors s(φ)·q(w) and q(w) given.
func designAt(r *row, f, q float64, dst []entryRef) []entryRef {
	for _, t := range r.lift {
		dst = append(dst, entryRef{t.col, f * t.v})
	}
	for _, t := range r.gamma {
		dst = append(dst, entryRef{t.col, f * t.v})
	}
	for _, t := range r.nuisPerQ {
		dst = append(dst, entryRef{t.col, q * t.v})
	}
	return append(dst, r.nuis...)
}

// unidentified names a parameter the data cannot pin down (a flat prior and
// no observation that sees it).
func (m *model) unidentified(lam []float64) error {
	for i := range m.lin {
		at := m.lay.pos[i]
		if lam[m.lay.base[at]+at] == 0 {
			return fmt.Errorf("fuse: %s is not identified by the evidence", m.linName(i))
		}
	}
	return fmt.Errorf("fuse: the evidence does not identify the parameters (a flat-prior offset seen by no window at low speed?)")
}

// draw samples the linear parameters from the conditional posterior:
// θ = m + L⁻ᵀz with Λ = L·Lᵀ (in layout order), so Cov θ = L⁻ᵀL⁻¹ = Λ⁻¹.
// z is overwritten.
func (c *cond) draw(z []float64, dst []float64) {
	backward(c.l, z, c.lay)
	for col := range dst {
		dst[col] = c.mean[col] + z[c.lay.pos[col]]
	}
}
