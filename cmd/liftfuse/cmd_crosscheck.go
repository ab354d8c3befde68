package main

import (
	"io"
	"math"

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

// unitCLA is the --unit word of a claimed C_L·A; printed as m².
const unitCLA = "m2"

func newCrosscheckCmd(runF func(*crosscheckOptions) error) *cobra.Command {
	var o crosscheckOptions
	cmd := &cobra.Command{
		Use:   "crosscheck FILE --config C --axle A --speed-kmh V --value X [--sd S] [--unit N|kgf|lbf|m2]",
		Short: "How surprising a claimed result is, and what would explain it",
		Long: `crosscheck compares a claimed lift (from a wind tunnel, a simulation, another
test day, a brochure) with the campaign's posterior predictive: z and the
two-sided tail probability. Then every modelled error (stiffness, tyre growth,
reference offset, wind, drift, pitch of drag, method scales) is asked how far it
would have to move, in its own prior standard deviations, to put the claim at
the centre — the cheapest explanations first. Forces are taken in still air at
the given speed; --unit m2 (or m²) claims a C_L·A. --axle and --unit take their
word in any case.`,
		Example: "  liftfuse crosscheck examples/ducktail-fastback/campaign.yaml --config ducktail --axle rear --speed-kmh 150 --value -12 --sd 1 --unit kgf",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if err := requireFlags(cmd, "config", "axle", "speed-kmh", "value"); err != nil {
				return err
			}
			if err := o.normalise(); err != nil {
				return err
			}
			if runF != nil {
				return runF(&o)
			}
			return runCrosscheck(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.claim.Config, "config", "", "configuration of the claim (required)")
	f.StringVar(&o.claim.Axle, "axle", "", "axle of the claim: front, rear or total (required)")
	f.Float64Var(&o.claim.SpeedKmh, "speed-kmh", 0, "speed of the claim, km/h (required)")
	f.Float64Var(&o.claim.Value, "value", 0, "claimed value, lift positive (required)")
	f.Float64Var(&o.claim.SD, "sd", 0, "the claim's own standard uncertainty, in --unit")
	f.StringVar(&o.claim.Unit, "unit", air.UnitN, "unit: N, kgf, lbf, or m2 (m²) for a C_L·A")
	f.BoolVar(&o.json, "json", false, "print the cross-check document as JSON on stdout")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

// normalise checks the claim's words and numbers (words in any case) and
// sets the unit's size in newtons.
func (o *crosscheckOptions) normalise() error {
	cl := &o.claim
	axle, err := enum("axle", cl.Axle, evidence.AxleFront, evidence.AxleRear, evidence.AxleTotal)
	if err != nil {
		return err
	}
	cl.Axle = axle
	if cl.Unit == "m²" {
		cl.Unit = unitCLA
	}
	unit, err := enum("unit", cl.Unit, air.UnitN, air.UnitKgf, air.UnitLbf, unitCLA)
	if err != nil {
		return err
	}
	cl.Unit = unit
	switch {
	case !(cl.SpeedKmh > 0 && cl.SpeedKmh < 500):
		return badInput("--speed-kmh must lie in (0, 500) km/h, got %g", cl.SpeedKmh)
	case !(cl.SD >= 0):
		return badInput("--sd must not be negative, got %g", cl.SD)
	case math.IsNaN(cl.Value) || math.IsInf(cl.Value, 0):
		return badInput("--value must be a finite number, got %g", cl.Value)
	}
	if cl.Unit != unitCLA {
		n, err := air.NewtonsPer(cl.Unit)
		if err != nil {
			return err
		}
		cl.NewtonsPerUnit = n
	}
	return nil
}

func runCrosscheck(o crosscheckOptions, out, stderr io.Writer) error {
	cl := o.claim
	a, err := analyse(o.file, o.quiet, stderr)
	if err != nil {
		return err
	}
	if !a.campaign.HasConfig(cl.Config) {
		return badInput("unknown configuration %q for --config (known: %s)", cl.Config, words(a.campaign.ConfigIDs(), "and"))
	}
	cc, err := a.fused.Crosscheck(cl, a.campaign.Density())
	if err != nil {
		return err
	}
	if o.json {
		return report.WriteJSON(out, cc)
	}
	report.CrosscheckText(out, printedUnits(cc))
	return nil
}

// printedUnits returns a copy of cc for the terminal, with a C_L·A's unit
// written m² as everywhere else (the JSON keeps the word "m2").
func printedUnits(cc *fuse.Crosscheck) *fuse.Crosscheck {
	c := *cc
	if c.Claim.Unit == unitCLA {
		c.Claim.Unit = "m²"
	}
	if c.Predictive.Unit == unitCLA {
		c.Predictive.Unit = "m²"
	}
	return &c
}
