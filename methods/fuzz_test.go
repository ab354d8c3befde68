package methods_test

import (
	"bytes"
	"encoding/json"
	"os"
	"path/filepath"
	"runtime/debug"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
)

// maxFuzzInput bounds each half of a fuzz input (campaign, log) so that one
// execution stays fast; larger inputs are skipped, not truncated.
const maxFuzzInput = 64 << 10

// fuzzSettings are fusion settings small enough for a fuzz execution: the
// sampler stops at a bulk ESS of 100 or 400 draws per chain.
func fuzzSettings(c *campaign.Campaign) fuse.Settings {
	ids := make([]string, len(c.Configurations))
	for i, cf := range c.Configurations {
		ids[i] = cf.ID
	}
	return fuse.Settings{Configs: ids, PriorSD: c.Prior.CLASDM2, Linear: c.Prior.SpeedModel == campaign.SpeedLinear,
		Seed: uint64(c.Report.Seed), Credible: c.Report.Credible, MinESS: 100, MaxDraws: 400}
}

// miniSeeds returns the minimal campaign and its log (testdata/mini) and a
// few mutations of them that once crashed or mis-reported (issue 16): a
// first time step of 1e-15 s, a cell of 1e308, negative logged speeds and
// an empty file name.
func miniSeeds(tb testing.TB) [][2][]byte {
	tb.Helper()
	yml, err := os.ReadFile("../testdata/mini/campaign.yaml")
	if err != nil {
		tb.Fatal(err)
	}
	csv, err := os.ReadFile("../testdata/mini/logs/run.csv")
	if err != nil {
		tb.Fatal(err)
	}
	// cells applies f to the cells of every data row of run.csv (columns
	// t,v,vms,d,fp,rl,cfg) for which pick(row) is true; row 1 is the first
	// data row.
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
	all := func(int) bool { return true }
	tiny := cells(row(2), func(c []string) { c[0] = "1e-15" })
	huge := cells(row(10), func(c []string) { c[4] = "1e308" })
	neg := cells(all, func(c []string) { c[1], c[2] = "-"+c[1], "-"+c[2] })
	yamlEdit := func(old, new string) []byte { return bytes.Replace(yml, []byte(old), []byte(new), 1) }
	return [][2][]byte{
		{yml, csv}, {yml, tiny}, {yml, huge}, {yml, neg},
		{yamlEdit("- file: logs/run.csv", `- file: ""`), csv},
		{yamlEdit("mm_per_unit: 25", "mm_per_unit: 1e308"), csv},
		{yamlEdit("force_unit: N", "force_unit: kgf\n  reference_config: wing\nprior: {speed_model: linear}"), csv},
		{yml, []byte("t,v,vms,d,fp,rl,cfg\n")},
	}
}

// writeCampaign writes a fuzz input as a campaign folder: campaign.yaml and
// logs/run.csv, and returns the campaign's path.
func writeCampaign(t *testing.T, yml, csv []byte) string {
	t.Helper()
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
	return path
}

// FuzzReduce: no campaign with its log may panic the loader, the adapters
// or the fusion (issue 16). The input is the campaign text and the text of
// logs/run.csv beside it; it is loaded the way the commands load it (log
// headers only — the adapters stream the bodies), reduced and fused.
// Errors are fine; a load error must be Problems (with positions), and a
// fusion that succeeds must give a result document that can be written.
func FuzzReduce(f *testing.F) {
	for _, s := range miniSeeds(f) {
		f.Add(s[0], s[1])
	}
	f.Fuzz(func(t *testing.T, yml, csv []byte) {
		if len(yml) > maxFuzzInput || len(csv) > maxFuzzInput {
			t.Skip("input over 64 KiB")
		}
		defer failOnPanic(t)
		c, err := campaign.Load(writeCampaign(t, yml, csv), campaign.Options{HeadersOnly: true})
		if err != nil {
			if p, ok := err.(campaign.Problems); !ok || len(p) == 0 {
				t.Fatalf("load error is %T, want non-empty Problems: %v", err, err)
			}
			t.Logf("load: %v", err)
			return
		}
		r, err := methods.Reduce(c, methods.Options{})
		if err != nil {
			t.Logf("reduce: %v", err)
			return
		}
		if r == nil {
			t.Fatal("nil reduction without error")
		}
		fz, err := fuse.Run(fuse.Input{Evidence: r.Evidence(), Settings: fuzzSettings(c), Reference: c.Report.ReferenceConfig,
			SpeedsKmh: c.Report.SpeedsKmh, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2, Warnings: r.Warnings})
		if err != nil {
			t.Logf("fuse: %v", err)
		} else if fz == nil || fz.Result == nil {
			t.Fatal("nil fusion without error")
		} else if _, err := json.Marshal(fz.Result); err != nil {
			// A NaN or Inf anywhere in the result would fail here: a fusion
			// that succeeds must give a result document that can be written.
			t.Fatalf("the result document cannot be written: %v", err)
		}
	})
}

// failOnPanic turns a panic of the code under test into a test failure with
// its stack, so that a crashing input fails this target (and the fuzzer
// records it) while the package's other tests still run.
func failOnPanic(t *testing.T) {
	if r := recover(); r != nil {
		t.Fatalf("panic: %v\n%s", r, debug.Stack())
	}
}
