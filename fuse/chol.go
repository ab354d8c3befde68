package fuse

import "math"

// A small dense Cholesky factorisation for the conditional posterior's
// precision matrix (tens of parameters): Λ = L·Lᵀ with L lower triangular,
// stored row-major in a p×p slice. Hand-written because the general
// factorisation also estimates a condition number, which costs more than
// the factorisation at this size and is not needed here.

// cholesky factorises the symmetric positive-definite a (row-major p×p, the
// lower triangle read) into l. It reports false if a is not positive
// definite.
func cholesky(a, l []float64, p int) bool {
	for j := range p {
		s := a[j*p+j]
		for k := range j {
			s -= l[j*p+k] * l[j*p+k]
		}
		if !(s > 0) {
			return false
		}
		d := math.Sqrt(s)
		l[j*p+j] = d
		for i := j + 1; i < p; i++ {
			s := a[i*p+j]
			for k := range j {
				s -= l[i*p+k] * l[j*p+k]
			}
			l[i*p+j] = s / d
		}
		for i := range j {
			l[i*p+j] = 0
		}
	}
	return true
}

// forward solves L·x = b in place.
func forward(l, x []float64, p int) {
	for i := range p {
		s := x[i]
		for k := range i {
			s -= l[i*p+k] * x[k]
		}
		x[i] = s / l[i*p+i]
	}
}

// backward solves Lᵀ·x = b in place.
func backward(l, x []float64, p int) {
	for i := p - 1; i >= 0; i-- {
		s := x[i]
		for k := i + 1; k < p; k++ {
			s -= l[k*p+i] * x[k]
		}
		x[i] = s / l[i*p+i]
	}
}

// logDetChol returns log|Λ| = 2·Σ log L_ii, taking one logarithm of the
// product (kept in range by splitting off binary exponents as it grows).
func logDetChol(l []float64, p int) float64 {
	m, e := 1.0, 0
	for i := range p {
		f, x := math.Frexp(m * l[i*p+i])
		m, e = f, e+x
	}
	return 2 * (math.Log(m) + float64(e)*math.Ln2)
}
