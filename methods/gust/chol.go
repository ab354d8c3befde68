package gust

import (
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// The small dense algebra of the restricted likelihood's blocks (a few
// columns each), on row-major slices, without allocation.

// cholesky factorises the symmetric positive definite n×n matrix a (its
// lower triangle read) in place into L, a = L·Lᵀ (LAPACK's dpotrf, through
// gonum), and returns log det a = 2·Σ log L_ii. ok is false if a is not
// positive definite.
func cholesky(a []float64, n int) (logDet float64, ok bool) {
	if n == 0 {
		return 0, true
	}
	t, ok := lapack64.Potrf(blas64.Symmetric{Uplo: blas.Lower, N: n, Stride: n, Data: a[:n*n]})
	if !ok {
		return 0, false
	}
	for j := range n {
		logDet += 2 * math.Log(t.Data[j*n+j])
	}
	return logDet, true
}

// forwardSolve overwrites x with L⁻¹x, L the n×n lower factor in l
// (dtrsv, through gonum).
func forwardSolve(l []float64, n int, x []float64) {
	if n == 0 {
		return
	}
	L := blas64.Triangular{Uplo: blas.Lower, Diag: blas.NonUnit, N: n, Stride: n, Data: l[:n*n]}
	blas64.Trsv(blas.NoTrans, L, blas64.Vector{N: n, Inc: 1, Data: x[:n]})
}

// rankOne adds alpha·x·yᵀ to the r×c matrix a (dger, through gonum).
func rankOne(a []float64, r, c int, alpha float64, x, y []float64) {
	if r == 0 || c == 0 {
		return
	}
	blas64.Ger(alpha, blas64.Vector{N: r, Inc: 1, Data: x[:r]}, blas64.Vector{N: c, Inc: 1, Data: y[:c]},
		blas64.General{Rows: r, Cols: c, Stride: c, Data: a[:r*c]})
}
