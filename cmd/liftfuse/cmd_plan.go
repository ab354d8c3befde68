package main

import (
	"io"
	"slices"

	"github.com/spf13/cobra"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/report"
)

type planOptions struct {
	file                 string
	config, axle, versus string
	json, quiet          bool
}

func newPlanCmd(runF func(*planOptions) error) *cobra.Command {
	var o planOptions
	cmd := &cobra.Command{
		Use:   "plan FILE",
		Short: "Which measurement to repeat for the most certainty per hour",
		Long: `plan takes today's fused posterior of a target — an axle of a configuration,
or its difference to another — and, for every evidence entry, the expected
posterior sd if its runs were repeated once: errors a repeat shares (the same
springs, the same reference port, the same tyre growth) do not average down.
Entries are ranked by variance removed per hour of plan.cost_h. For each
ride-height entry it gives the load it can resolve, in the campaign's
report.force_unit, and the speed the target needs. The target defaults to the
campaign's plan.target, else the rear of the last configuration versus the
reference. --target-axle takes its word in any case.`,
		Example: "  liftfuse plan examples/ducktail-fastback/campaign.yaml\n  liftfuse plan FILE --target-config ducktail --target-axle front --versus baseline --json",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if o.axle != "" {
				axle, err := enum("target-axle", o.axle, evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal)
				if err != nil {
					return err
				}
				o.axle = axle
			}
			if runF != nil {
				return runF(&o)
			}
			return runPlan(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.config, "target-config", "", "configuration of the target")
	f.StringVar(&o.axle, "target-axle", "", "axle of the target: front, rear or total")
	f.StringVar(&o.versus, "versus", "", "make the target a difference to this configuration")
	f.BoolVar(&o.json, "json", false, "print the plan document as JSON on stdout")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

// defaultTarget is the campaign's plan.target, with the campaign's default
// (methods/campaign, defaults.go: the one owner of that rule) applied.
func defaultTarget(c *campaign.Campaign) fuse.Target {
	t := c.Plan.Target
	return fuse.Target{Config: t.Config, Axle: t.Axle, Versus: t.Versus}
}

// planTarget resolves the target from flags over the default. A
// --target-config alone drops the default's difference.
func planTarget(o planOptions, c *campaign.Campaign) (fuse.Target, error) {
	t := defaultTarget(c)
	if o.config != "" {
		t.Config, t.Versus = o.config, ""
	}
	if o.axle != "" {
		t.Axle = o.axle
	}
	if o.versus != "" {
		t.Versus = o.versus
	}
	ids := c.ConfigIDs()
	switch {
	case !slices.Contains(ids, t.Config):
		return t, badInput("unknown target configuration %q (known: %s)", t.Config, words(ids, "and"))
	case t.Versus != "" && !slices.Contains(ids, t.Versus):
		return t, badInput("unknown configuration %q for --versus (known: %s)", t.Versus, words(ids, "and"))
	case t.Versus == t.Config:
		return t, badInput("a difference needs two different configurations, got %q twice", t.Config)
	}
	return t, nil
}

func runPlan(o planOptions, out, stderr io.Writer) error {
	a, err := analyse(o.file, o.quiet, stderr)
	if err != nil {
		return err
	}
	pl, err := makePlan(a, o)
	if err != nil {
		return err
	}
	if o.json {
		return report.WriteJSON(out, pl)
	}
	return report.PlanText(out, pl, a.campaign.Report.ForceUnit)
}

// makePlan ranks the repeats and adds each height entry's detectability.
func makePlan(a *analysis, o planOptions) (*fuse.Plan, error) {
	t, err := planTarget(o, a.campaign)
	if err != nil {
		return nil, err
	}
	pl, err := a.fused.PlanRepeats(t, a.campaign.CostH)
	if err != nil {
		return nil, err
	}
	for _, h := range methods.Details[*height.Result](a.reduced) {
		pl.Detectability = append(pl.Detectability, fuse.Detectability{Entry: h.Entry.ID, Axle: h.Entry.Axle,
			ResolvableN100: h.Detect.ResolvableN, SpeedForTarget: h.Detect.SpeedFor(pl.Target.Now.Mean)})
	}
	return pl, nil
}
