package fuse

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

// TestQuantileSelect: the quantiles found by selection equal those of the
// sorted draws (Hyndman & Fan type 7 on sort.Float64s' order, the
// reference), with ties, odd and even lengths, and the extreme levels.
func TestQuantileSelect(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 1))
	cases := []struct {
		name string
		x    []float64
	}{
		{"one", []float64{3}},
		{"two", []float64{2, -1}},
		{"ties", []float64{1, 1, 1, 0, 0, 2, 2, 1, 1}},
		{"sorted", []float64{1, 2, 3, 4, 5, 6, 7, 8}},
		{"reversed", []float64{8, 7, 6, 5, 4, 3, 2, 1, 0}},
	}
	for _, n := range []int{100, 1001, 20000} {
		x := make([]float64, n)
		for i := range x {
			x[i] = rng.NormFloat64()
			if i%7 == 0 {
				x[i] = float64(int(x[i] * 3)) // some ties
			}
		}
		cases = append(cases, struct {
			name string
			x    []float64
		}{fmt.Sprintf("normal-%d", n), x})
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s := slices.Clone(c.x)
			slices.Sort(s)
			for _, p := range []float64{0, 0.05, 0.25, 0.5, 0.95, 1} {
				want := quantileSorted(s, p)
				got := quantileSelect(slices.Clone(c.x), p)
				if got != want {
					t.Errorf("p = %g: %v, want %v", p, got, want)
				}
			}
		})
	}
}
