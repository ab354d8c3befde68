package main

import (
	"io"

	"github.com/spf13/cobra"

	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
	"liftfuse/report"
)

type crosscheckOptions struct {
	file        string
	claim       fuse.Claim
	json, quiet bool
}

func newCrosscheckCmd() *cobra.Command {
	var o crosscheckOptions
	cmd := &cobra.Command{
		Use:   "crosscheck FILE --config C --axle A --speed-kmh V --value X --sd S --unit N|kgf|lbf|m2",
		Short: "How surprising a claimed result is, and what would explain it",
		Long: `crosscheck compares a claimed lift (from a wind tunnel, a simulation, another
test day, a brochure) with the campaign's posterior predictive: z and the
two-sided tail probability. Then every modelled error (stiffness, tyre growth,
reference offset, wind, drift, pitch of drag, method scales) is asked how far it
would have to move, in its own prior standard deviations, to put the claim at
the centre — the cheapest explanations first. Forces are taken in still air at
the given speed; --unit m2 claims a C_L·A.`,
		Example: "  liftfuse crosscheck examples/ducktail-fastback/campaign.yaml --config ducktail --axle rear --speed-kmh 150 --value -12 --sd 1 --unit kgf",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			for _, name := range []string{"config", "axle", "speed-kmh", "value"} {
				if !cmd.Flags().Changed(name) {
					return badInput("--%s is required", name)
				}
			}
			return runCrosscheck(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.claim.Config, "config", "", "configuration of the claim")
	f.StringVar(&o.claim.Axle, "axle", "", "axle of the claim: front, rear or total")
	f.Float64Var(&o.claim.SpeedKmh, "speed-kmh", 0, "speed of the claim, km/h")
	f.Float64Var(&o.claim.Value, "value", 0, "claimed value (lift positive)")
	f.Float64Var(&o.claim.SD, "sd", 0, "the claim's own standard uncertainty")
	f.StringVar(&o.claim.Unit, "unit", air.UnitN, "unit: N, kgf, lbf, or m2 for a C_L·A")
	f.BoolVar(&o.json, "json", false, "print the cross-check document as JSON")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

func runCrosscheck(o crosscheckOptions, out, stderr io.Writer) error {
	cl := o.claim
	switch {
	case cl.Axle != evidence.AxleFront && cl.Axle != evidence.AxleRear && cl.Axle != evidence.AxleTotal:
		return badInput("--axle must be front, rear or total, got %q", cl.Axle)
	case !(cl.SpeedKmh > 0 && cl.SpeedKmh < 500):
		return badInput("--speed-kmh must lie in (0, 500), got %g", cl.SpeedKmh)
	case !(cl.SD >= 0):
		return badInput("--sd must not be negative")
	}
	if cl.Unit != "m2" {
		n, err := air.NewtonsPer(cl.Unit)
		if err != nil {
			return badInput("--unit must be N, kgf, lbf or m2, got %q", cl.Unit)
		}
		cl.NewtonsPerUnit = n
	}
	a, err := analyse(o.file, o.quiet, stderr)
	if err != nil {
		return err
	}
	known := false
	for _, c := range a.campaign.Configurations {
		known = known || c.ID == cl.Config
	}
	if !known {
		return badInput("unknown configuration %q", cl.Config)
	}
	cc, err := a.fused.Crosscheck(cl, a.campaign.Density())
	if err != nil {
		return err
	}
	if o.json {
		return report.WriteJSON(out, cc)
	}
	report.CrosscheckText(out, cc)
	return nil
}
