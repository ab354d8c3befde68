package report_test

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/report"
)

// maxFuzzInput bounds each half of a fuzz input (campaign, log) so that one
// execution stays fast; larger inputs are skipped, not truncated.
const maxFuzzInput = 64 << 10

// fuzzSeeds returns the minimal campaign and its log (testdata/mini) and
// mutations of them that once crashed or mis-reported (issue 16): a first
// time step of 1e-15 s, a cell of 1e308 in either sensor, negative logged
// speeds, an empty file name, a long title.
func fuzzSeeds(tb testing.TB) [][2][]byte {
	tb.Helper()
	yml, err := os.ReadFile("../testdata/mini/campaign.yaml")
	if err != nil {
		tb.Fatal(err)
	}
	csv, err := os.ReadFile("../testdata/mini/logs/run.csv")
	if err != nil {
		tb.Fatal(err)
	}
	// cells applies f to the cells (t,v,vms,d,fp,rl,cfg) of every data row
	// of run.csv for which pick(row) is true; row 1 is the first data row.
	cells := func(pick func(row int) bool, f func(c []string)) []byte {
		lines := strings.Split(string(csv), "\n")
		for i := 1; i < len(lines); i++ {
			if lines[i] != "" && pick(i) {
				c := strings.Split(lines[i], ",")
				f(c)
				lines[i] = strings.Join(c, ",")
			}
		}
		return []byte(strings.Join(lines, "\n"))
	}
	row := func(n int) func(int) bool { return func(i int) bool { return i == n } }
	yamlEdit := func(old, new string) []byte { return bytes.Replace(yml, []byte(old), []byte(new), 1) }
	return [][2][]byte{
		{yml, csv},
		{yml, cells(row(2), func(c []string) { c[0] = "1e-15" })},
		{yml, cells(row(10), func(c []string) { c[4] = "1e308" })},
		{yml, cells(row(40), func(c []string) { c[5] = "1e308" })},
		{yml, cells(func(int) bool { return true }, func(c []string) { c[1], c[2] = "-"+c[1], "-"+c[2] })},
		{yamlEdit("- file: logs/run.csv", `- file: ""`), csv},
		{yamlEdit("title: Fixture campaign", "title: "+strings.Repeat("Fixture campaign ", 200)), csv},
		{yamlEdit("force_unit: N", "force_unit: kgf\n  reference_config: wing\nprior: {speed_model: linear}"), csv},
		{yamlEdit("mm_per_unit: 25", "mm_per_unit: 1e308"), csv},
		{yml, []byte("t,v,vms,d,fp,rl,cfg\n")},
	}
}

// FuzzReport: no campaign with its log may panic anything on the way to
// the PDF (issue 16): the loader, the adapters, the fusion, the plan and
// the report. The input is the campaign text and the text of logs/run.csv
// beside it; it is loaded, reduced, fused with a small sampler budget,
// planned, and rendered. Errors are fine; a load error must be Problems
// (with positions), and a fusion that succeeds must give a result document
// that can be written (no NaN or Inf).
func FuzzReport(f *testing.F) {
	for _, s := range fuzzSeeds(f) {
		f.Add(s[0], s[1])
	}
	f.Fuzz(func(t *testing.T, yml, csv []byte) {
		if len(yml) > maxFuzzInput || len(csv) > maxFuzzInput {
			t.Skip("input over 64 KiB")
		}
		defer failOnPanic(t)
		in, err := fuzzInput(t, yml, csv)
		var probs campaign.Problems
		if errors.As(err, &probs) && len(probs) == 0 {
			t.Fatalf("an empty list of problems: %v", err)
		}
		if err != nil {
			t.Logf("before the report: %v", err)
			return
		}
		if _, err := report.JSON(in.Fused.Result); err != nil {
			t.Fatalf("the result document cannot be written: %v", err)
		}
		pdf, err := report.PDF(in)
		if err != nil {
			t.Logf("report: %v", err)
			return
		}
		if !bytes.HasPrefix(pdf, []byte("%PDF-")) {
			t.Fatalf("the report is not a PDF: %q", pdf[:min(len(pdf), 16)])
		}
	})
}

// fuzzInput writes a fuzz input as a campaign folder (campaign.yaml,
// logs/run.csv) and takes it through loading, the adapters, fusion and
// planning as the report command does.
func fuzzInput(t *testing.T, yml, csv []byte) (report.Input, error) {
	dir := t.TempDir()
	if err := os.Mkdir(filepath.Join(dir, "logs"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "logs", "run.csv"), csv, 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "campaign.yaml")
	if err := os.WriteFile(path, yml, 0o644); err != nil {
		t.Fatal(err)
	}
	c, err := campaign.Load(path, campaign.Options{})
	if err != nil {
		return report.Input{}, err
	}
	r, err := methods.Reduce(c, methods.Options{Height: height.Options{Trace: true}})
	if err != nil {
		return report.Input{}, err
	}
	ids := c.ConfigIDs()
	f, err := fuse.Run(fuse.Input{Evidence: r.Evidence(), Settings: fuse.Settings{Configs: ids, PriorSD: c.Prior.CLASDM2,
		Linear: c.Prior.SpeedModel == campaign.SpeedLinear, Seed: uint64(c.Report.Seed), Credible: c.Report.Credible, MinESS: 100, MaxDraws: 400},
		Reference: c.Report.ReferenceConfig, SpeedsKmh: c.Report.SpeedsKmh, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2, Warnings: r.Warnings})
	if err != nil {
		return report.Input{}, err
	}
	f.Result.Campaign = fuse.CampaignInfo{Title: c.Campaign.Title, SHA256: "fuzz"}
	// The campaign's plan target, its default applied on loading.
	tg := fuse.Target{Config: c.Plan.Target.Config, Axle: c.Plan.Target.Axle, Versus: c.Plan.Target.Versus}
	pl, err := f.PlanRepeats(tg, c.CostH)
	if err != nil {
		return report.Input{}, err
	}
	for _, h := range methods.Details[*height.Result](r) {
		pl.Detectability = append(pl.Detectability, fuse.Detectability{Entry: h.Entry.ID, Axle: h.Entry.Axle,
			ResolvableN100: h.Detect.ResolvableN, SpeedForTarget: h.Detect.SpeedFor(pl.Target.Now.Mean)})
	}
	return report.Input{Campaign: c, Reduced: r, Fused: f, Plan: pl, Version: "fuzz"}, nil
}

// failOnPanic turns a panic of the code under test into a test failure with
// its stack, so that a crashing input fails this target (and the fuzzer
// records it) while the package's other tests still run.
func failOnPanic(t *testing.T) {
	if r := recover(); r != nil {
		t.Fatalf("panic: %v\n%s", r, debug.Stack())
	}
}
