package main

import (
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/checks"
	"liftfuse/methods/height"
)

// analysis is a campaign taken through the adapters and fusion.
type analysis struct {
	campaign *campaign.Campaign
	reduced  *methods.Reduced
	fused    *fuse.Fused
}

// settings returns the fusion settings of a campaign.
func settings(c *campaign.Campaign) fuse.Settings {
	return fuse.Settings{Configs: c.ConfigIDs(), PriorSD: c.Prior.CLASDM2, Linear: c.Prior.SpeedModel == campaign.SpeedLinear,
		Seed: uint64(c.Report.Seed), Credible: c.Report.Credible}
}

// load reads a campaign for the adapters: loading reads only the logs'
// headers, and the adapters' read of each log is its only one (see
// reduceLoaded). hashed says the output carries the input hash: the
// adapters' reads then feed it; else it is left out of them
// (campaign.Options.HashLater).
func load(file string, hashed bool) (*campaign.Campaign, error) {
	return loadCampaign(file, campaign.Options{Stream: true, HashLater: !hashed})
}

// reduceLoaded runs every adapter on a campaign from load and completes
// its validation with what their reads found (campaign.Finish): on bad
// input, the problems validation lists, all at once; else the adapters'
// error. The warnings Finish adds join the campaign's, ahead of the
// adapters'.
func reduceLoaded(c *campaign.Campaign, opt methods.Options) (*methods.Reduced, error) {
	n := len(c.Warnings)
	r, err := methods.Reduce(c, opt)
	if err := c.Finish(err); err != nil {
		if _, ok := err.(campaign.Problems); ok {
			return nil, err
		}
		return nil, inputError{err}
	}
	var ws []string
	for _, w := range c.Warnings[n:] {
		ws = append(ws, w.Error())
	}
	r.Warnings = slices.Insert(r.Warnings, n, ws...)
	return r, nil
}

// reduce loads a campaign and runs every adapter, with a progress bar on
// stderr when it is a terminal and not silenced. hashed says the output
// carries the input hash (see load); traced that it draws the logs'
// traces (height.Options.Trace: the report). check, if not nil, is called
// on the loaded campaign before the (long) reduction.
func reduce(file string, hashed, traced, quiet bool, stderr io.Writer, check func(*campaign.Campaign) error) (*campaign.Campaign, *methods.Reduced, error) {
	c, err := load(file, hashed)
	if err != nil {
		return nil, nil, err
	}
	if check != nil {
		if err := check(c); err != nil {
			return nil, nil, err
		}
	}
	opt := methods.Options{Height: height.Options{Trace: traced}}
	if !quiet && isTerminal(stderr) {
		opt.Height.Progress = func(done, total int64) {
			fmt.Fprintf(stderr, "\rreading logs %s %3.0f%%", bar(done, total), 100*float64(done)/float64(max(total, 1)))
			if done >= total {
				fmt.Fprint(stderr, "\r"+strings.Repeat(" ", 50)+"\r")
			}
		}
	}
	r, err := reduceLoaded(c, opt)
	if err != nil {
		return nil, nil, err
	}
	return c, r, nil
}

// analyse loads, reduces and fuses a campaign.
func analyse(file string, quiet bool, stderr io.Writer) (*analysis, error) {
	return analyseChecked(file, false, quiet, stderr, nil)
}

// analyseChecked is analyse with the logs' traces kept when traced (for
// the report's plots) and a check of the loaded campaign before the long
// work (see reduce).
func analyseChecked(file string, traced, quiet bool, stderr io.Writer, check func(*campaign.Campaign) error) (*analysis, error) {
	c, r, err := reduce(file, true, traced, quiet, stderr, check)
	if err != nil {
		return nil, err
	}
	fusionStarts()
	f, err := fuse.Run(fuse.Input{
		Evidence: r.Evidence(), Settings: settings(c), Reference: c.Report.ReferenceConfig,
		SpeedsKmh: c.Report.SpeedsKmh, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2, Warnings: r.Warnings,
		Checks: checks.Run(c, r),
	})
	if err != nil {
		return nil, err
	}
	if err := stamp(f.Result, c); err != nil {
		return nil, err
	}
	return &analysis{campaign: c, reduced: r, fused: f}, nil
}

// stamp fills the result's campaign title, input hash and tool version.
func stamp(res *fuse.Result, c *campaign.Campaign) error {
	sum, err := c.Hash()
	if err != nil {
		return err
	}
	res.ToolVersion = Version
	res.Campaign = fuse.CampaignInfo{Title: c.Campaign.Title, SHA256: sum}
	return nil
}

func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

func bar(done, total int64) string {
	const width = 30
	n := int(width * done / max(total, 1))
	n = min(max(n, 0), width)
	return "[" + strings.Repeat("#", n) + strings.Repeat(".", width-n) + "]"
}
