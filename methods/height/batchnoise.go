package height

import (
	"math"

	"gonum.org/v1/gonum/floats"
)

// Batch noise. The 1 s batch means of a window's speed scatter about
// their line with variance σ_b², and adjacent ones correlate: the noise of
// a GPS speed, or the AR(1) noise of φ = 0.9 a 0.1 s sample the model's
// simulator draws, lasts longer than a batch (φ = 0.9 gives a correlation
// of about 0.5 between adjacent 1 s means). Both are pooled over a log's
// windows at speed, as a short window has few batches.
//
// The speed's noise is taken as AR(1) of coefficient φ a sample, so the
// means of batches of n samples correlate at lag k ≥ 1 as ρ₁ψ^(k−1), ψ =
// φⁿ, with
//
//	ρ₁ = φ(1 − φⁿ)²/(n²(1 − φ)²) / ((1/n)[(1 + φ)/(1 − φ) − 2φ(1 − φⁿ)/(n(1 − φ)²)])
//
// (the covariance of adjacent block means over the variance of one:
// Box & Jenkins, Time Series Analysis — from memory; the variance is the
// one TestMeanAccelError checks). With R that correlation matrix, for a
// window of b batch means fitted by a line (hat matrix H = uu' + ww',
// u = 1/√b, w = (t̄ − t̄̄)/√Sxx, M = I − H) the residuals e = M·v have
//
//	E[e'e]  = σ_b² tr(MR)  = σ_b² (b − u'Ru − w'Rw)
//	E[e'Ae] = σ_b² tr(AMRM)
//	        = σ_b² [(b−1)ρ₁ − 2(u'ARu + w'ARw) + (u'Au)(u'Ru) + (w'Aw)(w'Rw) + 2(u'Aw)(w'Ru)]
//
// with A the symmetric lag-one matrix (½ beside the diagonal), so e'Ae
// is the sum of products of adjacent residuals (E[x'Qx] = tr(QΣ): Searle,
// Linear Models, ch. 2 — from memory). φ solves Σ e'Ae / Σ e'e =
// Σ E[e'Ae] / Σ E[e'e] over the windows (method of moments; at φ = 0 the
// ratio is −Σ tr(HA)/Σ(b−2), the downward pull of fitting a line to few
// points: −0.5 at b = 4, so the plain lag-one correlation of residuals
// reads an AR(1) speed as nearly white), σ_b² = Σ e'e / Σ tr(MR), and
// the slope's variance is
//
//	Var(a) = σ_b² w'Rw / Sxx,
//
// whose factor w'Rw tends for many batches to (1 + ρ)/(1 − ρ) when the
// batch means are themselves AR(1) of lag-one correlation ρ: the variance
// inflation of a mean or slope of correlated data (Bayley & Hammersley,
// JRSS Suppl. 8, 1946, effective number of observations — from memory).
// A negative correlation is read as none (no deflation). A window of
// three batches tells nothing of φ (its residuals are ∝ (1, −2, 1)), so a
// log of only such windows cannot read it; rather than take its speed as
// white (at φ = 0.9 that stated the error 1.6× too small), it takes the
// noise's correlation time to be EndSpanS, the span chosen as about a GPS
// speed's (above): φ = exp(−1/n̄) a sample, n̄ the mean samples a batch
// (0.905 at 10 Hz, adjacent batch means correlating about 0.5). That is
// conservative for a white speed (its error reads too large) and right
// for the noise EndSpanS was chosen for; a speed correlated for much
// longer than EndSpanS would still read too small an error.
type batchNoise struct {
	v, phi float64 // σ_b² ((km/h)²), φ a sample
	ok     bool    // some window at speed had a degree of freedom
}

// maxSamplePhi bounds the φ read, so that one slow drift cannot make
// every slope's error unbounded.
const maxSamplePhi = 0.995

// pooledBatchNoise returns the batch noise pooled over the windows at
// speed.
func pooledBatchNoise(es []ends) batchNoise {
	var c0, c1 float64
	var use []ends
	for _, e := range es {
		if e.atSpeed && len(e.xc) > 2 { // a degree of freedom
			c0 += e.rss
			c1 += e.c1
			use = append(use, e)
		}
	}
	if len(use) == 0 {
		return batchNoise{}
	}
	readable, nbar := false, 0.0
	for _, e := range use {
		readable = readable || len(e.xc) >= 4
		nbar += e.perBatch / float64(len(use))
	}
	var buf momentBuf
	moments := func(phi float64) (e0, e1 float64) {
		for i := range use {
			m0, m1, _ := use[i].residualMoments(phi, &buf)
			e0 += m0
			e1 += m1
		}
		return e0, e1
	}
	phi := 0.0
	switch {
	case !readable:
		phi = math.Exp(-1 / nbar)
	case c0 > 0:
		r := c1 / c0
		ratio := func(phi float64) float64 { e0, e1 := moments(phi); return e1 / e0 }
		if r > ratio(0)+1e-9 { // windows of three batches give r = ratio(φ) for all φ
			lo, hi := 0.0, maxSamplePhi
			if r >= ratio(hi) {
				lo = hi
			}
			for hi-lo > 1e-6 {
				mid := (lo + hi) / 2
				if ratio(mid) < r {
					lo = mid
				} else {
					hi = mid
				}
			}
			phi = lo
		}
	}
	e0, _ := moments(phi)
	return batchNoise{v: c0 / e0, phi: phi, ok: true}
}

// batchCorr returns the lag-one correlation ρ₁ of the means of batches of
// n samples of an AR(1) noise of coefficient phi, and their decay ψ a
// further lag (above).
func batchCorr(phi, n float64) (rho1, psi float64) {
	if phi <= 0 {
		return 0, 0
	}
	pn := math.Pow(phi, n)
	v := ((1+phi)/(1-phi) - 2*phi*(1-pn)/(n*(1-phi)*(1-phi))) / n
	c := phi * (1 - pn) * (1 - pn) / (n * n * (1 - phi) * (1 - phi))
	return c / v, pn
}

// momentBuf is residualMoments' scratch, reused over the windows and the
// search for φ.
type momentBuf struct{ u, w, ru, rw []float64 }

// residualMoments returns tr(MR), tr(AMRM) and w'Rw (above) for the
// window at a sample's AR(1) coefficient phi.
func (e *ends) residualMoments(phi float64, buf *momentBuf) (e0, e1, wRw float64) {
	rho1, psi := batchCorr(phi, e.perBatch)
	n := len(e.xc)
	b := float64(n)
	u, w := resize(buf.u, n), resize(buf.w, n)
	for i, x := range e.xc {
		u[i], w[i] = 1/math.Sqrt(b), x/math.Sqrt(e.sxx)
	}
	ru, rw := corrTimes(u, rho1, psi, resize(buf.ru, n)), corrTimes(w, rho1, psi, resize(buf.rw, n))
	buf.u, buf.w, buf.ru, buf.rw = u, w, ru, rw
	uRu, wRw, wRu := floats.Dot(u, ru), floats.Dot(w, rw), floats.Dot(w, ru)
	e0 = b - uRu - wRw
	e1 = (b-1)*rho1 - 2*(lagDot(u, ru)+lagDot(w, rw)) +
		lagDot(u, u)*uRu + lagDot(w, w)*wRw + 2*lagDot(u, w)*wRu
	return e0, e1, wRw
}

// corrTimes returns R·p in out (len(p)), R_ii = 1, R_ij = ρ₁ψ^(|i−j|−1),
// in O(len(p)): f_i = ψf_{i−1} + ρ₁p_{i−1} sums the lags below, g_i the
// lags above.
func corrTimes(p []float64, rho1, psi float64, out []float64) []float64 {
	n := len(p)
	copy(out, p)
	f := 0.0
	for i := 1; i < n; i++ {
		f = psi*f + rho1*p[i-1]
		out[i] += f
	}
	g := 0.0
	for i := n - 2; i >= 0; i-- {
		g = psi*g + rho1*p[i+1]
		out[i] += g
	}
	return out
}

// resize returns b with length n, reallocated if too short.
func resize(b []float64, n int) []float64 {
	if cap(b) < n {
		return make([]float64, n)
	}
	return b[:n]
}

// lagDot returns p'Aq = ½ Σ (p_i q_{i+1} + p_{i+1} q_i).
func lagDot(p, q []float64) float64 {
	s := 0.0
	for i := 1; i < len(p); i++ {
		s += p[i-1]*q[i] + p[i]*q[i-1]
	}
	return s / 2
}

// errorOf returns a window's acceleration error (km/h/s) given the pooled
// batch noise n. The slope's is √(σ_b² w'Rw/Sxx). The fallback's (a
// window under two batches: first and last speed update, T apart, τ
// between updates) takes an update's variance as σ_b²·EndSpanS/τ, the
// white-noise scaling of a batch mean to one update (an upper bound for
// positively correlated noise), so SE = √(2σ_b²·EndSpanS/τ)/T. With no
// pooled batch either falls back to the window's own steps between
// updates (white noise: von Neumann, Ann. Math. Stat. 12, 1941 — from
// memory), and with nothing known to |a|: an acceleration is never
// stated exact when its error cannot be read.
//
// The slope's variance is floored at that of white rounding noise of the
// window's speed quantum q (its least step), q²/12 a sample (a uniform
// rounding error: Sheppard's correction — from memory) over the samples
// a batch, over Sxx, so that a held, quantised speed whose batch means
// lie on a line is not stated exact (the residuals are then 0, or
// rounding, from which no φ can be read).
func (e ends) errorOf(n batchNoise) float64 {
	tau := 0.0
	if e.upM > 0 {
		tau = e.upT / float64(e.upM)
	}
	if e.xc != nil {
		switch {
		case n.ok:
			_, _, wRw := e.residualMoments(n.phi, &momentBuf{})
			return math.Sqrt(max(n.v*wRw, e.q*e.q/12/e.perBatch) / e.sxx)
		case tau > 0 && !math.IsNaN(e.stepVar):
			return math.Sqrt(e.stepVar * tau / EndSpanS / e.sxx)
		}
		return math.Abs(e.a)
	}
	switch {
	case tau == 0:
		return math.Abs(e.a)
	case n.ok:
		return math.Sqrt(2*n.v*EndSpanS/tau) / e.upT
	case !math.IsNaN(e.stepVar):
		return math.Sqrt(2*e.stepVar) / e.upT
	}
	return math.Abs(e.a)
}
