package fuse

import (
	"math"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/evidence"
)

// The leave-one-out predictive check of an entry's data (model.md,
// "Agreement and fault localisation"). Entry e's data y_e are predicted from
// every other entry's posterior p(θ, φ | y_−e): the parameters e shares with
// the others (lift, speed slopes, springs, wind, drag pitch, probe — the
// same names) take the others' joint posterior, e's own errors (gain,
// offsets, its own tyre growth) their prior. So an error e shares with the
// others is counted once, in one joint distribution, instead of once in
// each of two posteriors that are then compared as if independent.
//
// Linearised at the predictive mean x̄ of (θ, φ), with J = ∂μ_e/∂(θ, φ) and
// C the predictive covariance,
//
//	y_e ~ N(μ_e(x̄), Σ_e + J C Jᵀ).
//
// The test statistic is what the entry's data say about the parameters
// they touch, relative to that prediction: one Gauss–Newton step of the
// entry's data alone from x̄, the standalone generalised least squares map
// A = W H⁻¹ JᵀΣ_e⁻¹ with H = P₀ + JᵀΣ_e⁻¹J (P₀ the prior precision, zero
// for a flat offset) applied to the residual,
//
//	t = A (y_e − μ_e(x̄)),   V = Cov t = W H⁻¹ F H⁻¹ Wᵀ + (W H⁻¹ F) C (W H⁻¹ F)ᵀ,  F = JᵀΣ_e⁻¹J,
//
// and d² = tᵀ V⁺ t is about χ² with rank(V) degrees of freedom when the
// entry agrees with the others (Gelman, Meng & Stern 1996 for predictive
// checks; Vehtari, Gelman & Gabry 2017 for leave-one-out predictive
// densities — from memory); its p-value comes from a simulated reference
// (referenceP), since scale factors give d² heavier tails. W picks the
// touched lift parameters and the entry's own additive errors with a
// proper prior (see weights); a flat offset drops out of t exactly
// (A J e_f = W e_f = 0), so its improper prior does no harm. The rank of V is the number of
// directions the entry's data can tell apart, so the degrees of freedom
// follow what the data say, not how many parameters are named.

// paramKey names parameter i of (θ, φ) so that the same parameter can be
// found in a model of a subset of the entries.
func (m *model) paramKey(i int) string {
	p := len(m.lin)
	if i >= p {
		return "φ " + m.phi[i-p].name
	}
	switch lp := m.lin[i]; lp.kind {
	case kindBeta:
		return "β " + lp.config + " " + lp.axle
	case kindGamma:
		return "γ " + lp.config + " " + lp.axle
	default:
		return "ν " + lp.nuis.Name
	}
}

// priorPrecision is P₀ of parameter i of (θ, φ), unweighted by any
// inflation: 0 for a flat prior.
func (m *model) priorPrecision(i int) float64 {
	p := len(m.lin)
	if i < p {
		return m.lin[i].prec
	}
	sd := m.phi[i-p].sd
	return 1 / (sd * sd)
}

// predictiveMean returns the mean over the full model's (θ, φ) of the
// others' posterior of entry e, with e's own parameters (those no other
// entry declares) at their priors (a flat prior at its mean: the statistic
// does not depend on it); src is sharedIndex(full, others' model).
func predictiveMean(full *model, others *Posterior, src []int) []float64 {
	oMean := others.jointMean()
	p := len(full.lin)
	mean := make([]float64, full.dim())
	for i := range mean {
		if j := src[i]; j >= 0 {
			mean[i] = oMean[j]
		} else if i < p && full.lin[i].prec > 0 {
			mean[i] = full.lin[i].mean
		}
	}
	return mean
}

// predictiveCov returns L C Lᵀ for C the predictive covariance over the
// parameters cols (L has one column per parameter of cols, in that order):
// the others' joint covariance over those they share, e's own independent
// of the rest with their prior variances; a flat prior gets variance 0 (it
// drops out of the test, see above). C is wanted over the parameters e's
// data touch alone, and only through L = A·J, whose rows are few: C itself
// cost len(cols)²/2 per draw, L·x costs rows × len(cols).
func predictiveCov(full *model, others *Posterior, src, cols []int, L *mat.Dense) *mat.SymDense {
	r, _ := L.Dims()
	p := len(full.lin)
	var shared []int // the others' index of each shared column of cols
	var at []int     // its place in cols
	for a, i := range cols {
		if src[i] >= 0 {
			shared, at = append(shared, src[i]), append(at, a)
		}
	}
	Ls := mat.NewDense(r, max(len(at), 1), nil)
	for x, a := range at {
		for i := range r {
			Ls.Set(i, x, L.At(i, a))
		}
	}
	out := others.jointCovOf(shared, Ls)
	for a, i := range cols {
		var v float64
		switch {
		case src[i] >= 0:
			continue
		case i >= p:
			v = full.phi[i-p].sd * full.phi[i-p].sd
		case full.lin[i].prec > 0:
			v = 1 / full.lin[i].prec
		}
		if v > 0 {
			out.SymRankOne(out, v, L.ColView(a))
		}
	}
	return out
}

// looStat is the predictive check's statistic of one entry: t and V over
// the rows of W (see weights).
type looStat struct {
	t     []float64
	V     *mat.SymDense
	names []evidence.Quantity // the lift parameter of a row, where it is one
	lift  []bool              // the row is a lift parameter β at V_ref

	// For the diagnosis: AJ = A·J, how t moves when a touched parameter
	// moves (k×nc), cols the full index of each of its columns, Vp = V⁺
	// and d2 = tᵀV⁺t.
	AJ   *mat.Dense
	cols []int
	Vp   *mat.SymDense
	d2   float64

	// For the reference distribution (replicate): A (k×n) with
	// t = A·(y − μ̄), the entry's rows in the order of A's columns,
	// μ̄ = μ_e(x̄) and src = sharedIndex(full, others' model).
	A    *mat.Dense
	rows []int
	mu   []float64
	src  []int
}

// looPredictive computes the statistic of entry e's Gaussian data under the
// others' posterior; ok is false when the entry has no Gaussian data or the
// computation is singular.
func looPredictive(full *model, e int, others *Posterior) (*looStat, bool) {
	src := sharedIndex(full, others.p.m)
	mean := predictiveMean(full, others, src)
	p := len(full.lin)
	theta, phi := mean[:p], mean[p:]
	lin := full.entryLinear(e, theta, phi)
	n := len(lin.rows)
	if n == 0 {
		return nil, false
	}
	st := &looStat{rows: lin.rows, mu: make([]float64, n), src: src}
	res := make([]float64, n)
	var buf []entryRef
	for k, ri := range lin.rows {
		r := &full.rows[ri]
		st.mu[k] = full.rowMean(r, theta, phi, buf)
		res[k] = r.y - st.mu[k]
	}
	cols := lin.touched(full.dim())
	if !st.finish(full, lin, cols, res, func(AJ *mat.Dense) *mat.SymDense { return predictiveCov(full, others, src, cols, AJ) }) {
		return nil, false
	}
	return st, true
}

// finish computes t, V and A·J over the parameters the entry's data touch,
// cols (the others do not enter H⁻¹ restricted to them, the prior being
// independent between parameters); covOf(L) is L C Lᵀ for C the predictive
// covariance over cols.
func (st *looStat) finish(full *model, lin *entryLin, cols []int, res []float64, covOf func(L *mat.Dense) *mat.SymDense) bool {
	nc := len(cols)
	if nc == 0 { // data that touch no parameter say nothing to compare
		return false
	}
	pos := make([]int, full.dim())
	for i := range pos {
		pos[i] = -1
	}
	for a, i := range cols {
		pos[i] = a
	}
	F := mat.NewDense(nc, nc, lin.info(pos, nc))
	W := st.weights(full, cols)
	if len(W) == 0 {
		return false
	}
	H := mat.NewSymDense(nc, nil)
	for a, i := range cols {
		for b := a; b < nc; b++ {
			H.SetSym(a, b, 0.5*(F.At(a, b)+F.At(b, a)))
		}
		H.SetSym(a, a, H.At(a, a)+full.priorPrecision(i))
	}
	var ch mat.Cholesky
	if !ch.Factorize(H) {
		return false
	}
	k := len(W)
	Wm := mat.NewDense(k, nc, nil)
	for r, w := range W {
		Wm.SetRow(r, w)
	}
	// B = W H⁻¹ (k×nc), t = B·Gᵀ(y − μ̄), AJ = B F.
	var HinvWt mat.Dense
	if err := ch.SolveTo(&HinvWt, Wm.T()); err != nil {
		return false
	}
	B := mat.DenseCopyOf(HinvWt.T())
	st.A = applyG(B, lin.restrict(pos), len(lin.rows))
	var t mat.VecDense
	t.MulVec(st.A, mat.NewVecDense(len(res), res))
	st.t = t.RawVector().Data
	var AJ, V1 mat.Dense
	AJ.Mul(B, F)
	V1.Mul(&AJ, B.T())
	V2 := covOf(&AJ)
	st.AJ, st.cols = &AJ, cols
	st.V = mat.NewSymDense(k, nil)
	for i := range k {
		for j := i; j < k; j++ {
			st.V.SetSym(i, j, 0.5*(V1.At(i, j)+V1.At(j, i))+V2.At(i, j))
		}
	}
	return true
}

// applyG returns A = B·Gᵀ (k×n) for G's n rows given sparse over B's
// columns: each column of A is B's columns weighted by a row of G.
func applyG(B *mat.Dense, G [][]entryRef, n int) *mat.Dense {
	k, _ := B.Dims()
	A := mat.NewDense(k, n, nil)
	for r, gr := range G {
		for _, e := range gr {
			for i := range k {
				A.Set(i, r, A.At(i, r)+B.At(i, e.col)*e.v)
			}
		}
	}
	return A
}

// weights returns the rows of W over the touched parameters cols (each
// row over their places): one row for the lift β and speed
// slope γ the entry's data touch, and one for each of its own additive
// errors with a proper prior (tyre growth, a patch's Cp), so that a
// discrepancy the entry's data put into one of its own errors (a laser
// whose tyres grow 3 mm against a prior of 0.5 ± 0.5) is seen as well as
// one in its lift. Left out: a flat offset (its prior says nothing to
// compare with); the errors shared with other entries (springs of an
// axle, the wind, the pitch of drag) — they are conditioned on the others
// in the prediction, and a disagreement about them is not this entry's
// alone (the wind's direction-dependent part is also where unmodelled
// direction effects — gusts, a gradient, acceleration — show; the model
// checks look for those); and its own scale factors (gain, springs it
// alone reads, an integration scale). A scale factor's column of J is
// Σ_c β_c times the lift columns (the data fix only the product s·β), so
// its row of t is a combination of the lift rows and adds no direction;
// but the φ columns come from finite differences, and on a day with two
// front pots a gain row survived the rank cut as a third degree of
// freedom carrying nothing (d² 15.108 with or without it, p 0.0017 on
// three degrees against 0.0005 on two).
func (st *looStat) weights(full *model, cols []int) [][]float64 {
	var W [][]float64
	nc := len(cols)
	for i, k := range cols {
		if full.priorPrecision(k) == 0 || full.sharedParam(k) || full.scaleParam(k) {
			continue
		}
		w := make([]float64, nc)
		w[i] = 1
		W = append(W, w)
		q, lift := evidence.Quantity{}, false
		if k < len(full.lin) && full.lin[k].kind != kindNuisance {
			q = evidence.Quantity{Config: full.lin[k].config, Axle: full.lin[k].axle}
			lift = full.lin[k].kind == kindBeta
		}
		st.names = append(st.names, q)
		st.lift = append(st.lift, lift)
	}
	return W
}

// scaleParam reports whether parameter k of (θ, φ) is a scale factor (a
// scale group's log or a log-normal nuisance's, not the wind).
func (m *model) scaleParam(k int) bool {
	p := len(m.lin)
	return k >= p && !m.phi[k-p].wind
}

// sharedParam reports whether parameter k of (θ, φ) is an error that more
// than one entry declares.
func (m *model) sharedParam(k int) bool {
	p := len(m.lin)
	if k >= p {
		return len(m.phi[k-p].owners) > 1
	}
	return m.lin[k].kind == kindNuisance && len(m.lin[k].owners) > 1
}

// metric returns the pseudo-inverse V⁺ of the statistic's covariance and
// its rank. The rows of t are dependent where the entry's data cannot
// tell two parameters apart (a pot's spring rate and its gain both scale
// its lift), so V is singular there: its eigen-directions below 10⁻⁶ of
// the largest, on the correlation scale (the rows are in m², mm and log
// units), are dropped — a loose cut, because the φ columns of J come from
// finite differences and a direction the data cannot see keeps an
// eigenvalue of their rounding, about 10⁻¹⁰.
func (st *looStat) metric() (*mat.SymDense, int) {
	k := len(st.t)
	sd := make([]float64, k)
	R := mat.NewSymDense(k, nil)
	for i := range k {
		sd[i] = math.Sqrt(st.V.At(i, i))
	}
	for i := range k {
		for j := i; j < k; j++ {
			if sd[i] > 0 && sd[j] > 0 {
				R.SetSym(i, j, st.V.At(i, j)/(sd[i]*sd[j]))
			}
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(R, true) {
		return nil, 0
	}
	vals := eig.Values(nil)
	var U mat.Dense
	eig.VectorsTo(&U)
	top := 0.0
	for _, v := range vals {
		top = math.Max(top, v)
	}
	Rp := mat.NewSymDense(k, nil)
	rank := 0
	for i, v := range vals {
		if v <= 1e-6*top || v <= 0 {
			continue
		}
		rank++
		Rp.SymRankOne(Rp, 1/v, U.ColView(i))
	}
	// V⁺ = D⁻¹ R⁺ D⁻¹ with D the diagonal of sds.
	Vp := mat.NewSymDense(k, nil)
	for i := range k {
		for j := i; j < k; j++ {
			if sd[i] > 0 && sd[j] > 0 {
				Vp.SetSym(i, j, Rp.At(i, j)/(sd[i]*sd[j]))
			}
		}
	}
	return Vp, rank
}

// quadForm returns xᵀ A x.
func quadForm(A *mat.SymDense, x []float64) float64 {
	v := mat.NewVecDense(len(x), x)
	return mat.Inner(v, A, v)
}
