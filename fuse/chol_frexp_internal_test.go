package fuse

import (
	"math"
	"testing"
)

// TestFrexp holds frexp to math.Frexp, bit for bit, on normal numbers of
// every sign and range and on the cases it leaves to math.Frexp.
func TestFrexp(t *testing.T) {
	cases := []struct {
		name string
		x    float64
	}{
		{"one", 1},
		{"half", 0.5},
		{"three", 3},
		{"negative", -7.25},
		{"large", 1e300},
		{"small normal", 2.2250738585072014e-308},
		{"largest", math.MaxFloat64},
		{"subnormal", 5e-324},
		{"negative subnormal", -1e-310},
		{"zero", 0},
		{"negative zero", math.Copysign(0, -1)},
		{"inf", math.Inf(1)},
		{"-inf", math.Inf(-1)},
		{"nan", math.NaN()},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f, e := frexp(c.x)
			wf, we := math.Frexp(c.x)
			if math.Float64bits(f) != math.Float64bits(wf) || e != we {
				t.Errorf("frexp(%g) = %g, %d, want %g, %d", c.x, f, e, wf, we)
			}
		})
	}
	for i := range 2000 {
		x := math.Float64frombits(uint64(i) * 0x9e3779b97f4a7c15)
		f, e := frexp(x)
		wf, we := math.Frexp(x)
		if math.Float64bits(f) != math.Float64bits(wf) || e != we {
			t.Fatalf("frexp(%g) = %g, %d, want %g, %d", x, f, e, wf, we)
		}
	}
}
