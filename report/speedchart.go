package report

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/methods"
	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// speedGrid is how many speeds the lift-against-speed curves are drawn
// at: enough for a smooth curve at print size.
const speedGrid = 48

// speedCharts writes lift against speed, front and rear axle side by side,
// each configuration's posterior mean with its credible band, and the
// result document's figures at the report speeds marked.
func (r *reporter) speedCharts() {
	pg := r.pg
	lo, hi := r.speedRange()
	pg.h1("Lift against speed")
	pg.para(fmt.Sprintf("Axle lift of each configuration from %g to %g km/h, the speeds the runs covered and the report speeds: the line is the fused estimate, the band its %s credible interval, the markers the figures of page 1 with their intervals. Lift is positive, downforce negative.", lo, hi, r.level()))
	var plots []*plot.Plot
	for i, ax := range []string{evidence.AxleFront, evidence.AxleRear} {
		plots = append(plots, r.speedChart(ax, i, lo, hi))
	}
	pg.charts(plots, 78)
}

// speedRange is the lowest and highest speed of the runs and the report
// speeds, km/h.
func (r *reporter) speedRange() (float64, float64) {
	vs := slices.Clone(r.in.Campaign.Report.SpeedsKmh)
	for _, h := range methods.Details[*height.Result](r.in.Reduced) {
		for _, w := range h.Windows {
			vs = append(vs, w.SpeedKmh)
		}
	}
	for _, p := range methods.Details[*pressure.Result](r.in.Reduced) {
		for _, rd := range p.Readings {
			vs = append(vs, rd.SpeedKmh)
		}
	}
	for _, v := range methods.Details[*vortex.Result](r.in.Reduced) {
		for _, o := range v.Observations {
			vs = append(vs, o.SpeedKmh)
		}
	}
	if len(vs) == 0 {
		return 0, 100
	}
	lo, hi := slices.Min(vs), slices.Max(vs)
	if hi-lo < 10 {
		lo, hi = math.Max(0, lo-5), hi+5
	}
	return math.Floor(lo), math.Ceil(hi)
}

// speedChart is one axle's lift against speed (axle index i: 0 front,
// 1 rear, as in atSpeed).
func (r *reporter) speedChart(ax string, i int, lo, hi float64) *plot.Plot {
	unit := r.in.Campaign.Report.ForceUnit
	p := newPlot(ax+" axle", "speed (km/h)", fmt.Sprintf("%s axle lift (%s)", ax, unit))
	rho := r.res.Air.DensityKgM3
	var d dropped
	shown := charted(len(r.res.Configs))
	for ci, cr := range r.res.Configs[:shown] {
		col, shape := styleOf(ci)
		var mean, band plotter.XYs
		var upper plotter.XYs
		for k := range speedGrid + 1 {
			v := lo + (hi-lo)*float64(k)/speedGrid
			q := air.DynamicPressure(rho, air.KmhToMs(v))
			e, _ := r.in.Fused.Posterior.At(v, evidence.Term{Config: cr.ID, Axle: ax, W: r.unit.of(q)})
			mean = append(mean, plotter.XY{X: v, Y: e.Mean})
			band = append(band, plotter.XY{X: v, Y: e.Lo})
			upper = append(upper, plotter.XY{X: v, Y: e.Hi})
		}
		slices.Reverse(upper)
		var thumbs []plot.Thumbnailer
		if poly := d.polygon(append(band, upper...)); poly != nil {
			poly.Color = tint(col, 0.18)
			poly.LineStyle.Width = 0
			p.Add(poly)
			thumbs = append(thumbs, poly)
		}
		if line := d.line(mean); line != nil {
			line.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1.2)}
			p.Add(line)
			thumbs = append(thumbs, line)
		}
		var pts plotter.XYs
		var errs plotter.YErrors
		for _, v := range r.in.Campaign.Report.SpeedsKmh {
			if s, ok := speedOf(cr, v); ok {
				e := r.unit.est(s.N[i])
				pts = append(pts, plotter.XY{X: v, Y: e.Mean})
				errs = append(errs, struct{ Low, High float64 }{e.Mean - e.Lo, e.Hi - e.Mean})
			}
		}
		pts, errs = d.keepBars(pts, errs)
		if sc := d.scatter(pts); sc != nil {
			sc.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.4), Shape: shape}
			eb := &plotter.YErrorBars{XYs: pts, YErrors: errs, LineStyle: draw.LineStyle{Color: col, Width: vg.Points(0.7)}, CapWidth: vg.Points(4)}
			p.Add(eb, sc)
			thumbs = append(thumbs, sc)
		}
		if len(thumbs) > 0 {
			p.Legend.Add(cr.ID, thumbs...)
		}
	}
	if zero := d.line(plotter.XYs{{X: lo, Y: 0}, {X: hi, Y: 0}}); zero != nil {
		zero.LineStyle = draw.LineStyle{Color: grayOf(120), Width: vg.Points(0.5)}
		p.Add(zero)
	}
	chartedNote(p, len(r.res.Configs))
	pad(p, legendShare(shown+moreLine(len(r.res.Configs)), 0.22))
	d.note(p)
	return p
}
