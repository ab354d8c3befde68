package fuse

import (
	"cmp"
	"slices"
	"sort"
)

// Merged sufficient statistics. Every element of a group's contribution to
// Λ = Λ₀ + Xᵀ Σ⁻¹ X and to b = Λ₀ μ₀ + Xᵀ Σ⁻¹ y is a coefficient times a
// basis function of φ,
//
//	v(φ) = κ_e⁻²·F_s(φ)^k·w^d,   F_s = exp(Σ_t pow_t φ_t),  w = φ_wind,
//
// with κ_e the inflation of the group's entry (1 unless the robust layer
// widens it), s its scale set, k ≤ 2 the power of F and d ≤ 4 the power of
// the wind (see group). Groups of one entry, scale set and wind that touch
// the same element of Λ — every run of a configuration touches its lift
// and the sensor's offset — differ only in the coefficient, so the
// coefficients are summed once when the model is built and a conditioning
// costs one multiply-add per distinct (element, basis) pair:
//
//	Λ_ij(φ) = Λ₀_ij + Σ_k v_k(φ)·C_k,ij,   b_i(φ) = (Λ₀μ₀)_i + Σ_k v_k(φ)·c_k,i.
//
// The same table gives the derivatives of Λ and b in φ for the gradient
// of the Laplace fit (gradient.go): ∂v/∂φ_t = k·pow_t·v for a scale,
// ∂v/∂w = d·κ_e⁻²·F^k·w^(d−1) for the wind.
type basis struct {
	entry, set, wind, fpow, deg int
}

// termTable holds, per basis k, the elements of Λ (positions in the
// envelope storage, see layout) and of b (layout positions) it adds to,
// with their coefficients: lamIdx[lamPtr[k]:lamPtr[k+1]], and so on.
type termTable struct {
	bases          []basis
	lamPtr, bPtr   []int
	lamIdx, bIdx   []int32
	lamCoef, bCoef []float64
	// lamRow, lamCol are the positions (i ≥ j) of each element of lamIdx
	lamRow, lamCol []int32
	yWy            []float64 // per entry: Σ yᵀΣ⁻¹y of its grouped rows
}

// termBuilder merges coefficients by basis and element.
type termBuilder struct {
	index map[basis]int
	lam   []map[int32]float64
	b     []map[int32]float64
}

func (tb *termBuilder) basis(k basis) int {
	i, ok := tb.index[k]
	if !ok {
		i = len(tb.lam)
		tb.index[k] = i
		tb.lam = append(tb.lam, map[int32]float64{})
		tb.b = append(tb.b, map[int32]float64{})
	}
	return i
}

// buildTerms merges the groups' coefficients into the model's term table;
// the layout must be built (group columns know their positions).
func (m *model) buildTerms() {
	tb := &termBuilder{index: map[basis]int{}}
	t := &termTable{yWy: make([]float64, len(m.entries))}
	for gi := range m.groups {
		g := &m.groups[gi]
		t.yWy[g.entry] += g.yWy
		nc := len(g.cols)
		for j, cj := range g.cols {
			for d, c := range g.b[j] {
				if c != 0 {
					k := tb.basis(basis{g.entry, g.set, g.wind, cj.fpow(), d})
					tb.b[k][int32(cj.at)] += c
				}
			}
			for kk := j; kk < nc; kk++ {
				ck := g.cols[kk]
				twice := 1.0
				if kk != j && ck.at == cj.at {
					twice = 2 // x_j·x_k and x_k·x_j on one diagonal element
				}
				idx := int32(m.lay.sym(cj.at, ck.at))
				for d, c := range g.lam[j*nc+kk] {
					if c != 0 {
						k := tb.basis(basis{g.entry, g.set, g.wind, cj.fpow() + ck.fpow(), d})
						tb.lam[k][idx] += twice * c
					}
				}
			}
		}
	}
	t.bases = make([]basis, len(tb.lam))
	for k, i := range tb.index {
		t.bases[i] = k
	}
	t.lamPtr, t.lamIdx, t.lamCoef = flattenTerms(tb.lam)
	t.bPtr, t.bIdx, t.bCoef = flattenTerms(tb.b)
	t.lamRow, t.lamCol = m.lay.elements(t.lamIdx)
	m.terms = t
}

// elements returns the row and column (i ≥ j) of elements of the envelope
// storage given by their index base[i] + j. Row i takes the indices
// base[i] + first[i] … base[i] + i, rows one after another.
func (l *layout) elements(idx []int32) (rows, cols []int32) {
	rows, cols = make([]int32, len(idx)), make([]int32, len(idx))
	p := len(l.base)
	for n, at := range idx {
		i := sort.Search(p, func(i int) bool { return l.base[i]+l.first[i] > int(at) }) - 1
		rows[n], cols[n] = int32(i), at-int32(l.base[i])
	}
	return rows, cols
}

// flattenTerms lays out per-basis maps as one index and one coefficient
// slice, each basis's elements in ascending order.
func flattenTerms(per []map[int32]float64) ([]int, []int32, []float64) {
	ptr := make([]int, 1, len(per)+1)
	var idx []int32
	var coef []float64
	for _, mp := range per {
		lo := len(idx)
		for i, c := range mp {
			idx, coef = append(idx, i), append(coef, c)
		}
		type ic struct {
			i int32
			c float64
		}
		part := make([]ic, len(idx)-lo)
		for j := range part {
			part[j] = ic{idx[lo+j], coef[lo+j]}
		}
		slices.SortFunc(part, func(a, b ic) int { return cmp.Compare(a.i, b.i) })
		for j, x := range part {
			idx[lo+j], coef[lo+j] = x.i, x.c
		}
		ptr = append(ptr, len(idx))
	}
	return ptr, idx, coef
}

// basisValues returns v_k(φ) of every basis into dst; fs are the scale
// factors F_s of the model's scale sets at φ.
func (m *model) basisValues(phi, fs, dst []float64) []float64 {
	dst = grow(dst, len(m.terms.bases))
	for k, bs := range m.terms.bases {
		kp := m.inflate[bs.entry]
		v := 1 / (kp * kp)
		switch bs.fpow {
		case 1:
			v *= fs[bs.set]
		case 2:
			v *= fs[bs.set] * fs[bs.set]
		}
		if bs.deg > 0 {
			w := phi[bs.wind]
			for range bs.deg {
				v *= w
			}
		}
		dst[k] = v
	}
	return dst
}

// addTerms adds Σ_k v_k·C_k to lam and Σ_k v_k·c_k to b, and returns the
// grouped rows' yᵀΣ⁻¹y under the model's inflation.
func (m *model) addTerms(vals, lam, b []float64) float64 {
	t := m.terms
	for k, v := range vals {
		idx, coef := t.lamIdx[t.lamPtr[k]:t.lamPtr[k+1]], t.lamCoef[t.lamPtr[k]:t.lamPtr[k+1]]
		for j, i := range idx {
			lam[i] += v * coef[j]
		}
		idx, coef = t.bIdx[t.bPtr[k]:t.bPtr[k+1]], t.bCoef[t.bPtr[k]:t.bPtr[k+1]]
		for j, i := range idx {
			b[i] += v * coef[j]
		}
	}
	var yWy float64
	for e, y := range t.yWy {
		k := m.inflate[e]
		yWy += y / (k * k)
	}
	return yWy
}
