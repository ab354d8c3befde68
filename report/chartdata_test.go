package report

import (
	"math"
	"testing"

	"gonum.org/v1/plot/plotter"
)

// TestChartable: what a chart may show. 1e308 is near the largest float64
// (≈ 1.7977e308, IEEE 754 binary64), where a span or a padding overflows
// to Inf; plotter.NewLine refuses NaN and ±Inf (gonum/plot CheckFloats).
func TestChartable(t *testing.T) {
	tests := []struct {
		name string
		pts  plotter.XYs
		keep int
		line bool // a line can be drawn through what is kept
	}{
		{"finite", plotter.XYs{{X: 0, Y: 1}, {X: 1, Y: 2}}, 2, true},
		{"one 1e308", plotter.XYs{{X: 0, Y: 1}, {X: 1, Y: 1e308}, {X: 2, Y: 3}}, 2, true},
		{"NaN and Inf", plotter.XYs{{X: math.NaN(), Y: 1}, {X: 1, Y: math.Inf(1)}, {X: 2, Y: 3}}, 1, false},
		{"at the limit", plotter.XYs{{X: -chartLimit, Y: chartLimit}, {X: 0, Y: 0}}, 2, true},
		{"none", nil, 0, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var d dropped
			if got := len(d.keep(tt.pts)); got != tt.keep || int(d) != len(tt.pts)-tt.keep {
				t.Errorf("kept %d and dropped %d, want %d and %d", got, d, tt.keep, len(tt.pts)-tt.keep)
			}
			if l := d.line(tt.pts); (l != nil) != tt.line {
				t.Errorf("line drawn = %v, want %v", l != nil, tt.line)
			}
		})
	}
}

// TestDrawable: a chart whose axes are not finite (or overflow when
// padded) is replaced by a note; an empty one is drawn (0 to 1).
func TestDrawable(t *testing.T) {
	tests := []struct {
		name     string
		min, max float64
		want     bool
	}{
		{"ordinary", 35, 40, true},
		{"empty", math.Inf(1), math.Inf(-1), true},
		{"NaN", math.NaN(), 1, false},
		{"overflowing", -1e308, 1e308, false},
		{"reversed", 2, 1, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			p := newPlot("t", "x", "y")
			p.Y.Min, p.Y.Max = tt.min, tt.max
			p.X.Min, p.X.Max = 0, 1
			if got := drawable(p); got != tt.want {
				t.Errorf("drawable = %v, want %v", got, tt.want)
			}
		})
	}
}
