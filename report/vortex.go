package report

import (
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/vortex"
)

// vortexReport: the sense of a trailing vortex, a sign only.
func vortexReport() methodReport {
	return methodReport{
		kind:     evidence.KindVortex,
		sections: (*reporter).vortexSections,
		reduced:  vortexReduced,
		signOnly: true,
		limits: func(c *campaign.Campaign) []string {
			if len(c.Evidence.Vortex) == 0 {
				return nil
			}
			return []string{"Vortex sense: a sign only, and only for fastbacks and steeply raked notchbacks; most useful near zero lift."}
		},
	}
}

// vortexSections writes one sub-section per vortex entry: what a sense
// means, what the entry says alone, and its senses against the fused P(lift).
func (r *reporter) vortexSections() {
	pg := r.pg
	for _, v := range methods.Details[*vortex.Result](r.in.Reduced) {
		e := v.Entry
		pg.h2(fmt.Sprintf("%s — %s trailing vortex sense", e.ID, e.Side), 95)
		pg.para(fmt.Sprintf("%s, seen from behind the car looking forward; a %s vortex turning %s means net lift. Misread probability %.2f. A sense is a sign only: it tells lift from downforce and sharpens the result only near zero lift, where the other methods are weakest.",
			upperFirst(count(len(v.Observations), "observation")), e.Side, map[bool]string{true: "clockwise", false: "counter-clockwise"}[e.Side == campaign.SideLeft], e.Misread))
		r.standaloneTable(e.ID)
		pg.chart(vortexChart(v, r.in.Fused.Posterior, r.configs()), 55)
	}
}

// vortexChart: observed senses (1 = lift, 0 = downforce) against speed,
// with the fused posterior probability of lift of the informed quantity.
func vortexChart(r *vortex.Result, P *fuse.Posterior, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": vortex sense seen, and the fused P(lift)", "speed (km/h)", "P(lift)")
	minV, maxV := math.Inf(1), math.Inf(-1)
	var ticks []plot.Tick
	seen := map[float64]bool{}
	for _, o := range r.Observations {
		minV, maxV = math.Min(minV, o.SpeedKmh), math.Max(maxV, o.SpeedKmh)
		if !seen[o.SpeedKmh] {
			seen[o.SpeedKmh] = true
			ticks = append(ticks, plot.Tick{Value: o.SpeedKmh, Label: fmt.Sprintf("%g", o.SpeedKmh)})
		}
	}
	lo, hi := math.Max(0, minV-20), maxV+20
	var d dropped
	for ci, cfg := range configs[:charted(len(configs))] {
		var pts plotter.XYs
		for _, o := range r.Observations {
			if o.Config != cfg {
				continue
			}
			y := 0.0
			if o.Lift {
				y = 1
			}
			pts = append(pts, plotter.XY{X: o.SpeedKmh + 3*(float64(ci)-float64(len(configs)-1)/2), Y: y})
		}
		s := d.scatter(pts)
		if s == nil {
			continue
		}
		col, shape := styleOf(ci)
		s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.5), Shape: shape}
		var curve plotter.XYs
		for k := range speedGrid + 1 {
			v := lo + (hi-lo)*float64(k)/speedGrid
			_, pDown := P.At(v, evidence.Term{Config: cfg, Axle: r.Entry.Informs, W: 1})
			curve = append(curve, plotter.XY{X: v, Y: 1 - pDown})
		}
		p.Add(s)
		thumbs := []plot.Thumbnailer{s}
		if l := d.line(curve); l != nil {
			l.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
			p.Add(l)
			thumbs = append(thumbs, l)
		}
		p.Legend.Add(cfg+": sense seen (1 lift, 0 downforce); line: fused P(lift)", thumbs...)
	}
	chartedNote(p, len(configs))
	d.note(p)
	if !chartable(lo) || !chartable(hi) {
		return p
	}
	p.X.Min, p.X.Max = lo, hi
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	p.Y.Min, p.Y.Max = -0.08, 1.45
	p.Y.Tick.Marker = plot.ConstantTicks([]plot.Tick{{Value: 0, Label: "0"}, {Value: 0.5, Label: "0.5"}, {Value: 1, Label: "1"}})
	p.Legend.Top, p.Legend.Left = true, true
	return p
}

// vortexReduced writes each vortex entry's observations and what each says.
func vortexReduced(w io.Writer, r *methods.Reduced, _ forceUnit) {
	for _, v := range methods.Details[*vortex.Result](r) {
		fmt.Fprintf(w, "%s: %s vortex, informs %s, misread %.2f\n", v.Entry.ID, v.Entry.Side, v.Entry.Informs, v.Entry.Misread)
		for _, o := range v.Observations {
			says := "downforce"
			if o.Lift {
				says = "lift"
			}
			fmt.Fprintf(w, "  %s at %g km/h: %s → %s\n", o.Config, o.SpeedKmh, o.Sense, says)
		}
		fmt.Fprintln(w)
	}
}
