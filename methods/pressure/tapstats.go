package pressure

import "math"

// tapStats accumulates one tap's samples over a steady window in one pass:
// the moments for the mean and variance and the lag-one sum for the AR(1)
// correlation. Values are shifted by the first sample for numerical
// stability. Memory is fixed however long the window lasts.
type tapStats struct {
	n                int
	shift, sum, ss   float64
	lag, first, last float64
}

func (w *tapStats) add(x float64) {
	if w.n == 0 {
		w.shift = x
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
}

func (w *tapStats) mean() float64 { return w.shift + w.sum/float64(w.n) }

// standardError returns the standard error of the window mean of an AR(1)
// series: s/√n_eff with s² the sample variance and
//
//	n_eff = n·(1 − r)/(1 + r),  r = c₁/c₀ the lag-one autocorrelation
//
// (Bayley & Hammersley 1946; Wilks, Statistical Methods in the Atmospheric
// Sciences, eq. 5.12 — from memory). A negative r is taken as 0 (n_eff = n),
// the cautious choice; r is capped at 0.99.
func (w *tapStats) standardError() float64 {
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
	r := math.Min(math.Max(c1/c0, 0), 0.99)
	neff := math.Max(1, n*(1-r)/(1+r))
	return math.Sqrt(c0 / (n - 1) / neff)
}
