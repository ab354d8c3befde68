package report

import (
	"fmt"
	"io"
	"math"
	"text/tabwriter"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/air"
	"liftfuse/methods/height"
	"liftfuse/methods/pressure"
	"liftfuse/methods/vortex"
)

// interval formats an estimate as "mean [lo, hi]" with the given decimals.
func interval(e fuse.Estimate, dec int) string {
	return fmt.Sprintf("%+.*f [%+.*f, %+.*f]", dec, e.Mean, dec, e.Lo, dec, e.Hi)
}

func pct(p float64) string {
	if math.IsNaN(p) {
		return "–"
	}
	return fmt.Sprintf("%.0f%%", 100*p)
}

// FuseText writes the fused result as readable tables: configurations ×
// axles, forces at the report speeds, deltas, and the agreement table.
func FuseText(w io.Writer, res *fuse.Result, unit string) error {
	k, err := air.NewtonsPer(unit)
	if err != nil {
		return err
	}
	lvl := fmt.Sprintf("%.0f%%", 100*res.Credible)
	fmt.Fprintf(w, "%s\nC_L·A in m², lift positive up (SAE J1594); intervals are central %s credible intervals\n\n", res.Campaign.Title, lvl)
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "config\tfront C_L·A\trear C_L·A\ttotal C_L·A\tP(downforce) f/r/t\tfront share")
	for _, c := range res.Configs {
		note := ""
		if c.PriorOnly {
			note = "  (prior only)"
		}
		fmt.Fprintf(tw, "%s%s\t%s\t%s\t%s\t%s/%s/%s\t%.2f [%.2f, %.2f]\n", c.ID, note, interval(c.Front.CLA, 3), interval(c.Rear.CLA, 3), interval(c.Total.CLA, 3),
			pct(c.Front.PDownforce), pct(c.Rear.PDownforce), pct(c.Total.PDownforce), c.FrontShare.Mean, c.FrontShare.Lo, c.FrontShare.Hi)
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
				pct(d.Front.PDownforce), pct(d.Rear.PDownforce), pct(d.Total.PDownforce))
		}
		tw.Flush()
	}
	fmt.Fprintln(w, "\nwhat each method says, and whether it agrees with the others")
	tw = tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "entry\tkind\tconfig\taxle\tC_L·A alone\tP(downforce)\tdistance\tp-value\tP(off)\tflag")
	for _, m := range res.Methods {
		ag := "\t\t\t"
		if a := m.Agreement; a != nil {
			flag := ""
			if a.Flag {
				flag = "DISAGREES"
			}
			ag = fmt.Sprintf("%.2f\t%.3f\t%.2f\t%s", a.Distance, a.PValue, a.POff, flag)
		}
		for i, s := range m.Standalone {
			id, kind, a := m.ID, m.Kind, ag
			if i > 0 {
				id, kind, a = "", "", "\t\t\t"
			}
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\n", id, kind, s.Config, s.Axle, interval(s.CLA, 3), pct(s.PDownforce), a)
		}
	}
	tw.Flush()
	writeWarnings(w, res.Warnings)
	if d := res.Diagnostics; d != nil {
		fmt.Fprintf(w, "\nsampler: %s; %d draws, seed %d", d.Sampler, d.Draws, d.Seed)
		if d.RhatMax != nil {
			fmt.Fprintf(w, ", R̂ ≤ %.3f, bulk ESS ≥ %.0f", *d.RhatMax, *d.ESSMin)
		}
		fmt.Fprintln(w)
	}
	return nil
}

func writeWarnings(w io.Writer, ws []string) {
	if len(ws) == 0 {
		return
	}
	fmt.Fprintln(w, "\nwarnings")
	for _, s := range ws {
		fmt.Fprintf(w, "  - %s\n", s)
	}
}

// ReduceText writes what each adapter made of its raw data: the steady
// windows of each height entry, the integrated pressure readings, the vortex
// senses, then each entry's standalone estimates.
func ReduceText(w io.Writer, r *methods.Reduced, res *fuse.Result) {
	for _, h := range methods.Details[*height.Result](r) {
		e := h.Entry
		fmt.Fprintf(w, "%s: %s %s, K = %.1f N/mm (%s), calibration %.4g mm/unit ± %.1f%%\n", e.ID, e.Axle, e.Sensor, h.Stiffness.K, h.Stiffness.Source, h.Calibration.Gain, 100*h.Calibration.RelSD)
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "  config\tdir\tspeed km/h\tq Pa\theight mm\tSE mm\tn_eff\ttime s")
		for _, win := range h.Windows {
			fmt.Fprintf(tw, "  %s\t%+d\t%.1f\t%.0f\t%.3f\t%.3f\t%.0f\t%.0f–%.0f\n", win.Config, win.Direction, win.SpeedKmh, win.Q, win.HeightMM, win.SE, win.NEff, win.From, win.To)
		}
		tw.Flush()
		d := h.Detect
		fmt.Fprintf(w, "  detectability: window sd %.2f mm → smallest load %.0f N at 2 sd (C_L·A %.3f m² at 100 km/h)\n\n", d.SigmaMM, d.ResolvableN, d.ResolvableCLA100)
	}
	for _, p := range methods.Details[*pressure.Result](r) {
		fmt.Fprintf(w, "%s: %d taps, %s\n", p.Entry.ID, len(p.Panels), p.Entry.Mode)
		tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "  config\tspeed km/h\tdir\tq Pa\tfront N\trear N\ttotal N\tβ_f m²\tβ_r m²\tβ_t m² (taps only)")
		for _, rd := range p.Readings {
			b := rd.ImpliedCLA()
			fmt.Fprintf(tw, "  %s\t%g\t%+d\t%.0f\t%.1f\t%.1f\t%.1f\t%+.3f\t%+.3f\t%+.3f\n", rd.Config, rd.SpeedKmh, rd.Direction, rd.Q,
				rd.Forces.Front, rd.Forces.Rear, rd.Forces.Total, b.Front, b.Rear, b.Total)
		}
		tw.Flush()
		fmt.Fprintln(w)
	}
	for _, v := range methods.Details[*vortex.Result](r) {
		fmt.Fprintf(w, "%s: %s vortex, informs %s, misread %.2f\n", v.Entry.ID, v.Entry.Side, v.Entry.Informs, v.Entry.Misread)
		for _, o := range v.Observations {
			says := "downforce"
			if o.Lift {
				says = "lift"
			}
			fmt.Fprintf(w, "  %s at %g km/h: %s → %s\n", o.Config, o.SpeedKmh, o.Sense, says)
		}
		fmt.Fprintln(w)
	}
	fmt.Fprintln(w, "what each entry says on its own (C_L·A, m²)")
	tw := tabwriter.NewWriter(w, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "entry\tconfig\taxle\tC_L·A\tP(downforce)")
	for _, m := range res.Methods {
		for _, s := range m.Standalone {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\n", m.ID, s.Config, s.Axle, interval(s.CLA, 3), pct(s.PDownforce))
		}
	}
	tw.Flush()
	writeWarnings(w, res.Warnings)
}
