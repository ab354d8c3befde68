package fuse

import (
	"math"

	"gonum.org/v1/gonum/floats"
)

// A small envelope (profile) Cholesky factorisation for the conditional
// posterior's precision matrix: Λ = L·Lᵀ with L lower triangular, each
// row's envelope stored one after another (layout.base), in the order of
// the model's layout. Row i of
// Λ, and of L, is zero left of first[i] (the envelope keeps the fill:
// George & Liu 1981, ch. 4 — from memory), so each row is worked only from
// there; with the arrowhead layout (see layout) the cost is linear in the
// number of configurations. Hand-written because the general
// factorisation also estimates a condition number and ignores the
// envelope. Entries of l outside the envelope are never written nor read.

// longDot is the length from which a row's dot product is left to
// gonum's vectorised one (the shared nuisances' rows, which span every
// configuration); shorter ones stay inline, where a call would cost more.
const longDot = 32

// cholesky factorises the symmetric positive-definite a (its lower
// triangle's envelope, stored as l is) into l. It reports false if a is
// not positive definite.
func cholesky(a, l []float64, lay *layout) bool {
	first, base := lay.first, lay.base
	for i := range len(first) {
		fi := first[i]
		li := l[base[i] : base[i]+i+1]
		ai := a[base[i] : base[i]+i+1]
		for j := fi; j < i; j++ {
			fj := first[j]
			if fj == j {
				// Row j is its diagonal alone (a run's wind, say): there
				// is nothing to subtract, L_jj is all. The general path
				// gives the same quotient, but forming its empty sum for
				// the many such rows cost a quarter of the factorisation
				// at 24 configurations (12.3 against 9.0 µs).
				li[j] = ai[j] / l[base[j]+j]
				continue
			}
			lj := l[base[j] : base[j]+j+1]
			s := ai[j]
			if k0 := max(fi, fj); j-k0 >= longDot {
				s -= floats.Dot(li[k0:j], lj[k0:j])
			} else {
				for k := k0; k < j; k++ {
					s -= li[k] * lj[k]
				}
			}
			li[j] = s / lj[j]
		}
		s := ai[i]
		if i-fi >= longDot {
			s -= floats.Dot(li[fi:i], li[fi:i])
		} else {
			for k := fi; k < i; k++ {
				s -= li[k] * li[k]
			}
		}
		if !(s > 0) {
			return false
		}
		li[i] = math.Sqrt(s)
	}
	return true
}

// forward solves L·x = b in place.
func forward(l, x []float64, lay *layout) {
	first, base := lay.first, lay.base
	for i := range len(first) {
		s := x[i]
		li := l[base[i] : base[i]+i+1]
		if fi := first[i]; i-fi >= longDot {
			s -= floats.Dot(li[fi:i], x[fi:i])
		} else {
			for k := fi; k < i; k++ {
				s -= li[k] * x[k]
			}
		}
		x[i] = s / li[i]
	}
}

// backward solves Lᵀ·x = b in place, column by column of L.
func backward(l, x []float64, lay *layout) {
	first, base := lay.first, lay.base
	for i := len(first) - 1; i >= 0; i-- {
		li := l[base[i] : base[i]+i+1]
		x[i] /= li[i]
		xi := x[i]
		if fi := first[i]; i-fi >= longDot {
			floats.AddScaled(x[fi:i], -xi, li[fi:i])
		} else {
			for k := fi; k < i; k++ {
				x[k] -= li[k] * xi
			}
		}
	}
}

// logDetChol returns log|Λ| = 2·Σ log L_ii, taking one logarithm of the
// product (kept in range by splitting off binary exponents as it grows).
func logDetChol(l []float64, lay *layout) float64 {
	m, e := 1.0, 0
	for i, b := range lay.base {
		f, x := frexp(m * l[b+i])
		m, e = f, e+x
	}
	return 2 * (math.Log(m) + float64(e)*math.Ln2)
}

// frexp is math.Frexp, its exponent read from the bits where x is a
// normal number (math.Frexp's checks for zero, subnormals, infinities and
// NaN cost a call each; they are left to it).
func frexp(x float64) (float64, int) {
	const mask, shift, bias = 0x7ff, 52, 1023
	b := math.Float64bits(x)
	e := int(b>>shift) & mask
	if e == 0 || e == mask {
		return math.Frexp(x)
	}
	b = b&^(mask<<shift) | (bias-1)<<shift
	return math.Float64frombits(b), e - bias + 1
}

// cholRev is the reverse mode of cholesky: given lbar = ∂f/∂L on the
// envelope, it overwrites lbar with ∂f/∂Λ for the lower triangle of Λ (the
// elements cholesky reads), so that df = Σ_{i≥j} Λ̄_ij dΛ_ij. It is the
// unblocked algorithm of I. Murray, "Differentiation of the Cholesky
// decomposition" (arXiv:1602.07527, 2016), column j from the last to the
// first, with r = L[j, :j], d = L_jj, c = L[j+1:, j] and B = L[j+1:, :j]:
//
//	d̄ ← (d̄ − cᵀc̄/d)/d,  c̄ ← c̄/d,  r̄ ← r̄ − d̄·r − Bᵀc̄,  B̄ ← B̄ − c̄ rᵀ,  d̄ ← d̄/2.
//
// Within the envelope only: an adjoint outside it multiplies entries of L
// that are zero, and feeds only adjoints outside it.
func cholRev(l, lbar []float64, lay *layout) {
	first, base := lay.first, lay.base
	for j := len(first) - 1; j >= 0; j-- {
		fj, bj := first[j], base[j]
		d := l[bj+j]
		rows := lay.colRow[lay.colPtr[j]:lay.colPtr[j+1]]
		dbar := lbar[bj+j]
		for _, k := range rows {
			at := base[k] + j
			dbar -= l[at] * lbar[at] / d
		}
		dbar /= d
		for _, k := range rows {
			lbar[base[k]+j] /= d
		}
		rbar, r := lbar[bj:bj+j], l[bj:bj+j]
		for q := fj; q < j; q++ {
			rbar[q] -= dbar * r[q]
		}
		for _, k := range rows {
			bk := base[k]
			cb := lbar[bk+j]
			lk, lbk := l[bk:bk+j], lbar[bk:bk+j]
			for q := max(fj, first[k]); q < j; q++ {
				rbar[q] -= cb * lk[q]
				lbk[q] -= cb * r[q]
			}
		}
		lbar[bj+j] = dbar / 2
	}
}
