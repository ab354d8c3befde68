package checks

import (
	"math"
	"testing"
)

// TestWLSAnscombe fits Anscombe's second data set (F. J. Anscombe, "Graphs
// in Statistical Analysis", The American Statistician 27(1):17–21, 1973):
// the line is y = 3.00 + 0.500·x like the other three sets, but the data
// lie on a parabola, y ≈ −5.996 + 2.781·x − 0.1267·x² (from memory), so the
// F test of the x² term must reject the line.
func TestWLSAnscombe(t *testing.T) {
	xs := []float64{10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5}
	ys := []float64{9.14, 8.14, 8.74, 8.77, 9.26, 8.10, 6.13, 3.10, 9.13, 7.26, 4.74}
	var x1, x2 [][]float64
	w := make([]float64, len(xs))
	for i, x := range xs {
		x1 = append(x1, []float64{1, x})
		x2 = append(x2, []float64{1, x, x * x})
		w[i] = 1
	}
	lin, err := wls(x1, ys, w)
	if err != nil {
		t.Fatal(err)
	}
	quad, err := wls(x2, ys, w)
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name      string
		got, want float64
		tol       float64
	}{
		{"line intercept", lin.Beta[0], 3.00, 0.005},
		{"line slope", lin.Beta[1], 0.500, 0.0005},
		{"parabola constant", quad.Beta[0], -5.996, 0.002},
		{"parabola x", quad.Beta[1], 2.781, 0.001},
		{"parabola x²", quad.Beta[2], -0.1267, 0.0001},
	}
	for _, c := range cases {
		if math.Abs(c.got-c.want) > c.tol {
			t.Errorf("%s: %.5f, want %.4f ± %g", c.name, c.got, c.want, c.tol)
		}
	}
	if p := fTest(lin, quad); p > 1e-6 {
		t.Errorf("F test of x² on Anscombe II: p = %.3g, want < 1e-6", p)
	}
	// Adding a column that changes nothing gives p = 1.
	if p := fTest(lin, lin); p != 1 {
		t.Errorf("F test of a fit against itself: p = %g, want 1", p)
	}
	// Rank deficiency is reported, not fitted.
	if _, err := wls([][]float64{{1, 2}, {2, 4}, {3, 6}}, []float64{1, 2, 3}, []float64{1, 1, 1}); err == nil {
		t.Error("collinear columns fitted without error")
	}
}
