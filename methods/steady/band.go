package steady

// Band is the speed of a steady window as it grows: every sample within
// ±tol of the window's mean (the steady-window rule of model.md, "Steady
// windows"). The zero value is an empty band.
type Band struct {
	n             int
	sum, min, max float64
}

// Admits reports whether v may join the band with every sample, v
// included, within ±tol of the new mean: with n samples and sum s,
// max − s/n ≤ tol and s/n − min ≤ tol, multiplied by n. An empty band
// admits any v.
//
// The extremes are kept with plain comparisons rather than min and max,
// whose NaN and signed-zero rules cost a dozen instructions each on every
// sample: the answers are the same, as a NaN makes the sum NaN, which
// admits nothing, and −0 and +0 compare equal.
func (b *Band) Admits(v, tol float64) bool {
	if b.n == 0 {
		return true
	}
	n := float64(b.n + 1)
	sum := b.sum + v
	hi, lo := b.max, b.min
	if v > hi {
		hi = v
	}
	if v < lo {
		lo = v
	}
	return n*hi-sum <= n*tol && sum-n*lo <= n*tol
}

// Add puts v in the band.
func (b *Band) Add(v float64) {
	if b.n == 0 {
		b.min, b.max = v, v
	}
	b.n++
	b.sum += v
	if v > b.max {
		b.max = v
	}
	if v < b.min {
		b.min = v
	}
}

// Mean returns the band's mean speed (0 when empty).
func (b *Band) Mean() float64 {
	if b.n == 0 {
		return 0
	}
	return b.sum / float64(b.n)
}
