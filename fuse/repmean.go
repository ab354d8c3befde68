package fuse

import (
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// The replicates' prediction term A·(μ_e(x) − μ̄) without a pass over the
// entry's rows. A row's mean (see row) is linear in θ given φ, and φ enters
// it through few factors: its scale set's s(φ), its wind's q(w) = q0 + a·w
// + c·w², the log-normal nuisances' e^φ. So, rows grouped by those
// factors,
//
//	A·μ_e(x) = Σ_terms s·w^π · M_term·x_cols + Σ_offsets s·w^π · a_offset,
//
// with M_term = Σ_rows c_π(row)·A_row·w_rowᵀ (A_row the row's column of A,
// c_π the row's q0, a or c, w_row its design weights) over the columns the
// rows of the term read. A term costs k × its columns, and the terms'
// columns grow with the configurations as the rows do; a replicate no
// longer costs rows × (design + k), which at 24 configurations was 771
// rows for 24 rows of A.

// repMean is A·μ_e(x) − A·μ̄ as terms (see above).
type repMean struct {
	terms []*repTerm
	base  []float64 // −A·μ̄
}

// repTerm is one term: factor fs[set] (set −1: 1) times w^pow for the wind
// φ_wind (wind −1: 1), times M·x[cols], or, for a log-normal nuisance's
// offset, times vec (set when the term is made; cols then stays empty).
type repTerm struct {
	set, wind, pow int
	cols           []int
	at             map[int]int // a column's place in cols
	m              [][]float64 // per column of cols, its k values of M
	vec            []float64
}

type repKey struct{ set, wind, pow, off int }

// newRepMean builds the terms of A·μ_e(x) for A (k×n) over the rows (the
// model's indices, in A's column order) and μ̄ (mu).
func (m *model) newRepMean(A *mat.Dense, rows []int, mu []float64) *repMean {
	k, _ := A.Dims()
	rm := &repMean{base: make([]float64, k)}
	byKey := map[repKey]*repTerm{}
	term := func(set, wind, pow, off int) *repTerm {
		key := repKey{set, wind, pow, off}
		if t, ok := byKey[key]; ok {
			return t
		}
		t := &repTerm{set: set, wind: wind, pow: pow, at: map[int]int{}}
		if off == 1 {
			t.vec = make([]float64, k)
		}
		byKey[key] = t
		rm.terms = append(rm.terms, t)
		return t
	}
	ar := make([]float64, k)
	for j, ri := range rows {
		r := &m.rows[ri]
		mat.Col(ar, j, A)
		floats.AddScaled(rm.base, -mu[j], ar)
		qs := [][2]float64{{0, r.q0}}
		wind := -1
		if r.wind >= 0 {
			wind, qs = r.wind, [][2]float64{{0, r.q0}, {1, r.a}, {2, r.c}}
		}
		for _, q := range qs {
			pow, c := int(q[0]), q[1]
			for _, ts := range [][]entryRef{r.lift, r.gamma} {
				term(r.scaleSet, wind, pow, 0).add(ts, c, ar)
			}
			term(-1, wind, pow, 0).add(r.nuisPerQ, c, ar)
			for _, o := range r.offs {
				if o.perQ {
					term(o.set, wind, pow, 1).addVec(o, c, ar)
				}
			}
		}
		term(-1, -1, 0, 0).add(r.nuis, 1, ar)
		for _, o := range r.offs {
			if !o.perQ {
				term(o.set, -1, 0, 1).addVec(o, 1, ar)
			}
		}
	}
	return rm
}

// add adds c·w·a to the column of each design entry (col, w).
func (t *repTerm) add(ts []entryRef, c float64, a []float64) {
	for _, e := range ts {
		i, ok := t.at[e.col]
		if !ok {
			i = len(t.cols)
			t.at[e.col] = i
			t.cols = append(t.cols, e.col)
			t.m = append(t.m, make([]float64, len(a)))
		}
		floats.AddScaled(t.m[i], c*e.v, a)
	}
}

// addVec adds c·v·a of a log-normal nuisance's term to the offset vector
// (the set −1 of a nuisance stated exactly is its idx −1).
func (t *repTerm) addVec(o offRef, c float64, a []float64) {
	floats.AddScaled(t.vec, c*o.v, a)
}

// eval writes A·μ_e(x) − A·μ̄ into t (k), fs the scale factors at x's φ
// (see model.scaleFactors).
func (rm *repMean) eval(m *model, x, fs, t []float64) {
	phi := x[len(m.lin):]
	copy(t, rm.base)
	for _, tm := range rm.terms {
		f := 1.0
		if tm.set >= 0 {
			f = fs[tm.set]
		}
		if tm.wind >= 0 && tm.pow > 0 {
			w := phi[tm.wind]
			f *= w
			if tm.pow == 2 {
				f *= w
			}
		}
		if tm.vec != nil {
			floats.AddScaled(t, f, tm.vec)
			continue
		}
		for i, c := range tm.cols {
			if v := f * x[c]; v != 0 {
				floats.AddScaled(t, v, tm.m[i])
			}
		}
	}
}
