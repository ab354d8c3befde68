package report

import (
	"image/color"
	"math"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/fuse"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// Configurations are told apart by shade and marker shape, which survive a
// mono printer.
var (
	shades = []color.Color{color.Gray{0}, color.Gray{120}, color.Gray{70}, color.Gray{160}}
	shapes = []draw.GlyphDrawer{draw.RingGlyph{}, draw.TriangleGlyph{}, draw.SquareGlyph{}, draw.CrossGlyph{}}
)

func styleOf(i int) (color.Color, draw.GlyphDrawer) {
	return shades[i%len(shades)], shapes[i%len(shapes)]
}

func newPlot(title, x, y string) *plot.Plot {
	chartFonts()
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Font.Size = 9
	p.X.Label.Text = x
	p.Y.Label.Text = y
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Size = 8
		a.Tick.Label.Font.Size = 7
	}
	p.Legend.TextStyle.Font.Size = 7
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.Padding = vg.Points(2)
	g := plotter.NewGrid()
	g.Vertical = draw.LineStyle{Color: color.Gray{225}, Width: vg.Points(0.4)}
	g.Horizontal = g.Vertical
	p.Add(g)
	return p
}

// heightChart: each steady window's mean height against q with ±1 SE bars,
// and the entry's fitted values (posterior mean) joined per configuration.
func heightChart(r *height.Result, fitted []float64, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": ride height against dynamic pressure", "dynamic pressure q (Pa)", "height (mm)")
	for ci, cfg := range configs {
		var pts plotter.XYs
		var errs plotter.YErrors
		var line plotter.XYs
		for i, w := range r.Windows {
			if w.Config != cfg {
				continue
			}
			pts = append(pts, plotter.XY{X: w.Q, Y: w.HeightMM})
			errs = append(errs, struct{ Low, High float64 }{w.SE, w.SE})
			if i < len(fitted) {
				line = append(line, plotter.XY{X: w.Q, Y: fitted[i]})
			}
		}
		if len(pts) == 0 {
			continue
		}
		col, shape := styleOf(ci)
		s, _ := plotter.NewScatter(pts)
		s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2), Shape: shape}
		eb := &plotter.YErrorBars{XYs: pts, YErrors: errs, LineStyle: draw.LineStyle{Color: col, Width: vg.Points(0.5)}, CapWidth: vg.Points(3)}
		sort.Slice(line, func(a, b int) bool { return line[a].X < line[b].X })
		l, _ := plotter.NewLine(line)
		l.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(3), vg.Points(2)}}
		p.Add(eb, s, l)
		p.Legend.Add(cfg+" (windows ± SE; dashed: fit)", s)
	}
	return p
}

// traceChart: an excerpt of the raw trace with its low-pass and moving
// average, around the entry's fastest window.
func traceChart(r *height.Result) *plot.Plot {
	p := newPlot(r.Entry.ID+": smoothed trace, excerpt", "time (s)", "height (mm)")
	if len(r.Traces) == 0 || len(r.Windows) == 0 {
		return p
	}
	best := r.Windows[0]
	for _, w := range r.Windows {
		if w.SpeedKmh > best.SpeedKmh {
			best = w
		}
	}
	from, to := best.From-20, best.To+20
	var raw, lp, ma plotter.XYs
	for _, t := range r.Traces[best.Log] {
		if t.T < from || t.T > to {
			continue
		}
		raw = append(raw, plotter.XY{X: t.T, Y: t.Raw})
		lp = append(lp, plotter.XY{X: t.T, Y: t.LowPass})
		ma = append(ma, plotter.XY{X: t.T, Y: t.MovingAverage})
	}
	if len(raw) < 2 {
		return p
	}
	lr, _ := plotter.NewLine(raw)
	lr.LineStyle = draw.LineStyle{Color: color.Gray{190}, Width: vg.Points(0.5)}
	ll, _ := plotter.NewLine(lp)
	ll.LineStyle = draw.LineStyle{Color: color.Gray{0}, Width: vg.Points(1)}
	lm, _ := plotter.NewLine(ma)
	lm.LineStyle = draw.LineStyle{Color: color.Gray{90}, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}
	p.Add(lr, ll, lm)
	p.Legend.Add("raw samples", lr)
	p.Legend.Add("first-order low-pass", ll)
	p.Legend.Add("moving average", lm)
	return p
}

// cpChart: Cp of every tap along x, upper surface filled and lower hollow,
// one marker shape per configuration.
func cpChart(r *pressure.Result, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": pressure coefficient along the car", "x from the front axle, rearward (m)", "Cp")
	p.Legend.Top = false
	for ci, cfg := range configs {
		for _, surface := range []string{campaign.SurfaceUpper, campaign.SurfaceLower} {
			var pts plotter.XYs
			for _, rd := range r.Readings {
				if rd.Config != cfg {
					continue
				}
				for _, pn := range r.Panels {
					if pn.Surface == surface {
						pts = append(pts, plotter.XY{X: pn.X, Y: rd.Cp[pn.ID]})
					}
				}
			}
			if len(pts) == 0 {
				continue
			}
			col, shape := styleOf(ci)
			s, _ := plotter.NewScatter(pts)
			s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.2), Shape: shape}
			if surface == campaign.SurfaceUpper {
				s.GlyphStyle.Shape = filled(shape)
			}
			p.Add(s)
			p.Legend.Add(cfg+", "+surface+" surface", s)
		}
	}
	return p
}

// filled returns the solid version of a marker where there is one.
func filled(g draw.GlyphDrawer) draw.GlyphDrawer {
	switch g.(type) {
	case draw.RingGlyph:
		return draw.CircleGlyph{}
	case draw.TriangleGlyph:
		return draw.PyramidGlyph{}
	case draw.SquareGlyph:
		return draw.BoxGlyph{}
	}
	return g
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

// bar is one interval of the agreement chart.
type bar struct {
	label   string
	est     fuse.Estimate
	fused   bool
	flagged bool
}

// agreementChart: every entry's standalone interval beside the fused one,
// per configuration and axle, as horizontal bars.
func agreementChart(rows []bar) *plot.Plot {
	p := newPlot("what each method says, and the fused result", "C_L·A (m²), central interval", "")
	names := make([]string, len(rows))
	for i, r := range rows {
		names[len(rows)-1-i] = r.label
		y := float64(len(rows) - 1 - i)
		col := color.Color(color.Gray{110})
		width := vg.Points(1.5)
		if r.fused {
			col, width = color.Gray{0}, vg.Points(3)
		}
		seg, _ := plotter.NewLine(plotter.XYs{{X: r.est.Lo, Y: y}, {X: r.est.Hi, Y: y}})
		seg.LineStyle = draw.LineStyle{Color: col, Width: width}
		if r.flagged {
			seg.LineStyle.Dashes = []vg.Length{vg.Points(2), vg.Points(1.5)}
		}
		dot, _ := plotter.NewScatter(plotter.XYs{{X: r.est.Mean, Y: y}})
		dot.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2), Shape: draw.CircleGlyph{}}
		p.Add(seg, dot)
	}
	zero, _ := plotter.NewLine(plotter.XYs{{X: 0, Y: -0.5}, {X: 0, Y: float64(len(rows)) - 0.5}})
	zero.LineStyle = draw.LineStyle{Color: color.Gray{150}, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
	p.Add(zero)
	p.NominalY(names...)
	p.Y.Tick.Label.Font.Size = 6.5
	return p
}
