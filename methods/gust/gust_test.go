package gust

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distmv"
)

// TestRunLogLik: the rank-one shortcut equals the multivariate normal
// density of gonum's distmv (a reference implementation), up to the
// constant −n/2·log 2π.
func TestRunLogLik(t *testing.T) {
	ps := []Point{{R: 0.3, Var: 0.04, C: 0.5}, {R: -0.1, Var: 0.09, C: 0.8, Base: 0.5}, {R: 0.6, Var: 0.01, C: -0.2, Base: 0.5}}
	ps[0].Base = 0.5
	for _, s2 := range []float64{0, 0.7, 4} {
		cov := mat.NewSymDense(3, nil)
		for i, p := range ps {
			for j, q := range ps {
				v := (s2 + 0.5) * p.C * q.C
				if i == j {
					v += p.Var
				}
				cov.SetSym(i, j, v)
			}
		}
		n, ok := distmv.NewNormal(make([]float64, 3), cov, nil)
		if !ok {
			t.Fatal("covariance not positive definite")
		}
		want := n.LogProb([]float64{0.3, -0.1, 0.6}) + 1.5*math.Log(2*math.Pi)
		if got := runLogLik(ps, s2); math.Abs(got-want) > 1e-12 {
			t.Errorf("σ² = %g: %.12f, want %.12f", s2, got, want)
		}
	}
}

// TestScatter: runs drawn with a known run-to-run scatter give it back
// within a few of its posterior sds, and a day without gusts gives a
// scatter well under the prior scale.
func TestScatter(t *testing.T) {
	cases := []struct {
		name string
		sd   float64
	}{{"calm", 0}, {"gusty", 2}, {"light", 0.7}}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(11, uint64(10*tc.sd)))
			var runs [][]Point
			for range 40 {
				d := tc.sd * rng.NormFloat64()
				var ps []Point
				for k := range 4 {
					c := 0.2 + 0.1*float64(k)
					ps = append(ps, Point{R: c*d + 0.05*rng.NormFloat64(), Var: 0.05 * 0.05, C: c})
				}
				runs = append(runs, ps)
			}
			got, sd := Scatter(runs, 1.5)
			t.Logf("σ_g = %.3f ± %.3f (true %g)", got, sd, tc.sd)
			if math.Abs(got-tc.sd) > 3*sd+0.05 {
				t.Errorf("σ_g = %.3f ± %.3f, true %g", got, sd, tc.sd)
			}
			if tc.sd == 0 && got > 0.2 {
				t.Errorf("calm day: σ_g = %.3f, want near 0", got)
			}
		})
	}
	if got, _ := Scatter(nil, 1.5); math.Abs(got-1.5) > 0.01 {
		t.Errorf("no data: σ_g = %.3f, want the prior's √E[σ²] = 1.5", got)
	}
}

// TestRuns: a run ends at a standstill, a change of configuration or
// direction, or a long pause.
func TestRuns(t *testing.T) {
	keys := []Key{
		{Config: "a", Direction: 1, SpeedKmh: 0, From: 0, To: 8},
		{Config: "a", Direction: 1, SpeedKmh: 80, From: 10, To: 26},
		{Config: "a", Direction: 1, SpeedKmh: 110, From: 30, To: 46},
		{Config: "a", Direction: 1, SpeedKmh: 0, From: 60, To: 68},
		{Config: "a", Direction: -1, SpeedKmh: 80, From: 70, To: 86},
		{Config: "a", Direction: -1, SpeedKmh: 110, From: 200, To: 216},
		{Config: "b", Direction: -1, SpeedKmh: 110, From: 220, To: 236},
	}
	got := Runs(keys)
	want := [][]int{{1, 2}, {4}, {5}, {6}}
	if len(got) != len(want) {
		t.Fatalf("runs %v, want %v", got, want)
	}
	for i := range want {
		if len(got[i]) != len(want[i]) || got[i][0] != want[i][0] {
			t.Errorf("runs %v, want %v", got, want)
		}
	}
}

// TestFit: the pilot recovers an exact line.
func TestFit(t *testing.T) {
	X := mat.NewDense(4, 2, []float64{1, 0, 1, 1, 1, 2, 1, 3})
	y := []float64{1, 3, 5, 7}
	b, r := Fit(X, y, []float64{1, 1, 1, 1})
	if math.Abs(b[0]-1) > 1e-6 || math.Abs(b[1]-2) > 1e-6 || math.Abs(r[3]) > 1e-6 {
		t.Errorf("fit %v, residuals %v", b, r)
	}
}
