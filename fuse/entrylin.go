package fuse

import (
	"math"
	"slices"
)

// The linearisation of one entry's data, kept sparse. Each row of an
// entry reads its configuration's β and γ, its own and shared nuisances and
// the few φ its factors depend on (scale sets, wind, log-normal
// nuisances): a handful of the model's D parameters, while D grows with the
// configurations. So J = ∂μ_e/∂(θ, φ) and G = Σ_e⁻¹J are kept as the
// non-zero entries of each row, and what the predictive check builds from
// them (F = JᵀG, Gᵀy) costs the rows' non-zeros instead of rows × D.

// entryLin is J and G = Σ⁻¹J of entry e's rows, in the order of its blocks
// and of each block's rows; each row's entries are in ascending column of
// (θ, φ).
type entryLin struct {
	rows []int        // the model's index of each row
	J, G [][]entryRef // the non-zero entries of each row of J and of G
}

// entryLinear linearises entry e's rows at (θ, φ): J's row is exact in θ
// (the design row, a column listed twice summed in the design's order) and
// by central differences in φ with step h = 10⁻⁵·max(1, |φ_j|), as
// repeatJacobian computes it, over the φ the row's mean depends on (its
// scales, its wind, its log-normal nuisances: the others' differences are
// exactly zero). G's row is w·J's for a diagonal block, Σ_b P_ab J_b for a
// full one (b in order, P_ab = 0 skipped).
func (m *model) entryLinear(e int, theta, phi []float64) *entryLin {
	lin := &entryLin{}
	acc := newSparseAcc(m.dim())
	up, dn := slices.Clone(phi), slices.Clone(phi)
	var buf []entryRef
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.entry != e {
			continue
		}
		at := len(lin.J)
		for _, ri := range bl.rows {
			lin.rows = append(lin.rows, ri)
			buf = m.jacobianRow(&m.rows[ri], theta, phi, up, dn, acc, buf)
			lin.J = append(lin.J, acc.take())
		}
		nb := len(bl.rows)
		for a := range nb {
			if bl.diag != nil {
				if w := bl.diag[a]; w != 0 {
					for _, t := range lin.J[at+a] {
						acc.add(t.col, w*t.v)
					}
				}
				lin.G = append(lin.G, acc.take())
				continue
			}
			for b := range nb {
				w := bl.precD[a*nb+b]
				if w == 0 {
					continue
				}
				for _, t := range lin.J[at+b] {
					acc.add(t.col, w*t.v)
				}
			}
			lin.G = append(lin.G, acc.take())
		}
	}
	return lin
}

// jacobianRow accumulates row r's entries of J into acc (see entryLinear);
// up and dn are copies of φ, restored on return; buf is scratch, returned.
func (m *model) jacobianRow(r *row, theta, phi, up, dn []float64, acc *sparseAcc, buf []entryRef) []entryRef {
	buf = m.design(r, phi, buf[:0])
	for _, d := range buf {
		acc.add(d.col, d.v)
	}
	p := len(m.lin)
	for _, j := range rowPhis(r) {
		h := 1e-5 * math.Max(1, math.Abs(phi[j]))
		up[j] += h
		dn[j] -= h
		acc.add(p+j, (m.rowMean(r, theta, up, buf)-m.rowMean(r, theta, dn, buf))/(2*h))
		up[j], dn[j] = phi[j], phi[j]
	}
	return buf
}

// rowPhis returns the φ indices a row's mean depends on, ascending, each
// once: its scale sets', its wind's and its log-normal nuisances'.
func rowPhis(r *row) []int {
	var out []int
	for _, sc := range r.scales {
		out = append(out, sc.idx)
	}
	if r.wind >= 0 {
		out = append(out, r.wind)
	}
	for _, o := range r.offs {
		if o.idx >= 0 {
			out = append(out, o.idx)
		}
	}
	slices.Sort(out)
	return slices.Compact(out)
}

// sparseAcc accumulates a sparse row over D columns: each column's sum in
// the order its terms came, as a dense row would hold it.
type sparseAcc struct {
	val  []float64
	seen []bool
	cols []int
}

func newSparseAcc(D int) *sparseAcc {
	return &sparseAcc{val: make([]float64, D), seen: make([]bool, D)}
}

// add adds v to column c.
func (a *sparseAcc) add(c int, v float64) {
	if !a.seen[c] {
		a.seen[c] = true
		a.cols = append(a.cols, c)
	}
	a.val[c] += v
}

// take returns the accumulated entries in ascending column and clears the
// accumulator.
func (a *sparseAcc) take() []entryRef {
	slices.Sort(a.cols)
	out := make([]entryRef, len(a.cols))
	for i, c := range a.cols {
		out[i] = entryRef{c, a.val[c]}
		a.val[c], a.seen[c] = 0, false
	}
	a.cols = a.cols[:0]
	return out
}

// touched returns the parameters the entry's data touch, ascending: those
// whose diagonal element of F = JᵀΣ⁻¹J = JᵀG is positive (each a sum over
// the rows in order, as over a dense J).
func (lin *entryLin) touched(D int) []int {
	f := make([]float64, D)
	for r, jr := range lin.J {
		gr := lin.G[r]
		for _, t := range jr {
			if g, ok := entryAt(gr, t.col); ok {
				f[t.col] += t.v * g
			}
		}
	}
	var cols []int
	for i, v := range f {
		if v > 0 {
			cols = append(cols, i)
		}
	}
	return cols
}

// entryAt returns the value of column c in a row sorted by column.
func entryAt(row []entryRef, c int) (float64, bool) {
	i, ok := slices.BinarySearchFunc(row, c, func(t entryRef, c int) int { return t.col - c })
	if !ok {
		return 0, false
	}
	return row[i].v, true
}

// restrict returns the rows of G over the places of cols (pos: a column's
// place, −1 for one not among them), entries outside cols dropped.
func (lin *entryLin) restrict(pos []int) [][]entryRef {
	out := make([][]entryRef, len(lin.G))
	for r, gr := range lin.G {
		for _, t := range gr {
			if a := pos[t.col]; a >= 0 {
				out[r] = append(out[r], entryRef{a, t.v})
			}
		}
	}
	return out
}

// info returns F = JᵀG over the places of cols (nc of them; pos as for
// restrict), row-major nc×nc: for each row, the outer product of its
// entries of J and of G.
func (lin *entryLin) info(pos []int, nc int) []float64 {
	F := make([]float64, nc*nc)
	for r, jr := range lin.J {
		gr := lin.G[r]
		for _, t := range jr {
			a := pos[t.col]
			if a < 0 {
				continue
			}
			fa := F[a*nc : (a+1)*nc]
			for _, g := range gr {
				if b := pos[g.col]; b >= 0 {
					fa[b] += t.v * g.v
				}
			}
		}
	}
	return F
}
