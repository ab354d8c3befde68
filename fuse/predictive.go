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

// predictiveMoments returns the mean over the full model's (θ, φ) of the
// others' posterior of entry e, with e's own parameters (those no other
// entry declares) at their priors, and the covariance over the parameters
// cols only (in that order), e's own independent of the rest with their
// prior variances; a flat prior gets variance 0 (it drops out of the test,
// see above). The covariance is wanted over the parameters e's data touch
// alone: over all of them it cost configurations² (and its draws' pass
// configurations² × draws) for an entry that reads a few of them.
func predictiveMoments(full *model, others *Posterior, cols []int) ([]float64, *mat.SymDense) {
	om := others.p.m
	oMean := others.jointMean()
	D := full.dim()
	p := len(full.lin)
	mean := make([]float64, D)
	src := sharedIndex(full, om)
	for i := range D {
		if j := src[i]; j >= 0 {
			mean[i] = oMean[j]
		} else if i < p && full.lin[i].prec > 0 {
			mean[i] = full.lin[i].mean
		}
	}
	if len(cols) == 0 {
		return mean, nil
	}
	var shared []int // the others' index of each shared column of cols
	var at []int     // its place in cols
	for a, i := range cols {
		if src[i] >= 0 {
			shared, at = append(shared, src[i]), append(at, a)
		}
	}
	cov := mat.NewSymDense(len(cols), nil)
	oCov := others.jointCov(shared)
	for x, a := range at {
		for y := x; y < len(at); y++ {
			cov.SetSym(a, at[y], oCov.At(x, y))
		}
	}
	for a, i := range cols {
		switch {
		case src[i] >= 0:
		case i >= p:
			sd := full.phi[i-p].sd
			cov.SetSym(a, a, sd*sd)
		case full.lin[i].prec > 0:
			cov.SetSym(a, a, 1/full.lin[i].prec)
		}
	}
	return mean, cov
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
	// t = A·(y − μ̄), the entry's rows in the order of A's columns and
	// μ̄ = μ_e(x̄).
	A    *mat.Dense
	rows []int
	mu   []float64
}

// looPredictive computes the statistic of entry e's Gaussian data under the
// others' posterior; ok is false when the entry has no Gaussian data or the
// computation is singular.
func looPredictive(full *model, e int, others *Posterior) (*looStat, bool) {
	mean, _ := predictiveMoments(full, others, nil)
	p := len(full.lin)
	theta, phi := mean[:p], mean[p:]
	sp := repeatSpace{D: full.dim(), newIdx: map[int]int{}}
	D := sp.D
	var Js []*mat.Dense
	st := &looStat{}
	var buf []entryRef
	var res []float64
	n := 0
	for bi := range full.blocks {
		bl := &full.blocks[bi]
		if bl.entry != e {
			continue
		}
		Js = append(Js, full.repeatJacobian(bl, sp, theta, phi))
		for _, ri := range bl.rows {
			r := &full.rows[ri]
			m := full.rowMean(r, theta, phi, buf)
			res = append(res, r.y-m)
			st.rows = append(st.rows, ri)
			st.mu = append(st.mu, m)
		}
		n += len(bl.rows)
	}
	if n == 0 {
		return nil, false
	}
	// G = Σ⁻¹J (n×D), block by block.
	J := mat.NewDense(n, D, nil)
	G := mat.NewDense(n, D, nil)
	k := 0
	for bi := range full.blocks {
		bl := &full.blocks[bi]
		if bl.entry != e {
			continue
		}
		Jb := Js[0]
		Js = Js[1:]
		nb := len(bl.rows)
		for a := range nb {
			J.SetRow(k+a, Jb.RawRowView(a))
			for b := range nb {
				var w float64
				switch {
				case bl.diag != nil && a == b:
					w = bl.diag[a]
				case bl.diag == nil:
					w = bl.precD[a*nb+b]
				}
				if w == 0 {
					continue
				}
				ga, jb := G.RawRowView(k+a), Jb.RawRowView(b)
				for i := range D {
					ga[i] += w * jb[i]
				}
			}
		}
		k += nb
	}
	cols := touched(J, G)
	_, C := predictiveMoments(full, others, cols)
	if !st.finish(full, J, G, cols, C, res) {
		return nil, false
	}
	return st, true
}

// touched returns the parameters the entry's data touch: those whose
// diagonal element of F = JᵀΣ⁻¹J = JᵀG is positive.
func touched(J, G *mat.Dense) []int {
	n, D := J.Dims()
	var cols []int
	for i := range D {
		var f float64
		for r := range n {
			f += J.At(r, i) * G.At(r, i)
		}
		if f > 0 {
			cols = append(cols, i)
		}
	}
	return cols
}

// finish computes t, V and A·J over the parameters the entry's data touch,
// cols (the others do not enter H⁻¹ restricted to them, the prior being
// independent between parameters); C is the predictive covariance over
// cols.
func (st *looStat) finish(full *model, J, G *mat.Dense, cols []int, C *mat.SymDense, res []float64) bool {
	n, _ := J.Dims()
	pos := map[int]int{}
	Js := mat.NewDense(n, len(cols), nil)
	Gs := mat.NewDense(n, len(cols), nil)
	for a, i := range cols {
		pos[i] = a
		for r := range n {
			Js.Set(r, a, J.At(r, i))
			Gs.Set(r, a, G.At(r, i))
		}
	}
	var F mat.Dense
	F.Mul(Js.T(), Gs)
	W := st.weights(full, pos, len(cols))
	if len(W) == 0 {
		return false
	}
	nc := len(cols)
	H := mat.NewSymDense(nc, nil)
	Fs, Cs := &F, C
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
	// B = W H⁻¹ (k×nc), A = B Gᵀ (k×n), AJ = B F.
	var HinvWt mat.Dense
	if err := ch.SolveTo(&HinvWt, Wm.T()); err != nil {
		return false
	}
	B := mat.DenseCopyOf(HinvWt.T())
	var M mat.Dense
	M.Mul(B, Gs.T())
	var t mat.VecDense
	t.MulVec(&M, mat.NewVecDense(n, res))
	st.A = &M
	var AJ, V1, tmp, V2 mat.Dense
	AJ.Mul(B, Fs)
	V1.Mul(&AJ, B.T())
	tmp.Mul(&AJ, Cs)
	V2.Mul(&tmp, AJ.T())
	st.AJ, st.cols = &AJ, cols
	st.V = mat.NewSymDense(k, nil)
	for i := range k {
		for j := i; j < k; j++ {
			st.V.SetSym(i, j, 0.5*(V1.At(i, j)+V1.At(j, i))+0.5*(V2.At(i, j)+V2.At(j, i)))
		}
	}
	st.t = t.RawVector().Data
	return true
}

// weights returns the rows of W over the touched parameters (pos maps a
// full column to its place among nc): one row for the lift β and speed
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
func (st *looStat) weights(full *model, pos map[int]int, nc int) [][]float64 {
	var W [][]float64
	for i, k := range sortedCols(pos) {
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

// sortedCols returns the full columns of pos in the order of their places.
func sortedCols(pos map[int]int) []int {
	cols := make([]int, len(pos))
	for c, i := range pos {
		cols[i] = c
	}
	return cols
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
