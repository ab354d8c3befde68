package gust

import (
	"math"
	"sync"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Group is a set of observations with the fixed effects of their pilot
// fit: the design X, the observations Y (known terms removed), their noise
// variances Var, each observation's sensitivity C to its run's wind
// deviation, the runs (positions in Y) and each run's Base variance (see
// Point). The first Shared columns of X are the effects any observation
// may carry (a static offset, a drift); the others are local, like one
// configuration's slope on q, and the likelihood is factorised with them
// in blocks (see reml). Shared = 0 is always right, only slower: every
// column is then local, and columns that meet in a row or a run share one
// block.
type Group struct {
	X         *mat.Dense
	Y, Var, C []float64
	Runs      [][]int
	Base      []float64
	Shared    int
}

// reml holds a group's sums for its restricted likelihood, with D the
// diagonal of variances and, per run r, a_r = c_rᵀD⁻¹c_r, u_r = XᵀD⁻¹c_r
// and w_r = c_rᵀD⁻¹y. Local columns that meet in a row or in a run form a
// block; a block's rows and runs touch only its own columns and the shared
// ones, so XᵀV⁻¹X is an arrowhead — blocks on the diagonal, the shared
// columns last — and every grid point costs time linear in the blocks, not
// cubic in the columns.
type reml struct {
	logDetD, ydy float64
	ns           int       // shared columns
	ss, ys       []float64 // XᵀD⁻¹X (ns×ns) and XᵀD⁻¹y on the shared columns
	runs         []remlRun // runs that touch no local column
	blocks       []remlBlock
	work         remlWork
}

// remlBlock is one block of local columns: its part of XᵀD⁻¹X (bb, nb×nb),
// its coupling to the shared columns (bs, nb×ns), its part of XᵀD⁻¹y and
// its runs.
type remlBlock struct {
	nb     int
	bb, bs []float64
	yb     []float64
	runs   []remlRun
}

// remlRun is one run's sums, u_r split into its block's and the shared
// columns.
type remlRun struct {
	a, w, base float64
	ub, us     []float64
}

// remlWork is logLik's scratch.
type remlWork struct {
	s, bS, bb, bs, yb, z []float64
}

func (g Group) prepare() *reml {
	n, p := g.X.Dims()
	X, ns := nonZeroColumns(g.X, n, p, min(g.Shared, p))
	_, p = X.Dims()
	blockOf, nblocks := localBlocks(X, g.Runs, ns)
	r := &reml{ns: ns, ss: make([]float64, ns*ns), ys: make([]float64, ns), blocks: make([]remlBlock, nblocks)}
	at := make([]int, p) // a local column's place in its block
	for j := ns; j < p; j++ {
		b := &r.blocks[blockOf[j]]
		at[j] = b.nb
		b.nb++
	}
	for i := range r.blocks {
		b := &r.blocks[i]
		b.bb, b.bs, b.yb = make([]float64, b.nb*b.nb), make([]float64, b.nb*ns), make([]float64, b.nb)
	}
	for i := range n {
		d := 1 / g.Var[i]
		r.logDetD += math.Log(g.Var[i])
		r.ydy += g.Y[i] * g.Y[i] * d
		r.addRow(X.RawRowView(i), d, g.Y[i], blockOf, at)
	}
	for k, run := range g.Runs {
		base := 0.0
		if k < len(g.Base) {
			base = g.Base[k]
		}
		r.addRun(X, g, run, base, blockOf, at)
	}
	return r
}

// addRow adds d·xxᵀ and d·y·x for one row x of the design.
func (r *reml) addRow(x []float64, d, y float64, blockOf, at []int) {
	ns := r.ns
	for a := range ns {
		r.ys[a] += x[a] * d * y
		for c := range ns {
			r.ss[a*ns+c] += x[a] * d * x[c]
		}
	}
	for j := ns; j < len(x); j++ {
		if x[j] == 0 {
			continue
		}
		b := &r.blocks[blockOf[j]]
		ja := at[j]
		b.yb[ja] += x[j] * d * y
		for c := range ns {
			b.bs[ja*ns+c] += x[j] * d * x[c]
		}
		for k := ns; k < len(x); k++ {
			if x[k] != 0 {
				b.bb[ja*b.nb+at[k]] += x[j] * d * x[k]
			}
		}
	}
}

// addRun adds one run's sums to its block (or to the shared runs).
func (r *reml) addRun(X *mat.Dense, g Group, run []int, base float64, blockOf, at []int) {
	ns := r.ns
	_, p := X.Dims()
	rr := remlRun{base: base, us: make([]float64, ns)}
	var b *remlBlock
	for _, i := range run {
		d := 1 / g.Var[i]
		rr.a += g.C[i] * g.C[i] * d
		rr.w += g.C[i] * d * g.Y[i]
		x := X.RawRowView(i)
		for c := range ns {
			rr.us[c] += x[c] * d * g.C[i]
		}
		for j := ns; j < p; j++ {
			if x[j] == 0 {
				continue
			}
			if b == nil {
				b = &r.blocks[blockOf[j]]
				rr.ub = make([]float64, b.nb)
			}
			rr.ub[at[j]] += x[j] * d * g.C[i]
		}
	}
	if b == nil {
		r.runs = append(r.runs, rr)
		return
	}
	b.runs = append(b.runs, rr)
}

// logLik returns the restricted (REML) log-likelihood of σ_g²,
// up to a constant: the likelihood of the residuals with the fixed effects
// integrated out under a flat prior (Patterson & Thompson, Biometrika 58,
// 1971; Harville, JASA 72, 1977 — from memory),
//
//	−½·[log det V + log det XᵀV⁻¹X + yᵀV⁻¹y − bᵀ(XᵀV⁻¹X)⁻¹b],  b = XᵀV⁻¹y
//
// with V = D + Σ_runs s_r·c_r·c_rᵀ, s_r = σ_g² + Base_r. The runs are
// disjoint, so by Sherman–Morrison V⁻¹ = D⁻¹ − Σ_r k_r·D⁻¹c_r·c_rᵀD⁻¹ with
// k_r = s_r/(1 + s_r·a_r), and log det V = log det D + Σ log(1 + s_r·a_r).
// XᵀV⁻¹X = A is an arrowhead (see reml); block elimination (Golub & Van
// Loan, Matrix Computations, §4.2 — from memory) gives, with A_bb = L_b·L_bᵀ,
// W_b = L_b⁻¹A_bs, z_b = L_b⁻¹b_b and the Schur complement
// S = A_ss − Σ W_bᵀW_b = L_s·L_sᵀ,
//
//	log det A = Σ log det A_bb + log det S,
//	bᵀA⁻¹b = Σ z_bᵀz_b + |L_s⁻¹(b_s − Σ W_bᵀz_b)|².
//
// Unlike the plain likelihood of pilot residuals it does not lose the
// run-to-run variance the fitted offsets, slopes and wind absorb. Columns
// of X that are all zero are left out; ok is false when XᵀV⁻¹X is singular.
func (r *reml) logLik(s2 float64) (ll float64, ok bool) { return r.logLikIn(s2, &r.work) }

// logLikIn is logLik with its work buffers given, one set per goroutine.
func (r *reml) logLikIn(s2 float64, w *remlWork) (ll float64, ok bool) {
	ns := r.ns
	w.s = append(w.s[:0], r.ss...)
	w.bS = append(w.bS[:0], r.ys...)
	ldv, quad, ldA, bAb := r.logDetD, r.ydy, 0.0, 0.0
	for _, rr := range r.runs {
		k := r.runTerms(&rr, s2, &ldv, &quad)
		rankOne(w.s, ns, ns, -k, rr.us, rr.us)
		floats.AddScaled(w.bS, -k*rr.w, rr.us)
	}
	for bi := range r.blocks {
		b := &r.blocks[bi]
		w.bb = append(w.bb[:0], b.bb...)
		w.bs = append(w.bs[:0], b.bs...)
		w.yb = append(w.yb[:0], b.yb...)
		for _, rr := range b.runs {
			k := r.runTerms(&rr, s2, &ldv, &quad)
			rankOne(w.bb, b.nb, b.nb, -k, rr.ub, rr.ub)
			rankOne(w.bs, b.nb, ns, -k, rr.ub, rr.us)
			rankOne(w.s, ns, ns, -k, rr.us, rr.us)
			floats.AddScaled(w.yb, -k*rr.w, rr.ub)
			floats.AddScaled(w.bS, -k*rr.w, rr.us)
		}
		ld, ok := cholesky(w.bb, b.nb)
		if !ok {
			return 0, false
		}
		ldA += ld
		eliminate(w, b.nb, ns)
		bAb += floats.Dot(w.yb, w.yb)
	}
	ld, ok := cholesky(w.s, ns)
	if !ok {
		return 0, false
	}
	w.z = append(w.z[:0], w.bS...)
	forwardSolve(w.s, ns, w.z)
	return -0.5 * (ldv + ldA + ld + quad - bAb - floats.Dot(w.z, w.z)), true
}

// runTerms adds a run's terms to log det V and yᵀV⁻¹y at σ_g² = s2 and
// returns its k_r.
func (r *reml) runTerms(rr *remlRun, s2 float64, ldv, quad *float64) float64 {
	s := s2 + rr.base
	*ldv += math.Log1p(s * rr.a)
	k := s / (1 + s*rr.a)
	*quad -= k * rr.w * rr.w
	return k
}

// eliminate takes a factorised block (w.bb = L_b) out of the shared
// columns: W_b = L_b⁻¹A_bs into w.bs, z_b = L_b⁻¹b_b into w.yb, then
// S −= W_bᵀW_b and b_s −= W_bᵀz_b.
func eliminate(w *remlWork, nb, ns int) {
	forwardSolve(w.bb, nb, w.yb)
	col := w.z[:0]
	for c := range ns {
		col = col[:0]
		for i := range nb {
			col = append(col, w.bs[i*ns+c])
		}
		forwardSolve(w.bb, nb, col)
		for i := range nb {
			w.bs[i*ns+c] = col[i]
		}
	}
	w.z = col
	for a := range ns {
		for i := range nb {
			w.bS[a] -= w.bs[i*ns+a] * w.yb[i]
		}
		for c := range ns {
			var v float64
			for i := range nb {
				v += w.bs[i*ns+a] * w.bs[i*ns+c]
			}
			w.s[a*ns+c] -= v
		}
	}
}

// localBlocks puts each local column (index ≥ ns) of X in a block: columns
// that are non-zero in one row, or in the rows of one run, share a block
// (union–find). It returns each column's block (−1 for shared columns)
// and the number of blocks.
func localBlocks(X *mat.Dense, runs [][]int, ns int) ([]int, int) {
	n, p := X.Dims()
	parent := make([]int, p)
	for j := range parent {
		parent[j] = j
	}
	find := func(j int) int {
		for parent[j] != j {
			parent[j] = parent[parent[j]]
			j = parent[j]
		}
		return j
	}
	join := func(rows []int) {
		first := -1
		for _, i := range rows {
			for j, x := range X.RawRowView(i)[ns:] {
				if x == 0 {
					continue
				}
				if first < 0 {
					first = find(ns + j)
				} else {
					parent[find(ns+j)] = first
				}
			}
		}
	}
	for i := range n {
		join([]int{i})
	}
	for _, run := range runs {
		join(run)
	}
	blockOf, id := make([]int, p), map[int]int{}
	for j := range p {
		blockOf[j] = -1
		if j < ns {
			continue
		}
		root := find(j)
		if _, ok := id[root]; !ok {
			id[root] = len(id)
		}
		blockOf[j] = id[root]
	}
	return blockOf, len(id)
}

// ScatterREML is Scatter with the groups' restricted likelihood in place of
// the runs' plain one: the posterior mean of σ_g² (as its square root, m/s)
// and the posterior sd of σ_g under the half-normal prior of the given
// scale. A group whose likelihood cannot be formed is left out.
func ScatterREML(groups []Group, scale float64) (sd, sdOfSD float64) {
	rs := make([]*reml, len(groups))
	for i, g := range groups {
		rs[i] = g.prepare()
	}
	return posteriorGrid(scale, gridN, gridWorkers, func() func(s2 float64) float64 {
		ws := make([]remlWork, len(rs))
		return func(s2 float64) float64 {
			var ll float64
			for i, r := range rs {
				if v, ok := r.logLikIn(s2, &ws[i]); ok {
					ll += v
				}
			}
			return ll
		}
	})
}

// gridWorkers is how many goroutines share the restricted likelihood's
// grid: a day of many configurations has many runs, and at 24
// configurations the grid's 400 points took 34 ms of the reduction's
// 72 ms of CPU, serially (pprof of the fuse command's benchmark); the
// machines this runs on have two cores.
const gridWorkers = 2

// nonZeroColumns returns X without its all-zero columns (one zero column
// if every column is), and how many of its first ns columns are kept.
func nonZeroColumns(X *mat.Dense, n, p, ns int) (*mat.Dense, int) {
	var keep []int
	kept := 0
	for j := range p {
		for i := range n {
			if X.At(i, j) != 0 {
				keep = append(keep, j)
				if j < ns {
					kept++
				}
				break
			}
		}
	}
	out := mat.NewDense(n, max(len(keep), 1), nil)
	for k, j := range keep {
		for i := range n {
			out.Set(i, k, X.At(i, j))
		}
	}
	return out, kept
}

// posterior returns √E[σ²] and sd(σ) on a grid for a log-likelihood of σ²
// and a half-normal prior of the given scale.
func posterior(loglik func(s2 float64) float64, scale float64) (sd, sdOfSD float64) {
	return posteriorN(loglik, scale, gridN)
}

// posteriorN is posterior on a grid of n points.
func posteriorN(loglik func(s2 float64) float64, scale float64, n int) (sd, sdOfSD float64) {
	return posteriorGrid(scale, n, 1, func() func(s2 float64) float64 { return loglik })
}

// posteriorGrid is posteriorN with the grid's points shared by workers
// goroutines, each with the log-likelihood newLoglik returns it: the
// points are the same and summed in the same order, so the result does
// not depend on workers.
func posteriorGrid(scale float64, n, workers int, newLoglik func() func(s2 float64) float64) (sd, sdOfSD float64) {
	if scale <= 0 {
		return 0, 0
	}
	top := 5 * scale
	lp := make([]float64, n)
	points := func(w int) {
		loglik := newLoglik()
		for k := w; k < n; k += workers {
			s := top * (float64(k) + 0.5) / float64(n)
			lp[k] = -0.5*s*s/(scale*scale) + loglik(s*s)
		}
	}
	var wg sync.WaitGroup
	for w := 1; w < workers; w++ {
		wg.Add(1)
		go func() { defer wg.Done(); points(w) }()
	}
	points(0)
	wg.Wait()
	best := math.Inf(-1)
	for _, v := range lp {
		best = math.Max(best, v)
	}
	var z, m1, m2 float64
	for k := range n {
		s := top * (float64(k) + 0.5) / float64(n)
		w := math.Exp(lp[k] - best)
		z += w
		m1 += w * s
		m2 += w * s * s
	}
	m1, m2 = m1/z, m2/z
	return math.Sqrt(m2), math.Sqrt(math.Max(0, m2-m1*m1))
}
