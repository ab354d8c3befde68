// Package steady holds the statistics of one steady window of a logged
// signal, accumulated in one pass in fixed memory: mean, variance, the
// lag-one autocorrelation and batch sums, and the window mean's standard
// error that respects autocorrelation. Every adapter that averages a logged
// channel over steady windows (ride height, pressure taps) uses it.
package steady

import "math"

// EffectiveN returns the effective sample size of n samples of an AR(1)
// process with lag-one autocorrelation r,
//
//	n_eff = n·(1 − r)/(1 + r)
//
// (Bayley & Hammersley 1946; Wilks, Statistical Methods in the Atmospheric
// Sciences, 3rd ed., eq. 5.12 — from memory). A negative r would make
// n_eff > n; it is clamped to n, which is the cautious choice.
func EffectiveN(n int, r float64) float64 {
	if r <= 0 {
		return float64(n)
	}
	if r >= 1 {
		return 1
	}
	return math.Max(1, float64(n)*(1-r)/(1+r))
}

// maxBatches bounds the batch sums a Stats keeps: when full,
// neighbouring batches merge and the batch size doubles, so memory stays
// fixed however long a window lasts.
const maxBatches = 64

// Stats accumulates the statistics of one steady window in one pass:
// moments for the mean and variance, the lag-one sum for the AR(1)
// correlation, and batch sums for the batch-means variance. Values are
// shifted by the first sample for numerical stability.
type Stats struct {
	n       int
	shift   float64
	sum, ss float64 // Σx, Σx² of shifted values
	lag     float64 // Σ x_i·x_{i−1}
	first   float64
	last    float64
	batch   [maxBatches]float64
	nb      int // full batches
	bsize   int // samples per batch
	cur     float64
	curN    int
}

// Add takes the next sample.
func (w *Stats) Add(x float64) {
	if w.n == 0 {
		w.shift, w.bsize = x, 1
	}
	x -= w.shift
	if w.n == 0 {
		w.first = x
	} else {
		w.lag += x * w.last
	}
	w.n++
	w.sum += x
	w.ss += x * x
	w.last = x
	w.cur += x
	w.curN++
	if w.curN == w.bsize {
		w.batch[w.nb] = w.cur
		w.nb++
		w.cur, w.curN = 0, 0
		if w.nb == maxBatches {
			for i := 0; i < maxBatches/2; i++ {
				w.batch[i] = w.batch[2*i] + w.batch[2*i+1]
			}
			w.nb = maxBatches / 2
			w.bsize *= 2
		}
	}
}

// N returns the number of samples taken.
func (w *Stats) N() int { return w.n }

// Mean returns the window mean.
func (w *Stats) Mean() float64 { return w.shift + w.sum/float64(w.n) }

// Variance returns the sample variance (n − 1 denominator).
func (w *Stats) Variance() float64 {
	if w.n < 2 {
		return 0
	}
	m := w.sum / float64(w.n)
	return math.Max(0, (w.ss-float64(w.n)*m*m)/float64(w.n-1))
}

// lag1 returns the lag-one autocorrelation r = c1/c0 with
// c1 = Σ_{i≥2}(x_i − m)(x_{i−1} − m)/n and c0 = Σ(x_i − m)²/n.
func (w *Stats) lag1() float64 {
	if w.n < 3 {
		return 0
	}
	n := float64(w.n)
	m := w.sum / n
	c0 := w.ss - n*m*m
	if c0 <= 0 {
		return 0
	}
	// Σ_{i≥2} x_i = sum − first; Σ_{i≤n−1} x_i = sum − last.
	c1 := w.lag - m*((w.sum-w.first)+(w.sum-w.last)) + (n-1)*m*m
	return c1 / c0
}

// batchVar returns the batch-means estimate of Var(x̄): the sample variance
// of the B full batch means divided by B (samples of a trailing partial batch
// are left out). It needs at least two batches; ok is false otherwise.
func (w *Stats) batchVar() (v float64, ok bool) {
	return BatchMeansVar(w.batch[:w.nb], w.bsize)
}

// BatchMeansVar returns the batch-means estimate of the variance of the
// overall mean from batch sums of size b each:
//
//	Var(x̄) ≈ s²_B / B,  s²_B the sample variance of the B batch means
//
// (the method of batch means; e.g. Law & Kelton, Simulation Modeling and
// Analysis, §9.5 — from memory).
func BatchMeansVar(sums []float64, b int) (float64, bool) {
	B := len(sums)
	if B < 2 || b < 1 {
		return 0, false
	}
	var m float64
	for _, s := range sums {
		m += s / float64(b)
	}
	m /= float64(B)
	var ss float64
	for _, s := range sums {
		d := s/float64(b) - m
		ss += d * d
	}
	return ss / float64(B-1) / float64(B), true
}

// StandardError returns the window mean's standard error: the larger of the
// batch-means estimate and the AR(1) one, s/√n_eff. The lag-one
// correlation of a short series is biased low, E[r̂] ≈ r − (1 + 3r)/n
// (Kendall 1954; Marriott & Pope 1954 — from memory), which would make the
// window look more informative than it is; r̂ is corrected by that amount.
func (w *Stats) StandardError() (se, neff float64) {
	s2 := w.Variance()
	r := w.lag1()
	r = math.Min(r+(1+3*r)/float64(w.n), 0.99)
	neff = EffectiveN(w.n, r)
	v := s2 / neff
	if bv, ok := w.batchVar(); ok && bv > v {
		v = bv
		neff = s2 / bv
	}
	return math.Sqrt(v), neff
}
