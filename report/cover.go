package report

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"liftfuse/fuse"
)

// cover writes page 1, which answers the customer: what each
// configuration does at the report speeds, what changed against the
// reference and how sure we are, which entries disagreed, and what to do
// next. The configurations and the detailed tables follow.
func (r *reporter) cover() {
	c := r.in.Campaign
	pg := r.pg
	pg.pdf.AddPage()
	pg.pdf.SetTextColor(grey, grey, grey)
	pg.flow("Aerodynamic development report — on-road lift and downforce", "", 9, 5, margin, pg.w)
	pg.pdf.SetTextColor(0, 0, 0)
	pg.pdf.Ln(1)
	r.title()
	pg.pdf.Ln(1)
	line := fmt.Sprintf("Car: %s (%s body, wheelbase %.3g m). Test date: %s.", c.Vehicle.Label, c.Vehicle.Body, c.Vehicle.WheelbaseM, c.Campaign.Date)
	if c.Campaign.Site != "" {
		line += " Site: " + c.Campaign.Site + "."
	}
	pg.flow(line, "", 10, 5, margin, pg.w)
	pg.pdf.Ln(1)

	pg.h2("What we found", 30)
	for _, s := range r.findings() {
		pg.para(s)
	}
	r.speedTable()
	r.changeTable()
	pg.h2("Checks", 15)
	pg.bullets(r.checks())
	if rec := r.recommendation(); rec != "" {
		pg.h2("What to do next", 15)
		pg.para(rec)
	}
}

// maxTitleLines is how many lines the title may take on page 1; a longer
// title (the campaign allows 2000 characters) is shortened there and
// given in full under Provenance.
const maxTitleLines = 3

// title sets the campaign's title on page 1, at most maxTitleLines lines.
func (r *reporter) title() {
	pg := r.pg
	pg.font("B", 20)
	lines, cut := pg.clamp(bind(r.in.Campaign.Campaign.Title), pg.w, 20, maxTitleLines)
	pg.setLines(lines, 20, 9, margin)
	r.titleCut = cut
}

// configurationsTable lists the configurations with the reference marked.
func (r *reporter) configurationsTable() {
	c := r.in.Campaign
	r.pg.h2("Configurations", 20)
	var rows [][]string
	for _, cf := range c.Configurations {
		ref := ""
		if cf.ID == c.Report.ReferenceConfig {
			ref = "reference"
		}
		rows = append(rows, []string{cf.ID, cf.Note, ref})
	}
	r.pg.table([]column{{"id", 1, "L"}, {"description", 3, "L"}, {"", 0.8, "L"}}, rows)
}

// findings says in words what the reference does at every report speed
// and what each other configuration changes, with how sure we are. Every
// figure is read from the result document at its speed.
func (r *reporter) findings() []string {
	c := r.in.Campaign
	unit := c.Report.ForceUnit
	var out []string
	for _, cr := range r.res.Configs {
		if cr.ID != c.Report.ReferenceConfig {
			continue
		}
		var parts []string
		for _, v := range proseSpeeds(c.Report.SpeedsKmh) {
			s, ok := speedOf(cr, v)
			if !ok {
				continue
			}
			parts = append(parts, fmt.Sprintf("%s at the front and %s at the rear at %g km/h", r.liftWord(s.N[0], unit), r.liftWord(s.N[1], unit), v))
		}
		if len(parts) > 0 {
			out = append(out, fmt.Sprintf("As tested, %s makes %s (%s credible intervals in brackets%s).", cr.ID, join(parts, "; and "), r.level(), r.speedsShown()))
		}
	}
	for i, d := range r.res.Deltas {
		if i == maxProseChanges {
			out = append(out, fmt.Sprintf("The changes of the other %s are in the table below.", count(len(r.res.Deltas)-i, "configuration")))
			break
		}
		var chs []changeAt
		for _, v := range proseSpeeds(c.Report.SpeedsKmh) {
			chs = append(chs, r.deltaAt(d, v))
		}
		var b strings.Builder
		fmt.Fprintf(&b, "Against %s, %s changes ", d.Versus, d.Config)
		for k, ax := range []string{"rear", "front"} {
			i := map[string]int{"front": 0, "rear": 1}[ax]
			var by, sure []string
			for _, ch := range chs {
				e := r.unit.est(ch.N[i])
				by = append(by, fmt.Sprintf("%+.1f %s (%+.1f to %+.1f) at %g km/h", e.Mean, unit, e.Lo, e.Hi, ch.SpeedKmh))
				sure = append(sure, percent(ch.PLess[i]))
			}
			if k > 0 {
				b.WriteString(" It changes ")
			}
			fmt.Fprintf(&b, "%s lift by %s; the probability that it lowers %s lift is %s.", ax, join(by, " and "), ax, sameOrEach(sure, chs))
		}
		out = append(out, b.String())
	}
	return out
}

// maxProseChanges is how many configurations' changes page 1 says in
// sentences; the table under them gives every one.
const maxProseChanges = 6

// maxProseSpeeds is how many report speeds page 1's sentences speak of;
// with more, they speak of the lowest, a middle and the highest, and the
// tables under them give every one.
const maxProseSpeeds = 4

// proseSpeeds are the report speeds page 1's sentences speak of, in the
// campaign's order: all of them up to maxProseSpeeds, else the lowest, the
// median and the highest.
func proseSpeeds(vs []float64) []float64 {
	if len(vs) <= maxProseSpeeds {
		return vs
	}
	sorted := slices.Clone(vs)
	slices.Sort(sorted)
	pick := map[float64]bool{sorted[0]: true, sorted[len(sorted)/2]: true, sorted[len(sorted)-1]: true}
	var out []float64
	for _, v := range vs {
		if pick[v] {
			out = append(out, v)
			delete(pick, v)
		}
	}
	return out
}

// speedsShown says, when page 1's sentences leave report speeds out, how
// many they speak of and where the rest are.
func (r *reporter) speedsShown() string {
	vs := r.in.Campaign.Report.SpeedsKmh
	n := len(proseSpeeds(vs))
	if n == len(vs) {
		return ""
	}
	return fmt.Sprintf("; %d of the %d report speeds, every one in the tables below", n, len(vs))
}

// sameOrEach is one probability when it is the same at every speed, or
// each with its speed.
func sameOrEach(ps []string, chs []changeAt) string {
	same := true
	for _, p := range ps {
		same = same && p == ps[0]
	}
	if same {
		if len(ps) > 1 {
			return ps[0] + " at every report speed"
		}
		return ps[0]
	}
	var each []string
	for i, p := range ps {
		each = append(each, fmt.Sprintf("%s at %g km/h", p, chs[i].SpeedKmh))
	}
	return join(each, " and ")
}

// liftWord says a force in newtons as lift or downforce in the display
// unit, with its interval.
func (r *reporter) liftWord(n fuse.Estimate, unit string) string {
	e := r.unit.est(n)
	word := "lift"
	if e.Mean < 0 {
		word = "downforce"
	}
	return fmt.Sprintf("%.1f %s of %s (%+.1f to %+.1f)", math.Abs(e.Mean), unit, word, e.Lo, e.Hi)
}

// checks lists the entries that disagreed with the others, which fusion
// the headline figures are, the model checks that tripped and the other
// warnings of the run, or says that the methods agree.
func (r *reporter) checks() []string {
	h := headlineOf(r.res)
	kinds := map[string]bool{}
	var flagged []string
	for _, m := range r.res.Methods {
		kinds[m.Kind] = true
		if a := m.Agreement; a != nil && a.Suspect {
			s := fmt.Sprintf("%s (%s) disagrees with the other entries (p = %.3g, P(off) %s)", m.ID, m.Kind, a.PValue, isPercent(a.POff))
			if w := a.Worst; w != nil {
				s += fmt.Sprintf(", most on %s %s, by %+.3f m² of %s (%.1f sd)", w.Config, w.Axle, w.DiffM2, symCLA, w.Sigmas)
			}
			flagged = append(flagged, s+"; "+h.flaggedEffect(m.ID))
		}
	}
	var out []string
	switch {
	case len(r.res.Methods) == 1:
		out = append(out, "One entry only was used, so there is no independent check of it.")
	case len(flagged) == 0:
		out = append(out, fmt.Sprintf("The %s (%s) agree with one another within their stated uncertainties.", count(len(kinds), "measurement method"), count(len(r.res.Methods), "entry")))
	default:
		out = append(out, flagged...)
	}
	if s := h.robustNote(r.res.Deltas); s != "" {
		out = append(out, s)
	}
	for _, c := range checksOf(r.res) {
		out = append(out, "Model check: "+c.sentence())
	}
	for _, w := range r.otherWarnings() {
		out = append(out, "Warning: "+w)
	}
	return out
}

// otherWarnings are the result's warnings other than the disagreements,
// the robust headline and the model checks, which page 1 already says in
// its own words.
func (r *reporter) otherWarnings() []string {
	said := map[string]bool{}
	for _, c := range checksOf(r.res) {
		said[c.Line()] = true
	}
	for _, m := range r.res.Methods {
		if a := m.Agreement; a != nil && a.Suspect {
			said[a.Warning(m.ID)] = true
		}
	}
	var out []string
	for _, w := range r.res.Warnings {
		if !said[w] && !fuse.IsRobustWarning(w) {
			out = append(out, w)
		}
	}
	return out
}

// recommendation is the plan's best repeat in one paragraph, and the
// repeat that would tell whether a flagged entry is off.
func (r *reporter) recommendation() string {
	pl := r.in.Plan
	if pl == nil || len(pl.Options) == 0 {
		return ""
	}
	o := pl.Options[0]
	t := pl.Target
	s := fmt.Sprintf("To pin down %s (today %+.4f ± %.4f m² of %s), repeat the runs of %s first (%.1f h): it would remove %.0f %% of the variance, %.0f %% per hour — %s.", t.String(), t.Now.Mean, t.Now.SD, symCLA, o.Entry, o.CostH, o.RemovedPct, o.PerHour, o.Why)
	for _, d := range pl.Discriminate {
		s += " " + d.Flagged + " looks off: " + d.Why + "."
	}
	return s + " The full ranking is under What to repeat next."
}
