package report

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
)

// Chart data are checked before gonum/plot sees them: its constructors
// (plotter.NewLine, NewScatter, NewPolygon) refuse NaN and ±Inf with an
// error and a nil plotter, which the report must never draw. A point is
// charted only when both its coordinates are finite and no larger than
// chartLimit: no quantity the charts show (heights in mm, pressures in Pa,
// forces, Cp, speeds) comes near it, and below it the axes' spans and
// paddings stay far from the largest float64 (≈ 1.8e308, IEEE 754
// binary64), so that no sum or difference of them overflows. What is left
// out is counted and said in the chart's title.

// chartLimit is the largest magnitude a charted coordinate may have.
const chartLimit = 1e15

// chartable reports whether v can be drawn.
func chartable(v float64) bool { return !math.IsNaN(v) && math.Abs(v) <= chartLimit }

// dropped counts the points a chart left out.
type dropped int

// keep returns the chartable points of pts and counts the others.
func (d *dropped) keep(pts plotter.XYs) plotter.XYs {
	out := make(plotter.XYs, 0, len(pts))
	for _, p := range pts {
		if chartable(p.X) && chartable(p.Y) {
			out = append(out, p)
		} else {
			*d++
		}
	}
	return out
}

// keepBars returns the chartable points of pts with their error bars
// (both ends chartable too), and counts the others.
func (d *dropped) keepBars(pts plotter.XYs, errs plotter.YErrors) (plotter.XYs, plotter.YErrors) {
	var op plotter.XYs
	var oe plotter.YErrors
	for i, p := range pts {
		e := errs[i]
		if chartable(p.X) && chartable(p.Y) && chartable(e.Low) && chartable(e.High) && chartable(p.Y-e.Low) && chartable(p.Y+e.High) {
			op, oe = append(op, p), append(oe, e)
		} else {
			*d++
		}
	}
	return op, oe
}

// line is a line through the chartable points, or nil when fewer than two
// remain.
func (d *dropped) line(pts plotter.XYs) *plotter.Line {
	ok := d.keep(pts)
	if len(ok) < 2 {
		return nil
	}
	l, err := plotter.NewLine(ok)
	if err != nil {
		return nil
	}
	return l
}

// scatter is a scatter of the chartable points, or nil when none remains.
func (d *dropped) scatter(pts plotter.XYs) *plotter.Scatter {
	ok := d.keep(pts)
	if len(ok) == 0 {
		return nil
	}
	s, err := plotter.NewScatter(ok)
	if err != nil {
		return nil
	}
	return s
}

// polygon is a filled outline of the chartable points, or nil when fewer
// than three remain.
func (d *dropped) polygon(pts plotter.XYs) *plotter.Polygon {
	ok := d.keep(pts)
	if len(ok) < 3 {
		return nil
	}
	p, err := plotter.NewPolygon(ok)
	if err != nil {
		return nil
	}
	return p
}

// note says in the chart's title how many points were left out.
func (d dropped) note(p *plot.Plot) {
	if d > 0 {
		p.Title.Text += fmt.Sprintf(" (%s out of range left out)", count(int(d), "value"))
	}
}

// axisLimit is the largest magnitude of a finished chart's axis range:
// chartable data padded for markers and the legend stay well below it.
const axisLimit = 1e3 * chartLimit

// drawable reports whether a finished plot's axes can be drawn: each
// range finite, within axisLimit and not reversed, or empty (gonum/plot
// draws an empty axis as 0 to 1).
func drawable(p *plot.Plot) bool {
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		if math.IsInf(a.Min, 1) && math.IsInf(a.Max, -1) {
			continue // no data
		}
		if math.IsNaN(a.Min) || math.IsNaN(a.Max) || math.Abs(a.Min) > axisLimit || math.Abs(a.Max) > axisLimit || a.Max < a.Min {
			return false
		}
	}
	return true
}
