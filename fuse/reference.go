package fuse

import (
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// The statistic's reference distribution. d² would be χ² with rank(V)
// degrees of freedom if the entry's data were linear in (θ, φ) and the
// others' posterior Gaussian; they are not quite: a scale factor (a gain,
// the springs, an integration scale) multiplies the lift it scales, so the
// prediction of their product is a product of two uncertain quantities,
// with heavier tails than a normal. On five of the simulated days of
// TestPriorDrawnFalseAlarms (uncertain parts drawn from the declared
// priors), the 99th percentile of d² over 12 000 replicate data sets came
// out 1–14 % above χ²'s for a suspension pot (within 2 % for the laser and
// the taps), which multiplied p-values near 10⁻³ by 3 to 4.
//
// So the reference is simulated: replicate data of the entry are drawn from
// its leave-one-out predictive — (θ, φ) from the others' joint draws for
// what e shares with them, e's own parameters from their priors, noise from
// e's blocks — each replicate's d² computed with the same A, μ̄ and V⁺ as
// the data's, and c·χ²_ν fitted to the replicates' mean and variance
// (Satterthwaite's two-moment approximation, Biometrics Bulletin 2 (1946)
// 110–114; Box, Ann. Math. Stat. 25 (1954) 290–302), p = P(χ²_ν > d²/c).
// Fitted moments rather than the share of replicates beyond d² keep the
// p-value smooth in d² and meaningful below 1/replicates.

// referenceReps is the number of replicate data sets (the variance of d²
// is then known to about 6 %).
const referenceReps = 2000

// referenceP returns the p-value of d² under the simulated reference, or
// under χ²_rank when the replicates cannot be drawn or their moments are
// degenerate.
func (st *looStat) referenceP(full *model, e int, others *Posterior, rank int) float64 {
	chi := distuv.ChiSquared{K: float64(rank)}.Survival(st.d2)
	ts := st.replicates(full, e, others, newRand(full.set.Seed, 900+uint64(e)))
	if len(ts) < referenceReps/2 {
		return chi
	}
	mu, v := meanVar(ts)
	if !(mu > 0 && v > 0) {
		return chi
	}
	c, nu := v/(2*mu), 2*mu*mu/v
	return distuv.ChiSquared{K: nu}.Survival(st.d2 / c)
}

// replicates draws d² of replicate data sets of entry e (see referenceP).
func (st *looStat) replicates(full *model, e int, others *Posterior, rng *rand.Rand) []float64 {
	noise := entryNoise(full, e)
	need := sharedCols(full, e, others.p.m)
	draws := others.nDraws()
	if draws == 0 || noise == nil {
		return nil
	}
	per := (referenceReps + draws - 1) / draws
	op := len(others.p.m.lin)
	x := make([]float64, full.dim())
	t := make([]float64, len(st.t))
	rm := full.newRepMean(st.A, st.rows, st.mu)
	var out, fs []float64
	others.drawsOf(need, func(theta, phi []float64) {
		for range per {
			if len(out) == referenceReps {
				return
			}
			full.predictiveDraw(x, st.src, theta, phi, op, rng)
			eps := noise.draw(rng)
			fs = full.scaleFactors(x[len(full.lin):], fs)
			rm.eval(full, x, fs, t)
			for i := range t {
				t[i] += floats.Dot(st.A.RawRowView(i), eps)
			}
			out = append(out, quadForm(st.Vp, t))
		}
	})
	return out
}

// sharedIndex maps each parameter of the full model to its index in the
// others' model (−1 where they do not have it).
func sharedIndex(full, om *model) []int {
	where := map[string]int{}
	for i := range om.dim() {
		where[om.paramKey(i)] = i
	}
	src := make([]int, full.dim())
	for i := range src {
		src[i] = -1
		if j, ok := where[full.paramKey(i)]; ok {
			src[i] = j
		}
	}
	return src
}

// predictiveDraw fills x with one draw of (θ, φ) from the leave-one-out
// predictive: the others' draw (theta, phi; op its number of θ) where they
// have the parameter, the prior elsewhere (a flat prior at its mean: the
// statistic does not depend on it).
func (m *model) predictiveDraw(x []float64, src []int, theta, phi []float64, op int, rng *rand.Rand) {
	p := len(m.lin)
	for i := range x {
		switch j := src[i]; {
		case j >= 0 && j < op:
			x[i] = theta[j]
		case j >= 0:
			x[i] = phi[j-op]
		case i >= p:
			x[i] = m.phi[i-p].sd * rng.NormFloat64()
		case m.lin[i].prec > 0:
			x[i] = m.lin[i].mean + rng.NormFloat64()/math.Sqrt(m.lin[i].prec)
		default:
			x[i] = m.lin[i].mean
		}
	}
}

// noiseDraws draws an entry's observation errors, block by block in the
// order of its rows: N(0, Σ_b) as L⁻ᵀz with Σ_b⁻¹ = LLᵀ, or σ·z.
type noiseDraws struct {
	blocks []*block
	u      [][]float64 // U = Lᵀ row-major, L of a full block's precision; nil when diagonal
	sd     [][]float64 // 1/√P_ii of a diagonal block
	out    []float64
}

// entryNoise prepares the error draws of entry e's blocks (nil when a
// precision cannot be factorised).
func entryNoise(m *model, e int) *noiseDraws {
	nd := &noiseDraws{}
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.entry != e {
			continue
		}
		nd.blocks = append(nd.blocks, bl)
		if bl.diag != nil {
			sd := make([]float64, len(bl.diag))
			for a, p := range bl.diag {
				sd[a] = 1 / math.Sqrt(p)
			}
			nd.u, nd.sd = append(nd.u, nil), append(nd.sd, sd)
			continue
		}
		var ch mat.Cholesky
		if !ch.Factorize(bl.prec) {
			return nil
		}
		var L mat.TriDense
		ch.LTo(&L)
		n := len(bl.rows)
		u := make([]float64, n*n)
		for i := range n {
			for k := i; k < n; k++ {
				u[i*n+k] = L.At(k, i)
			}
		}
		nd.u, nd.sd = append(nd.u, u), append(nd.sd, nil)
	}
	return nd
}

// draw returns one draw of the entry's errors, block by block: for a block
// whose precision is P = L·Lᵀ, ε = L⁻ᵀ·z with z standard normal has
// covariance P⁻¹ (back substitution in U = Lᵀ); a diagonal block scales z
// by 1/√P_ii.
func (nd *noiseDraws) draw(rng *rand.Rand) []float64 {
	nd.out = nd.out[:0]
	for b, bl := range nd.blocks {
		k := len(nd.out)
		for range bl.rows {
			nd.out = append(nd.out, rng.NormFloat64())
		}
		z := nd.out[k:]
		if u := nd.u[b]; u != nil {
			backSubst(u, z)
			continue
		}
		for a, s := range nd.sd[b] {
			z[a] *= s
		}
	}
	return nd.out
}

// backSubst solves U·x = z in place for x, U upper triangular and
// non-singular (n×n row-major, n = len(z)).
func backSubst(u, z []float64) {
	n := len(z)
	for i := n - 1; i >= 0; i-- {
		row := u[i*n : (i+1)*n]
		s := z[i]
		for k := i + 1; k < n; k++ {
			s -= row[k] * z[k]
		}
		z[i] = s / row[i]
	}
}
