package report

import (
	"fmt"
	"io"
	"text/tabwriter"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/air"
)

// FuseText writes the fused result as readable tables: configurations ×
// axles, forces at the report speeds, deltas, and the agreement table.
func FuseText(w io.Writer, res *fuse.Result, unit string) error {
	k, err := air.NewtonsPer(unit)
	if err != nil {
		return err
	}
	lvl := percent(res.Credible)
	fmt.Fprintf(w, "%s\nC_L·A in m², lift positive up (SAE J1594); intervals are central %s credible intervals\n\n", res.Campaign.Title, lvl)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "config\tfront C_L·A\trear C_L·A\ttotal C_L·A\tP(downforce) f/r/t\tfront share")
	for _, c := range res.Configs {
		note := ""
		if c.PriorOnly {
			note = "  (prior only)"
		}
		fmt.Fprintf(tw, "%s%s\t%s\t%s\t%s\t%s/%s/%s\t%.2f [%.2f, %.2f]\n", c.ID, note, interval(c.Front.CLA, 3), interval(c.Rear.CLA, 3), interval(c.Total.CLA, 3),
			percent(c.Front.PDownforce), percent(c.Rear.PDownforce), percent(c.Total.PDownforce), c.FrontShare.Mean, c.FrontShare.Lo, c.FrontShare.Hi)
	}
	tw.Flush()
	fmt.Fprintf(w, "\nforces in %s (lift positive)\n", unit)
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "config\tspeed\tfront\trear\ttotal")
	for _, c := range res.Configs {
		for _, s := range c.AtSpeeds {
			fmt.Fprintf(tw, "%s\t%g km/h\t%s\t%s\t%s\n", c.ID, s.SpeedKmh, interval(s.FrontN.Scale(1/k), 1), interval(s.RearN.Scale(1/k), 1), interval(s.TotalN.Scale(1/k), 1))
		}
	}
	tw.Flush()
	if len(res.Deltas) > 0 {
		fmt.Fprintln(w, "\ndifferences (C_L·A, m²)")
		tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "change\tfront\trear\ttotal\tP(less lift) f/r/t")
		for _, d := range res.Deltas {
			fmt.Fprintf(tw, "%s − %s\t%s\t%s\t%s\t%s/%s/%s\n", d.Config, d.Versus, interval(d.Front.CLA, 3), interval(d.Rear.CLA, 3), interval(d.Total.CLA, 3),
				percent(d.Front.PDownforce), percent(d.Rear.PDownforce), percent(d.Total.PDownforce))
		}
		tw.Flush()
	}
	fmt.Fprintln(w, "\nwhat each method says, and whether it agrees with the others")
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "entry\tkind\tconfig\taxle\tC_L·A alone\tP(downforce)\tdistance\tp-value\tP(off)\tflag")
	for _, m := range res.Methods {
		ag := "\t\t\t"
		if a := m.Agreement; a != nil {
			ag = fmt.Sprintf("%.2f\t%.3f\t%.2f\t%s", a.Distance, a.PValue, a.POff, flagWord(a))
		}
		for i, s := range m.Standalone {
			id, kind, a := m.ID, m.Kind, ag
			if i > 0 {
				id, kind, a = "", "", "\t\t\t"
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\n", id, kind, s.Config, s.Axle, interval(s.CLA, 3), percent(s.PDownforce), a)
		}
	}
	tw.Flush()
	writeWarnings(w, res.Warnings)
	if d := res.Diagnostics; d != nil {
		fmt.Fprintf(w, "\nsampler: %s; %s, seed %d", d.Sampler, count(d.Draws, "draw"), d.Seed)
		if d.RhatMax != nil && d.ESSMin != nil {
			fmt.Fprintf(w, ", R̂ ≤ %.3f, bulk ESS ≥ %.0f", *d.RhatMax, *d.ESSMin)
		}
		fmt.Fprintln(w)
	}
	return nil
}

// writeWarnings lists the warnings under a count of them ("1 warning").
func writeWarnings(w io.Writer, ws []string) {
	if len(ws) == 0 {
		return
	}
	fmt.Fprintf(w, "\n%s\n", count(len(ws), "warning"))
	for _, s := range ws {
		fmt.Fprintf(w, "  - %s\n", s)
	}
}

// ReduceText writes what each adapter made of its raw data: the steady
// windows of each height entry, the integrated pressure readings, the vortex
// senses, then each entry's standalone estimates. Forces (a ride-height
// entry's detectability, the taps' integrated loads) are in unit, the
// campaign's report.force_unit, as in fuse and plan.
func ReduceText(w io.Writer, r *methods.Reduced, res *fuse.Result, unit string) error {
	u, err := newForceUnit(unit)
	if err != nil {
		return err
	}
	for _, m := range methodReports() {
		m.reduced(w, r, u)
	}
	fmt.Fprintln(w, "what each entry says on its own (C_L·A, m²)")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "entry\tconfig\taxle\tC_L·A\tP(downforce)")
	for _, m := range res.Methods {
		for _, s := range m.Standalone {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", m.ID, s.Config, s.Axle, interval(s.CLA, 3), percent(s.PDownforce))
		}
	}
	tw.Flush()
	writeWarnings(w, res.Warnings)
	return nil
}
