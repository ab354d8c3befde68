package gust

import "math"

// The small dense algebra of the restricted likelihood's blocks (a few
// columns each), on row-major slices, without allocation.

// cholesky factorises the symmetric positive definite n×n matrix a (its
// lower triangle read) in place into L, a = L·Lᵀ, and returns log det a.
// ok is false if a is not positive definite (Golub & Van Loan, Matrix
// Computations, Algorithm 4.2.1 — from memory).
func cholesky(a []float64, n int) (logDet float64, ok bool) {
	for j := range n {
		d := a[j*n+j]
		for k := range j {
			d -= a[j*n+k] * a[j*n+k]
		}
		if !(d > 0) {
			return 0, false
		}
		d = math.Sqrt(d)
		a[j*n+j] = d
		logDet += 2 * math.Log(d)
		for i := j + 1; i < n; i++ {
			v := a[i*n+j]
			for k := range j {
				v -= a[i*n+k] * a[j*n+k]
			}
			a[i*n+j] = v / d
		}
	}
	return logDet, true
}

// forwardSolve overwrites x with L⁻¹x, L the n×n lower factor in l.
func forwardSolve(l []float64, n int, x []float64) {
	for i := range n {
		v := x[i]
		for k := range i {
			v -= l[i*n+k] * x[k]
		}
		x[i] = v / l[i*n+i]
	}
}

// rankOne adds alpha·x·yᵀ to the r×c matrix a.
func rankOne(a []float64, r, c int, alpha float64, x, y []float64) {
	for i := range r {
		ax := alpha * x[i]
		row := a[i*c : (i+1)*c]
		for j := range row {
			row[j] += ax * y[j]
		}
	}
}

// axpy adds alpha·x to y.
func axpy(y []float64, alpha float64, x []float64) {
	for i := range y {
		y[i] += alpha * x[i]
	}
}

func dot(x, y []float64) float64 {
	var s float64
	for i := range x {
		s += x[i] * y[i]
	}
	return s
}
