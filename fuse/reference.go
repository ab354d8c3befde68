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
	draws := others.nDraws()
	if draws == 0 {
		return nil
	}
	noise := newStatNoise(full, e, st.A)
	if noise == nil {
		return nil
	}
	need := sharedCols(full, e, others.p.m)
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
			fs = full.scaleFactors(x[len(full.lin):], fs)
			rm.eval(full, x, fs, t)
			noise.add(t, rng)
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

// statNoise draws an entry's observation errors as the statistic sees
// them. With ε ~ N(0, Σ) the entry's errors (Σ block-diagonal: each block
// the inverse of its precision, in the order of A's columns), A·ε is
// N(0, AΣAᵀ), drawn as C·z with C·Cᵀ = AΣAᵀ and z standard normal in the
// statistic's k dimensions: k² per replicate, not n errors drawn and A·ε
// formed (n·k, n the entry's rows). C = Q·Λ^½ from the eigendecomposition
// AΣAᵀ = QΛQᵀ, which a rank-deficient AΣAᵀ (eigenvalues at rounding
// level, clamped at 0) does not stop.
type statNoise struct {
	c []float64 // k×k row-major
	z []float64
}

// newStatNoise prepares the error draws of entry e of m for the
// statistic's matrix A (nil when a block's precision cannot be
// factorised or A's columns are not the entry's rows).
func newStatNoise(m *model, e int, A *mat.Dense) *statNoise {
	k, n := A.Dims()
	if k == 0 {
		return nil
	}
	M := mat.NewSymDense(k, nil)
	off := 0
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.entry != e {
			continue
		}
		nb := len(bl.rows)
		if off+nb > n {
			return nil
		}
		Ab := A.Slice(0, k, off, off+nb).(*mat.Dense)
		off += nb
		if bl.diag != nil {
			for a, p := range bl.diag {
				M.SymRankOne(M, 1/p, Ab.ColView(a))
			}
			continue
		}
		// A_b·P⁻¹·A_bᵀ = WᵀW with W = L⁻¹·A_bᵀ, P = L·Lᵀ.
		var ch mat.Cholesky
		if !ch.Factorize(bl.prec) {
			return nil
		}
		var L mat.TriDense
		ch.LTo(&L)
		var W mat.Dense
		if err := W.Solve(&L, Ab.T()); err != nil {
			return nil
		}
		var S mat.SymDense
		S.SymOuterK(1, W.T())
		M.AddSym(M, &S)
	}
	if off != n {
		return nil
	}
	var es mat.EigenSym
	if !es.Factorize(M, true) {
		return nil
	}
	vals := es.Values(nil)
	var Q mat.Dense
	es.VectorsTo(&Q)
	sn := &statNoise{c: make([]float64, k*k), z: make([]float64, k)}
	for i := range k {
		for j, v := range vals {
			sn.c[i*k+j] = Q.At(i, j) * math.Sqrt(math.Max(v, 0))
		}
	}
	return sn
}

// add adds one draw of A·ε, C·z, to t.
func (sn *statNoise) add(t []float64, rng *rand.Rand) {
	for j := range sn.z {
		sn.z[j] = rng.NormFloat64()
	}
	k := len(sn.z)
	for i := range t {
		t[i] += floats.Dot(sn.c[i*k:(i+1)*k], sn.z)
	}
}
