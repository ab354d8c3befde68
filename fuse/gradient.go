package fuse

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// The gradient of the Laplace objective f(φ) = −log p(y | φ) − log p(φ)
// − Σ_signs log E[P(sign | θ)] (see objective), in reverse mode: f
// depends on φ only through Λ(φ), b(φ) and yᵀΣ⁻¹y(φ), whose derivatives
// the term table gives (terms.go), so one conditioning and one reverse pass give
// every ∂f/∂φ_t — about three conditionings' work, where central
// differences took two per parameter.
//
// With m = Λ⁻¹b, Λ = LLᵀ, and for a sign with weights a: μ = aᵀm,
// x = L⁻¹a, σ² = τ² + ‖x‖², z = μ/σ, P = ε + (1 − 2ε)Φ(±z) and
// g = d log P/dz, the pieces of F = −f (matrix calculus: Petersen &
// Pedersen, The Matrix Cookbook, 2012, eqs. 57, 61 — from memory) are
//
//	d(½ bᵀm)      = mᵀdb − ½ mᵀ dΛ m
//	d(−½ log|Λ|)  = −Σ_i dL_ii / L_ii
//	Σ_s g_s dμ_s/σ_s = uᵀdb − uᵀ dΛ m,   u = Λ⁻¹ Σ_s (g_s/σ_s) a_s
//	dσ_s²          = −2 (L⁻ᵀx_s)ᵀ dL x_s,  weighted by −g_s μ_s/(2σ_s³).
//
// The terms in dL are collected as L̄ and taken back to Λ̄ by the reverse
// Cholesky (cholRev); the rest are evaluated on each element directly.
// Only the positions of a sign's components and of the shared nuisances
// carry x_s and L⁻ᵀx_s (see signVar), so the cost stays linear in the
// number of configurations.

// gradBuf holds the reverse pass's buffers, reused between calls.
type gradBuf struct {
	lbar, mL, u, v, abar []float64
}

// objectiveGrad returns f(φ) and writes ∇f into grad. With fresh false, c
// already holds the conditioning at φ (the line search asks for f and ∇f
// at one point). Models with blocks outside the term table (full error
// covariances whose rows differ in wind or scales) are not covered: see
// hasGradient.
func (m *model) objectiveGrad(phi, grad []float64, c *cond, gb *gradBuf, fresh bool) float64 {
	if fresh {
		if err := m.condition(phi, c); err != nil {
			return math.Inf(1)
		}
	}
	p, lay := len(m.lin), m.lay
	gb.lbar, gb.mL = grow(gb.lbar, lay.size), grow(gb.mL, p)
	gb.u, gb.v, gb.abar = grow(gb.u, p), grow(gb.v, p), grow(gb.abar, p)
	clear(gb.lbar)
	clear(gb.abar)
	if len(c.a) != p {
		c.a, c.x = make([]float64, p), make([]float64, p)
	}
	F := c.logML + m.logPhiPrior(phi)
	for i, b := range lay.base {
		gb.lbar[b+i] = -1 / c.l[b+i] // −½ log|Λ| = −Σ log L_ii
	}
	for si := range m.signs {
		F += m.signAdjoint(si, c, gb)
	}
	c.toLayout(c.mean, gb.mL)
	c.toLayout(gb.abar, gb.u)
	forward(c.l, gb.u, lay)
	backward(c.l, gb.u, lay)
	cholRev(c.l, gb.lbar, lay)
	clear(grad)
	m.basisAdjoint(phi, c, gb, grad)
	pr := m.priorTerms()
	for i := range grad {
		grad[i] = -(grad[i] - phi[i]/(pr.phiSD[i]*pr.phiSD[i]))
	}
	return -F
}

// signAdjoint returns sign si's log E[P(sign | θ)] and adds its adjoints:
// (g/σ)·a to gb.abar (column order) and the weight of dσ² to gb.lbar.
func (m *model) signAdjoint(si int, c *cond, gb *gradBuf) float64 {
	s := &m.signs[si]
	if m.inflate[s.entry] > 1 {
		return math.Log(0.5)
	}
	mean := s.value(c.mean)
	sig := math.Sqrt(s.softness*s.softness + m.signVar(si, c)) // c.x holds x = L⁻¹a
	z := mean / sig
	pr, dir := s.probit(z), 1.0
	if !s.up {
		pr, dir = 1-pr, -1
	}
	if pr < 1e-300 {
		return math.Log(1e-300) // clamped as in objective: flat there
	}
	g := dir * (1 - 2*s.misread) * distuv.UnitNormal.Prob(z) / pr
	for _, t := range s.all {
		gb.abar[t.col] += g / sig * t.v
	}
	w := -2 * (-g * mean / (2 * sig * sig * sig)) // L̄ += w·v xᵀ
	lay, l, x, v := c.lay, c.l, c.x, gb.v
	spans := m.signSpans[si]
	for _, sp := range spans {
		copy(v[sp[0]:sp[1]], x[sp[0]:sp[1]])
	}
	for k := len(spans) - 1; k >= 0; k-- { // v = L⁻ᵀx on the spans
		for i := spans[k][1] - 1; i >= spans[k][0]; i-- {
			li := l[lay.base[i]:]
			v[i] /= li[i]
			for _, sq := range spans[:k+1] {
				for q := max(lay.first[i], sq[0]); q < min(sq[1], i); q++ {
					v[q] -= li[q] * v[i]
				}
			}
		}
	}
	for k, sp := range spans {
		for i := sp[0]; i < sp[1]; i++ {
			lb, wv := gb.lbar[lay.base[i]:], w*v[i]
			for _, sq := range spans[:k+1] {
				for q := max(lay.first[i], sq[0]); q < min(sq[1], i+1); q++ {
					lb[q] += wv * x[q]
				}
			}
		}
	}
	return math.Log(pr)
}

// basisAdjoint adds ∂F/∂φ through the term table into dF: each basis's
// adjoint s_k = Σ C_k,ij·Λ̄_ij + Σ c_k,i·b̄_i − ½ y_k, times ∂v_k/∂φ. Λ̄ is
// the reverse Cholesky's (gb.lbar) plus the direct terms −½ mᵀdΛm − uᵀdΛm
// on each element (both orders of an off-diagonal one), b̄ = m + u, and
// −½ y_k is the basis's share of −½ yᵀΣ⁻¹y, which depends on φ through the
// log-normal nuisances' terms (y − o(φ), see terms.go).
func (m *model) basisAdjoint(phi []float64, c *cond, gb *gradBuf, dF []float64) {
	t, mL, u := m.terms, gb.mL, gb.u
	for k, bs := range t.bases {
		if bs.constant() {
			continue // its value does not move with φ (∂v/∂φ = 0): it adds nothing to the gradient
		}
		var s float64
		for n := t.lamPtr[k]; n < t.lamPtr[k+1]; n++ {
			i, j := t.lamRow[n], t.lamCol[n]
			d := gb.lbar[t.lamIdx[n]]
			if i == j {
				d -= 0.5*mL[i]*mL[i] + u[i]*mL[i]
			} else {
				d -= mL[i]*mL[j] + u[i]*mL[j] + u[j]*mL[i]
			}
			s += t.lamCoef[n] * d
		}
		for n := t.bPtr[k]; n < t.bPtr[k+1]; n++ {
			i := t.bIdx[n]
			s += t.bCoef[n] * (mL[i] + u[i])
		}
		s -= 0.5 * t.yCoef[k]
		if s == 0 {
			continue
		}
		v := c.vals[k]
		switch {
		case bs.f1 >= 0 && bs.f1 == bs.f2:
			for _, sc := range m.scaleSets[bs.f1] {
				dF[sc.idx] += s * 2 * sc.pow * v
			}
		case bs.f1 >= 0:
			for _, sc := range m.scaleSets[bs.f1] {
				dF[sc.idx] += s * sc.pow * v
			}
			fallthrough
		case bs.f2 >= 0:
			for _, sc := range m.scaleSets[bs.f2] {
				dF[sc.idx] += s * sc.pow * v
			}
		}
		if bs.deg > 0 {
			kp := m.inflate[bs.entry]
			dv := float64(bs.deg) / (kp * kp) * bs.factors(c.fs) * math.Pow(phi[bs.wind], float64(bs.deg-1))
			dF[bs.wind] += s * dv
		}
	}
}

// hasGradient reports whether objectiveGrad covers the model: every block
// is in the term table.
func (m *model) hasGradient() bool { return len(m.fullBlocks) == 0 }
