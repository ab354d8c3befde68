package fuse

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
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
// add the same constant to every φ).
type cond struct {
	chol  mat.Cholesky
	mean  []float64
	logML float64
}

// lift returns the factor s(φ)·q(w) of a row.
func (m *model) liftFactor(r *row, phi []float64) float64 {
	s := 0.0
	for _, sc := range r.scales {
		s += sc.pow * phi[sc.idx]
	}
	q := r.q0
	if r.wind >= 0 {
		w := phi[r.wind]
		q += r.a*w + r.c*w*w
	}
	return math.Exp(s) * q
}

// inflation returns how much an entry-owned prior is widened: κ when every
// owner of the parameter is inflated, else 1.
func (m *model) inflation(owners map[int]bool) float64 {
	k := 1.0
	for e := range owners {
		if m.inflate[e] == 1 {
			return 1
		}
		k = m.inflate[e]
	}
	return k
}

// condition computes the conditional posterior at φ into c.
func (m *model) condition(phi []float64, c *cond) error {
	p := len(m.lin)
	lam := make([]float64, p*p)
	b := make([]float64, p)
	var yWy, mu0 float64
	logDetPrior := 0.0
	for i, lp := range m.lin {
		prec := lp.prec
		if lp.kind == kindNuisance && prec > 0 {
			k := m.inflation(lp.owners)
			prec /= k * k
		}
		lam[i*p+i] = prec
		b[i] = prec * lp.mean
		mu0 += prec * lp.mean * lp.mean
		if prec > 0 {
			logDetPrior += math.Log(prec)
		}
	}
	var logDetSigma float64
	n := 0
	xs := make([][]entryRef, 0, 64)
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		k := m.inflate[bl.entry]
		w := 1 / (k * k)
		logDetSigma += bl.logdet + 2*float64(len(bl.rows))*math.Log(k)
		n += len(bl.rows)
		xs = xs[:0]
		for _, ri := range bl.rows {
			xs = append(xs, m.design(&m.rows[ri], phi, nil))
		}
		if bl.diag != nil {
			for i, ri := range bl.rows {
				wt := w * bl.diag[i]
				y := m.rows[ri].y
				yWy += wt * y * y
				for _, a := range xs[i] {
					b[a.col] += wt * a.v * y
					for _, bb := range xs[i] {
						lam[a.col*p+bb.col] += wt * a.v * bb.v
					}
				}
			}
			continue
		}
		for i, ri := range bl.rows {
			for j, rj := range bl.rows {
				wt := w * bl.prec.At(i, j)
				yj := m.rows[rj].y
				yWy += wt * m.rows[ri].y * yj
				for _, a := range xs[i] {
					b[a.col] += wt * a.v * yj
					for _, bb := range xs[j] {
						lam[a.col*p+bb.col] += wt * a.v * bb.v
					}
				}
			}
		}
	}
	// Symmetrise (the sums above are symmetric up to rounding).
	L := mat.NewSymDense(p, nil)
	for i := range p {
		for j := i; j < p; j++ {
			L.SetSym(i, j, 0.5*(lam[i*p+j]+lam[j*p+i]))
		}
	}
	if !c.chol.Factorize(L) {
		return m.unidentified(L)
	}
	bv := mat.NewVecDense(p, b)
	var mv mat.VecDense
	if err := c.chol.SolveVecTo(&mv, bv); err != nil {
		return m.unidentified(L)
	}
	c.mean = mv.RawVector().Data
	c.logML = -0.5*yWy - 0.5*mu0 + 0.5*mat.Dot(bv, &mv) - 0.5*c.chol.LogDet() + 0.5*logDetPrior -
		0.5*logDetSigma - 0.5*float64(n)*math.Log(2*math.Pi)
	return nil
}

// design appends the non-zero entries of a row's design vector at φ.
func (m *model) design(r *row, phi []float64, dst []entryRef) []entryRef {
	f := m.liftFactor(r, phi)
	for _, t := range r.lift {
		dst = append(dst, entryRef{t.col, f * t.v})
	}
	for _, t := range r.gamma {
		dst = append(dst, entryRef{t.col, f * t.v})
	}
	return append(dst, r.nuis...)
}

// unidentified names a parameter the data cannot pin down (a flat prior and
// no observation that sees it).
func (m *model) unidentified(L *mat.SymDense) error {
	for i := range m.lin {
		if L.At(i, i) == 0 {
			return fmt.Errorf("fuse: %s is not identified by the evidence", m.linName(i))
		}
	}
	return fmt.Errorf("fuse: the evidence does not identify the parameters (a flat-prior offset seen by no window at low speed?)")
}

// draw samples the linear parameters from the conditional posterior:
// θ = m + U⁻¹z with Λ = UᵀU, so Cov θ = Λ⁻¹.
func (c *cond) draw(z []float64, dst []float64) {
	var u mat.TriDense
	c.chol.UTo(&u)
	zv := mat.NewVecDense(len(z), append([]float64(nil), z...))
	var x mat.VecDense
	if err := x.SolveVec(&u, zv); err != nil {
		copy(dst, c.mean)
		return
	}
	for i := range dst {
		dst[i] = c.mean[i] + x.AtVec(i)
	}
}

// cov returns the conditional covariance Λ⁻¹.
func (c *cond) cov() *mat.SymDense {
	var s mat.SymDense
	if err := c.chol.InverseTo(&s); err != nil {
		return nil
	}
	return &s
}
