package main

import (
	"io"

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

func newPlanCmd() *cobra.Command {
	var o planOptions
	cmd := &cobra.Command{
		Use:   "plan FILE",
		Short: "Which measurement to repeat for the most certainty per hour",
		Long: `plan takes today's fused posterior of a target — an axle of a configuration,
or its difference to another — and, for every evidence entry, the expected
posterior sd if its runs were repeated once: errors a repeat shares (the same
springs, the same reference port, the same tyre growth) do not average down.
Entries are ranked by variance removed per hour of plan.cost_h. For each
ride-height entry it gives the load it can resolve and the speed the target
needs. The target defaults to the campaign's plan.target, else the rear of the
last configuration versus the reference.`,
		Example: "  liftfuse plan examples/ducktail-fastback/campaign.yaml\n  liftfuse plan FILE --target-config ducktail --target-axle front --versus baseline --json",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			return runPlan(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.config, "target-config", "", "configuration of the target")
	f.StringVar(&o.axle, "target-axle", "", "axle of the target: front, rear or total")
	f.StringVar(&o.versus, "versus", "", "make the target a difference to this configuration")
	f.BoolVar(&o.json, "json", false, "print the plan document as JSON")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

// planTarget resolves the target from flags, the campaign and defaults.
func planTarget(o planOptions, c *campaign.Campaign) (fuse.Target, error) {
	t := fuse.Target{Config: c.Plan.Target.Config, Axle: c.Plan.Target.Axle, Versus: c.Plan.Target.Versus}
	if t.Config == "" {
		last := c.Configurations[len(c.Configurations)-1].ID
		t = fuse.Target{Config: last, Axle: evidence.AxleRear}
		if last != c.Report.ReferenceConfig {
			t.Versus = c.Report.ReferenceConfig
		}
	}
	if o.config != "" {
		t.Config, t.Versus = o.config, ""
	}
	if o.axle != "" {
		t.Axle = o.axle
	}
	if o.versus != "" {
		t.Versus = o.versus
	}
	known := map[string]bool{}
	for _, cf := range c.Configurations {
		known[cf.ID] = true
	}
	switch {
	case !known[t.Config]:
		return t, badInput("unknown target configuration %q", t.Config)
	case t.Versus != "" && !known[t.Versus]:
		return t, badInput("unknown configuration %q for --versus", t.Versus)
	case t.Versus == t.Config:
		return t, badInput("a difference needs two different configurations")
	case t.Axle != evidence.AxleFront && t.Axle != evidence.AxleRear && t.Axle != evidence.AxleTotal:
		return t, badInput("--target-axle must be front, rear or total, got %q", t.Axle)
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
