package fuse

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// denseStat is the predictive check's statistic computed as it was before
// the entry's rows were kept sparse: J and G = Σ⁻¹J dense over all D
// parameters (denseJacobian), F = JᵀG by a dense product, the predictive
// covariance C over the touched parameters in full, V = W H⁻¹ F H⁻¹ Wᵀ +
// (A J) C (A J)ᵀ and A = W H⁻¹ Gᵀ dense. It is the reference the
// structured computation (entryLin, predictiveCov) is checked against.
type denseStat struct {
	t     []float64
	V, AJ *mat.Dense
	A     *mat.Dense
	cols  []int
}

func denseLoo(t *testing.T, full *model, e int, others *Posterior) *denseStat {
	t.Helper()
	src := sharedIndex(full, others.p.m)
	mean := predictiveMean(full, others, src)
	p, D := len(full.lin), full.dim()
	theta, phi := mean[:p], mean[p:]
	sp := repeatSpace{D: D, newIdx: map[int]int{}}
	var Jrows, Grows [][]float64
	var res []float64
	for bi := range full.blocks {
		bl := &full.blocks[bi]
		if bl.entry != e {
			continue
		}
		Jb := denseJacobian(full, bl, sp, theta, phi)
		nb := len(bl.rows)
		for a, ri := range bl.rows {
			res = append(res, full.rows[ri].y-full.rowMean(&full.rows[ri], theta, phi, nil))
			Jrows = append(Jrows, Jb.RawRowView(a))
			g := make([]float64, D)
			for b := range nb {
				w := 0.0
				switch {
				case bl.diag != nil && a == b:
					w = bl.diag[a]
				case bl.diag == nil:
					w = bl.precD[a*nb+b]
				}
				floats.AddScaled(g, w, Jb.RawRowView(b))
			}
			Grows = append(Grows, g)
		}
	}
	n := len(Jrows)
	var cols []int
	for i := range D {
		var f float64
		for r := range n {
			f += Jrows[r][i] * Grows[r][i]
		}
		if f > 0 {
			cols = append(cols, i)
		}
	}
	nc := len(cols)
	Js, Gs := mat.NewDense(n, nc, nil), mat.NewDense(n, nc, nil)
	for a, i := range cols {
		for r := range n {
			Js.Set(r, a, Jrows[r][i])
			Gs.Set(r, a, Grows[r][i])
		}
	}
	var F mat.Dense
	F.Mul(Js.T(), Gs)
	H := mat.NewSymDense(nc, nil)
	for a, i := range cols {
		for b := a; b < nc; b++ {
			H.SetSym(a, b, 0.5*(F.At(a, b)+F.At(b, a)))
		}
		H.SetSym(a, a, H.At(a, a)+full.priorPrecision(i))
	}
	W := (&looStat{}).weights(full, cols)
	Wm := mat.NewDense(len(W), nc, nil)
	for r, w := range W {
		Wm.SetRow(r, w)
	}
	var ch mat.Cholesky
	if !ch.Factorize(H) {
		t.Fatal("H not positive definite")
	}
	var HinvWt mat.Dense
	if err := ch.SolveTo(&HinvWt, Wm.T()); err != nil {
		t.Fatal(err)
	}
	B := mat.DenseCopyOf(HinvWt.T())
	ds := &denseStat{cols: cols, A: &mat.Dense{}, AJ: &mat.Dense{}, V: &mat.Dense{}}
	ds.A.Mul(B, Gs.T())
	ds.AJ.Mul(B, &F)
	var tv mat.VecDense
	tv.MulVec(ds.A, mat.NewVecDense(n, res))
	ds.t = tv.RawVector().Data
	var V1, V1t, tmp, V2 mat.Dense
	V1.Mul(ds.AJ, B.T())
	V1t.CloneFrom(V1.T())
	V1.Add(&V1, &V1t) // symmetrised, as finish does: ½(V1 + V1ᵀ)
	V1.Scale(0.5, &V1)
	tmp.Mul(ds.AJ, denseC(full, others, src, cols))
	V2.Mul(&tmp, ds.AJ.T())
	ds.V.Add(&V1, &V2)
	return ds
}

// denseC is the predictive covariance over cols in full (see predictiveCov).
func denseC(full *model, others *Posterior, src, cols []int) *mat.Dense {
	p := len(full.lin)
	var shared, at []int
	for a, i := range cols {
		if src[i] >= 0 {
			shared, at = append(shared, src[i]), append(at, a)
		}
	}
	C := mat.NewDense(len(cols), len(cols), nil)
	oCov := others.jointCov(shared)
	for x, a := range at {
		for y, b := range at {
			C.Set(a, b, oCov.At(x, y))
		}
	}
	for a, i := range cols {
		switch {
		case src[i] >= 0:
		case i >= p:
			C.Set(a, a, full.phi[i-p].sd*full.phi[i-p].sd)
		case full.lin[i].prec > 0:
			C.Set(a, a, 1/full.lin[i].prec)
		}
	}
	return C
}

// exactCases are the campaigns of the exactness tests: the scaling
// benchmark's of 2 and 6 configurations (the laser, the pots, the taps:
// diagonal and full error blocks) and offsetModel's (log-normal nuisances
// in and out of q, one stated exactly, a scale group on half a block).
func exactCases(t *testing.T) map[string]*looCase {
	t.Helper()
	evs, set := offsetEvidence(t, 3, true)
	offsets := newLooCase(t, evs, set.withDefaults())
	return map[string]*looCase{"configs=2": scaleLoo(t, 2), "configs=6": scaleLoo(t, 6), "offsets": offsets}
}

// TestPredictiveStructuredExact checks the structured leave-one-out
// statistic (sparse rows of J and G, the predictive covariance only through
// A·J) against the dense computation it replaced, entry by entry, on
// exactCases. Both are the same formulas (predictive.go); they may differ
// only by rounding, so the tolerance is 10⁻⁹ relative to each matrix's
// largest element (common practice (no source): a reordered sum in double
// precision agrees to about 10⁻¹³).
func TestPredictiveStructuredExact(t *testing.T) {
	eachGaussianEntry(t, func(t *testing.T, c *looCase, ei int, O, W *Posterior, st *looStat) {
		ds := denseLoo(t, c.full, ei, W)
		if fmt.Sprint(st.cols) != fmt.Sprint(ds.cols) {
			t.Fatalf("touched columns %v, dense %v", st.cols, ds.cols)
		}
		closeSlices(t, "t", st.t, ds.t)
		closeSlices(t, "V", mat.DenseCopyOf(st.V).RawMatrix().Data, ds.V.RawMatrix().Data)
		// V's diagonal spans decades: its small rows are held on the
		// correlation scale too, as metric reads them.
		for i := range ds.V.RawMatrix().Rows {
			for j := range ds.V.RawMatrix().Cols {
				s := math.Sqrt(ds.V.At(i, i) * ds.V.At(j, j))
				if d := math.Abs(st.V.At(i, j) - ds.V.At(i, j)); !(d <= 1e-9*s) {
					t.Fatalf("V[%d][%d] = %.15g, dense %.15g (scale %.3g)", i, j, st.V.At(i, j), ds.V.At(i, j), s)
				}
			}
		}
		closeSlices(t, "AJ", st.AJ.RawMatrix().Data, ds.AJ.RawMatrix().Data)
		closeSlices(t, "A", st.A.RawMatrix().Data, ds.A.RawMatrix().Data)
	})
}

// eachGaussianEntry runs fn, as a subtest, on every entry with Gaussian
// data of every exactCases campaign, twice: with the entry's others'
// posterior whole, and compacted as the robust refits keep it
// (compactOthers: the columns the agreement reads and the nuisances the
// entry shares, its joint covariance computed before) — each time with
// that posterior's structured statistic, O, and the whole posterior, W,
// for the reference. The others are fitted afresh for each (the same
// seed, so the same draws), so the shared cases' posteriors are left as
// they were.
func eachGaussianEntry(t *testing.T, fn func(t *testing.T, c *looCase, ei int, O, W *Posterior, st *looStat)) {
	for name, c := range exactCases(t) {
		for ei, ev := range c.evs {
			if len(ev.Blocks) == 0 {
				continue
			}
			fit := func() (*Posterior, error) {
				om, err := c.lo.othersModel(c.evs, ei)
				if err != nil {
					return nil, err
				}
				return om.fit()
			}
			W, err := fit()
			if err != nil {
				t.Fatal(err)
			}
			kept, err := fit()
			if err != nil {
				t.Fatal(err)
			}
			compactOthers(kept, c.full, ei, ev, fit)
			for _, v := range []struct {
				name string
				O    *Posterior
			}{{"whole", W}, {"compacted", kept}} {
				t.Run(name+"/"+ev.Entry+"/"+v.name, func(t *testing.T) {
					st, ok := looPredictive(c.full, ei, v.O)
					if !ok {
						t.Fatal("no statistic")
					}
					fn(t, c, ei, v.O, W, st)
				})
			}
		}
	}
}

// closeSlices fails unless got and want agree within 10⁻⁹ of want's
// largest magnitude.
func closeSlices(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d values, want %d", what, len(got), len(want))
	}
	scale := 0.0
	for _, w := range want {
		scale = math.Max(scale, math.Abs(w))
	}
	for i := range got {
		if d := math.Abs(got[i] - want[i]); !(d <= 1e-9*scale) {
			t.Fatalf("%s[%d] = %.15g, dense %.15g (scale %.3g)", what, i, got[i], want[i], scale)
		}
	}
}

// rowReplicates is the replicates' d² computed row by row, as before the
// structured prediction term (repMean): t = A·(μ(x) − μ̄) from each row's
// mean, plus the same error draw C·z (statNoise's C, multiplied here by
// gonum rather than by statNoise.add). Same seed, same draws.
func rowReplicates(full *model, e int, st *looStat, others *Posterior, seed uint64) []float64 {
	rng := newRand(seed, 900+uint64(e))
	noise := newStatNoise(full, e, st.A)
	if noise == nil {
		return nil
	}
	draws := others.nDraws()
	per := (referenceReps + draws - 1) / draws
	p, op := len(full.lin), len(others.p.m.lin)
	x := make([]float64, full.dim())
	y := make([]float64, len(st.rows))
	t := make([]float64, len(st.t))
	k := len(t)
	C, z := mat.NewDense(k, k, noise.c), make([]float64, k)
	var cz mat.VecDense
	var out []float64
	others.drawsOf(sharedCols(full, e, others.p.m), func(theta, phi []float64) {
		for range per {
			if len(out) == referenceReps {
				return
			}
			full.predictiveDraw(x, st.src, theta, phi, op, rng)
			for r, ri := range st.rows {
				y[r] = full.rowMean(&full.rows[ri], x[:p], x[p:], nil) - st.mu[r]
			}
			for i := range t {
				t[i] = floats.Dot(st.A.RawRowView(i), y)
			}
			for j := range z {
				z[j] = rng.NormFloat64()
			}
			cz.MulVec(C, mat.NewVecDense(k, z)) // statNoise.add's draw, by gonum
			floats.Add(t, cz.RawVector().Data)
			out = append(out, quadForm(st.Vp, t))
		}
	})
	return out
}

// TestStatNoiseCovariance: the replicates' error term C·z has the
// covariance of A·ε, C·Cᵀ = A·Σ·Aᵀ, with Σ formed densely here from the
// inverse of each of the entry's block precisions (gonum's Inverse; a
// diagonal block's 1/P_ii), for every Gaussian entry of exactCases.
func TestStatNoiseCovariance(t *testing.T) {
	eachGaussianEntry(t, func(t *testing.T, c *looCase, ei int, O, W *Posterior, st *looStat) {
		sn := newStatNoise(c.full, ei, st.A)
		if sn == nil {
			t.Fatal("no error draws")
		}
		k, n := st.A.Dims()
		sigma := mat.NewDense(n, n, nil)
		off := 0
		for bi := range c.full.blocks {
			bl := &c.full.blocks[bi]
			if bl.entry != ei {
				continue
			}
			nb := len(bl.rows)
			if bl.diag != nil {
				for a, p := range bl.diag {
					sigma.Set(off+a, off+a, 1/p)
				}
			} else {
				var inv mat.Dense
				if err := inv.Inverse(bl.prec); err != nil {
					t.Fatal(err)
				}
				sigma.Slice(off, off+nb, off, off+nb).(*mat.Dense).Copy(&inv)
			}
			off += nb
		}
		var AS, want, got mat.Dense
		AS.Mul(st.A, sigma)
		want.Mul(&AS, st.A.T())
		C := mat.NewDense(k, k, sn.c)
		got.Mul(C, C.T())
		closeSlices(t, "C·Cᵀ", got.RawMatrix().Data, want.RawMatrix().Data)
	})
}

// TestReplicatesStructuredExact checks the replicates' d² computed with the
// prediction term by terms (repMean) against the same replicates computed
// row by row (rowReplicates), replicate by replicate, for every Gaussian
// entry of exactCases: the same formulas in another order (see
// closeSlices for the tolerance).
func TestReplicatesStructuredExact(t *testing.T) {
	eachGaussianEntry(t, func(t *testing.T, c *looCase, ei int, O, W *Posterior, st *looStat) {
		if st.Vp, _ = st.metric(); st.Vp == nil {
			t.Fatal("no metric")
		}
		got := st.replicates(c.full, ei, O, newRand(c.full.set.Seed, 900+uint64(ei)))
		want := rowReplicates(c.full, ei, st, W, c.full.set.Seed)
		if len(got) != referenceReps {
			t.Fatalf("%d replicates, want %d", len(got), referenceReps)
		}
		closeSlices(t, "d²", got, want)
	})
}

// TestFinishNoTouchedColumns: data that touch no parameter give no
// statistic (ok false) instead of a zero-sized matrix, which gonum refuses
// with a panic.
func TestFinishNoTouchedColumns(t *testing.T) {
	c := scaleLoo(t, 2)
	if (&looStat{}).finish(c.full, &entryLin{}, nil, nil, nil) {
		t.Fatal("a statistic over no parameters")
	}
}

// denseJacobian is J = ∂μ/∂(θ, φ) of a block's observation means over
// the repeat's parameters as computed before the sparse rows (entrylin.go)
// and kept here as the reference: the design row for θ, and central
// differences over every φ (zero for those a row does not read) with step
// 10⁻⁵·max(1, |φ_j|).
func denseJacobian(m *model, bl *block, sp repeatSpace, theta, phi []float64) *mat.Dense {
	p := len(m.lin)
	J := mat.NewDense(len(bl.rows), sp.n(), nil)
	var buf []entryRef
	for k, ri := range bl.rows {
		r := &m.rows[ri]
		Jk := J.RawRowView(k)
		buf = m.design(r, phi, buf[:0])
		for _, d := range buf {
			Jk[sp.col(d.col)] += d.v
		}
		for j := range m.phi {
			h := 1e-5 * math.Max(1, math.Abs(phi[j]))
			up := append([]float64(nil), phi...)
			dn := append([]float64(nil), phi...)
			up[j] += h
			dn[j] -= h
			Jk[sp.col(p+j)] += (m.rowMean(r, theta, up, buf) - m.rowMean(r, theta, dn, buf)) / (2 * h)
		}
	}
	return J
}
