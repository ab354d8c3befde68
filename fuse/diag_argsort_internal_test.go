package fuse

import (
	"cmp"
	"math"
	"slices"
	"testing"
)

// TestArgsort holds the radix argsort to a stable comparison sort of the
// same values: ties (repeated draws of a rejected step, ±0), negatives,
// values spread over many binades and values that differ only in their
// last bits, reusing one scratch as the diagnostics do.
func TestArgsort(t *testing.T) {
	rng := newRand(3, 1)
	gens := []struct {
		name string
		gen  func(i int) float64
	}{
		{"normal", func(int) float64 { return rng.NormFloat64() }},
		{"ties", func(int) float64 { return float64(rng.IntN(7)) - 3 }},
		{"signed zero", func(i int) float64 { return []float64{0, math.Copysign(0, -1), 1, -1}[i%4] }},
		{"binades", func(int) float64 { return math.Exp(40*rng.NormFloat64()) * float64(1-2*rng.IntN(2)) }},
		{"last bits", func(int) float64 { return math.Float64frombits(math.Float64bits(1.5) + uint64(rng.IntN(300))) }},
		{"constant", func(int) float64 { return 2.5 }},
	}
	sc := new(scratch)
	for _, g := range gens {
		for _, n := range []int{1, 2, 17, 256, 3001} {
			vals := make([]float64, n)
			for i := range vals {
				vals[i] = g.gen(i)
			}
			want := make([]int32, n)
			for i := range want {
				want[i] = int32(i)
			}
			slices.SortStableFunc(want, func(a, b int32) int {
				// -0 before +0, as their bit patterns order them
				if vals[a] == 0 && vals[b] == 0 {
					return cmp.Compare(boolInt(!math.Signbit(vals[a])), boolInt(!math.Signbit(vals[b])))
				}
				return cmp.Compare(vals[a], vals[b])
			})
			if got := sc.argsort(vals); !slices.Equal(got, want) {
				t.Errorf("%s, n=%d: argsort differs from the stable sort", g.name, n)
			}
		}
	}
}

func boolInt(b bool) int {
	if b {
		return 1
	}
	return 0
}
