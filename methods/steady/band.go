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
func (b *Band) Admits(v, tol float64) bool {
	if b.n == 0 {
		return true
	}
	n := float64(b.n + 1)
	sum := b.sum + v
	return n*max(b.max, v)-sum <= n*tol && sum-n*min(b.min, v) <= n*tol
}

// Add puts v in the band.
func (b *Band) Add(v float64) {
	if b.n == 0 {
		b.min, b.max = v, v
	}
	b.n++
	b.sum += v
	b.min, b.max = min(b.min, v), max(b.max, v)
}

// Mean returns the band's mean speed (0 when empty).
func (b *Band) Mean() float64 {
	if b.n == 0 {
		return 0
	}
	return b.sum / float64(b.n)
}
