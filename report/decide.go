package report

import (
	"fmt"
	"io"
	"text/tabwriter"

	"liftfuse/fuse"
)

// PlanText writes a plan as a readable ranking.
func PlanText(w io.Writer, pl *fuse.Plan, unit string) error {
	t := pl.Target
	fmt.Fprintf(w, "target: %s, C_L·A now %+.4f m² ± %.4f [%+.4f, %+.4f]\n\n", t.String(), t.Now.Mean, t.Now.SD, t.Now.Lo, t.Now.Hi)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "rank\trepeat\tkind\thours\tsd after\tvariance removed\tper hour\twhy")
	for i, o := range pl.Options {
		fmt.Fprintf(tw, "%d\t%s\t%s\t%.1f\t%.4f\t%.1f %%\t%.1f %%/h\t%s\n", i+1, o.Entry, o.Kind, o.CostH, o.SDAfter, o.RemovedPct, o.PerHour, o.Why)
	}
	tw.Flush()
	for _, d := range pl.Discriminate {
		fmt.Fprintf(w, "\n%s looks off: %s\n", d.Flagged, d.Why)
	}
	if len(pl.Detectability) > 0 {
		u, err := newForceUnit(unit)
		if err != nil {
			return err
		}
		fmt.Fprintln(w, "\ndetectability of the ride-height entries (2 sd of one steady window)")
		tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintf(tw, "entry\taxle\tsmallest load (%s)\tspeed for the target's size\n", unit)
		for _, d := range pl.Detectability {
			fmt.Fprintf(tw, "%s\t%s\t%.1f\t%.0f km/h\n", d.Entry, d.Axle, u.of(d.ResolvableN100), d.SpeedForTarget)
		}
		tw.Flush()
	}
	return nil
}

// claimUnit is a claim's unit as the text prints it: a C_L·A ("m2" on the
// command line and in the document) reads "m² (C_L·A)", a force its unit.
func claimUnit(u string) string {
	if t := unitText(u); t == "m²" {
		return "m² (C_L·A)"
	}
	return u
}

// maxExplanations is how many explanations the text lists.
const maxExplanations = 6

// CrosscheckText writes a cross-check as readable text: the claim, the
// campaign's prediction, the verdict, and the explanations or the things
// to look at that go with it.
func CrosscheckText(w io.Writer, cc *fuse.Crosscheck) {
	c := cc.Claim
	fmt.Fprintf(w, "claim: %s %s at %g km/h = %+.3g ± %.3g %s\n", c.Config, c.Axle, c.SpeedKmh, c.Value, c.SD, claimUnit(c.Unit))
	fmt.Fprintf(w, "this campaign predicts %+.3g ± %.3g %s: z = %+.2f, two-sided p = %.3g\n", cc.Predictive.Mean, cc.Predictive.SD, claimUnit(cc.Predictive.Unit), cc.Z, cc.PValue)
	if cc.Summary != "" {
		fmt.Fprintf(w, "verdict: %s\n", cc.Summary)
	}
	if len(cc.Explanations) > 0 {
		fmt.Fprintln(w, "\nwhat would have to be different, cheapest first (shift in prior standard deviations)")
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		for i, e := range cc.Explanations {
			if i == maxExplanations {
				fmt.Fprintf(tw, "  …\t\t\t%d more, each further off (see --json)\n", len(cc.Explanations)-i)
				break
			}
			mark := ""
			if e.Plausible {
				mark = "plausible"
			}
			fmt.Fprintf(tw, "  %+.1f sd\t%s\t%s\t%s\n", e.ShiftSD, mark, e.Entry, e.Note)
		}
		tw.Flush()
	}
	if len(cc.Checks) > 0 {
		head := "no modelled error explains it plausibly; look at:"
		if len(cc.Explanations) == 0 {
			head = "look at:"
		}
		fmt.Fprintf(w, "\n%s\n", head)
		for _, s := range cc.Checks {
			fmt.Fprintf(w, "  - %s\n", s)
		}
	}
}
