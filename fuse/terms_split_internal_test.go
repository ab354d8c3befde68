package fuse

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestConstantTermsExact: Λ and b of a conditioning, which start from the
// prior's lam0 and b0 with the constant pairs already added
// (splitConstant), equal to the bit those summed the plain way — the
// prior, then every pair of the term table in basis order — on campaigns
// of 2 and 5 configurations, with an entry's errors inflated by the
// robust layer (constant bases then worth κ⁻², not 1), and on
// offsetModel's log-normal nuisances, at random φ. A pair added twice or
// dropped, or the constant pairs added in another order, fails it; these
// models have no constant pair after a varying one on the same element,
// which TestSplitPairs works by hand.
func TestConstantTermsExact(t *testing.T) {
	for _, tc := range []struct {
		name    string
		n       int
		inflate bool
	}{
		{"2-constant", 2, false},
		{"5-robust", 5, true},
		{"offsets", 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			m := scaleModelOr(t, tc.n)
			if tc.inflate {
				m = m.variant(map[int]bool{0: true, len(m.entries) - 1: true}, true, true)
			}
			pre := 0
			for _, p := range m.terms.lamPre {
				if p {
					pre++
				}
			}
			if pre == 0 {
				t.Fatal("no constant pair: the test would not exercise the split")
			}
			rng := rand.New(rand.NewPCG(5, uint64(tc.n)))
			for range 3 {
				phi := randomPhi(m, 0.5, rng)
				var c cond
				if err := m.condition(phi, &c); err != nil {
					t.Fatal(err)
				}
				lam, b := plainTerms(m, phi)
				for i := range lam {
					if math.Float64bits(lam[i]) != math.Float64bits(c.lam[i]) {
						t.Fatalf("Λ element %d: %v, summed plainly %v", i, c.lam[i], lam[i])
					}
				}
				for i := range b {
					if math.Float64bits(b[i]) != math.Float64bits(c.b[i]) {
						t.Fatalf("b element %d: %v, summed plainly %v", i, c.b[i], b[i])
					}
				}
			}
		})
	}
}

// scaleModelOr is scaleModel of n configurations, or offsetModel for 0.
func scaleModelOr(t *testing.T, n int) *model {
	if n == 0 {
		return offsetModel(t, 2, false)
	}
	return scaleModel(t, n, false)
}

// plainTerms sums Λ and b of the grouped rows at φ the plain way: the
// prior, then every pair of the term table, basis by basis.
func plainTerms(m *model, phi []float64) (lam, b []float64) {
	lay, pr, t := m.lay, m.priorTerms(), m.terms
	lam, b = make([]float64, lay.size), make([]float64, len(m.lin))
	for i := range m.lin {
		at := lay.pos[i]
		lam[lay.base[at]+at] = pr.prec[i]
		b[at] = pr.prec[i] * m.lin[i].mean
	}
	vals := m.basisValues(phi, m.scaleFactors(phi, nil), nil)
	for k, v := range vals {
		for n := t.lamPtr[k]; n < t.lamPtr[k+1]; n++ {
			lam[t.lamIdx[n]] += v * t.lamCoef[n]
		}
		for n := t.bPtr[k]; n < t.bPtr[k+1]; n++ {
			b[t.bIdx[n]] += v * t.bCoef[n]
		}
	}
	return lam, b
}

// TestSplitPairs: a constant basis's pair goes to the prior's start only
// on an element no varying basis touched before it (common practice (no
// source): hand-worked table).
func TestSplitPairs(t *testing.T) {
	constant, wind := basis{f1: -1, f2: -1}, basis{f1: -1, f2: -1, deg: 1}
	for _, tc := range []struct {
		name      string
		bases     []basis
		ptr       []int
		idx       []int32
		wantPre   []bool
		wantPtrV  []int
		wantIdxV  []int32
		wantCoefV []float64
	}{
		{"constant first", []basis{constant, wind, constant}, []int{0, 2, 3, 5}, []int32{0, 1, 1, 0, 1},
			[]bool{true, true, false, true, false}, []int{0, 0, 1, 2}, []int32{1, 1}, []float64{3, 5}},
		{"constants after a varying basis", []basis{constant, wind, constant, constant}, []int{0, 2, 3, 4, 5}, []int32{0, 1, 1, 1, 1},
			[]bool{true, true, false, false, false}, []int{0, 0, 1, 2, 3}, []int32{1, 1, 1}, []float64{3, 4, 5}},
		{"varying first", []basis{wind, constant}, []int{0, 1, 3}, []int32{2, 0, 2},
			[]bool{false, true, false}, []int{0, 1, 2}, []int32{2, 2}, []float64{1, 3}},
		{"no constant", []basis{wind}, []int{0, 2}, []int32{0, 1},
			[]bool{false, false}, []int{0, 2}, []int32{0, 1}, []float64{1, 2}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			coef := make([]float64, len(tc.idx))
			for i := range coef {
				coef[i] = float64(i + 1)
			}
			ptrV, idxV, coefV, pre := splitPairs(tc.bases, tc.ptr, tc.idx, coef, 3)
			if !slices.Equal(pre, tc.wantPre) || !slices.Equal(ptrV, tc.wantPtrV) || !slices.Equal(idxV, tc.wantIdxV) || !slices.Equal(coefV, tc.wantCoefV) {
				t.Errorf("pre %v ptr %v idx %v coef %v, want %v %v %v %v", pre, ptrV, idxV, coefV, tc.wantPre, tc.wantPtrV, tc.wantIdxV, tc.wantCoefV)
			}
		})
	}
}
