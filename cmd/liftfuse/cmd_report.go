package main

import (
	"fmt"
	"io"
	"slices"

	"github.com/spf13/cobra"

	"liftfuse/fuse"
	"liftfuse/methods/evidence"
	"liftfuse/report"
)

type reportOptions struct {
	file, out, json, paper string
	quiet                  bool
}

func newReportCmd() *cobra.Command {
	var o reportOptions
	cmd := &cobra.Command{
		Use:   "report FILE -o OUT.pdf",
		Short: "Write the customer development report (PDF), and the result document (JSON)",
		Long: `report runs the whole job — adapters, fusion, agreement, planning — and lays it
out as a development report: summary of front and rear lift per configuration,
what each method says with its charts, where the methods disagree and what
could explain it, what to repeat next, method notes and safety cautions, and
provenance. --json writes the result document beside it. Files are written to
a temporary file and renamed, so a failed run leaves nothing behind.`,
		Example: "  liftfuse report examples/ducktail-fastback/campaign.yaml -o report.pdf --json report.json",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if o.out == "" {
				return badInput("-o OUT.pdf is required")
			}
			if !slices.Contains(report.Papers(), o.paper) {
				return badInput("--paper must be A4 or Letter, got %q", o.paper)
			}
			return runReport(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVarP(&o.out, "out", "o", "", "PDF file to write")
	f.StringVar(&o.json, "json", "", "also write the result document to this file")
	f.StringVar(&o.paper, "paper", "A4", "paper size: A4 or Letter")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

func runReport(o reportOptions, out, stderr io.Writer) error {
	a, err := analyse(o.file, o.quiet, stderr)
	if err != nil {
		return err
	}
	pl, err := makePlan(a, planOptions{})
	if err != nil {
		return err
	}
	explain, err := explanations(a)
	if err != nil {
		return err
	}
	pdf, err := report.PDF(report.Input{Campaign: a.campaign, Reduced: a.reduced, Fused: a.fused, Plan: pl, Explain: explain, Version: Version, Paper: o.paper})
	if err != nil {
		return err
	}
	var js []byte
	if o.json != "" {
		if js, err = report.JSON(a.fused.Result); err != nil {
			return err
		}
	}
	if err := report.WriteFile(o.out, pdf, 0o644); err != nil {
		return err
	}
	if o.json != "" {
		if err := report.WriteFile(o.json, js, 0o644); err != nil {
			return err
		}
	}
	fmt.Fprintf(out, "wrote %s", o.out)
	if o.json != "" {
		fmt.Fprintf(out, " and %s", o.json)
	}
	fmt.Fprintln(out)
	return nil
}

// explanations asks, for each flagged entry, which of its own modelled
// errors would have to move least for it to agree with the other entries on
// the quantity where it disagrees most: the others' estimate is the claim,
// the entry's standalone posterior the prediction.
func explanations(a *analysis) (map[string]*fuse.Crosscheck, error) {
	out := map[string]*fuse.Crosscheck{}
	for _, m := range a.fused.Result.Methods {
		ag := m.Agreement
		alone, others := a.fused.Standalone[m.ID], a.fused.Others[m.ID]
		if ag == nil || !ag.Flag || ag.Worst == nil || alone == nil || others == nil {
			continue
		}
		w := ag.Worst
		e, _ := others.Quantity(evidence.Quantity{Config: w.Config, Axle: w.Axle})
		cc, err := alone.Crosscheck(fuse.Claim{Config: w.Config, Axle: w.Axle, SpeedKmh: evidence.RefSpeedKmh, Value: e.Mean, SD: e.SD, Unit: "m2"}, a.campaign.Density())
		if err != nil {
			return nil, err
		}
		out[m.ID] = cc
	}
	return out, nil
}
