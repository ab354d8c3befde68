package main

import (
	"context"
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"liftfuse/fuse"
	"liftfuse/methods/campaign"
	"liftfuse/report"
)

type reportOptions struct {
	file, out, jsonOut, paper string
	json, quiet               bool
}

// outputs are the files the report writes, with their flags.
func (o reportOptions) outputs() []output {
	outs := []output{{"-o", o.out}}
	if o.jsonOut != "" {
		outs = append(outs, output{"--json-out", o.jsonOut})
	}
	return outs
}

func newReportCmd(runF func(*reportOptions) error) *cobra.Command {
	var o reportOptions
	cmd := &cobra.Command{
		Use:   "report FILE -o OUT.pdf [--json-out OUT.json]",
		Short: "Write the customer development report (PDF), and the result document (JSON)",
		Long: `report runs the whole job — adapters, fusion, agreement, planning — and lays it
out as a development report: summary of front and rear lift per configuration,
what each method says with its charts, where the methods disagree and what
could explain it, what to repeat next, method notes and safety cautions, and
provenance. --json-out writes the result document (the one fuse --json prints)
beside it; --json prints it on stdout instead of the "wrote" line.

Outputs are safe: an output that is the campaign or any file it reads is
refused before the run, as are a missing folder, a folder, a FIFO or a device.
The PDF and the JSON are written to temporary files beside them and renamed
into place only when both were written, so a failed or interrupted run
(SIGINT, SIGTERM) leaves the previous files as they were and no temporary
file. An existing output keeps its permissions. An output that is a symbolic
link stays a link: the file it points to is replaced.`,
		Example: "  liftfuse report examples/ducktail-fastback/campaign.yaml -o report.pdf --json-out report.json",
		Args:    reportArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if err := requireFlags(cmd, "out"); err != nil {
				return err
			}
			paper, err := enum("paper", o.paper, report.Papers()...)
			if err != nil {
				return err
			}
			o.paper = paper
			if runF != nil {
				return runF(&o)
			}
			return runReport(cmd.Context(), o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	f := cmd.Flags()
	f.StringVarP(&o.out, "out", "o", "", "the PDF `FILE` to write (required)")
	f.StringVar(&o.jsonOut, "json-out", "", "also write the result document to `FILE`")
	f.BoolVar(&o.json, "json", false, "print the result document as JSON on stdout")
	f.StringVar(&o.paper, "paper", "A4", "paper `SIZE`: A4 or Letter (any case)")
	f.BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

// reportArgs wants one campaign file, and recognises the older
// `--json FILE` (a file after the switch) with a hint.
func reportArgs(cmd *cobra.Command, args []string) error {
	if len(args) == 2 && cmd.Flags().Changed("json") {
		return badInput("--json is a switch (print the result document on stdout); to write it to a file use --json-out %s", args[1])
	}
	return argsExactly(1, "one campaign file")(cmd, args)
}

// reportAnalysis checks that the outputs can be written, before and after
// loading the campaign, and analyses it keeping the logs' traces, which
// the report plots (height.Options.Trace).
func reportAnalysis(file string, quiet bool, stderr io.Writer, outs []output) (*analysis, error) {
	if err := checkOutputs(file, nil, outs...); err != nil {
		return nil, err
	}
	return analyseChecked(file, true, quiet, stderr, func(c *campaign.Campaign) error { return checkOutputs(file, c, outs...) })
}

func runReport(ctx context.Context, o reportOptions, out, stderr io.Writer) error {
	outs := o.outputs()
	a, err := reportAnalysis(o.file, o.quiet, stderr, outs)
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
	js, err := report.JSON(a.fused.Result)
	if err != nil {
		return err
	}
	files, names := []report.Output{report.Bytes(o.out, pdf)}, []string{o.out}
	if o.jsonOut != "" {
		files, names = append(files, report.Bytes(o.jsonOut, js)), append(names, o.jsonOut)
	}
	if err := report.WriteFiles(ctx, files...); err != nil {
		return err
	}
	if o.json {
		if !o.quiet {
			fmt.Fprintf(stderr, "wrote %s\n", words(names, "and"))
		}
		_, err := out.Write(js)
		return err
	}
	fmt.Fprintf(out, "wrote %s\n", words(names, "and"))
	return nil
}

// explanations asks, for each flagged entry, which single one of its own
// modelled errors, within physical bounds, explains its disagreement with
// the other entries (fuse.Fused.Diagnose), if any.
func explanations(a *analysis) (map[string]*fuse.Crosscheck, error) {
	out := map[string]*fuse.Crosscheck{}
	for _, m := range a.fused.Result.Methods {
		if ag := m.Agreement; ag == nil || !ag.Suspect {
			continue
		}
		cc, err := a.fused.Diagnose(m.ID)
		if err != nil {
			return nil, err
		}
		out[m.ID] = cc
	}
	return out, nil
}
