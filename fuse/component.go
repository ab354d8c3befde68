package fuse

import (
	"math"
	"slices"
)

// Component steps. Given φ and the shared nuisances θ_S, the components of
// θ (see layout) are independent, each Gaussian from the Gaussian data,
// times the probabilities of the signs that involve it. After every joint
// independence step each component θ_k is refreshed by a Metropolis step
// within Gibbs (Tierney, "Markov chains for exploring posterior
// distributions", Ann. Statist. 22 (1994) 1701–1762 — from memory): θ_k′ is
// drawn from its conditional Gaussian p(θ_k | θ_S, φ, y) and kept with
// probability min(1, Π P(sign | θ′) / Π P(sign | θ)) over its signs (always,
// without signs: a Gibbs step). The joint step alone proposes every
// component at once, so its acceptance falls as the signs of more
// configurations multiply; the component steps keep the chain moving at a
// cost linear in the number of configurations.
//
// With Λ = L·Lᵀ in layout order (shared last), θ − m = L⁻ᵀz; the rows of
// component k give L_kkᵀ x_k + L_Skᵀ x_S = z_k, so a fresh z_k with x_S
// held is a draw of x_k given x_S.
type component struct {
	lo, hi int   // positions in the layout
	shared int   // first position of the shared nuisances
	signs  []int // signs that involve the component
	idx    int
	own    bool // every sign of the component involves it alone
}

// components returns the components of the model's layout.
func (m *model) components() []component {
	lay := m.lay
	shared := lay.shared()
	var out []component
	for k, signs := range m.compSigns {
		lo, hi := lay.span(k)
		c := component{lo: lo, hi: hi, shared: shared, signs: signs, idx: k}
		c.own = m.ownSigns(&c)
		out = append(out, c)
	}
	return out
}

// signLogProb is Σ log P(sign | θ) over the signs of a component (in
// ascending order). The probabilities are multiplied and their product's
// logarithm taken once (before it could underflow), not one logarithm per
// sign; a sign that repeats the one before it (see sameAsPrev) repeats its
// probability.
func (m *model) signLogProb(signs []int, theta []float64) float64 {
	if len(signs) == 0 {
		return 0 // log 1: spares the logarithm for a component without signs
	}
	var s, p float64
	prod, prev := 1.0, -2
	for _, si := range signs {
		if si != prev+1 || !m.sameAsPrev[si] {
			sg := &m.signs[si]
			p = math.Max(m.signProb(sg, sg.value(theta)), 1e-300)
		}
		prev = si
		prod *= p
		if prod < 1e-200 {
			s += math.Log(prod)
			prod = 1
		}
	}
	return s + math.Log(prod)
}

// refreshAll makes every component step, given the current conditioning
// c, and records the chain's state. The shared nuisances' x_S = θ_S − m_S,
// which no component step moves, are set once for all of them.
func (pr *proposal) refreshAll(ch *chainState) {
	c := &ch.conds[ch.cur]
	if pr.d == 0 {
		c = &ch.conds[0]
	}
	if len(pr.comps) > 0 {
		lay := c.lay
		for i := pr.comps[0].shared; i < c.p; i++ {
			ch.x[i] = ch.theta[lay.col[i]] - c.mean[lay.col[i]]
		}
	}
	for k := range pr.comps {
		pr.refresh(ch, &pr.comps[k], c)
	}
	ch.stage.add(ch.theta, ch.phi)
	if ch.stage.n == stageDraws {
		ch.stage.flush(ch.draws, ch.phis)
	}
}

// refresh makes the component step for component k of a chain's state,
// given the conditioning c and the shared nuisances' x_S in ch.x (see
// refreshAll).
func (pr *proposal) refresh(ch *chainState, k *component, c *cond) {
	m := pr.m
	lay, l, p, x, theta := c.lay, c.l, c.p, ch.x, ch.theta
	for i := k.lo; i < k.hi; i++ {
		x[i] = ch.rng.NormFloat64()
		ch.zp[i] = x[i] // the proposal's standardised draw, kept on acceptance
	}
	for j := k.shared; j < p; j++ {
		lj := l[lay.base[j]:]
		for i := max(k.lo, lay.first[j]); i < k.hi; i++ {
			x[i] -= lj[i] * x[j]
		}
	}
	for i := k.hi - 1; i >= k.lo; i-- {
		li := l[lay.base[i]:]
		x[i] /= li[i]
		for q := lay.first[i]; q < i; q++ {
			x[q] -= li[q] * x[i]
		}
	}
	var old float64
	if len(k.signs) > 0 {
		old = ch.signLogProb(m, k, theta)
		for i := k.lo; i < k.hi; i++ {
			ch.saved[i] = theta[lay.col[i]]
		}
	}
	for i := k.lo; i < k.hi; i++ {
		theta[lay.col[i]] = c.mean[lay.col[i]] + x[i]
	}
	if len(k.signs) == 0 {
		copy(ch.zc[k.lo:k.hi], ch.zp[k.lo:k.hi])
		return
	}
	nw := m.signLogProb(k.signs, theta)
	if math.Log(ch.rng.Float64()) < nw-old {
		ch.lw += nw - old
		ch.lp[k.idx] = nw
		copy(ch.zc[k.lo:k.hi], ch.zp[k.lo:k.hi])
		return
	}
	for i := k.lo; i < k.hi; i++ {
		theta[lay.col[i]] = ch.saved[i]
	}
}

// signLogProb returns the component's Σ log P(sign | θ) at the chain's
// state, kept from the last component step unless a joint step moved θ
// since (or a sign involves other components too, which may have moved).
func (ch *chainState) signLogProb(m *model, k *component, theta []float64) float64 {
	if len(ch.lp) == 0 {
		ch.lp, ch.lpGen = make([]float64, len(m.compSigns)), make([]int, len(m.compSigns))
	}
	if ch.lpGen[k.idx] != ch.accept || !k.own {
		ch.lp[k.idx], ch.lpGen[k.idx] = m.signLogProb(k.signs, theta), ch.accept
	}
	return ch.lp[k.idx]
}

// keepSignSums records, after an accepted joint step, the components' sign
// sums that the proposal computed, so the component steps need not.
func (ch *chainState) keepSignSums(pr *proposal) {
	if !pr.ownSigns {
		return
	}
	if len(ch.lp) == 0 {
		ch.lp, ch.lpGen = make([]float64, len(pr.comps)), make([]int, len(pr.comps))
	}
	for k := range pr.comps {
		ch.lp[k], ch.lpGen[k] = ch.lpProp[k], ch.accept
	}
}

// ownSigns reports whether every sign of the component involves it alone.
func (m *model) ownSigns(k *component) bool {
	for _, si := range k.signs {
		if len(m.signComps[si]) > 1 {
			return false
		}
	}
	return true
}

// markRepeats sets sameAsPrev: sign i says what sign i − 1 says (the same
// quantity, entry, sense, misread and softness — an observer who saw the
// same sense at several speeds under the constant speed model), so its
// probability is the same at every θ.
func (m *model) markRepeats() {
	m.sameAsPrev = make([]bool, len(m.signs))
	for i := 1; i < len(m.signs); i++ {
		a, b := &m.signs[i-1], &m.signs[i]
		m.sameAsPrev[i] = a.entry == b.entry && a.up == b.up && a.misread == b.misread &&
			a.softness == b.softness && slices.Equal(a.all, b.all)
	}
}
