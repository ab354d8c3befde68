package report

import (
	"fmt"
	"image/color"
	"slices"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// agreement writes "Agreement between methods": the chart of every entry
// beside the fused result, the table of distances, and for each flagged
// entry what could explain it.
func (r *reporter) agreement() {
	pg := r.pg
	pg.h1("Agreement between methods")
	intro := "Each entry's data are compared with what all the other entries predict they would say (a leave-one-out check; the errors it shares with them, such as the springs or the wind, are counted once): the distance between the two, in standard deviations of their difference, and its p-value; and the probability that the entry's errors are larger than stated (P(off), from a robust mixture). An entry is named as disagreeing when p < 0.01 or P(off) > 0.5; p < 0.05 alone is marked but not acted on (one correct entry in twenty reaches it by chance)."
	if h := headlineOf(r.res); h.known && h.robust {
		intro += fmt.Sprintf(" The fused result here is the robust fusion's, with the errors of %s widened; the plain fusion's figures are in the result document (plain).", List(h.downWeighted))
	}
	pg.para(intro)
	if bars := r.agreementBars(); len(bars) > 0 {
		for _, part := range barGroups(bars, maxBars) {
			pg.chart(agreementChart(part), 30+4.2*float64(len(part)))
		}
		note := "Thick bar, filled marker: fused result of every entry. Thin bar, hollow marker: each entry alone (dashed when it disagrees, as marked in the table). Colour and marker are the configuration's, as in every chart. Sign-only entries (vortex sense) are left out of the chart: alone they say only lift or downforce; their check is in the table."
		if n := len(r.configs()); n > maxCharted {
			note += fmt.Sprintf(" The chart shows the first %d of the %d configurations.", maxCharted, n)
		}
		pg.note(note)
	}
	r.agreementTable()
	r.checksTable()
	for _, m := range r.res.Methods {
		if cc, ok := r.in.Explain[m.ID]; ok {
			r.explain(m.ID, cc)
		}
	}
}

// bar is one interval of the agreement chart.
type bar struct {
	label   string
	config  int // index of the configuration, for its colour
	est     fuse.Estimate
	fused   bool
	flagged bool
}

// maxBars is how many intervals one agreement chart holds: 30 mm of
// frame and 4.2 mm a bar make 198 mm, what a page takes under a heading.
const maxBars = 40

// barGroups cuts the bars into charts of at most max bars, keeping each
// configuration-and-axle group (its fused bar and its entries) in one
// chart unless the group alone is longer.
func barGroups(bars []bar, n int) [][]bar {
	var out [][]bar
	start := 0
	for start < len(bars) {
		end := min(start+n, len(bars))
		if end < len(bars) {
			for k := end; k > start+1; k-- {
				if bars[k].fused { // bars[k] starts a group: cut before it
					end = k
					break
				}
			}
		}
		out = append(out, bars[start:end])
		start = end
	}
	return out
}

// agreementBars lists, per configuration and axle, the fused interval
// followed by each entry's own; sign-only entries are left out.
func (r *reporter) agreementBars() []bar {
	var bars []bar
	flagged := map[string]bool{}
	signOnly := map[string]bool{}
	for _, m := range r.res.Methods {
		flagged[m.ID] = m.Agreement != nil && m.Agreement.Suspect
		mr, _ := reportOf(m.Kind)
		signOnly[m.ID] = mr.signOnly
	}
	cfgs := r.configs()
	for ci, cfg := range cfgs[:charted(len(cfgs))] {
		for _, ax := range axles {
			var entries []bar
			for _, m := range r.res.Methods {
				if signOnly[m.ID] {
					continue
				}
				for _, s := range m.Standalone {
					if s.Config == cfg && s.Axle == ax {
						entries = append(entries, bar{label: cfg + " " + ax + ": " + m.ID, config: ci, est: s.CLA, flagged: flagged[m.ID]})
					}
				}
			}
			if len(entries) == 0 {
				continue
			}
			e, _ := r.in.Fused.Posterior.Quantity(evidence.Quantity{Config: cfg, Axle: ax})
			bars = append(bars, bar{label: cfg + " " + ax + ": fused", config: ci, est: e, fused: true})
			bars = append(bars, entries...)
		}
	}
	return bars
}

// flagWord marks an agreement in a table: DISAGREES for a suspect (p <
// 0.01 or P(off) > 0.5, what the tool acts on), "p < 0.05" for an entry
// the result document flags but the tool does not act on, else nothing.
func flagWord(a *fuse.Agreement) string {
	switch {
	case a.Suspect:
		return "DISAGREES"
	case a.Flag:
		return "p < 0.05"
	}
	return ""
}

// agreementTable writes each entry's distance from the others, its p-value
// and P(off), and its largest difference.
func (r *reporter) agreementTable() {
	var rows [][]string
	for _, m := range r.res.Methods {
		if a := m.Agreement; a != nil {
			worst := ""
			if w := a.Worst; w != nil {
				worst = fmt.Sprintf("%s %s %+.3f (%+.1f sd)", w.Config, w.Axle, w.DiffM2, w.Sigmas)
			}
			rows = append(rows, []string{m.ID, m.Kind, fmt.Sprintf("%.2f", a.Distance), fmt.Sprintf("%.3g", a.PValue), fmt.Sprintf("%.2f", a.POff), worst, flagWord(a)})
		} else {
			rows = append(rows, []string{m.ID, m.Kind, "–", "–", "–", "no other entry", ""})
		}
	}
	r.pg.table([]column{{"entry", 1.1, "L"}, {"kind", 1, "L"}, {"distance", 0.8, "R"}, {"p-value", 0.8, "R"}, {"P(off)", 0.7, "R"}, {"largest difference (m²)", 2, "L"}, {"", 0.9, "L"}}, rows)
}

// checksTable writes the model checks that tripped: where, what, how
// sure, the likely cause and what to do. Nothing when none did.
func (r *reporter) checksTable() {
	cs := checksOf(r.res)
	if len(cs) == 0 {
		return
	}
	r.pg.h2("Model checks that tripped", 25)
	r.pg.para("Each entry's data are also checked against what its own model assumes (heights linear in q, residuals of the windows, taps that read like a blocked or leaking line, plausible speeds and sizes). A check that trips does not change the figures; it says where to look.")
	var rows [][]string
	for _, c := range cs {
		where := strings.Join(slices.DeleteFunc([]string{c.Config, c.Where}, func(s string) bool { return s == "" }), ", ")
		rows = append(rows, []string{c.Entry, where, checkName(c.Check.Check), fmt.Sprintf("%.2g", c.PValue), c.Cause, c.Action})
	}
	r.pg.table([]column{{"entry", 1, "L"}, {"where", 1.2, "L"}, {"check", 1.1, "L"}, {"p", 0.5, "R"}, {"likely cause", 1.6, "L"}, {"what to do", 1.6, "L"}}, rows)
}

// explain writes what could reconcile a flagged entry with the others:
// the errors of its own model that would have to move least, or, when no
// single one within its physical bounds would, what to look at.
func (r *reporter) explain(id string, cc *fuse.Crosscheck) {
	pg := r.pg
	pg.h2("What could explain "+id, 30)
	s := fmt.Sprintf("On %s %s, %s alone says %+.3f ± %.3f m² ("+symCLA+") where the other entries together say %+.3f ± %.3f m² (z = %+.1f).",
		cc.Claim.Config, cc.Claim.Axle, id, cc.Predictive.Mean, cc.Predictive.SD, cc.Claim.Value, cc.Claim.SD, -cc.Z)
	if len(cc.Explanations) == 0 {
		s += fmt.Sprintf(" No single error of %s's own model, within its physical bounds, would make it agree.", id)
		pg.para(s)
	} else {
		pg.para(s + fmt.Sprintf(" The errors in %s's own model that would have to move least for it to agree, in their own prior standard deviations:", id))
		var items []string
		for i, e := range cc.Explanations {
			if i == 4 {
				break
			}
			mark := ""
			if e.Plausible {
				mark = " (plausible)"
			}
			items = append(items, fmt.Sprintf("%+.1f sd%s: %s", e.ShiftSD, mark, e.Note))
		}
		pg.bullets(items)
	}
	if len(cc.Checks) > 0 {
		lead := "None of these is plausible; look also at: "
		if len(cc.Explanations) == 0 {
			lead = "Look at: "
		}
		pg.para(lead + strings.Join(cc.Checks, "; ") + ".")
	}
}

// agreementChart: every entry's standalone interval beside the fused one,
// per configuration and axle, as horizontal bars.
func agreementChart(rows []bar) *plot.Plot {
	p := newPlot("what each method says, and the fused result", "axle lift coefficient × area (m²), central interval", "")
	var d dropped
	names := make([]string, len(rows))
	for i, r := range rows {
		names[len(rows)-1-i] = r.label
		y := float64(len(rows) - 1 - i)
		col, shape := styleOf(r.config)
		width := vg.Points(1)
		if r.fused {
			width = vg.Points(3)
		} else {
			shape = hollow(shape)
		}
		if seg := d.line(plotter.XYs{{X: r.est.Lo, Y: y}, {X: r.est.Hi, Y: y}}); seg != nil {
			seg.LineStyle = draw.LineStyle{Color: col, Width: width}
			if r.flagged {
				seg.LineStyle.Dashes = []vg.Length{vg.Points(2), vg.Points(1.5)}
			}
			p.Add(seg)
		}
		if dot := d.scatter(plotter.XYs{{X: r.est.Mean, Y: y}}); dot != nil {
			dot.GlyphStyle = draw.GlyphStyle{Color: col, Radius: vg.Points(2.2), Shape: shape}
			p.Add(dot)
		}
	}
	if zero := d.line(plotter.XYs{{X: 0, Y: -0.5}, {X: 0, Y: float64(len(rows)) - 0.5}}); zero != nil {
		zero.LineStyle = draw.LineStyle{Color: color.Gray{150}, Width: vg.Points(0.6), Dashes: []vg.Length{vg.Points(1), vg.Points(2)}}
		p.Add(zero)
	}
	p.NominalY(names...)
	p.Y.Tick.Label.Font.Size = 6.5
	if drawable(p) {
		dx := 0.04 * (p.X.Max - p.X.Min)
		p.X.Min, p.X.Max = p.X.Min-dx, p.X.Max+dx
	}
	d.note(p)
	return p
}
