package fuse

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sync"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/optimize"

	"liftfuse/methods/evidence"
)

// The sampler. The linear parameters (lift, speed slopes, additive
// nuisances) are Gaussian given the few non-linear ones φ (log scale
// factors, winds), so they are integrated exactly and only φ is explored:
//
//  1. a Laplace fit of p(φ | y) — its mode by BFGS (gonum optimize), its
//     curvature by finite differences — using the exact marginal likelihood
//     of the Gaussian data and, for sign observations, the exact expectation
//     of each sign's probit under the conditional Gaussian;
//  2. four independence Metropolis–Hastings chains whose proposal is a
//     multivariate Student-t (ν = 5, scale 1.1) around that fit, joined
//     with an exact draw of the linear parameters from their conditional
//     Gaussian; the acceptance ratio is the ratio of importance weights
//     p(y | φ)·p(φ)·Π P(sign | θ) / q(φ), so sign observations and the tails
//     of the log-normal scales are handled exactly, not approximated;
//  3. after every such step, each configuration's block of θ redrawn given
//     φ and the shared nuisances (component.go), kept by its signs' ratio.
//
// Every step costs time linear in the number of configurations (the
// arrowhead layout of layout.go), and the number of draws is set by the
// ESS wanted per quantity, not by the campaign's size.
//
// Independence MH with a heavy-tailed proposal close to the posterior mixes
// fast and its chains are independent, so R̂ and bulk ESS (Vehtari et al.
// 2021) diagnose it as they would any MCMC. Campaigns with neither
// non-linear parameters nor signs take the closed form instead.
const (
	gradStep = 1e-5 // finite-difference step of the Laplace fit's gradient
	nChains  = 4
	tNu      = 5
	tScale   = 1.1
)

// Diagnostics of a posterior computation.
type Diagnostics struct {
	Sampler string
	Draws   int
	Seed    uint64
	RhatMax float64
	ESSMin  float64
	Accept  float64
}

// posterior is the joint posterior of a model.
type posterior struct {
	m        *model
	gaussian bool
	cond     cond         // the closed form, when gaussian
	draws    []*drawStore // per chain: the linear draws (the first n count)
	phiDraws []*drawStore // per chain: the non-linear draws
	n        int          // draws per chain
	phiMode  []float64
	phiCov   *mat.SymDense // the Laplace fit's inverse curvature at phiMode
	logZ     float64       // Laplace estimate of log p(y), for the robust layer
	diag     Diagnostics
}

// logPhiPrior returns log p(φ) up to a constant that does not depend on the
// inflation of any entry (each φ_i ~ N(0, (k·sd)²)).
func (m *model) logPhiPrior(phi []float64) float64 {
	pr := m.priorTerms()
	var lp float64
	for i := range m.phi {
		z := phi[i] / pr.phiSD[i]
		lp += -0.5 * z * z
	}
	return lp + pr.phiNorm
}

// laplaceObjective is −log p(φ | y) up to a constant, with each sign's
// likelihood replaced by its expectation under the conditional Gaussian:
// E[ε + (1−2ε)Φ(aᵀθ/τ)] = ε + (1−2ε)Φ(aᵀm/√(τ² + aᵀΛ⁻¹a)).
func (m *model) laplaceObjective(phi []float64) float64 {
	var c cond
	return m.objective(phi, &c)
}

// objective is laplaceObjective with a reusable conditioning buffer.
func (m *model) objective(phi []float64, cp *cond) float64 {
	c := cp
	if err := m.condition(phi, c); err != nil {
		return math.Inf(1)
	}
	v := c.logML + m.logPhiPrior(phi)
	p := len(m.lin)
	if len(c.a) != p {
		c.a, c.x = make([]float64, p), make([]float64, p)
	}
	for si := range m.signs {
		s := &m.signs[si]
		if m.inflate[s.entry] > 1 {
			v += math.Log(0.5)
			continue
		}
		mean := s.value(c.mean)
		vr := m.signVar(si, c) // aᵀΛ⁻¹a
		pr := s.probit(mean / math.Sqrt(s.softness*s.softness+vr))
		if !s.up {
			pr = 1 - pr
		}
		v += math.Log(math.Max(pr, 1e-300))
	}
	return -v
}

// laplace finds the mode of p(φ | y) by BFGS (gonum optimize) with the
// reverse-mode gradient (gradient.go), and the inverse of the curvature
// there by central differences of that gradient, and returns a Laplace
// estimate of log p(y).
func (m *model) laplace() (mode []float64, cov *mat.SymDense, logZ float64, err error) {
	d := len(m.phi)
	if d == 0 {
		f := m.laplaceObjective(nil)
		if math.IsInf(f, 1) {
			var c cond
			return nil, nil, 0, m.condition(nil, &c)
		}
		return nil, nil, -f, nil
	}
	lf := &laplaceFns{m: m}
	x0 := m.start.point(m.phi)
	if math.IsInf(lf.f(x0), 1) {
		var c cond
		if err := m.condition(x0, &c); err != nil {
			return nil, nil, 0, err
		}
	}
	mode = lf.minimize(x0, m.start.whitener(m.phi, m.priorTerms().phiSD))
	H := lf.hessian(mode)
	var ch mat.Cholesky
	cov = mat.NewSymDense(d, nil)
	if ch.Factorize(H) && ch.InverseTo(cov) == nil {
		logZ = -lf.f(mode) + 0.5*float64(d)*math.Log(2*math.Pi) - 0.5*ch.LogDet()
		return mode, cov, logZ, nil
	}
	// The curvature is not positive definite (a flat direction): fall back
	// on the prior spread, for the proposal and for the evidence alike.
	logZ = -lf.f(mode) + 0.5*float64(d)*math.Log(2*math.Pi)
	for i, p := range m.phi {
		cov.SetSym(i, i, p.sd*p.sd)
		logZ += math.Log(p.sd)
	}
	return mode, cov, logZ, nil
}

// minimize returns the mode of f by BFGS (gonum optimize) from x0, over
// u with φ = x0 + T·u when a whitener T is given (see warmStart.whitener).
// A failed line search or the iteration limit still leaves a usable best
// point; the chains correct for an imperfect proposal. It stops where two
// iterations gain less than 1e-5 in log density (the objective's rounding
// keeps the gradient from ever reaching the threshold on a large
// campaign).
func (lf *laplaceFns) minimize(x0 []float64, T *mat.TriDense) []float64 {
	d := len(x0)
	prob := optimize.Problem{Func: lf.f, Grad: lf.grad}
	start := x0
	x, gx := make([]float64, d), make([]float64, d)
	at := func(u []float64) []float64 { // φ = x0 + T·u
		mat.NewVecDense(d, x).MulVec(T, mat.NewVecDense(d, u))
		for i := range x {
			x[i] += x0[i]
		}
		return x
	}
	if T != nil {
		prob.Func = func(u []float64) float64 { return lf.f(at(u)) }
		prob.Grad = func(g, u []float64) {
			lf.grad(gx, at(u))
			mat.NewVecDense(d, g).MulVec(T.T(), mat.NewVecDense(d, gx))
		}
		start = make([]float64, d)
	}
	conv := &optimize.FunctionConverge{Absolute: 1e-5, Iterations: 2}
	res, _ := optimize.Minimize(prob, start, &optimize.Settings{GradientThreshold: 1e-4, MajorIterations: 200, Converger: conv}, &optimize.BFGS{})
	if res == nil || math.IsInf(res.F, 0) || math.IsNaN(res.F) {
		return x0
	}
	if T == nil {
		return res.X // also when the optimiser stopped early: its best point
	}
	return slices.Clone(at(res.X))
}

// laplaceFns are the Laplace fit's objective, gradient and curvature,
// sharing one conditioning buffer: the line search asks for f and ∇f at
// the same φ, and the gradient then reuses f's conditioning.
type laplaceFns struct {
	m    *model
	c    cond
	gb   gradBuf
	last []float64 // the φ whose conditioning c holds, if finite
	ok   bool
}

func (lf *laplaceFns) f(phi []float64) float64 {
	v := lf.m.objective(phi, &lf.c)
	lf.last, lf.ok = append(lf.last[:0], phi...), !math.IsInf(v, 1)
	return v
}

// grad writes ∇f at φ into g. A model the reverse pass does not cover
// (hasGradient) takes central differences with a step of 1e-5 (φ are log
// scales and winds in m/s; forward differences at the default step of
// ~1e-8 met the objective's rounding on a 24-configuration day, common
// practice (no source): step ∝ ε^(1/3)).
func (lf *laplaceFns) grad(g, phi []float64) {
	if !lf.m.hasGradient() {
		fd.Gradient(g, lf.f, phi, &fd.Settings{Formula: fd.Central, Step: gradStep})
		return
	}
	fresh := !lf.ok || !slices.Equal(phi, lf.last)
	v := lf.m.objectiveGrad(phi, g, &lf.c, &lf.gb, fresh)
	lf.last, lf.ok = append(lf.last[:0], phi...), !math.IsInf(v, 1)
}

// hessian returns the curvature of f at φ: central differences of the
// gradient, step h = gradStep·max(1, |φ_j|), symmetrised (without the
// reverse pass, gonum's central-difference Hessian of f).
func (lf *laplaceFns) hessian(phi []float64) *mat.SymDense {
	d := len(phi)
	H := mat.NewSymDense(d, nil)
	if !lf.m.hasGradient() {
		fd.Hessian(H, lf.f, phi, &fd.Settings{Formula: fd.Central})
		return H
	}
	J := mat.NewDense(d, d, nil)
	x := slices.Clone(phi)
	gp, gm := make([]float64, d), make([]float64, d)
	for j := range d {
		h := gradStep * math.Max(1, math.Abs(phi[j]))
		x[j] = phi[j] + h
		lf.grad(gp, x)
		x[j] = phi[j] - h
		lf.grad(gm, x)
		x[j] = phi[j]
		for i := range d {
			J.Set(i, j, (gp[i]-gm[i])/(2*h))
		}
	}
	for i := range d {
		for j := i; j < d; j++ {
			H.SetSym(i, j, 0.5*(J.At(i, j)+J.At(j, i)))
		}
	}
	return H
}

// sample computes the posterior: closed form when it can, else the chains.
// The chains' steps: a Laplace fit of p(φ | y), the Student-t proposal
// around it, batches of draws until the diagnostics pass, and the
// acceptance summary.
func (m *model) sample() (*posterior, error) {
	if len(m.phi) == 0 && len(m.signs) == 0 {
		return m.closedForm()
	}
	post := &posterior{m: m}
	post.diag.Seed = m.set.Seed
	mode, cov, logZ, err := m.laplace()
	if err != nil {
		return nil, err
	}
	post.phiMode, post.phiCov, post.logZ = mode, cov, logZ
	prop, err := m.newProposal(mode, cov)
	if err != nil {
		return nil, err
	}
	chains := prop.newChains()
	if err := post.drawUntilConverged(prop, chains); err != nil {
		return nil, err
	}
	var acc, tries int
	for _, ch := range chains {
		acc += ch.accept
		tries += ch.tries
	}
	post.diag.Accept = float64(acc) / float64(tries)
	post.diag.Draws = post.n * nChains
	post.diag.Sampler = fmt.Sprintf("independence Metropolis–Hastings, %d chains, Student-t proposal from a Laplace fit over %d non-linear parameters, linear parameters drawn exactly given them, each configuration's redrawn after every step", nChains, prop.d)
	if prop.still {
		// Accept then counts the chains' first steps only.
		post.diag.Sampler = fmt.Sprintf("Metropolis within Gibbs, %d chains: each configuration's block drawn from its conditional Gaussian and kept by its signs' ratio (no non-linear parameters, no shared nuisances)", nChains)
	}
	return post, nil
}

// closedForm is the posterior of a model with neither non-linear
// parameters nor signs: the conjugate Gaussian (see cond), exact.
func (m *model) closedForm() (*posterior, error) {
	post := &posterior{m: m}
	post.diag.Seed = m.set.Seed
	if err := m.condition(nil, &post.cond); err != nil {
		return nil, err
	}
	post.gaussian = true
	post.logZ = post.cond.logML
	post.diag.Sampler = "closed form (conjugate Gaussian)"
	post.diag.RhatMax, post.diag.ESSMin = 1, math.Inf(1)
	return post, nil
}

// drawUntilConverged runs the chains in batches until the bulk ESS of every
// tracked quantity reaches MinESS with R̂ ≤ 1.01, or MaxDraws per chain.
// A first batch of 2.4 draws per wanted effective draw usually suffices
// (1.6, tried for speed, made the simulation-based calibration's rank
// histograms less uniform: mean χ² 11.5 against 9.7 over six seeds of
// TestSimulationBasedCalibration, 9 expected — the chains' start is a
// larger share of a shorter run); later batches draw what the ESS so far
// says is still needed, with a margin of 35 %:
//
//	batch = n·(MinESS/ESS − 1)·1.35,  at least n/10
//
// Before diagnosing every tracked quantity, a batch is screened on an
// eighth of them (every eighth at first, then those the last full
// diagnosis found least converged): a batch that fails there is not worth
// diagnosing whole, and a diagnosis was a seventh of a fusion's work.
// Only a full diagnosis ends the sampling.
func (post *posterior) drawUntilConverged(prop *proposal, chains []*chainState) error {
	m := post.m
	tracked := m.trackedColumns()
	screen := everyEighth(len(tracked))
	batch := int(math.Ceil(m.set.MinESS / nChains * 2.4))
	passes := func(r, e float64) bool { return e >= m.set.MinESS && r <= 1.01 }
	for {
		n := prop.runBatch(chains, batch)
		if n == 0 {
			return fmt.Errorf("fuse: the sampler found no state with finite probability")
		}
		if float64(n*nChains) < m.set.MinESS && n < m.set.MaxDraws {
			batch = 100
			continue // ESS cannot exceed the draws yet
		}
		post.collect(chains, n, prop.p, prop.d)
		if len(screen) < len(tracked) && n < m.set.MaxDraws {
			rmax, emin := extremes(post.diagnose(subset(tracked, screen)))
			if !passes(rmax, emin) {
				batch = nextBatch(n, emin, m.set)
				continue
			}
		}
		rs, es := post.diagnose(tracked)
		rmax, emin := extremes(rs, es)
		post.diag.RhatMax, post.diag.ESSMin = rmax, emin
		if passes(rmax, emin) || n >= m.set.MaxDraws {
			post.keep()
			return nil
		}
		screen = leastConverged(rs, es, max(1, len(tracked)/8))
		batch = nextBatch(n, emin, m.set)
	}
}

// nextBatch is the batch after n draws per chain gave a bulk ESS of ess
// (see drawUntilConverged).
func nextBatch(n int, ess float64, set Settings) int {
	need := float64(n) * (set.MinESS/math.Max(ess, 1) - 1) * 1.35
	return int(math.Min(math.Max(need, 0.1*float64(n)), float64(set.MaxDraws-n)))
}

// everyEighth returns every eighth index below n, from 0.
func everyEighth(n int) []int {
	var out []int
	for i := 0; i < n; i += 8 {
		out = append(out, i)
	}
	return out
}

// subset returns the tracked quantities at the given indices.
func subset(tracked [][]entryRef, idx []int) [][]entryRef {
	out := make([][]entryRef, len(idx))
	for k, i := range idx {
		out[k] = tracked[i]
	}
	return out
}

// leastConverged returns the indices (ascending) of the k quantities with
// the smallest ESS, ties broken by the larger R̂.
func leastConverged(rs, es []float64, k int) []int {
	idx := make([]int, len(es))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		if c := cmp.Compare(es[a], es[b]); c != 0 {
			return c
		}
		return cmp.Compare(rs[b], rs[a])
	})
	out := slices.Clone(idx[:k])
	slices.Sort(out)
	return out
}

// extremes returns the largest R̂ and the smallest ESS.
func extremes(rs, es []float64) (rmax, emin float64) {
	rmax, emin = 1, math.Inf(1)
	for i := range rs {
		rmax, emin = math.Max(rmax, rs[i]), math.Min(emin, es[i])
	}
	return rmax, emin
}

// diagnose returns the R̂ and the bulk ESS of each tracked quantity,
// diagnosed by workers goroutines, each its own buffer (the chains are
// idle meanwhile).
func (post *posterior) diagnose(tracked [][]entryRef) (rs, es []float64) {
	rs, es = make([]float64, len(tracked)), make([]float64, len(tracked))
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var buf []float64
			for qi := w; qi < len(tracked); qi += workers {
				var chains [][]float64
				chains, buf = post.seriesInto(tracked[qi], buf)
				rs[qi], es[qi] = RhatESS(chains)
			}
		}()
	}
	wg.Wait()
	return rs, es
}

// collect keeps the first n draws of every chain (p linear and d
// non-linear parameters per draw).
func (post *posterior) collect(chains []*chainState, n, p, d int) {
	post.n = n
	post.draws = post.draws[:0]
	post.phiDraws = post.phiDraws[:0]
	for _, ch := range chains {
		post.draws = append(post.draws, ch.draws)
		post.phiDraws = append(post.phiDraws, ch.phis)
	}
}

// keep drops the draws past the first n of every chain, so that a
// posterior held for later (the standalone and leave-one-out fits are)
// holds no more memory than its draws.
func (post *posterior) keep() {
	for c := range post.draws {
		post.draws[c].trim(post.n)
		post.phiDraws[c].trim(post.n)
	}
}

// trackedColumns returns the quantities whose convergence gates sampling:
// the front, rear and total β of every configuration the evidence speaks
// of (the others are the prior, drawn exactly) and, given the reference
// configuration of the result (Settings.reference), each one's difference
// to it — every figure of the result that is a linear function of β. A
// fit made for one entry (Settings.track) tracks that entry's quantities
// alone: its standalone figures, or those its agreement with the others
// compares. Every quantity tracked is one more chance for R̂'s own noise
// to exceed its bound: the five others' fits of a 24-configuration day,
// tracking the 72 axles where an entry's figures are 24, drew 6552 where
// their first batches were 4800; tracking the entry's, 6164.
func (m *model) trackedColumns() [][]entryRef {
	var out [][]entryRef
	if m.set.track != nil {
		seen := map[evidence.Quantity]bool{}
		for _, q := range m.set.track {
			if m.informed[q.Config] && !seen[q] {
				seen[q] = true
				out = append(out, m.quantity(q))
			}
		}
		return out
	}
	axles := []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal}
	for _, c := range m.set.Configs {
		if !m.informed[c] {
			continue
		}
		for _, ax := range axles {
			out = append(out, m.quantity(evidence.Quantity{Config: c, Axle: ax}))
		}
	}
	ref := m.set.reference
	if _, ok := m.beta[[2]string{ref, evidence.AxleFront}]; !ok {
		return out
	}
	for _, c := range m.set.Configs {
		if c == ref || (!m.informed[c] && !m.informed[ref]) {
			continue
		}
		for _, ax := range axles {
			d := m.quantity(evidence.Quantity{Config: c, Axle: ax})
			for _, t := range m.quantity(evidence.Quantity{Config: ref, Axle: ax}) {
				d = append(d, entryRef{t.col, -t.v})
			}
			out = append(out, d)
		}
	}
	return out
}

// series returns the draws of a linear combination, chain by chain.
func (p *posterior) series(w []entryRef) [][]float64 {
	out, _ := p.seriesInto(w, nil)
	return out
}

// seriesInto is series with the chains cut from one buffer, grown as
// needed and returned for reuse.
func (p *posterior) seriesInto(w []entryRef, buf []float64) ([][]float64, []float64) {
	return storesSeries(p.draws, p.n, w, buf)
}

// pooledInto writes the draws of a linear combination into buf, grown as
// needed, the chains one after another, and returns it: the pooled draws
// an estimate summarises, without the chains cut apart.
func (p *posterior) pooledInto(w []entryRef, buf []float64) []float64 {
	return combineInto(p.draws, p.n, w, buf)
}

// storesSeries is seriesInto over the first n draws of given chains.
func storesSeries(chains []*drawStore, n int, w []entryRef, buf []float64) ([][]float64, []float64) {
	buf = combineInto(chains, n, w, buf)
	out := make([][]float64, len(chains))
	for c := range chains {
		out[c] = buf[c*n : (c+1)*n]
	}
	return out, buf
}

// combineInto writes the first n draws of w of each chain into buf, grown
// as needed, the chains one after another.
func combineInto(chains []*drawStore, n int, w []entryRef, buf []float64) []float64 {
	buf = grow(buf, len(chains)*n)
	for c, d := range chains {
		d.combine(w, buf[c*n:(c+1)*n])
	}
	return buf
}

// newRand returns a seeded generator for stream k.
func newRand(seed uint64, k uint64) *rand.Rand { return rand.New(rand.NewPCG(seed, k)) }
