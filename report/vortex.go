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
		limits: []string{
			"Vortex sense: a sign only, and only for fastbacks and steeply raked notchbacks; most useful near zero lift.",
		},
	}
}

// vortexSections writes one sub-section per vortex entry: what a sense
// means, what the entry says alone, and its senses against the fused P(lift).
func (r *reporter) vortexSections() {
	pg := r.pg
	for _, v := range methods.Details[*vortex.Result](r.in.Reduced) {
		e := v.Entry
		pg.h2(fmt.Sprintf("%s — %s trailing vortex sense", e.ID, e.Side), 60)
		pg.para(fmt.Sprintf("%d observations, seen from behind the car looking forward; a %s vortex turning %s means net lift. Misread probability %.2f. A sense is a sign only: it tells lift from downforce and sharpens the result only near zero lift, where the other methods are weakest.",
			len(v.Observations), e.Side, map[bool]string{true: "clockwise", false: "counter-clockwise"}[e.Side == campaign.SideLeft], e.Misread))
		r.standaloneTable(e.ID)
		pg.chart(vortexChart(v, r.in.Fused.Posterior, r.configs()), 55)
	}
}

// vortexChart: observed senses (1 = lift, 0 = downforce) against speed,
// with the fused posterior probability of lift of the informed quantity.
func vortexChart(r *vortex.Result, P *fuse.Posterior, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": vortex sense and P(lift)", "speed (km/h)", "lift seen (1) / P(lift)")
	p.Legend.Top, p.Legend.Left = false, false
	maxV := 0.0
	for _, o := range r.Observations {
		maxV = math.Max(maxV, o.SpeedKmh)
	}
	for ci, cfg := range configs {
		var pts plotter.XYs
		for _, o := range r.Observations {
			if o.Config != cfg {
				continue
			}
			y := 0.0
			if o.Lift {
				y = 1
			}
			pts = append(pts, plotter.XY{X: o.SpeedKmh, Y: y + 0.02*float64(ci)})
		}
		if len(pts) == 0 {
			continue
		}
		col, shape := styleOf(ci)
		s, _ := plotter.NewScatter(pts)
		s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.5), Shape: shape}
		var curve plotter.XYs
		for v := 10.0; v <= math.Max(maxV*1.2, 60); v += 5 {
			_, pDown := P.At(v, evidence.Term{Config: cfg, Axle: r.Entry.Informs, W: 1})
			curve = append(curve, plotter.XY{X: v, Y: 1 - pDown})
		}
		l, _ := plotter.NewLine(curve)
		l.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
		p.Add(s, l)
		p.Legend.Add(cfg+": seen", s)
		p.Legend.Add(cfg+": P(lift), fused", l)
	}
	p.Y.Min, p.Y.Max = -0.1, 1.1
	return p
}

// vortexReduced writes each vortex entry's observations and what each says.
func vortexReduced(w io.Writer, r *methods.Reduced) {
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
