package fuse

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// Grouped sufficient statistics. Rows of a diagonal block that share their
// scale factors, wind and design columns differ only in numbers, and every
// element of their contribution to Xᵀ Σ⁻¹ X and Xᵀ Σ⁻¹ y is a polynomial in
// the wind w (q(w) = q0 + a·w + c·w² enters at most squared) times a power
// of the scale factor F = s(φ). Summing the polynomial coefficients once
// makes the cost of conditioning on φ independent of the number of rows.
//
// A row's terms of log-normal nuisances, o(φ) = Σ_g v_g·G_g·q(w)^{0 or 1}
// with G_g = e^{φ_g} (see offRef), are known given φ and shift the data:
// y − o(φ). They are kept as columns of kind colOffset beside the design
// columns, so that the same sums hold their products: a design column
// times an offset column is a term of −Xᵀ Σ⁻¹ o (of b), an offset's own
// terms are −2 yᵀΣ⁻¹o and oᵀΣ⁻¹o (of yᵀΣ⁻¹y) — see buildTerms.

// column kinds: how a design column depends on φ.
const (
	colFixed  = iota // constant: static offset, tyre growth, drift
	colPerQ          // ∝ q(w): a patch's Cp
	colLift          // ∝ F·q(w): the lift parameters
	colOffset        // a log-normal nuisance's term: ∝ G = e^φ, times q(w) when perQ
)

type gcol struct {
	col  int // column of θ; for an offset, its φ (−1: stated exactly)
	kind int
	perQ bool // an offset ∝ q(w)
	set  int  // an offset's factor G among the model's scaleSets, or −1
	at   int  // position of col in the model's layout (not for an offset)
}

// qpow is the power of q(w) in the column.
func (g gcol) qpow() int {
	switch g.kind {
	case colFixed:
		return 0
	case colOffset:
		if g.perQ {
			return 1
		}
		return 0
	}
	return 1
}

// key tells the columns of a block apart: a column of θ by its index, an
// offset by its φ and whether it scales with q.
func (g gcol) key() int {
	if g.kind != colOffset {
		return g.col
	}
	k := -2 * (g.col + 2)
	if g.perQ {
		k--
	}
	return k
}

// factor returns the index among the model's scaleSets of the column's
// φ-dependence e^{Σ pow·φ} in group gr: F for a lift column, G for an
// offset, −1 for none.
func (g gcol) factor(gr *group) int {
	switch g.kind {
	case colLift:
		return gr.set
	case colOffset:
		return g.set
	}
	return -1
}

// group is a set of rows with one structure.
type group struct {
	entry  int
	scales []phiRef
	set    int // index of scales in the model's scaleSets
	wind   int
	cols   []gcol
	lam    [][5]float64 // per pair j ≤ k: coefficients of w⁰…w⁴
	b      [][5]float64 // per column
	yWy    float64
}

// signature writes into b the key of a row's structure in entry's
// block (strconv, not fmt: a key per row of every fit's model).
func (m *model) signature(entry int, r *row, b []byte) []byte {
	b = appendTagged(b[:0], 'e', entry)
	b = appendTagged(append(b, '|'), 'w', r.wind)
	b = append(b, '|')
	for _, s := range r.scales {
		b = append(appendTagged(b, 's', s.idx), '^')
		b = append(strconv.AppendFloat(b, s.pow, 'g', -1, 64), ',')
	}
	for _, part := range []struct {
		tag  byte
		cols []entryRef
	}{{'L', r.lift}, {'G', r.gamma}, {'Q', r.nuisPerQ}, {'N', r.nuis}} {
		for _, c := range part.cols {
			b = append(appendTagged(b, part.tag, c.col), ',')
		}
	}
	for _, o := range r.offs {
		b = append(appendTagged(b, 'O', o.idx), ':')
		b = append(strconv.AppendBool(b, o.perQ), ',')
	}
	return b
}

// appendTagged appends tag and the decimal n.
func appendTagged(b []byte, tag byte, n int) []byte {
	return strconv.AppendInt(append(b, tag), int64(n), 10)
}

// rowValues returns a row's design columns and values (before F and q).
func rowValues(r *row) ([]gcol, []float64) { return rowValuesInto(r, nil, nil) }

// rowValuesInto is rowValues appending to cols and vals (from empty).
func rowValuesInto(r *row, cols []gcol, vals []float64) ([]gcol, []float64) {
	for _, c := range r.lift {
		cols, vals = append(cols, gcol{col: c.col, kind: colLift}), append(vals, c.v)
	}
	for _, c := range r.gamma {
		cols, vals = append(cols, gcol{col: c.col, kind: colLift}), append(vals, c.v)
	}
	for _, c := range r.nuisPerQ {
		cols, vals = append(cols, gcol{col: c.col, kind: colPerQ}), append(vals, c.v)
	}
	for _, c := range r.nuis {
		cols, vals = append(cols, gcol{col: c.col, kind: colFixed}), append(vals, c.v)
	}
	for _, o := range r.offs {
		cols, vals = append(cols, gcol{col: o.idx, kind: colOffset, perQ: o.perQ, set: o.set}), append(vals, o.v)
	}
	return cols, vals
}

// buildGroups sorts the rows of diagonal blocks into groups and the other
// blocks into fullBlocks.
func (m *model) buildGroups() {
	m.indexScaleSets()
	index := map[string]int{}
	var sig []byte
	var cols []gcol // a row's columns and values, reused from row to row
	var vals []float64
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.diag == nil {
			if !m.groupFullBlock(bl, index) {
				m.fullBlocks = append(m.fullBlocks, bi)
			}
			continue
		}
		for i, ri := range bl.rows {
			r := &m.rows[ri]
			sig = m.signature(bl.entry, r, sig)
			gi, ok := index[string(sig)]
			cols, vals = rowValuesInto(r, cols[:0], vals[:0])
			if !ok {
				gi = len(m.groups)
				index[string(sig)] = gi
				nc := len(cols)
				m.groups = append(m.groups, group{entry: bl.entry, scales: r.scales, set: r.scaleSet, wind: r.wind, cols: slices.Clone(cols),
					lam: make([][5]float64, nc*nc), b: make([][5]float64, nc)})
			}
			g := &m.groups[gi]
			wt := bl.diag[i]
			q := [3]float64{r.q0, r.a, r.c}
			q2 := [5]float64{q[0] * q[0], 2 * q[0] * q[1], 2*q[0]*q[2] + q[1]*q[1], 2 * q[1] * q[2], q[2] * q[2]}
			poly := func(pw int) [5]float64 {
				switch pw {
				case 0:
					return [5]float64{1}
				case 1:
					return [5]float64{q[0], q[1], q[2]}
				}
				return q2
			}
			nc := len(cols)
			for j := range nc {
				pj := poly(cols[j].qpow())
				for d := range 5 {
					g.b[j][d] += wt * vals[j] * r.y * pj[d]
				}
				for k := j; k < nc; k++ {
					pk := poly(cols[j].qpow() + cols[k].qpow())
					for d := range 5 {
						g.lam[j*nc+k][d] += wt * vals[j] * vals[k] * pk[d]
					}
				}
			}
			g.yWy += wt * r.y * r.y
		}
	}
	m.buildLayout()
	for gi := range m.groups {
		for j := range m.groups[gi].cols {
			if c := &m.groups[gi].cols[j]; c.kind != colOffset {
				c.at = m.lay.pos[c.col]
			}
		}
	}
	m.buildTerms()
	m.groups = nil
}

// qPoly returns the coefficients in w of q(w)^pw for a row, pw ≤ 2.
func qPoly(r *row, pw int) [5]float64 {
	q := [3]float64{r.q0, r.a, r.c}
	switch pw {
	case 0:
		return [5]float64{1}
	case 1:
		return [5]float64{q[0], q[1], q[2]}
	}
	return [5]float64{q[0] * q[0], 2 * q[0] * q[1], 2*q[0]*q[2] + q[1]*q[1], 2 * q[1] * q[2], q[2] * q[2]}
}

// polyMul returns the product of two polynomials in w of degrees whose sum
// is at most 4.
func polyMul(a, b [5]float64) [5]float64 {
	var out [5]float64
	for i, x := range a {
		if x == 0 {
			continue
		}
		for j := 0; i+j < 5; j++ {
			out[i+j] += x * b[j]
		}
	}
	return out
}

// groupFullBlock adds a block with a full error covariance to a group,
// when its rows share their wind and scales: then every element of its
// contribution Σ_ij P_ij x_i x_jᵀ is again a polynomial in w times a
// power of F, the rows' columns taken together. It reports false for a
// block whose rows differ in wind or scales (conditioned row by row).
func (m *model) groupFullBlock(bl *block, index map[string]int) bool {
	r0 := &m.rows[bl.rows[0]]
	var cols []gcol
	at := map[int]int{}
	for _, ri := range bl.rows {
		r := &m.rows[ri]
		if r.wind != r0.wind || r.scaleSet != r0.scaleSet {
			return false
		}
		rc, _ := rowValues(r)
		for _, c := range rc {
			if j, ok := at[c.key()]; ok {
				if cols[j].kind != c.kind {
					return false
				}
				continue
			}
			at[c.key()] = len(cols)
			cols = append(cols, c)
		}
	}
	var sig strings.Builder
	fmt.Fprintf(&sig, "e%d|full|w%d|s%d|", bl.entry, r0.wind, r0.scaleSet)
	for _, c := range cols {
		fmt.Fprintf(&sig, "%d:%d,", c.key(), c.kind)
	}
	gi, ok := index[sig.String()]
	nc := len(cols)
	if !ok {
		gi = len(m.groups)
		index[sig.String()] = gi
		m.groups = append(m.groups, group{entry: bl.entry, scales: r0.scales, set: r0.scaleSet, wind: r0.wind, cols: cols,
			lam: make([][5]float64, nc*nc), b: make([][5]float64, nc)})
	}
	m.addFullBlock(&m.groups[gi], bl, at)
	return true
}

// addFullBlock adds Σ_ij P_ij x_i x_jᵀ, Σ_ij P_ij x_i y_j and Σ_ij P_ij y_i y_j
// of a block to a group's coefficients; at maps a column of θ to its
// index among the group's columns.
func (m *model) addFullBlock(g *group, bl *block, at map[int]int) {
	n, nc := len(bl.rows), len(g.cols)
	vals := make([][]float64, n)
	for i, ri := range bl.rows {
		vals[i] = make([]float64, nc)
		rc, rv := rowValues(&m.rows[ri])
		for k, c := range rc {
			vals[i][at[c.key()]] += rv[k]
		}
	}
	for i, ri := range bl.rows {
		for j, rj := range bl.rows {
			w := bl.precD[i*n+j]
			yi, yj := m.rows[ri].y, m.rows[rj].y
			g.yWy += w * yi * yj
			for a, ca := range g.cols {
				pa := qPoly(&m.rows[ri], ca.qpow())
				for d := range 5 {
					g.b[a][d] += w * vals[i][a] * yj * pa[d]
				}
				for b := a; b < nc; b++ {
					pab := polyMul(pa, qPoly(&m.rows[rj], g.cols[b].qpow()))
					for d := range 5 {
						g.lam[a*nc+b][d] += w * vals[i][a] * vals[j][b] * pab[d]
					}
				}
			}
		}
	}
}

// indexScaleSets numbers the distinct scales of the rows, then the factors
// G = e^φ of the log-normal nuisances their offsets name.
func (m *model) indexScaleSets() {
	m.scaleSets = m.scaleSets[:0]
	index := func(set []phiRef) int {
		i := slices.IndexFunc(m.scaleSets, func(s []phiRef) bool { return slices.Equal(s, set) })
		if i < 0 {
			i = len(m.scaleSets)
			m.scaleSets = append(m.scaleSets, set)
		}
		return i
	}
	for i := range m.rows {
		r := &m.rows[i]
		r.scaleSet = index(r.scales)
	}
	for i := range m.rows {
		for k := range m.rows[i].offs {
			o := &m.rows[i].offs[k]
			o.set = -1
			if o.idx >= 0 {
				o.set = index([]phiRef{{o.idx, 1}})
			}
		}
	}
}

// scaleFactors returns s(φ) = exp(Σ pow·φ) of every scale set into dst.
func (m *model) scaleFactors(phi, dst []float64) []float64 {
	dst = dst[:0]
	for _, set := range m.scaleSets {
		var s float64
		for _, sc := range set {
			s += sc.pow * phi[sc.idx]
		}
		dst = append(dst, math.Exp(s))
	}
	return dst
}
