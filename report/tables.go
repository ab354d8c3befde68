package report

import (
	"fmt"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
)

// speedTable writes every configuration's axle forces at every report
// speed, with P(downforce) per axle, from the result document at that
// speed.
func (r *reporter) speedTable() {
	c := r.in.Campaign
	unit := c.Report.ForceUnit
	r.pg.h2(fmt.Sprintf("Lift at the report speeds, %s (lift positive, downforce negative; %s credible intervals)", unit, r.level()), 25)
	var rows [][]string
	for _, cr := range r.res.Configs {
		for _, v := range c.Report.SpeedsKmh {
			s, ok := speedOf(cr, v)
			if !ok {
				continue
			}
			rows = append(rows, []string{cr.ID, fmt.Sprintf("%g", v), r.force(s.N[0]), r.force(s.N[1]), r.force(s.N[2]), triple(s.PDown)})
		}
	}
	r.pg.table([]column{{"configuration", 1.1, "L"}, {"km/h", 0.45, "R"}, {"front", 1.5, "R"}, {"rear", 1.5, "R"}, {"total", 1.5, "R"}, {"P(downforce) f / r / t", 1.5, "R"}}, rows)
}

// changeTable writes each configuration's change against the reference
// at every report speed, with the probability that it lowers lift.
func (r *reporter) changeTable() {
	if len(r.res.Deltas) == 0 {
		return
	}
	c := r.in.Campaign
	r.pg.h2(fmt.Sprintf("Change against %s, %s (negative: less lift)", c.Report.ReferenceConfig, c.Report.ForceUnit), 20)
	var rows [][]string
	for _, d := range r.res.Deltas {
		for _, v := range c.Report.SpeedsKmh {
			ch := r.deltaAt(d, v)
			rows = append(rows, []string{d.Config, fmt.Sprintf("%g", v), r.force(ch.N[0]), r.force(ch.N[1]), r.force(ch.N[2]), triple(ch.PLess)})
		}
	}
	r.pg.table([]column{{"configuration", 1.1, "L"}, {"km/h", 0.45, "R"}, {"front", 1.5, "R"}, {"rear", 1.5, "R"}, {"total", 1.5, "R"}, {"P(less lift) f / r / t", 1.5, "R"}}, rows)
}

// triple formats three probabilities as "f / r / t".
func triple(p [3]float64) string {
	return percent(p[0]) + " / " + percent(p[1]) + " / " + percent(p[2])
}

// details writes the fused result as coefficients: C_L·A per axle with
// the balance, the SAE J1594 coefficients, and the changes in C_L·A.
func (r *reporter) details() {
	pg := r.pg
	pg.h1("Detailed results")
	r.configurationsTable()
	pg.h2(symCLA+" per axle (m²) and balance", 25)
	var rows [][]string
	for _, cr := range r.res.Configs {
		rows = append(rows, []string{cr.ID, cla(cr.Front.CLA), cla(cr.Rear.CLA), cla(cr.Total.CLA), cla(r.balance(cr.ID))})
	}
	pg.table([]column{{"configuration", 1.1, "L"}, {"front " + symCLA, 1.6, "R"}, {"rear " + symCLA, 1.6, "R"}, {"total " + symCLA, 1.6, "R"}, {"balance, front − rear", 1.6, "R"}}, rows)
	pg.note("Balance: front minus rear " + symCLA + " (m²), defined under Method notes. Positive: the front gains more lift than the rear, which moves the car's balance at speed towards understeer; negative: the rear gains more, towards oversteer.")
	if A := r.in.Campaign.Vehicle.FrontalAreaM2; A > 0 {
		rows = nil
		for _, cr := range r.res.Configs {
			if s := cr.SAE; s != nil {
				rows = append(rows, []string{cr.ID, cla(s.CLF), cla(s.CLR), cla(s.CL)})
			}
		}
		pg.h2(fmt.Sprintf("SAE J1594 coefficients (frontal area %.3g m²)", A), 25)
		pg.table([]column{{"configuration", 1.1, "L"}, {symCLF, 1.6, "R"}, {symCLR, 1.6, "R"}, {symCL, 1.6, "R"}}, rows)
	}
	if len(r.res.Deltas) > 0 {
		pg.h2(fmt.Sprintf("Change of %s against %s (m²)", symCLA, r.in.Campaign.Report.ReferenceConfig), 20)
		rows = nil
		for _, d := range r.res.Deltas {
			rows = append(rows, []string{d.Config, cla(d.Front.CLA), cla(d.Rear.CLA), cla(d.Total.CLA),
				triple([3]float64{d.Front.PDownforce, d.Rear.PDownforce, d.Total.PDownforce})})
		}
		pg.table([]column{{"configuration", 1.1, "L"}, {"front", 1.6, "R"}, {"rear", 1.6, "R"}, {"total", 1.6, "R"}, {"P(less lift) f / r / t", 1.6, "R"}}, rows)
	}
}

// balance is front minus rear C_L·A of a configuration (m²), from the
// fused posterior: a difference of lift, meaningful whatever the sign of
// either axle (a share of the total is not, when the total is near zero).
func (r *reporter) balance(cfg string) fuse.Estimate {
	e, _ := r.in.Fused.Posterior.Linear(evidence.Term{Config: cfg, Axle: evidence.AxleFront, W: 1}, evidence.Term{Config: cfg, Axle: evidence.AxleRear, W: -1})
	return e
}
