package report

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"text/tabwriter"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
)

// heightReport: ride height, from suspension potentiometers or a
// body-to-ground laser.
func heightReport() methodReport {
	return methodReport{
		kind:     evidence.KindRideHeight,
		sections: (*reporter).heightSections,
		reduced:  heightReduced,
		limits:   heightLimits,
	}
}

// heightLimits are the limits of the ride-height sensors the campaign used.
func heightLimits(c *campaign.Campaign) []string {
	var out []string
	for _, s := range []struct{ sensor, limit string }{
		{campaign.SensorPot, "Ride height (potentiometers): needs the heave stiffness at the wheel; a spring rate or installation ratio known only roughly scales every figure, and suspension friction hides small deflections. Low-speed runs pin the static height."},
		{campaign.SensorLaser, "Ride height (laser): also sees tyre growth with speed, which grows like aerodynamic load; absolute lift is loose, differences between configurations at matched speeds are sharp."},
	} {
		for _, e := range c.Evidence.RideHeight {
			if e.Sensor == s.sensor {
				out = append(out, s.limit)
				break
			}
		}
	}
	return out
}

// heightSections writes one sub-section per ride-height entry.
func (r *reporter) heightSections() {
	for _, h := range methods.Details[*height.Result](r.in.Reduced) {
		r.heightSection(h)
	}
}

// heightSection: calibration, stiffness and resolution of one entry, what
// it says alone, its windows against q with the fit, and a trace excerpt.
func (r *reporter) heightSection(h *height.Result) {
	pg := r.pg
	e := h.Entry
	pg.h2(fmt.Sprintf("%s — %s ride height (%s)", e.ID, e.Axle, map[string]string{campaign.SensorPot: "suspension potentiometer", campaign.SensorLaser: "body-to-ground laser"}[e.Sensor]), 100)
	cal := fmt.Sprintf("gain %.4g mm per unit ± %.1f %%", h.Calibration.Gain, 100*h.Calibration.RelSD)
	stiff := fmt.Sprintf("heave stiffness %.1f N/mm from the %s ± %.1f %%", h.Stiffness.K, h.Stiffness.Source, 100*h.Stiffness.RelSD())
	txt := fmt.Sprintf("%s from %s; %s; %s.", count(len(h.Windows), "steady window"), count(len(e.Logs), "log"), cal, stiff)
	if e.FrictionMm > 0 {
		txt += fmt.Sprintf(" Suspension friction band ±%.2g mm.", e.FrictionMm)
	}
	if e.Sensor == campaign.SensorLaser {
		txt += fmt.Sprintf(" Tyre growth prior %.2g ± %.2g mm at 100 km/h: a laser alone cannot tell growth from lift, so its absolute figures are loose and its differences between configurations sharp.", e.TyreGrowth.MmAt100kmh, e.TyreGrowth.SDMm)
	}
	txt += " It resolves about " + r.loadBoth(h.Detect.ResolvableN) + " of axle load at two standard deviations of one window."
	pg.para(txt)
	r.standaloneTable(e.ID)
	var fitted []float64
	if alone := r.in.Fused.Standalone[e.ID]; alone != nil {
		fitted, _ = alone.Fitted(e.ID)
	}
	pg.chart(heightChart(h, fitted, r.configs()), 62)
	pg.chart(traceChart(h), 48)
}

// heightChart: each steady window's mean height against q with ±1 SE bars,
// and per configuration the straight line through the entry's fitted
// values (posterior mean): the fit's trend with q, the per-log offsets and
// drifts that make the fitted values scatter about it averaged out.
func heightChart(r *height.Result, fitted []float64, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": ride height against dynamic pressure", "dynamic pressure q (Pa)", "height (mm)")
	var d dropped
	shown := charted(len(configs))
	for ci, cfg := range configs[:shown] {
		var pts, fit plotter.XYs
		var errs plotter.YErrors
		for i, w := range r.Windows {
			if w.Config != cfg {
				continue
			}
			pts = append(pts, plotter.XY{X: w.Q, Y: w.HeightMM})
			errs = append(errs, struct{ Low, High float64 }{w.SE, w.SE})
			if i < len(fitted) {
				fit = append(fit, plotter.XY{X: w.Q, Y: fitted[i]})
			}
		}
		pts, errs = d.keepBars(pts, errs)
		s := d.scatter(pts)
		if s == nil {
			continue
		}
		col, shape := styleOf(ci)
		s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2), Shape: shape}
		eb := &plotter.YErrorBars{XYs: pts, YErrors: errs, LineStyle: draw.LineStyle{Color: col, Width: vg.Points(0.5)}, CapWidth: vg.Points(3)}
		p.Add(eb, s)
		if l := trendLine(d.keep(fit)); l != nil {
			l.LineStyle = draw.LineStyle{Color: col, Width: vg.Points(1)}
			p.Add(l)
			p.Legend.Add(cfg+": windows ± SE, line: fit", s, l)
		} else {
			p.Legend.Add(cfg+": windows ± SE", s)
		}
	}
	chartedNote(p, len(configs))
	pad(p, legendShare(shown+moreLine(len(configs)), 0.2))
	d.note(p)
	return p
}

// trendLine is the least-squares straight line through chartable points,
// drawn across their x range, or nil for fewer than two distinct x or a
// line that cannot be drawn.
func trendLine(pts plotter.XYs) *plotter.Line {
	n := float64(len(pts))
	var sx, sy, sxx, sxy float64
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range pts {
		sx, sy, sxx, sxy = sx+p.X, sy+p.Y, sxx+p.X*p.X, sxy+p.X*p.Y
		lo, hi = math.Min(lo, p.X), math.Max(hi, p.X)
	}
	den := n*sxx - sx*sx
	if len(pts) < 2 || !(den > 0) || !(hi > lo) {
		return nil
	}
	b := (n*sxy - sx*sy) / den
	a := (sy - b*sx) / n
	var d dropped
	l := d.line(plotter.XYs{{X: lo, Y: a + b*lo}, {X: hi, Y: a + b*hi}})
	if d > 0 {
		return nil
	}
	return l
}

// traceChart: an excerpt of the raw trace with its low-pass and moving
// average, around the entry's fastest window.
func traceChart(r *height.Result) *plot.Plot {
	p := newPlot(r.Entry.ID+": the fastest steady run as logged, and filtered", "time (s)", "height (mm)")
	if len(r.Traces) == 0 || len(r.Windows) == 0 {
		return p
	}
	best := r.Windows[0]
	for _, w := range r.Windows {
		if w.SpeedKmh > best.SpeedKmh {
			best = w
		}
	}
	if best.Log < 0 || best.Log >= len(r.Traces) {
		return p
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
	var d dropped
	for _, s := range []struct {
		pts   plotter.XYs
		label string
		style draw.LineStyle
	}{
		{raw, "raw samples", draw.LineStyle{Color: color.Gray{190}, Width: vg.Points(0.5)}},
		{lp, "first-order low-pass", draw.LineStyle{Color: color.Gray{0}, Width: vg.Points(1)}},
		{ma, "moving average", draw.LineStyle{Color: color.Gray{90}, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(2), vg.Points(2)}}},
	} {
		if l := d.line(s.pts); l != nil {
			l.LineStyle = s.style
			p.Add(l)
			p.Legend.Add(s.label, l)
		}
	}
	pad(p, 0.3)
	d.note(p)
	return p
}

// heightReduced writes each ride-height entry's steady windows and its
// detectability.
func heightReduced(w io.Writer, r *methods.Reduced, u forceUnit) {
	for _, h := range methods.Details[*height.Result](r) {
		e := h.Entry
		fmt.Fprintf(w, "%s: %s %s, K = %.1f N/mm (%s), calibration %.4g mm/unit ± %.1f %%\n", e.ID, e.Axle, e.Sensor, h.Stiffness.K, h.Stiffness.Source, h.Calibration.Gain, 100*h.Calibration.RelSD)
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "  config\tdir\tspeed km/h\tq Pa\theight mm\tSE mm\tn_eff\ttime s")
		for _, win := range h.Windows {
			fmt.Fprintf(tw, "  %s\t%+d\t%.1f\t%.0f\t%.3f\t%.3f\t%.0f\t%.0f–%.0f\n", win.Config, win.Direction, win.SpeedKmh, win.Q, win.HeightMM, win.SE, win.NEff, win.From, win.To)
		}
		tw.Flush()
		d := h.Detect
		fmt.Fprintf(w, "  detectability: window sd %.2f mm → smallest load %.1f %s at 2 sd (C_L·A %.3f m² at 100 km/h)\n\n", d.SigmaMM, u.of(d.ResolvableN), u.name, d.ResolvableCLA100)
	}
}
