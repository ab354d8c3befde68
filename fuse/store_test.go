package fuse

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"

	"liftfuse/methods/evidence"
)

// TestDrawStore: draws written to the block store — one by one (add), or
// staged by a chain and stored in runs (staged, addRows), flushed when
// full and at the end of a chain's steps — read back as they were written
// to a plain row-major slice (the reference) — one by one, as a linear
// combination of columns, after trimming to fewer draws and after keeping
// fewer columns — across block boundaries.
func TestDrawStore(t *testing.T) {
	for _, tc := range []struct {
		width, n, trim, narrow int
		staged                 bool
	}{
		{3, 10, 7, 2, false},
		{5, storeBlock, storeBlock - 1, 5, false},
		{4, 2*storeBlock + 17, storeBlock + 3, 1, false},
		{0, 300, 200, 0, false},
		{3, 10, 7, 2, true},
		{5, storeBlock, storeBlock - 1, 5, true},
		{4, 3*storeBlock + 17, storeBlock + 3, 1, true},
		{0, 300, 200, 0, true},
	} {
		t.Run(fmt.Sprintf("w%d-n%d-trim%d-narrow%d-staged%v", tc.width, tc.n, tc.trim, tc.narrow, tc.staged), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(1, uint64(tc.n)))
			s, phis := newDrawStore(tc.width), newDrawStore(1)
			var st staged
			var ref []float64
			for i := range tc.n {
				x := make([]float64, tc.width)
				for j := range x {
					x[j] = rng.NormFloat64()
				}
				ref = append(ref, x...)
				if !tc.staged {
					s.add(x)
					continue
				}
				st.add(x, []float64{float64(i)})
				// full, or a chain's steps ending at odd places
				if st.n == stageDraws || i%13 == 12 {
					st.flush(s, phis)
				}
			}
			if tc.staged {
				st.flush(s, phis)
				var buf []float64
				for i := range tc.n {
					if buf = phis.at(i, buf); buf[0] != float64(i) {
						t.Fatalf("staged φ of draw %d = %v", i, buf[0])
					}
				}
			}
			w := []entryRef{}
			if tc.width > 0 {
				w = []entryRef{{0, 2}, {tc.width - 1, -0.5}}
			}
			check := func(stage string, n, width int) {
				t.Helper()
				if s.n != n {
					t.Fatalf("%s: %d draws, want %d", stage, s.n, n)
				}
				got := make([]float64, n)
				s.combine(w, got)
				var buf []float64
				for i := range n {
					row := ref[i*tc.width : i*tc.width+width]
					if buf = s.at(i, buf); !slices.Equal(buf, row) {
						t.Fatalf("%s: draw %d = %v, want %v", stage, i, buf, row)
					}
					var want float64
					for _, r := range w {
						want += r.v * ref[i*tc.width+r.col]
					}
					if got[i] != want {
						t.Fatalf("%s: combination at draw %d = %v, want %v", stage, i, got[i], want)
					}
				}
			}
			check("written", tc.n, tc.width)
			s.trim(tc.trim)
			check("trimmed", tc.trim, tc.width)
			if tc.narrow < tc.width { // keep the first columns (pick, as compaction does)
				s.pick(firstCols(tc.narrow))
			}
			if tc.narrow > 0 {
				w = []entryRef{{0, 1.5}, {tc.narrow - 1, 1}}
			}
			check("narrowed", tc.trim, tc.narrow)
		})
	}
}

// TestCompactKeepsFigures: compacting a posterior (dropping its nuisance
// draws) changes none of its figures, its joint mean, nor — through the
// seeded refit — its joint covariance and draws, against the same fit
// left whole.
func TestCompactKeepsFigures(t *testing.T) {
	m := scaleModel(t, 2, false)
	whole, err := m.fit()
	if err != nil {
		t.Fatal(err)
	}
	P, err := m.fit()
	if err != nil {
		t.Fatal(err)
	}
	refits := 0
	P.compact(func() (*Posterior, error) { refits++; return m.fit() }, nil)
	if !P.compacted || refits != 0 {
		t.Fatalf("compacted %v, refits %d", P.compacted, refits)
	}
	for _, c := range m.set.Configs {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
			q := evidence.Quantity{Config: c, Axle: ax}
			a, pa := P.Quantity(q)
			b, pb := whole.Quantity(q)
			if a != b || pa != pb {
				t.Errorf("%s %s: %+v (%v) compacted, %+v (%v) whole", c, ax, a, pa, b, pb)
			}
		}
	}
	if !slices.Equal(P.jointMean(), whole.jointMean()) {
		t.Error("joint mean differs after compaction")
	}
	mc, cc := P.joint()
	mw, cw := whole.joint()
	if !slices.Equal(mc, mw) || !slices.Equal(cc.RawSymmetric().Data, cw.RawSymmetric().Data) || refits != 1 {
		t.Errorf("joint moments differ after compaction (refits %d)", refits)
	}
	var a, b [][]float64
	P.jointDraws(func(th, ph []float64) { a = append(a, append(slices.Clone(th), ph...)) })
	whole.jointDraws(func(th, ph []float64) { b = append(b, append(slices.Clone(th), ph...)) })
	if !slices.EqualFunc(a, b, slices.Equal) || refits != 1 {
		t.Errorf("joint draws differ after compaction (refits %d)", refits)
	}
}

// TestStepStoresEveryDraw: a chain's steps store every draw they make,
// the last few that do not fill a stage of stageDraws too — 13 steps of a
// begun chain of the 2-configuration model add 13 draws and 13 φ, none
// left staged (a step that does not flush at its end adds 8 or 16).
func TestStepStoresEveryDraw(t *testing.T) {
	m := scaleModel(t, 2, false)
	mode, cov, _, err := m.laplace()
	if err != nil {
		t.Fatal(err)
	}
	pr, err := m.newProposal(mode, cov)
	if err != nil {
		t.Fatal(err)
	}
	ch := pr.newChains()[0]
	pr.step(ch, 13)
	if !ch.begun {
		t.Fatal("the chain has not begun in 13 steps")
	}
	n, nphi := ch.draws.n, ch.phis.n
	pr.step(ch, 13)
	if got, gotPhi := ch.draws.n-n, ch.phis.n-nphi; got != 13 || gotPhi != 13 || ch.stage.n != 0 {
		t.Fatalf("13 steps stored %d draws and %d φ, %d left staged", got, gotPhi, ch.stage.n)
	}
}
