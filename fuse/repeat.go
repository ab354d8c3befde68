package fuse

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// The expected posterior after a repeat of one entry's runs (see
// Fused.PlanRepeats for the model). The steps: lay out the parameters of
// the repeat (today's, then the copies that come new with it), compute the
// repeat's Fisher information over them, integrate the new copies out by a
// Schur complement, and update today's covariance with what is left.

// repeatSpace is the parameter space of a repeat of an entry: today's D
// parameters (θ then φ), then a new copy of each parameter that belongs to
// one set of runs (a log's offset and drift, the day's wind).
type repeatSpace struct {
	D       int
	newIdx  map[int]int // today's index → the new copy's index, ≥ D
	newPrec []float64   // prior precision of each new copy
}

// repeatSpace lays out the parameters of a repeat of entry e.
func (m *model) repeatSpace(e int) repeatSpace {
	sp := repeatSpace{D: m.dim(), newIdx: map[int]int{}}
	p := len(m.lin)
	for i, lp := range m.lin {
		if lp.kind == kindNuisance && lp.nuis.PerRun && lp.owners[e] {
			sp.newIdx[i] = sp.D + len(sp.newPrec)
			sp.newPrec = append(sp.newPrec, lp.prec)
		}
	}
	for j, ph := range m.phi {
		if ph.perRun && ph.owners[e] {
			sp.newIdx[p+j] = sp.D + len(sp.newPrec)
			sp.newPrec = append(sp.newPrec, 1/(ph.sd*ph.sd))
		}
	}
	return sp
}

// n is the dimension of the repeat's space, N = D + R.
func (sp repeatSpace) n() int { return sp.D + len(sp.newPrec) }

// col maps today's parameter i to its column in the repeat's space: its new
// copy where it comes new with the repeat, else itself.
func (sp repeatSpace) col(i int) int {
	if k, ok := sp.newIdx[i]; ok {
		return k
	}
	return i
}

// repeatInfo is the Fisher information of a repeat of entry e at the
// parameters mean = (θ, φ), over the repeat's N parameters:
//
//	I_rep = Σ_blocks Jᵀ Σ⁻¹ J + Σ_signs f'(x)² / (P(1 − P)) · a aᵀ
//
// J the Jacobian of a block's observation means; for a sign with
// P = ε + (1 − 2ε)Φ(x/τ) and x = aᵀθ, the Bernoulli information of P. Only
// the upper triangle is accumulated.
func (m *model) repeatInfo(e int, sp repeatSpace, mean []float64) *mat.SymDense {
	N := sp.n()
	I := mat.NewSymDense(N, nil)
	p := len(m.lin)
	theta, phi := mean[:p], mean[p:]
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.entry != e {
			continue
		}
		J := m.repeatJacobian(bl, sp, theta, phi)
		for a := range bl.rows {
			if bl.diag != nil {
				I.SymRankOne(I, bl.diag[a], J.RowView(a))
				continue
			}
			for b := range bl.rows {
				addOuter(I, bl.prec.At(a, b), J.RawRowView(a), J.RawRowView(b))
			}
		}
	}
	for si := range m.signs {
		s := &m.signs[si]
		if s.entry != e {
			continue
		}
		a := mat.NewVecDense(N, nil)
		for _, t := range s.refs() {
			a.SetVec(sp.col(t.col), a.AtVec(sp.col(t.col))+t.v)
		}
		x := s.value(theta)
		pr, dp := s.pUp(x), s.dpUp(x)
		I.SymRankOne(I, dp*dp/math.Max(pr*(1-pr), 1e-12), a)
	}
	return I
}

// repeatJacobian is J = ∂μ/∂(θ, φ) of a block's observation means, one row
// per observation, over the repeat's N parameters: exact in θ (the design
// row), by central differences in φ with step h = 10⁻⁵·max(1, |φ_j|).
func (m *model) repeatJacobian(bl *block, sp repeatSpace, theta, phi []float64) *mat.Dense {
	J := mat.NewDense(len(bl.rows), sp.n(), nil)
	acc := newSparseAcc(m.dim())
	up, dn := slices.Clone(phi), slices.Clone(phi)
	var buf []entryRef
	for k, ri := range bl.rows {
		buf = m.jacobianRow(&m.rows[ri], theta, phi, up, dn, acc, buf)
		Jk := J.RawRowView(k)
		for _, t := range acc.take() {
			Jk[sp.col(t.col)] += t.v
		}
	}
	return J
}

// addOuter adds wt·x yᵀ to the upper triangle of I, skipping zeros.
func addOuter(I *mat.SymDense, wt float64, x, y []float64) {
	for i, xi := range x {
		if xi == 0 {
			continue
		}
		for j := i; j < len(y); j++ {
			if y[j] != 0 {
				I.SetSym(i, j, I.At(i, j)+wt*xi*y[j])
			}
		}
	}
}

// integrateOutNew returns the information on today's D parameters once the
// repeat's new copies are integrated out: the Schur complement
//
//	I_eff = I_xx − I_xn (I_nn + P_n)⁻¹ I_nx
//
// with P_n the prior precision of the new copies.
func integrateOutNew(I *mat.SymDense, sp repeatSpace) (*mat.SymDense, error) {
	D, R := sp.D, len(sp.newPrec)
	Ieff := mat.NewSymDense(D, nil)
	Ieff.CopySym(I.SliceSym(0, D))
	if R == 0 {
		return Ieff, nil
	}
	Inn := mat.NewSymDense(R, nil)
	Inn.CopySym(I.SliceSym(D, D+R))
	for i, pr := range sp.newPrec {
		Inn.SetSym(i, i, Inn.At(i, i)+pr)
	}
	var ch mat.Cholesky
	if !ch.Factorize(Inn) {
		return nil, fmt.Errorf("a repeat could not pin its own offsets (no low-speed windows?)")
	}
	Ixn := mat.NewDense(D, R, nil)
	for i := range D {
		for j := range R {
			Ixn.Set(i, j, I.At(i, D+j))
		}
	}
	var tmp, corr mat.Dense
	if err := ch.SolveTo(&tmp, Ixn.T()); err != nil {
		return nil, err
	}
	corr.Mul(Ixn, &tmp)
	for i := range D {
		for j := i; j < D; j++ {
			Ieff.SetSym(i, j, Ieff.At(i, j)-corr.At(i, j))
		}
	}
	return Ieff, nil
}

// updatedVar returns wᵀC'w, the variance of wᵀθ under the updated
// covariance
//
//	C' = (C⁻¹ + I_eff)⁻¹ = C − C (I + I_eff C)⁻¹ I_eff C,
//
// without inverting C (it may hold flat-prior directions pinned only by
// data). I_eff is zero outside the rows S of the parameters the repeat
// touches, I_eff = E I_SS Eᵀ, and (I + E I_SS Eᵀ C)⁻¹ E = E (I + I_SS C_SS)⁻¹
// (the push-through identity; Henderson & Searle, SIAM Review 23 (1981) 53
// — from memory), so with c = C w
//
//	wᵀC'w = wᵀc − c_Sᵀ x,   (I + I_SS C_SS) x = I_SS c_S:
//
// one system of the touched parameters' size with one right-hand side.
func updatedVar(C, Ieff *mat.SymDense, w []entryRef) (float64, error) {
	D := C.SymmetricDim()
	wv := make([]float64, D)
	for _, t := range w {
		wv[t.col] += t.v
	}
	var c mat.VecDense
	c.MulVec(C, mat.NewVecDense(D, wv))
	var S []int
	for i := range D {
		for j := range D {
			if Ieff.At(i, j) != 0 {
				S = append(S, i)
				break
			}
		}
	}
	wc := mat.Dot(mat.NewVecDense(D, wv), &c)
	k := len(S)
	if k == 0 {
		return wc, nil
	}
	Iss, Css := mat.NewDense(k, k, nil), mat.NewDense(k, k, nil)
	cS := mat.NewVecDense(k, nil)
	for a, i := range S {
		for b, j := range S {
			Iss.Set(a, b, Ieff.At(i, j))
			Css.Set(a, b, C.At(i, j))
		}
		cS.SetVec(a, c.AtVec(i))
	}
	var A mat.Dense
	A.Mul(Iss, Css)
	for a := range k {
		A.Set(a, a, A.At(a, a)+1)
	}
	var rhs mat.VecDense
	rhs.MulVec(Iss, cS)
	var x mat.VecDense
	if err := x.SolveVec(&A, &rhs); err != nil {
		return 0, err
	}
	return wc - mat.Dot(cS, &x), nil
}

// repeatVar returns the expected posterior variance of wᵀθ after entry e's
// runs are repeated once.
func (P *Posterior) repeatVar(e int, w []entryRef) (float64, error) {
	m := P.p.m
	mean, C := P.joint()
	sp := m.repeatSpace(e)
	Ieff, err := integrateOutNew(m.repeatInfo(e, sp, mean), sp)
	if err != nil {
		return 0, err
	}
	return updatedVar(C, Ieff, w)
}
