package report

import (
	"fmt"
	"io"
	"text/tabwriter"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/pressure"
)

// pressureReport: surface pressure taps, integrated over their panels.
func pressureReport() methodReport {
	return methodReport{
		kind:     evidence.KindPressure,
		sections: (*reporter).pressureSections,
		reduced:  pressureReduced,
		limits: func(c *campaign.Campaign) []string {
			if len(c.Evidence.Pressure) == 0 {
				return nil
			}
			return []string{"Pressure taps: see only where there are taps; uncovered areas, the reference port's offset and the integration of a finite set of taps are modelled, and the axle split needs the pitch of drag. Figures are approximate."}
		},
	}
}

// pressureSections writes one sub-section per pressure entry.
func (r *reporter) pressureSections() {
	for _, p := range methods.Details[*pressure.Result](r.in.Reduced) {
		r.pressureSection(p)
	}
}

// pressureSection: the entry's error model, its integrated forces per
// reading, what it says alone, and its Cp chart.
func (r *reporter) pressureSection(p *pressure.Result) {
	pg := r.pg
	e := p.Entry
	pg.h2(fmt.Sprintf("%s — pressure taps (%s, %s)", e.ID, e.Mode, count(len(p.Panels), "tap")), 70)
	pg.para(fmt.Sprintf("Sensor noise %.3g Pa per tap, reference port ±%.3g Pa, integration scale ±%.0f %% for what a finite set of taps misses; %s. Pressure integration sees the vertical pressure force only: the pitch of drag is added as a modelled nuisance, and the figures are approximate.",
		e.SensorSDPa, e.ReferenceSDPa, e.ModelSDPct, uncoveredCarry(len(e.Uncovered))))
	var rows [][]string
	for _, rd := range p.Readings {
		f := rd.Forces
		rows = append(rows, []string{rd.Config, fmt.Sprintf("%g", rd.SpeedKmh), fmt.Sprintf("%+d", rd.Direction), fmt.Sprintf("%.0f", rd.Q),
			fmt.Sprintf("%+.1f", r.unit.of(f.Front)), fmt.Sprintf("%+.1f", r.unit.of(f.Rear)), fmt.Sprintf("%+.1f", r.unit.of(f.Total))})
	}
	unit := r.in.Campaign.Report.ForceUnit
	pg.table([]column{{"configuration", 1.3, "L"}, {"km/h", 0.7, "R"}, {"dir", 0.5, "R"}, {"q (Pa)", 0.8, "R"}, {"front " + unit, 1, "R"}, {"rear " + unit, 1, "R"}, {"total " + unit, 1, "R"}}, rows)
	pg.note("Integrated tap forces as read (upward positive), split to the axles by moments about the front axle; before the pitch of drag, uncovered patches and the integration scale.")
	r.standaloneTable(e.ID)
	pg.chart(cpChart(p, r.configs()), 62)
}

// uncoveredCarry says how many uncovered patches carry a prior on their
// Cp, in words.
func uncoveredCarry(n int) string {
	switch n {
	case 0:
		return "no uncovered patch is declared"
	case 1:
		return "1 uncovered patch carries a prior on its Cp"
	}
	return count(n, "uncovered patch") + " carry a prior on their Cp"
}

// cpChart: Cp of every tap along x, upper surface filled and lower hollow,
// one marker shape per configuration.
func cpChart(r *pressure.Result, configs []string) *plot.Plot {
	p := newPlot(r.Entry.ID+": pressure coefficient along the car", "x from the front axle, rearward (m)", "Cp")
	var d dropped
	shown := charted(len(configs))
	for ci, cfg := range configs[:shown] {
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
			s := d.scatter(pts)
			if s == nil {
				continue
			}
			col, shape := styleOf(ci)
			s.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.2), Shape: shape}
			if surface == campaign.SurfaceLower {
				s.GlyphStyle.Shape = hollow(shape)
			}
			p.Add(s)
			p.Legend.Add(cfg+", "+surface+" surface", s)
		}
	}
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.XOffs = 0
	chartedNote(p, len(configs))
	pad(p, legendShare(2*shown+moreLine(len(configs)), 0.32))
	d.note(p)
	return p
}

// pressureReduced writes each pressure entry's integrated readings and the
// C_L·A the taps alone imply.
func pressureReduced(w io.Writer, r *methods.Reduced, u forceUnit) {
	for _, p := range methods.Details[*pressure.Result](r) {
		fmt.Fprintf(w, "%s: %s, %s\n", p.Entry.ID, count(len(p.Panels), "tap"), p.Entry.Mode)
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintf(tw, "  config\tspeed km/h\tdir\tq Pa\tfront %[1]s\trear %[1]s\ttotal %[1]s\tβ_f m²\tβ_r m²\tβ_t m² (taps only)\n", u.name)
		for _, rd := range p.Readings {
			b := rd.ImpliedCLA()
			fmt.Fprintf(tw, "  %s\t%g\t%+d\t%.0f\t%.1f\t%.1f\t%.1f\t%+.3f\t%+.3f\t%+.3f\n", rd.Config, rd.SpeedKmh, rd.Direction, rd.Q,
				u.of(rd.Forces.Front), u.of(rd.Forces.Rear), u.of(rd.Forces.Total), b.Front, b.Rear, b.Total)
		}
		tw.Flush()
		fmt.Fprintln(w)
	}
}
