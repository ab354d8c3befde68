package report

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"

	"codeberg.org/go-pdf/fpdf"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// Input is everything the report lays out.
type Input struct {
	Campaign *campaign.Campaign
	Reduced  *methods.Reduced
	Fused    *fuse.Fused
	Plan     *fuse.Plan
	// Explain holds, for each flagged entry, the cross-check of the other
	// entries' estimate of its worst quantity against its own posterior:
	// which of its errors would have to move to agree.
	Explain map[string]*fuse.Crosscheck
	Version string
	Paper   string // "A4" (default) or "Letter"
}

// Papers are the page sizes --paper accepts.
var Papers = []string{"A4", "Letter"}

// PDF renders the development report. The same input gives the same bytes:
// the creation date is the campaign date, the catalogue is sorted, and
// nothing else varies.
func PDF(in Input) ([]byte, error) {
	paper := in.Paper
	if paper == "" {
		paper = "A4"
	}
	if paper != "A4" && paper != "Letter" {
		return nil, fmt.Errorf("unknown paper %q (want A4 or Letter)", paper)
	}
	c := in.Campaign
	pdf := fpdf.New("P", "mm", paper, "")
	date, err := time.Parse("2006-01-02", c.Campaign.Date)
	if err != nil {
		return nil, err
	}
	pdf.SetCreationDate(date)
	pdf.SetModificationDate(date)
	pdf.SetCatalogSort(true)
	pdf.SetCompression(true)
	pdf.SetProducer("liftfuse "+in.Version, true)
	pdf.SetCreator("liftfuse "+in.Version, true)
	pdf.SetTitle(c.Campaign.Title, true)
	pdf.SetMargins(margin, margin, margin)
	pdf.SetAutoPageBreak(true, margin+4)
	registerFonts(pdf)
	pdf.AliasNbPages("{nb}")
	w, _ := pdf.GetPageSize()
	pg := &page{pdf: pdf, w: w - 2*margin}
	pdf.SetFooterFunc(func() {
		_, h := pdf.GetPageSize()
		pdf.SetY(h - margin + 4)
		pg.font("", 7.5)
		pdf.SetTextColor(grey, grey, grey)
		pdf.CellFormat(pg.w/2, 4, c.Campaign.Title, "", 0, "L", false, 0, "")
		pdf.CellFormat(pg.w/2, 4, fmt.Sprintf("page %d of {nb}", pdf.PageNo()), "", 0, "R", false, 0, "")
		pdf.SetTextColor(0, 0, 0)
	})
	r := &reporter{in: in, pg: pg, res: in.Fused.Result}
	if r.unitN, err = air.NewtonsPer(c.Report.ForceUnit); err != nil {
		return nil, err
	}
	r.cover()
	r.methods()
	r.agreement()
	r.plan()
	r.notes()
	r.provenance()
	if err := pdf.Error(); err != nil {
		return nil, fmt.Errorf("rendering the report: %w", err)
	}
	var b bytes.Buffer
	if err := pdf.Output(&b); err != nil {
		return nil, fmt.Errorf("rendering the report: %w", err)
	}
	return b.Bytes(), nil
}

type reporter struct {
	in    Input
	pg    *page
	res   *fuse.Result
	unitN float64 // newtons per display unit
}

func (r *reporter) configs() []string {
	ids := make([]string, len(r.in.Campaign.Configurations))
	for i, c := range r.in.Campaign.Configurations {
		ids[i] = c.ID
	}
	return ids
}

// force formats an estimate in newtons in the display unit.
func (r *reporter) force(e fuse.Estimate) string { return interval(e.Scale(1/r.unitN), 1) }

func cla(e fuse.Estimate) string { return interval(e, 3) }

func (r *reporter) level() string { return fmt.Sprintf("%.0f %%", 100*r.res.Credible) }

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
					pctText(cr.Front.PDownforce) + " / " + pctText(cr.Rear.PDownforce) + " / " + pctText(cr.Total.PDownforce)})
			}
		}
		pg.table([]column{{"configuration", 1.1, "L"}, {"front", 1.6, "R"}, {"rear", 1.6, "R"}, {"total", 1.6, "R"}, {"P(downforce) f / r / t", 1.6, "R"}}, rows)
	}
	pg.h2("C_L·A per axle (m²) and balance", 25)
	rows = nil
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
	if len(r.res.Deltas) > 0 {
		v := slices.Max(c.Report.SpeedsKmh)
		q := air.DynamicPressure(c.Density(), air.KmhToMs(v))
		pg.h2(fmt.Sprintf("Change against %s at %g km/h, %s", c.Report.ReferenceConfig, v, unit), 25)
		rows = nil
		for _, d := range r.res.Deltas {
			rows = append(rows, []string{d.Config, r.force(d.Front.CLA.Scale(q)), r.force(d.Rear.CLA.Scale(q)), r.force(d.Total.CLA.Scale(q)),
				pctText(d.Front.PDownforce) + " / " + pctText(d.Rear.PDownforce) + " / " + pctText(d.Total.PDownforce)})
		}
		pg.table([]column{{"configuration", 1.1, "L"}, {"front", 1.6, "R"}, {"rear", 1.6, "R"}, {"total", 1.6, "R"}, {"P(less lift) f / r / t", 1.6, "R"}}, rows)
		if r.in.Campaign.Prior.SpeedModel == campaign.SpeedLinear {
			pg.note("With the linear speed model, the changes above are those of C_L·A at 100 km/h scaled to the speed; the forces at each speed in the tables before include the speed dependence.")
		}
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
		fmt.Fprintf(&b, "the probability that it lowers rear lift is %s, and that it lowers front lift %s. ", pctText(d.Rear.PDownforce), pctText(d.Front.PDownforce))
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

// standaloneRows lists what one entry says on its own.
func (r *reporter) standaloneRows(id string) [][]string {
	var rows [][]string
	for _, m := range r.res.Methods {
		if m.ID != id {
			continue
		}
		for _, s := range m.Standalone {
			rows = append(rows, []string{s.Config, s.Axle, cla(s.CLA), pctText(s.PDownforce)})
		}
	}
	return rows
}

var standaloneCols = []column{{"configuration", 1.2, "L"}, {"axle", 0.8, "L"}, {"C_L·A alone (m²)", 2, "R"}, {"P(downforce)", 1.1, "R"}}

func (r *reporter) methods() {
	pg := r.pg
	red := r.in.Reduced
	cfgs := r.configs()
	pg.h1("What each method says")
	pg.para("Each entry below is reduced from its raw data and then fused on its own, with the same priors as the full campaign: its own verdict, before it is weighed against the others. Intervals are " + r.level() + " central credible intervals; C_L·A is per axle, lift positive (SAE J1594).")
	for _, h := range methods.Details[*height.Result](red) {
		e := h.Entry
		pg.h2(fmt.Sprintf("%s — %s ride height (%s)", e.ID, e.Axle, map[string]string{campaign.SensorPot: "suspension potentiometer", campaign.SensorLaser: "body-to-ground laser"}[e.Sensor]), 70)
		cal := fmt.Sprintf("gain %.4g mm per unit ± %.1f %%", h.Calibration.Gain, 100*h.Calibration.RelSD)
		stiff := fmt.Sprintf("heave stiffness %.1f N/mm from the %s ± %.1f %%", h.Stiffness.K, h.Stiffness.Source, 100*h.Stiffness.RelSD())
		txt := fmt.Sprintf("%d steady windows from %d log(s); %s; %s.", len(h.Windows), len(e.Logs), cal, stiff)
		if e.FrictionMm > 0 {
			txt += fmt.Sprintf(" Suspension friction band ±%.2g mm.", e.FrictionMm)
		}
		if e.Sensor == campaign.SensorLaser {
			txt += fmt.Sprintf(" Tyre growth prior %.2g ± %.2g mm at 100 km/h: a laser alone cannot tell growth from lift, so its absolute figures are loose and its differences between configurations sharp.", e.TyreGrowth.MmAt100kmh, e.TyreGrowth.SDMm)
		}
		txt += fmt.Sprintf(" It resolves about %.0f N (%.1f %s) of axle load at two standard deviations of one window.", h.Detect.ResolvableN, h.Detect.ResolvableN/r.unitN, r.in.Campaign.Report.ForceUnit)
		pg.para(txt)
		pg.table(standaloneCols, r.standaloneRows(e.ID))
		fitted, _ := r.in.Fused.Standalone[e.ID].Fitted(e.ID)
		pg.chart(heightChart(h, fitted, cfgs), 62)
		pg.chart(traceChart(h), 48)
	}
	for _, p := range methods.Details[*pressure.Result](red) {
		e := p.Entry
		pg.h2(fmt.Sprintf("%s — pressure taps (%s, %d taps)", e.ID, e.Mode, len(p.Panels)), 70)
		pg.para(fmt.Sprintf("Sensor noise %.3g Pa per tap, reference port ±%.3g Pa, integration scale ±%.0f %% for what a finite set of taps misses; %d uncovered patch(es) carry a prior on their Cp. Pressure integration sees the vertical pressure force only: the pitch of drag is added as a modelled nuisance, and the figures are approximate.",
			e.SensorSDPa, e.ReferenceSDPa, e.ModelSDPct, len(e.Uncovered)))
		var rows [][]string
		for _, rd := range p.Readings {
			f := rd.Forces
			rows = append(rows, []string{rd.Config, fmt.Sprintf("%g", rd.SpeedKmh), fmt.Sprintf("%+d", rd.Direction), fmt.Sprintf("%.0f", rd.Q),
				fmt.Sprintf("%+.1f", f.Front/r.unitN), fmt.Sprintf("%+.1f", f.Rear/r.unitN), fmt.Sprintf("%+.1f", f.Total/r.unitN)})
		}
		unit := r.in.Campaign.Report.ForceUnit
		pg.table([]column{{"configuration", 1.3, "L"}, {"km/h", 0.7, "R"}, {"dir", 0.5, "R"}, {"q (Pa)", 0.8, "R"}, {"front " + unit, 1, "R"}, {"rear " + unit, 1, "R"}, {"total " + unit, 1, "R"}}, rows)
		pg.note("Integrated tap forces as read (upward positive), split to the axles by moments about the front axle; before the pitch of drag, uncovered patches and the integration scale.")
		pg.table(standaloneCols, r.standaloneRows(e.ID))
		pg.chart(cpChart(p, cfgs), 62)
	}
	for _, v := range methods.Details[*vortex.Result](red) {
		e := v.Entry
		pg.h2(fmt.Sprintf("%s — %s trailing vortex sense", e.ID, e.Side), 60)
		pg.para(fmt.Sprintf("%d observations, seen from behind the car looking forward; a %s vortex turning %s means net lift. Misread probability %.2f. A sense is a sign only: it tells lift from downforce and sharpens the result only near zero lift, where the other methods are weakest.",
			len(v.Observations), e.Side, map[bool]string{true: "clockwise", false: "counter-clockwise"}[e.Side == campaign.SideLeft], e.Misread))
		pg.table(standaloneCols, r.standaloneRows(e.ID))
		pg.chart(vortexChart(v, r.in.Fused.Posterior, cfgs), 55)
	}
}

func (r *reporter) agreement() {
	pg := r.pg
	pg.h1("Agreement between methods")
	pg.para("Each entry's own estimate is compared with the fused estimate of all the other entries on the quantities it informs: the Mahalanobis distance and its p-value, and the probability that the entry's errors are larger than stated (P(off), from a robust mixture). An entry is flagged when p < 0.05 or P(off) > 0.5.")
	var bars []bar
	flagged := map[string]bool{}
	for _, m := range r.res.Methods {
		if m.Agreement != nil && m.Agreement.Flag {
			flagged[m.ID] = true
		}
	}
	signOnly := map[string]bool{}
	for _, m := range r.res.Methods {
		signOnly[m.ID] = m.Kind == string(evidence.KindVortex)
	}
	for _, cfg := range r.configs() {
		for _, ax := range []string{evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal} {
			var entries []bar
			for _, m := range r.res.Methods {
				if signOnly[m.ID] {
					continue
				}
				for _, s := range m.Standalone {
					if s.Config == cfg && s.Axle == ax {
						entries = append(entries, bar{label: cfg + " " + ax + ": " + m.ID, est: s.CLA, flagged: flagged[m.ID]})
					}
				}
			}
			if len(entries) == 0 {
				continue
			}
			e, _ := r.in.Fused.Posterior.Quantity(evidence.Quantity{Config: cfg, Axle: ax})
			bars = append(bars, bar{label: cfg + " " + ax + ": fused", est: e, fused: true})
			bars = append(bars, entries...)
		}
	}
	if len(bars) > 0 {
		pg.chart(agreementChart(bars), math.Min(30+4.2*float64(len(bars)), 200))
		pg.note("Thick black: fused result of every entry. Grey: each entry alone (dashed when flagged). Sign-only entries (vortex sense) are left out of the chart: alone they say only lift or downforce; their check is in the table.")
	}
	var rows [][]string
	for _, m := range r.res.Methods {
		if a := m.Agreement; a != nil {
			flag := ""
			if a.Flag {
				flag = "DISAGREES"
			}
			worst := ""
			if w := a.Worst; w != nil {
				worst = fmt.Sprintf("%s %s %+.3f (%+.1f sd)", w.Config, w.Axle, w.DiffM2, w.Sigmas)
			}
			rows = append(rows, []string{m.ID, m.Kind, fmt.Sprintf("%.2f", a.Distance), fmt.Sprintf("%.3g", a.PValue), fmt.Sprintf("%.2f", a.POff), worst, flag})
		} else {
			rows = append(rows, []string{m.ID, m.Kind, "–", "–", "–", "no other entry", ""})
		}
	}
	pg.table([]column{{"entry", 1.1, "L"}, {"kind", 1, "L"}, {"distance", 0.8, "R"}, {"p-value", 0.8, "R"}, {"P(off)", 0.7, "R"}, {"largest difference (m²)", 2, "L"}, {"", 0.9, "L"}}, rows)
	for _, m := range r.res.Methods {
		cc, ok := r.in.Explain[m.ID]
		if !ok {
			continue
		}
		pg.h2("What could explain "+m.ID, 30)
		pg.para(fmt.Sprintf("On %s %s, %s alone says %+.3f ± %.3f m² (C_L·A) where the other entries together say %+.3f ± %.3f m² (z = %+.1f). The errors in %s's own model that would have to move least for it to agree, in their own prior standard deviations:",
			cc.Claim.Config, cc.Claim.Axle, m.ID, cc.Predictive.Mean, cc.Predictive.SD, cc.Claim.Value, cc.Claim.SD, -cc.Z, m.ID))
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
		if len(cc.Checks) > 0 {
			pg.para("None of these is plausible; look also at: " + strings.Join(cc.Checks, "; ") + ".")
		}
	}
}

func (r *reporter) plan() {
	pl := r.in.Plan
	if pl == nil {
		return
	}
	pg := r.pg
	pg.h1("What to repeat next")
	t := pl.Target
	pg.para(fmt.Sprintf("Target: %s, today %+.4f ± %.4f m² (C_L·A). For each entry, the expected uncertainty of the target if its runs were repeated once: errors a repeat shares with today's runs (the same springs, the same reference port, the same tyres) do not average down, so some repeats buy little. Ranked by variance removed per hour.", t.String(), t.Now.Mean, t.Now.SD))
	var rows [][]string
	for i, o := range pl.Options {
		rows = append(rows, []string{fmt.Sprintf("%d", i+1), o.Entry, fmt.Sprintf("%.1f", o.CostH), fmt.Sprintf("%.4f", o.SDAfter), fmt.Sprintf("%.1f %%", o.RemovedPct), fmt.Sprintf("%.1f %%/h", o.PerHour)})
	}
	pg.table([]column{{"rank", 0.5, "R"}, {"repeat", 1.2, "L"}, {"hours", 0.6, "R"}, {"sd after (m²)", 1, "R"}, {"variance removed", 1, "R"}, {"per hour", 0.9, "R"}}, rows)
	var why []string
	for _, o := range pl.Options {
		why = append(why, o.Entry+": "+o.Why)
	}
	pg.bullets(why)
	for _, d := range pl.Discriminate {
		pg.para(d.Flagged + " looks off: " + d.Why + ".")
	}
	if len(pl.Detectability) > 0 {
		unit := r.in.Campaign.Report.ForceUnit
		pg.h2("Detectability of the ride-height entries", 25)
		rows = nil
		for _, d := range pl.Detectability {
			rows = append(rows, []string{d.Entry, d.Axle, fmt.Sprintf("%.1f", d.ResolvableN100/r.unitN), fmt.Sprintf("%.0f", d.SpeedForTarget)})
		}
		pg.table([]column{{"entry", 1.2, "L"}, {"axle", 0.8, "L"}, {"smallest load at 2 sd (" + unit + ")", 1.6, "R"}, {"speed for the target's size (km/h)", 1.8, "R"}}, rows)
		pg.note("A stiffer car deflects less for the same load and needs more speed to show the same lift.")
	}
}

// notes are the method notes, assumptions and safety cautions.
func (r *reporter) notes() {
	pg := r.pg
	pg.h1("Method notes, assumptions and cautions")
	pg.h2("Conventions", 20)
	pg.para("Terms follow SAE J1594 (Vehicle Aerodynamics Terminology). Lift is positive upward and downforce is negative lift. Axle lift is resolved about a centre at ground level, mid-wheelbase, so it includes the pitching moment of drag: it is the change of the axle's tyre loads, what the springs feel and what grip depends on. C_L·A is the lift coefficient times its reference area, per axle; with a frontal area A, C_LF = C_L·A(front)/A and C_LR = C_L·A(rear)/A. Forces are given at the stated speeds in still air with the test day's air density.")
	pg.h2("What each method cannot see", 30)
	pg.bullets([]string{
		"Ride height (potentiometers): needs the heave stiffness at the wheel; a spring rate or installation ratio known only roughly scales every figure, and suspension friction hides small deflections. Low-speed runs pin the static height.",
		"Ride height (laser): also sees tyre growth with speed, which grows like aerodynamic load; absolute lift is loose, differences between configurations at matched speeds are sharp.",
		"Pressure taps: see only where there are taps; uncovered areas, the reference port's offset and the integration of a finite set of taps are modelled, and the axle split needs the pitch of drag. Figures are approximate.",
		"Vortex sense: a sign only, and only for fastbacks and steeply raked notchbacks; most useful near zero lift.",
	})
	pg.h2("Modelled approximately, or not at all", 25)
	pg.bullets([]string{
		"Anti-dive and anti-squat geometry, which lets drive and braking forces lift or squat the body, is not modelled: compare steady-speed windows only.",
		"The along-road wind is one value for the session, estimated from runs in both directions; gusts and crosswind are not modelled.",
		"Stiffness, gains and method scales are log-normal factors known to first order; suspension friction is a band of stated width.",
	})
	pg.h2("Safety", 40)
	pg.para("On-road aerodynamic testing happens at speed and can hurt people. Test only on closed roads or tracks with the owner's permission and proper marshalling, within the local law. Secure every sensor, bracket, cable, tube and ballast mass so that nothing can come loose at speed. Stay within the tyres' speed rating and load index, and check pressures before each run. Temporary springs, removed anti-roll bars or added ballast change how the car brakes and handles: drive it gently until the driver knows it. Keep people off the edges of the runway and out of the run-off areas. These notes do not replace local codes, the venue's rules or licensed practice, which take precedence.")
}

func (r *reporter) provenance() {
	pg := r.pg
	c := r.in.Campaign
	pg.h2("Provenance", 45)
	d := r.res.Diagnostics
	rows := [][]string{
		{"tool", "liftfuse " + r.in.Version},
		{"campaign file", c.File},
		{"inputs SHA-256", r.res.Campaign.SHA256},
		{"air density", fmt.Sprintf("%.4f kg/m³ (%s; %g °C, %g hPa, %g %% RH, %g ppm CO₂)", r.res.Air.DensityKgM3, r.res.Air.Method, c.Air.TemperatureC, c.Air.PressureHPa, c.Air.HumidityPct, c.Air.CO2ppm)},
		{"seed", fmt.Sprintf("%d", d.Seed)},
		{"sampler", d.Sampler},
		{"draws", fmt.Sprintf("%d", d.Draws)},
	}
	if d.RhatMax != nil {
		rows = append(rows, []string{"convergence", fmt.Sprintf("rank-normalised split R-hat ≤ %.3f, bulk ESS ≥ %.0f (Vehtari et al. 2021)", *d.RhatMax, *d.ESSMin)})
	}
	for i, f := range c.Files {
		rows = append(rows, []string{fmt.Sprintf("input %d", i+1), f})
	}
	pg.table([]column{{"item", 1, "L"}, {"value", 4, "L"}}, rows)
	if len(r.res.Warnings) > 0 {
		pg.h2("Warnings", 15)
		pg.bullets(r.res.Warnings)
	}
}
