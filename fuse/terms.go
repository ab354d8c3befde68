package fuse

import (
	"cmp"
	"slices"
	"sort"
)

// Merged sufficient statistics. Every element of a group's contribution to
// Λ = Λ₀ + Xᵀ Σ⁻¹ X, to b = Λ₀ μ₀ + Xᵀ Σ⁻¹ (y − o(φ)) and to
// (y − o)ᵀ Σ⁻¹ (y − o) is a coefficient times a basis function of φ,
//
//	v(φ) = κ_e⁻²·E₁(φ)·E₂(φ)·w^d,   E = exp(Σ_t pow_t φ_t),  w = φ_wind,
//
// with κ_e the inflation of the group's entry (1 unless the robust layer
// widens it), E₁ and E₂ the two columns' factors — F = s(φ) of the row's
// scale set for a lift column, G = e^{φ_g} for a log-normal nuisance's
// term (group.go), 1 otherwise — and d ≤ 4 the power of the wind (see
// group). Groups of one entry, factors and wind that touch the same
// element of Λ — every run of a configuration touches its lift and the
// sensor's offset — differ only in the coefficient, so the coefficients
// are summed once when the model is built and a conditioning costs one
// multiply-add per distinct (element, basis) pair:
//
//	Λ_ij(φ) = Λ₀_ij + Σ_k v_k(φ)·C_k,ij,   b_i(φ) = (Λ₀μ₀)_i + Σ_k v_k(φ)·c_k,i,
//	yᵀΣ⁻¹y(φ) = Σ_k v_k(φ)·y_k.
//
// The same table gives the derivatives of Λ, b and yᵀΣ⁻¹y in φ for the
// gradient of the Laplace fit (gradient.go): ∂v/∂φ_t = (pow_t of E₁ +
// pow_t of E₂)·v for a factor, ∂v/∂w = d·κ_e⁻²·E₁·E₂·w^(d−1) for the wind.
type basis struct {
	// f1 ≤ f2 are the factors' indices among the model's scaleSets, −1
	// for none (f1 = −1 when there is one).
	entry, f1, f2, wind, deg int
}

// termTable holds, per basis k, the elements of Λ (positions in the
// envelope storage, see layout) and of b (layout positions) it adds to,
// with their coefficients: lamIdx[lamPtr[k]:lamPtr[k+1]], and so on; and
// its coefficient of yᵀΣ⁻¹y.
type termTable struct {
	bases          []basis
	lamPtr, bPtr   []int
	lamIdx, bIdx   []int32
	lamCoef, bCoef []float64
	// lamRow, lamCol are the positions (i ≥ j) of each element of lamIdx
	lamRow, lamCol []int32
	yCoef          []float64 // per basis: its coefficient of yᵀΣ⁻¹y

	// The pairs a conditioning adds at every φ (see splitConstant):
	// lamIdxV[lamPtrV[k]:lamPtrV[k+1]] and so on; lamPre and bPre mark
	// the pairs of lamIdx and bIdx left out, which the prior's start
	// (prior.lam0, prior.b0) holds instead.
	lamPtrV, bPtrV   []int
	lamIdxV, bIdxV   []int32
	lamCoefV, bCoefV []float64
	lamPre, bPre     []bool
}

// constant reports whether a basis function does not depend on φ: no
// factor and no power of the wind (its value is the entry's κ⁻², fixed
// for a model).
func (bs basis) constant() bool { return bs.f1 < 0 && bs.f2 < 0 && bs.deg == 0 }

// splitConstant finds the pairs of the table whose sum does not change
// with φ: those of a constant basis on an element of Λ (or b) that no
// varying basis before it touches. Each element's sum runs over the bases
// in order, so those pairs come first in it, and a model adds them once,
// into its prior's start (priorTerms), leaving the others to every
// conditioning: the same additions in the same order, so the same Λ and b
// to the bit. Most such pairs are a sensor's offsets, seen at every run.
func (t *termTable) splitConstant(lamSize, p int) {
	t.lamPtrV, t.lamIdxV, t.lamCoefV, t.lamPre = splitPairs(t.bases, t.lamPtr, t.lamIdx, t.lamCoef, lamSize)
	t.bPtrV, t.bIdxV, t.bCoefV, t.bPre = splitPairs(t.bases, t.bPtr, t.bIdx, t.bCoef, p)
}

// splitPairs is splitConstant for one of Λ and b, of size elements.
func splitPairs(bases []basis, ptr []int, idx []int32, coef []float64, size int) ([]int, []int32, []float64, []bool) {
	varied := make([]bool, size) // touched by a varying basis so far
	pre := make([]bool, len(idx))
	ptrV := make([]int, 1, len(bases)+1)
	var idxV []int32
	var coefV []float64
	for k, bs := range bases {
		c := bs.constant()
		for n := ptr[k]; n < ptr[k+1]; n++ {
			i := idx[n]
			if c && !varied[i] {
				pre[n] = true
				continue
			}
			varied[i] = varied[i] || !c
			idxV, coefV = append(idxV, i), append(coefV, coef[n])
		}
		ptrV = append(ptrV, len(idxV))
	}
	return ptrV, idxV, coefV, pre
}

// addConstant adds the pairs splitConstant left out, Σ v_k·C_k over them,
// to lam and b: the values vals of the constant bases are all it reads.
func (m *model) addConstant(vals, lam, b []float64) {
	t := m.terms
	for k, bs := range t.bases {
		if !bs.constant() {
			continue
		}
		v := vals[k]
		for n := t.lamPtr[k]; n < t.lamPtr[k+1]; n++ {
			if t.lamPre[n] {
				lam[t.lamIdx[n]] += v * t.lamCoef[n]
			}
		}
		for n := t.bPtr[k]; n < t.bPtr[k+1]; n++ {
			if t.bPre[n] {
				b[t.bIdx[n]] += v * t.bCoef[n]
			}
		}
	}
}

// termBuilder merges coefficients by basis and element.
type termBuilder struct {
	index map[basis]int
	lam   []map[int32]float64
	b     []map[int32]float64
	y     []float64
	lay   *layout
}

// basis returns the index of the basis of group g's columns' factors f1,
// f2 (−1: none) and wind power d, adding it when new.
func (tb *termBuilder) basis(g *group, f1, f2, d int) int {
	if f1 > f2 {
		f1, f2 = f2, f1
	}
	k := basis{g.entry, f1, f2, g.wind, d}
	i, ok := tb.index[k]
	if !ok {
		i = len(tb.lam)
		tb.index[k] = i
		tb.lam = append(tb.lam, map[int32]float64{})
		tb.b = append(tb.b, map[int32]float64{})
		tb.y = append(tb.y, 0)
	}
	return i
}

// buildTerms merges the groups' coefficients into the model's term table;
// the layout must be built (group columns know their positions).
func (m *model) buildTerms() {
	tb := &termBuilder{index: map[basis]int{}, lay: m.lay}
	for gi := range m.groups {
		g := &m.groups[gi]
		tb.y[tb.basis(g, -1, -1, 0)] += g.yWy
		for j, cj := range g.cols {
			for d, c := range g.b[j] {
				if c == 0 {
					continue
				}
				k := tb.basis(g, cj.factor(g), -1, d)
				if cj.kind == colOffset {
					tb.y[k] -= 2 * c // (y − o)ᵀΣ⁻¹(y − o) ∋ −2 yᵀΣ⁻¹o
				} else {
					tb.b[k][int32(cj.at)] += c
				}
			}
			for kk := j; kk < len(g.cols); kk++ {
				tb.addPair(g, j, kk)
			}
		}
	}
	t := &termTable{bases: make([]basis, len(tb.lam)), yCoef: tb.y}
	for k, i := range tb.index {
		t.bases[i] = k
	}
	t.lamPtr, t.lamIdx, t.lamCoef = flattenTerms(tb.lam)
	t.bPtr, t.bIdx, t.bCoef = flattenTerms(tb.b)
	t.lamRow, t.lamCol = m.lay.elements(t.lamIdx)
	t.splitConstant(m.lay.size, len(m.lin))
	m.terms = t
}

// addPair merges the coefficients of columns j ≤ kk of group g: an element
// of Λ for two design columns, of −Xᵀ Σ⁻¹ o in b for a design column and
// an offset, of oᵀΣ⁻¹o for two offsets.
func (tb *termBuilder) addPair(g *group, j, kk int) {
	cj, ck := g.cols[j], g.cols[kk]
	offJ, offK := cj.kind == colOffset, ck.kind == colOffset
	twice := 1.0
	if kk != j && (offJ && offK || !offJ && !offK && ck.at == cj.at) {
		twice = 2 // x_j·x_k and x_k·x_j on one element
	}
	for d, c := range g.lam[j*len(g.cols)+kk] {
		if c == 0 {
			continue
		}
		k := tb.basis(g, cj.factor(g), ck.factor(g), d)
		switch {
		case offJ && offK:
			tb.y[k] += twice * c
		case offJ:
			tb.b[k][int32(ck.at)] -= c
		case offK:
			tb.b[k][int32(cj.at)] -= c
		default:
			tb.lam[k][int32(tb.lay.sym(cj.at, ck.at))] += twice * c
		}
	}
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

// basisValues returns v_k(φ) of every basis into dst; fs are the factors
// of the model's scaleSets at φ.
func (m *model) basisValues(phi, fs, dst []float64) []float64 {
	dst = grow(dst, len(m.terms.bases))
	for k, bs := range m.terms.bases {
		kp := m.inflate[bs.entry]
		v := 1 / (kp * kp)
		v *= bs.factors(fs)
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

// factors returns E₁·E₂ of a basis (see basisValues).
func (bs basis) factors(fs []float64) float64 {
	switch {
	case bs.f1 >= 0:
		return fs[bs.f1] * fs[bs.f2]
	case bs.f2 >= 0:
		return fs[bs.f2]
	}
	return 1
}

// addTerms adds Σ_k v_k·C_k to lam and Σ_k v_k·c_k to b, but for the pairs
// that the prior's start holds (see splitConstant), and returns the
// grouped rows' (y − o)ᵀΣ⁻¹(y − o), Σ_k v_k·y_k.
func (m *model) addTerms(vals, lam, b []float64) float64 {
	t := m.terms
	var yWy float64
	for k, v := range vals {
		idx, coef := t.lamIdxV[t.lamPtrV[k]:t.lamPtrV[k+1]], t.lamCoefV[t.lamPtrV[k]:t.lamPtrV[k+1]]
		for j, i := range idx {
			lam[i] += v * coef[j]
		}
		idx, coef = t.bIdxV[t.bPtrV[k]:t.bPtrV[k+1]], t.bCoefV[t.bPtrV[k]:t.bPtrV[k+1]]
		for j, i := range idx {
			b[i] += v * coef[j]
		}
		yWy += v * t.yCoef[k]
	}
	return yWy
}
