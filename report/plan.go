package report

import "fmt"

// plan writes "What to repeat next": the repeats ranked by variance removed
// per hour, why, and how small a load each ride-height entry resolves.
func (r *reporter) plan() {
	pl := r.in.Plan
	if pl == nil {
		return
	}
	pg := r.pg
	pg.h1("What to repeat next")
	t := pl.Target
	pg.para(fmt.Sprintf("Target: %s, today %+.4f ± %.4f m² ("+symCLA+"). For each entry, the expected uncertainty of the target if its runs were repeated once: errors a repeat shares with today's runs (the same springs, the same reference port, the same tyres) do not average down, so some repeats buy little. Ranked by variance removed per hour.", t.String(), t.Now.Mean, t.Now.SD))
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
			rows = append(rows, []string{d.Entry, d.Axle, fmt.Sprintf("%.1f", r.unit.of(d.ResolvableN100)), fmt.Sprintf("%.0f", d.SpeedForTarget)})
		}
		pg.table([]column{{"entry", 1.2, "L"}, {"axle", 0.8, "L"}, {"smallest load at 2 sd (" + unit + ")", 1.6, "R"}, {"speed for the target's size (km/h)", 1.8, "R"}}, rows)
		pg.note("A stiffer car deflects less for the same load and needs more speed to show the same lift.")
	}
}
