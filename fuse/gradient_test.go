package fuse

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
)

// TestObjectiveGradient: the reverse-mode gradient of the Laplace
// objective equals central finite differences of the objective (gonum
// diff/fd, the reference library; steps 0.1 and 0.05 prior sd with
// Richardson's extrapolation, error O(h⁴): a smaller step meets the
// objective's rounding) to
// 10⁻⁵ of the gradient's scale, and its value equals objective's, on
// campaigns with signs and shared nuisances (the taps' log-normal pitch of
// drag among them), with both speed models, with an entry's errors
// inflated by the robust layer, and on offsetModel's log-normal nuisances
// (in diagonal and full blocks, two in one row, one stated exactly), at
// random φ.
func TestObjectiveGradient(t *testing.T) {
	for _, tc := range []struct {
		name    string
		n       int
		linear  bool
		inflate bool
	}{
		{"2-constant", 2, false, false},
		{"5-linear", 5, true, false},
		{"5-constant-robust", 5, false, true},
		{"offsets", 0, false, false},
		{"offsets-robust", 0, false, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var m *model
			if tc.n == 0 {
				m = offsetModel(t, 3, false)
				checkOffsetPaths(t, m)
			} else {
				m = scaleModel(t, tc.n, tc.linear)
			}
			if !m.hasGradient() || len(m.signs) == 0 {
				t.Fatal("the campaign does not exercise the gradient's sign and term paths")
			}
			if tc.inflate {
				m = m.variant(map[int]bool{0: true, len(m.entries) - 1: true}, true, true)
			}
			rng := rand.New(rand.NewPCG(7, uint64(tc.n)))
			for range 3 {
				phi := randomPhi(m, 0.7, rng)
				checkGradient(t, m, phi)
			}
		})
	}
}

func checkGradient(t *testing.T, m *model, phi []float64) {
	t.Helper()
	var c cond
	var gb gradBuf
	d := len(phi)
	got := make([]float64, d)
	f := m.objectiveGrad(phi, got, &c, &gb, true)
	if want := m.laplaceObjective(phi); math.Abs(f-want) > 1e-9*math.Max(1, math.Abs(want)) {
		t.Errorf("objective %v, want %v", f, want)
	}
	want := make([]float64, d)
	x := append([]float64(nil), phi...)
	for i, p := range m.phi {
		g := func(v float64) float64 { x[i] = v; return m.laplaceObjective(x) }
		central := func(h float64) float64 {
			return fd.Derivative(g, phi[i], &fd.Settings{Formula: fd.Central, Step: h})
		}
		h := 0.1 * p.sd
		want[i] = (4*central(h/2) - central(h)) / 3 // Richardson: error O(h⁴)
		x[i] = phi[i]
	}
	for i := range d {
		scale := 1 / m.phi[i].sd // the prior's own gradient at one sd
		if math.Abs(got[i]-want[i]) > 1e-5*math.Max(scale, math.Abs(want[i])) {
			t.Errorf("∂f/∂%s = %.10g, finite differences %.10g", m.phi[i].name, got[i], want[i])
		}
	}
}
