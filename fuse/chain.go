package fuse

import (
	"errors"
	"math"
	"math/rand/v2"
	"sync"

	"gonum.org/v1/gonum/mat"
)

// proposal is the independence sampler's proposal around a Laplace fit of
// p(φ | y) with mode μ and covariance S: φ from a multivariate Student-t,
//
//	φ = μ + √(ν/u)·L z,   z ~ N(0, I_d),  u ~ χ²_ν,  L Lᵀ = s²·S  (ν = tNu, s = tScale),
//
// then θ from its exact conditional Gaussian p(θ | φ, y).
type proposal struct {
	m     *model
	mode  []float64
	lower mat.TriDense // L
	d, p  int
	comps []component // the blocks of θ refreshed after every joint step
	// ownSigns: every sign involves one component only
	ownSigns bool
	// still: the joint step cannot move a chain once it has begun — no φ
	// and no shared nuisances, so it would propose the components' held
	// draws again (one entry's signs alone); the component steps do all
	// the moving
	still bool
}

// newProposal builds the proposal around a Laplace fit.
func (m *model) newProposal(mode []float64, cov *mat.SymDense) (*proposal, error) {
	pr := &proposal{m: m, mode: mode, d: len(m.phi), p: len(m.lin), comps: m.components(), ownSigns: true}
	pr.still = pr.d == 0 && m.lay.shared() == pr.p
	for _, comps := range m.signComps {
		pr.ownSigns = pr.ownSigns && len(comps) == 1
	}
	if pr.d > 0 {
		sc := mat.NewSymDense(pr.d, nil)
		sc.ScaleSym(tScale*tScale, cov)
		var chol mat.Cholesky
		if !chol.Factorize(sc) {
			return nil, errors.New("fuse: proposal covariance is not positive definite")
		}
		chol.LTo(&pr.lower)
	}
	return pr, nil
}

// chainState is one independence Metropolis–Hastings chain.
type chainState struct {
	rng *rand.Rand
	// conds[cur] is the conditional posterior at the current φ, the other
	// one that at the proposed φ (without φ, one conditioning serves all).
	conds [2]cond
	cur   int
	ready bool
	// layout-order buffers of the component steps
	x, saved []float64
	// zc are the standardised draws z of the current θ = m + L⁻ᵀz (layout
	// order), zp those of the proposal
	zc, zp []float64
	// lp[k] is Σ log P(sign | θ) of component k's signs, valid when
	// lpGen[k] equals accept (no joint step has moved θ since)
	lp     []float64
	lpGen  []int
	lpProp []float64 // the proposal's sums, by component
	// proposal buffers, swapped with theta and phi on acceptance
	propTheta, propPhi, z []float64
	lw                    float64 // log weight of the current state
	theta                 []float64
	phi                   []float64
	begun                 bool
	accept                int
	tries                 int
	draws, phis           *drawStore
	stage                 staged // draws not yet in draws and phis
}

// newChains returns nChains chains, chain c seeded with stream c+1.
func (pr *proposal) newChains() []*chainState {
	p, d := pr.p, pr.d
	chains := make([]*chainState, nChains)
	for c := range chains {
		chains[c] = &chainState{rng: rand.New(rand.NewPCG(pr.m.set.Seed, uint64(c)+1)), theta: make([]float64, p), phi: make([]float64, d),
			propTheta: make([]float64, p), propPhi: make([]float64, d), z: make([]float64, max(p, d)), x: make([]float64, p), saved: make([]float64, p),
			zc: make([]float64, p), zp: make([]float64, p), draws: newDrawStore(p), phis: newDrawStore(d)}
	}
	return chains
}

// propose draws φ from the Student-t proposal and θ from its conditional
// Gaussian into the chain's proposal buffers, and returns the log
// importance weight (−∞ where the conditioning fails). In the coordinates
// (φ, z) with θ = m(φ) + L(φ)⁻ᵀz, where the Gaussian part of the target is
// N(z; 0, I), the step proposes φ and the shared nuisances' z afresh and
// holds the components' z (which the component steps renew): a
// Metropolis–Hastings update of (φ, z_S) given z_K, whose ratio is that of
// the weights below. Holding z_K keeps each configuration's lift at the
// same standardised place as φ moves, so the signs' probabilities, and
// the acceptance, do not degrade as configurations multiply.
//
//	log w = log p(y | φ) + log p(φ) − log q(φ) + Σ_signs log P(sign | θ),
//	log q(φ) = −½(ν + d)·log(1 + ‖z‖²/u)  (+ const).
func (pr *proposal) propose(ch *chainState) float64 {
	m, d, p := pr.m, pr.d, pr.p
	phi, theta, z := ch.propPhi, ch.propTheta, ch.z
	var maha float64
	if d > 0 {
		for i := range d {
			z[i] = ch.rng.NormFloat64()
		}
		var u float64 // χ² with tNu degrees of freedom
		for range tNu {
			g := ch.rng.NormFloat64()
			u += g * g
		}
		f := math.Sqrt(tNu / u)
		for i := range d {
			var s float64
			for j := 0; j <= i; j++ {
				s += pr.lower.At(i, j) * z[j]
			}
			phi[i] = pr.mode[i] + f*s
			maha += z[i] * z[i] * f * f
		}
	}
	logq := -0.5 * (tNu + float64(d)) * math.Log1p(maha/tNu)
	c := ch.proposed(d)
	if !ch.ready || d > 0 {
		if err := m.condition(phi, c); err != nil {
			return math.Inf(-1)
		}
		ch.ready = d == 0
	}
	for i := range p {
		if ch.begun && m.lay.comp[i] >= 0 {
			ch.zp[i] = ch.zc[i] // the components' standardised draws held
		} else {
			ch.zp[i] = ch.rng.NormFloat64()
		}
	}
	copy(z, ch.zp)
	c.draw(z[:p], theta)
	lw := c.logML + m.logPhiPrior(phi) - logq
	if !pr.ownSigns {
		return lw + m.signLogProb(m.allSigns, theta)
	}
	// Each sign in one component: sum by component, and keep the sums for
	// the component steps should the proposal be accepted.
	ch.lpProp = grow(ch.lpProp, len(pr.comps))
	for k := range pr.comps {
		ch.lpProp[k] = m.signLogProb(pr.comps[k].signs, theta)
		lw += ch.lpProp[k]
	}
	return lw
}

// proposed returns the conditioning buffer of a proposal: the one not
// holding the current state's, or the only one when there is no φ.
func (ch *chainState) proposed(d int) *cond {
	if d == 0 {
		return &ch.conds[0]
	}
	return &ch.conds[1-ch.cur]
}

// step advances a chain by n proposals, accepting with probability
// min(1, w'/w) (the first finite proposal always), refreshes each
// component of θ given the rest (see component), and records the state
// from the first acceptance on.
func (pr *proposal) step(ch *chainState, n int) {
	for range n {
		if pr.still && ch.begun {
			pr.refreshAll(ch)
			continue
		}
		lw := pr.propose(ch)
		ch.tries++
		if !math.IsInf(lw, -1) && (!ch.begun || math.Log(ch.rng.Float64()) < lw-ch.lw) {
			ch.phi, ch.propPhi = ch.propPhi, ch.phi
			ch.theta, ch.propTheta = ch.propTheta, ch.theta
			ch.lw, ch.begun = lw, true
			ch.zc, ch.zp = ch.zp, ch.zc
			ch.accept++
			ch.keepSignSums(pr)
			if pr.d > 0 {
				ch.cur = 1 - ch.cur
			}
		}
		if ch.begun {
			pr.refreshAll(ch)
		}
	}
	ch.stage.flush(ch.draws, ch.phis)
}

// stageDraws is how many draws a chain holds before it stores them: the
// draw stores keep each column's draws together, and a run of eight is one
// cache line written at once instead of eight lines touched by every draw.
const stageDraws = 8

// staged holds a chain's latest draws of θ and φ, one after another, until
// they are stored (flush).
type staged struct {
	theta, phi []float64
	n          int
}

// add stages one draw.
func (st *staged) add(theta, phi []float64) {
	st.theta = append(st.theta[:st.n*len(theta)], theta...)
	st.phi = append(st.phi[:st.n*len(phi)], phi...)
	st.n++
}

// flush stores the staged draws, in order, and empties the stage.
func (st *staged) flush(draws, phis *drawStore) {
	draws.addRows(st.theta, st.n)
	phis.addRows(st.phi, st.n)
	st.n = 0
}

// runBatch advances every chain by batch proposals, one goroutine per
// chain, and returns the draws the shortest chain holds.
func (pr *proposal) runBatch(chains []*chainState, batch int) int {
	var wg sync.WaitGroup
	for _, ch := range chains {
		wg.Add(1)
		go func() { defer wg.Done(); pr.step(ch, batch) }()
	}
	wg.Wait()
	n := chains[0].draws.n
	for _, ch := range chains {
		n = min(n, ch.draws.n)
	}
	return n
}
