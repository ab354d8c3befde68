package fuse

import "slices"

// layout orders the linear parameters for the factorisation of the
// conditional precision Λ. Given φ, configurations are independent but for
// the nuisances they share (a sensor's offset, the tyre growth, the drag
// pitch…), so with each configuration's columns together and the shared
// nuisances last, Λ is an arrowhead:
//
//	Λ = ⎡A₁        B₁⎤
//	    ⎢   ⋱      ⋮ ⎥
//	    ⎢      A_K B_K⎥
//	    ⎣B₁ᵀ … B_Kᵀ C ⎦
//
// and so is its Cholesky factor: fill stays inside the envelope of the
// rows (George & Liu, Computer Solution of Large Sparse Positive Definite
// Systems, 1981, ch. 4 — from memory). Factorising within the envelope is
// the block elimination with the Schur complement C − Σ Bₖᵀ Aₖ⁻¹ Bₖ on the
// shared nuisances, at a cost linear in the number of configurations.
type layout struct {
	pos   []int // column of θ → position in the factorisation
	col   []int // position → column
	first []int // position i → first position of row i's envelope
	// comp is each position's component: positions of one component are
	// contiguous and share no observation with another component's; the
	// shared nuisances (comp −1) come last.
	comp []int
	// base and size place the envelope in one slice: element (i, j) of a
	// lower-triangular matrix, first[i] ≤ j ≤ i, is at base[i] + j, and
	// the matrix takes size elements — linear in the local columns, not
	// p². base[i] = Σ_{r<i}(r − first[r] + 1) − first[i] ≥ 0.
	base []int
	size int
	// colRow[colPtr[j]:colPtr[j+1]] are the rows k > j with first[k] ≤ j.
	colPtr []int
	colRow []int32
}

// sym returns where element (i, j) or (j, i) of a symmetric matrix held by
// its lower triangle stands.
func (l *layout) sym(i, j int) int {
	if j > i {
		i, j = j, i
	}
	return l.base[i] + j
}

// cliques returns the sets of columns of θ that appear together in Λ: the
// columns of a group, and every column of a full block's rows; and those
// of each sign's quantity, so that the lift columns a sign sees (front and
// rear, for a sign of the total) are one component, redrawn together by
// the component steps.
func (m *model) cliques() [][]int {
	var out [][]int
	for si := range m.signs {
		var c []int
		for _, t := range m.signs[si].refs() {
			c = append(c, t.col)
		}
		out = append(out, c)
	}
	for gi := range m.groups {
		var c []int
		for _, g := range m.groups[gi].cols {
			if g.kind != colOffset {
				c = append(c, g.col)
			}
		}
		out = append(out, c)
	}
	for _, bi := range m.fullBlocks {
		var c []int
		for _, ri := range m.blocks[bi].rows {
			for _, e := range designAt(&m.rows[ri], 1, 1, nil) {
				c = append(c, e.col)
			}
		}
		out = append(out, c)
	}
	return out
}

// unionFind is a disjoint-set forest over 0…n−1.
type unionFind []int

func newUnionFind(n int) unionFind {
	u := make(unionFind, n)
	for i := range u {
		u[i] = i
	}
	return u
}

func (u unionFind) find(i int) int {
	for u[i] != i {
		u[i] = u[u[i]]
		i = u[i]
	}
	return i
}

func (u unionFind) union(i, j int) { u[u.find(i)] = u.find(j) }

// buildLayout finds the components and the shared nuisances: lift columns
// (β, γ) that share an observation are one component; a nuisance that
// shares observations with the lift columns of two or more configurations
// (not tied by an observation) is shared; the rest join the components
// they meet. A nuisance of one configuration's run (its wind, seen by the
// front and the rear sensors) so joins that configuration's front and rear
// columns instead of growing the shared block with the number of runs.
func (m *model) buildLayout() {
	p := len(m.lin)
	cl := m.cliques()
	isLift := func(c int) bool { return m.lin[c].kind != kindNuisance }
	joinWithin := func(u unionFind, keep func(int) bool) {
		for _, c := range cl {
			prev := -1
			for _, col := range c {
				if !keep(col) {
					continue
				}
				if prev >= 0 {
					u.union(prev, col)
				}
				prev = col
			}
		}
	}
	// lift classes: lift columns that share an observation, and those of
	// one configuration, are one class
	lift := newUnionFind(p)
	joinWithin(lift, isLift)
	byConfig := map[string]int{}
	for c, lp := range m.lin {
		if !isLift(c) {
			continue
		}
		if first, ok := byConfig[lp.config]; ok {
			lift.union(first, c)
		} else {
			byConfig[lp.config] = c
		}
	}
	meets := make([]map[int]bool, p)
	for _, c := range cl {
		for _, a := range c {
			for _, b := range c {
				if !isLift(a) && isLift(b) {
					if meets[a] == nil {
						meets[a] = map[int]bool{}
					}
					meets[a][lift.find(b)] = true
				}
			}
		}
	}
	shared := func(c int) bool { return !isLift(c) && len(meets[c]) >= 2 }
	u := newUnionFind(p)
	joinWithin(u, func(c int) bool { return !shared(c) })
	m.lay = orderLayout(p, cl, u, shared)
	m.compSigns = m.componentSigns()
	m.markRepeats()
	m.allSigns = make([]int, len(m.signs))
	for i := range m.allSigns {
		m.allSigns[i] = i
	}
	m.signSpans = make([][][2]int, len(m.signs))
	for si, comps := range m.signComps {
		for _, k := range slices.Sorted(slices.Values(comps)) {
			lo, hi := m.lay.span(k)
			m.signSpans[si] = append(m.signSpans[si], [2]int{lo, hi})
		}
		m.signSpans[si] = append(m.signSpans[si], [2]int{m.lay.shared(), p})
	}
}

// shared returns the first position of the shared nuisances (p if none).
func (l *layout) shared() int {
	for i, k := range l.comp {
		if k < 0 {
			return i
		}
	}
	return len(l.comp)
}

// orderLayout places the components in the order of their first column,
// then the shared columns, and computes the envelope.
func orderLayout(p int, cl [][]int, u unionFind, shared func(int) bool) *layout {
	lay := &layout{pos: make([]int, p), comp: make([]int, 0, p)}
	byRoot := map[int]int{}
	var comps [][]int
	var tail []int
	for c := range p {
		if shared(c) {
			tail = append(tail, c)
			continue
		}
		r := u.find(c)
		k, ok := byRoot[r]
		if !ok {
			k = len(comps)
			byRoot[r] = k
			comps = append(comps, nil)
		}
		comps[k] = append(comps[k], c)
	}
	// Within a component, the columns that appear in few cliques (a run's
	// wind, a window's own nuisance) come first and the lift columns, which
	// appear in every clique, last: each row's envelope then starts near
	// its own position, and the fill stays linear in the number of such
	// local columns (a minimum-degree order, George & Liu 1981 — from
	// memory). Ties keep the column order.
	degree := make([]int, p)
	for _, c := range cl {
		for _, col := range c {
			degree[col]++
		}
	}
	for k, cs := range comps {
		slices.SortStableFunc(cs, func(a, b int) int { return degree[a] - degree[b] })
		for _, c := range cs {
			lay.col = append(lay.col, c)
			lay.comp = append(lay.comp, k)
		}
	}
	for _, c := range tail {
		lay.col = append(lay.col, c)
		lay.comp = append(lay.comp, -1)
	}
	for i, c := range lay.col {
		lay.pos[c] = i
	}
	lay.first = make([]int, p)
	for i := range p {
		lay.first[i] = i
	}
	for _, c := range cl {
		lo := p
		for _, col := range c {
			lo = min(lo, lay.pos[col])
		}
		for _, col := range c {
			i := lay.pos[col]
			lay.first[i] = min(lay.first[i], lo)
		}
	}
	lay.base = make([]int, p)
	off := 0
	for i := range p {
		lay.base[i] = off - lay.first[i]
		off += i - lay.first[i] + 1
	}
	lay.size = off
	lay.columns()
	return lay
}

// columns lists, for each position j, the rows k > j whose envelope reaches
// j (first[k] ≤ j), ascending: the strictly lower column j of the
// envelope, for the reverse-mode Cholesky (chol.go).
func (l *layout) columns() {
	p := len(l.first)
	l.colPtr = make([]int, p+1)
	for k := range p {
		for j := l.first[k]; j < k; j++ {
			l.colPtr[j+1]++
		}
	}
	for j := range p {
		l.colPtr[j+1] += l.colPtr[j]
	}
	l.colRow = make([]int32, l.colPtr[p])
	next := append([]int(nil), l.colPtr[:p]...)
	for k := range p {
		for j := l.first[k]; j < k; j++ {
			l.colRow[next[j]] = int32(k)
			next[j]++
		}
	}
}

// span returns the positions [lo, hi) of component k.
func (l *layout) span(k int) (int, int) {
	lo := slices.Index(l.comp, k)
	hi := lo
	for hi < len(l.comp) && l.comp[hi] == k {
		hi++
	}
	return lo, hi
}

// componentSigns lists, for each component of the layout, the signs whose
// quantity involves one of its columns, and records each sign's
// components in m.signComps.
func (m *model) componentSigns() [][]int {
	n := 0
	for _, k := range m.lay.comp {
		n = max(n, k+1)
	}
	out := make([][]int, n)
	m.signComps = make([][]int, len(m.signs))
	for si := range m.signs {
		for _, t := range m.signs[si].refs() {
			k := m.lay.comp[m.lay.pos[t.col]]
			if k >= 0 && !slices.Contains(m.signComps[si], k) {
				m.signComps[si] = append(m.signComps[si], k)
				out[k] = append(out[k], si)
			}
		}
	}
	return out
}
