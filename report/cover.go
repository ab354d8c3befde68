package report

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
)

// cover writes the first pages: title, car, configurations, the summary in
// words and the tables of the fused result.
func (r *reporter) cover() {
	c := r.in.Campaign
	pg := r.pg
	pg.pdf.AddPage()
	pg.font("", 9)
	pg.pdf.SetTextColor(grey, grey, grey)
	pg.pdf.MultiCell(pg.w, 5, "Aerodynamic development report — on-road lift and downforce", "", "L", false)
	pg.pdf.SetTextColor(0, 0, 0)
	pg.pdf.Ln(2)
	pg.font("B", 20)
	pg.pdf.MultiCell(pg.w, 9, c.Campaign.Title, "", "L", false)
	pg.pdf.Ln(2)
	pg.font("", 10.5)
	lines := []string{"Car: " + c.Vehicle.Label + " (" + c.Vehicle.Body + " body, wheelbase " + fmt.Sprintf("%.3g m", c.Vehicle.WheelbaseM) + ")",
		"Test date: " + c.Campaign.Date}
	if c.Campaign.Site != "" {
		lines = append(lines, "Site: "+c.Campaign.Site)
	}
	for _, l := range lines {
		pg.pdf.MultiCell(pg.w, 5.5, l, "", "L", false)
	}
	if c.Campaign.Notes != "" {
		pg.pdf.Ln(1)
		pg.para(c.Campaign.Notes)
	}
	pg.h2("Configurations", 20)
	var rows [][]string
	for _, cf := range c.Configurations {
		ref := ""
		if cf.ID == c.Report.ReferenceConfig {
			ref = "reference"
		}
		rows = append(rows, []string{cf.ID, cf.Note, ref})
	}
	pg.table([]column{{"id", 1, "L"}, {"description", 3, "L"}, {"", 0.8, "L"}}, rows)

	pg.h2("Summary", 40)
	pg.para(r.summaryText())
	r.liftTables()
	r.claTables()
	r.deltaTable()
}

// liftTables writes, per report speed, every configuration's axle forces
// and the probability of downforce.
func (r *reporter) liftTables() {
	c := r.in.Campaign
	pg := r.pg
	unit := c.Report.ForceUnit
	for _, v := range c.Report.SpeedsKmh {
		pg.h2(fmt.Sprintf("Lift at %g km/h, %s (lift positive, downforce negative; %s credible intervals)", v, unit, r.level()), 25)
		var rows [][]string
		for _, cr := range r.res.Configs {
			for _, s := range cr.AtSpeeds {
				if s.SpeedKmh != v {
					continue
				}
				rows = append(rows, []string{cr.ID, r.force(s.FrontN), r.force(s.RearN), r.force(s.TotalN),
					percent(cr.Front.PDownforce) + " / " + percent(cr.Rear.PDownforce) + " / " + percent(cr.Total.PDownforce)})
			}
		}
		pg.table([]column{{"configuration", 1.1, "L"}, {"front", 1.6, "R"}, {"rear", 1.6, "R"}, {"total", 1.6, "R"}, {"P(downforce) f / r / t", 1.6, "R"}}, rows)
	}
}

// claTables writes C_L·A per axle with the balance and, when the frontal
// area is known, the SAE J1594 coefficients.
func (r *reporter) claTables() {
	c := r.in.Campaign
	pg := r.pg
	pg.h2("C_L·A per axle (m²) and balance", 25)
	var rows [][]string
	for _, cr := range r.res.Configs {
		bal := fmt.Sprintf("%.2f [%.2f, %.2f]", cr.FrontShare.Mean, cr.FrontShare.Lo, cr.FrontShare.Hi)
		rows = append(rows, []string{cr.ID, cla(cr.Front.CLA), cla(cr.Rear.CLA), cla(cr.Total.CLA), bal})
	}
	pg.table([]column{{"configuration", 1.1, "L"}, {"front C_L·A", 1.6, "R"}, {"rear C_L·A", 1.6, "R"}, {"total C_L·A", 1.6, "R"}, {"front share of total", 1.4, "R"}}, rows)
	if c.Vehicle.FrontalAreaM2 > 0 {
		rows = nil
		for _, cr := range r.res.Configs {
			if s := cr.SAE; s != nil {
				rows = append(rows, []string{cr.ID, cla(s.CLF), cla(s.CLR), cla(s.CL)})
			}
		}
		pg.h2(fmt.Sprintf("SAE J1594 coefficients (frontal area %.3g m²)", c.Vehicle.FrontalAreaM2), 25)
		pg.table([]column{{"configuration", 1.1, "L"}, {"C_LF", 1.6, "R"}, {"C_LR", 1.6, "R"}, {"C_L", 1.6, "R"}}, rows)
	}
}

// deltaTable writes each configuration's change against the reference at
// the top report speed, with the probability that it lowers lift.
func (r *reporter) deltaTable() {
	if len(r.res.Deltas) == 0 {
		return
	}
	c := r.in.Campaign
	pg := r.pg
	unit := c.Report.ForceUnit
	v := slices.Max(c.Report.SpeedsKmh)
	q := air.DynamicPressure(c.Density(), air.KmhToMs(v))
	pg.h2(fmt.Sprintf("Change against %s at %g km/h, %s", c.Report.ReferenceConfig, v, unit), 25)
	var rows [][]string
	for _, d := range r.res.Deltas {
		rows = append(rows, []string{d.Config, r.force(d.Front.CLA.Scale(q)), r.force(d.Rear.CLA.Scale(q)), r.force(d.Total.CLA.Scale(q)),
			percent(d.Front.PDownforce) + " / " + percent(d.Rear.PDownforce) + " / " + percent(d.Total.PDownforce)})
	}
	pg.table([]column{{"configuration", 1.1, "L"}, {"front", 1.6, "R"}, {"rear", 1.6, "R"}, {"total", 1.6, "R"}, {"P(less lift) f / r / t", 1.6, "R"}}, rows)
	if c.Prior.SpeedModel == campaign.SpeedLinear {
		pg.note("With the linear speed model, the changes above are those of C_L·A at 100 km/h scaled to the speed; the forces at each speed in the tables before include the speed dependence.")
	}
}

// summaryText says in plain words what changed and how sure we are.
func (r *reporter) summaryText() string {
	c := r.in.Campaign
	unit := c.Report.ForceUnit
	v := slices.Max(c.Report.SpeedsKmh) // the summary speaks of the top report speed
	q := air.DynamicPressure(c.Density(), air.KmhToMs(v))
	var b strings.Builder
	for _, cr := range r.res.Configs {
		if cr.ID != c.Report.ReferenceConfig {
			continue
		}
		fmt.Fprintf(&b, "As tested, %s makes %s at the front and %s at the rear at %g km/h. ", cr.ID,
			liftWord(cr.Front, q, r.unitN, unit), liftWord(cr.Rear, q, r.unitN, unit), v)
	}
	for _, d := range r.res.Deltas {
		rear := d.Rear.CLA.Scale(q / r.unitN)
		front := d.Front.CLA.Scale(q / r.unitN)
		fmt.Fprintf(&b, "Against %s, %s changes rear lift by %+.1f %s (%s interval %+.1f to %+.1f) and front lift by %+.1f %s (%+.1f to %+.1f) at %g km/h; ",
			d.Versus, d.Config, rear.Mean, unit, r.level(), rear.Lo, rear.Hi, front.Mean, unit, front.Lo, front.Hi, v)
		fmt.Fprintf(&b, "the probability that it lowers rear lift is %s, and that it lowers front lift %s. ", percent(d.Rear.PDownforce), percent(d.Front.PDownforce))
	}
	flagged := 0
	for _, m := range r.res.Methods {
		if m.Agreement != nil && m.Agreement.Flag {
			flagged++
		}
	}
	switch {
	case len(r.res.Methods) == 1:
		b.WriteString("One method only was used, so there is no independent check of it.")
	case flagged == 0:
		fmt.Fprintf(&b, "The %d measurement methods agree with one another within their stated uncertainties.", len(r.res.Methods))
	default:
		fmt.Fprintf(&b, "%d of the %d measurement entries disagree with the rest (see Agreement); the fused figures weigh every entry by its stated uncertainty, so read them with that in mind.", flagged, len(r.res.Methods))
	}
	return b.String()
}

func liftWord(a fuse.AxleResult, q, unitN float64, unit string) string {
	e := a.CLA.Scale(q / unitN)
	word := "lift"
	if e.Mean < 0 {
		word = "downforce"
	}
	return fmt.Sprintf("%.1f %s of %s (%.1f to %.1f)", math.Abs(e.Mean), unit, word, e.Lo, e.Hi)
}
