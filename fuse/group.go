package fuse

import (
	"fmt"
	"math"
	"strings"
)

// Grouped sufficient statistics. Rows of a diagonal block that share their
// scale factors, wind and design columns differ only in numbers, and every
// element of their contribution to Xᵀ Σ⁻¹ X and Xᵀ Σ⁻¹ y is a polynomial in
// the wind w (q(w) = q0 + a·w + c·w² enters at most squared) times a power
// of the scale factor F = s(φ). Summing the polynomial coefficients once
// makes the cost of conditioning on φ independent of the number of rows.

// column kinds: how a design column depends on φ.
const (
	colFixed = iota // constant: static offset, tyre growth, drift
	colPerQ         // ∝ q(w): a patch's Cp, the pitch of drag
	colLift         // ∝ F·q(w): the lift parameters
)

type gcol struct {
	col  int
	kind int
	at   int // position of col in the model's layout
}

func (g gcol) qpow() int { return min(g.kind, 1) }
func (g gcol) fpow() int { return g.kind / 2 }

// group is a set of rows with one structure.
type group struct {
	entry  int
	scales []phiRef
	wind   int
	cols   []gcol
	lam    [][5]float64 // per pair j ≤ k: coefficients of w⁰…w⁴
	b      [][5]float64 // per column
	yWy    float64
}

// signature describes a row's structure.
func (m *model) signature(r *row) string {
	var sb strings.Builder
	fmt.Fprintf(&sb, "w%d|", r.wind)
	for _, s := range r.scales {
		fmt.Fprintf(&sb, "s%d^%g,", s.idx, s.pow)
	}
	for _, c := range r.lift {
		fmt.Fprintf(&sb, "L%d,", c.col)
	}
	for _, c := range r.gamma {
		fmt.Fprintf(&sb, "G%d,", c.col)
	}
	for _, c := range r.nuisPerQ {
		fmt.Fprintf(&sb, "Q%d,", c.col)
	}
	for _, c := range r.nuis {
		fmt.Fprintf(&sb, "N%d,", c.col)
	}
	return sb.String()
}

// rowValues returns a row's design columns and values (before F and q).
func rowValues(r *row) ([]gcol, []float64) {
	var cols []gcol
	var vals []float64
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
	return cols, vals
}

// buildGroups sorts the rows of diagonal blocks into groups and the other
// blocks into fullBlocks.
func (m *model) buildGroups() {
	index := map[string]int{}
	for bi := range m.blocks {
		bl := &m.blocks[bi]
		if bl.diag == nil {
			m.fullBlocks = append(m.fullBlocks, bi)
			continue
		}
		for i, ri := range bl.rows {
			r := &m.rows[ri]
			key := fmt.Sprintf("e%d|%s", bl.entry, m.signature(r))
			gi, ok := index[key]
			cols, vals := rowValues(r)
			if !ok {
				gi = len(m.groups)
				index[key] = gi
				nc := len(cols)
				m.groups = append(m.groups, group{entry: bl.entry, scales: r.scales, wind: r.wind, cols: cols,
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
			c := &m.groups[gi].cols[j]
			c.at = m.lay.pos[c.col]
		}
	}
}

// accumulate adds the group's contribution at φ to Λ and b (in layout
// order) and returns its share of yᵀΣ⁻¹y.
func (g *group) accumulate(m *model, phi, lam, b []float64, p int) float64 {
	k := m.inflate[g.entry]
	iw := 1 / (k * k)
	var s float64
	for _, sc := range g.scales {
		s += sc.pow * phi[sc.idx]
	}
	F := math.Exp(s)
	w := 0.0
	if g.wind >= 0 {
		w = phi[g.wind]
	}
	pw := [5]float64{1, w, w * w, w * w * w, w * w * w * w}
	fpow := [3]float64{1, F, F * F}
	nc := len(g.cols)
	for j, cj := range g.cols {
		var v float64
		for d := range 5 {
			v += g.b[j][d] * pw[d]
		}
		b[cj.at] += iw * fpow[cj.fpow()] * v
		for kk := j; kk < nc; kk++ {
			ck := g.cols[kk]
			c := &g.lam[j*nc+kk]
			v := c[0] + c[1]*pw[1] + c[2]*pw[2] + c[3]*pw[3] + c[4]*pw[4]
			v *= iw * fpow[cj.fpow()+ck.fpow()]
			lam[cj.at*p+ck.at] += v
			if kk != j {
				lam[ck.at*p+cj.at] += v
			}
		}
	}
	return iw * g.yWy
}
