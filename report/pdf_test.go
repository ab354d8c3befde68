package report_test

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/report"
)

// demoInput runs the bundled demo through the adapters and fusion.
func demoInput(t testing.TB, mutate func(*campaign.Campaign)) report.Input {
	t.Helper()
	c, err := campaign.Load("../examples/ducktail-fastback/campaign.yaml", campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if mutate != nil {
		mutate(c)
	}
	r, err := methods.Reduce(c, methods.Options{Height: height.Options{Trace: true}})
	if err != nil {
		t.Fatal(err)
	}
	var ids []string
	for _, cf := range c.Configurations {
		ids = append(ids, cf.ID)
	}
	f, err := fuse.Run(fuse.Input{Evidence: r.Evidence(), Settings: fuse.Settings{Configs: ids, Seed: uint64(c.Report.Seed), Credible: c.Report.Credible},
		Reference: c.Report.ReferenceConfig, SpeedsKmh: c.Report.SpeedsKmh, Rho: c.Density(), FrontalAreaM2: c.Vehicle.FrontalAreaM2, Warnings: r.Warnings})
	if err != nil {
		t.Fatal(err)
	}
	f.Result.Campaign = fuse.CampaignInfo{Title: c.Campaign.Title, SHA256: "test"}
	pl, err := f.PlanRepeats(fuse.Target{Config: "ducktail", Axle: "rear", Versus: "baseline"}, c.CostH)
	if err != nil {
		t.Fatal(err)
	}
	return report.Input{Campaign: c, Reduced: r, Fused: f, Plan: pl, Version: "test"}
}

// poppler returns the path of a poppler tool, or skips the test where it is
// missing outside CI (CI installs poppler-utils in .ci/run).
func poppler(t *testing.T, tool string) string {
	t.Helper()
	path, err := exec.LookPath(tool)
	if err != nil {
		if os.Getenv("CI") != "" {
			t.Fatalf("%s is missing; .ci/run installs poppler-utils", tool)
		}
		t.Skipf("%s not installed (apt-get install poppler-utils)", tool)
	}
	return path
}

func pdfText(t *testing.T, pdf []byte) string {
	t.Helper()
	name := filepath.Join(t.TempDir(), "r.pdf")
	if err := os.WriteFile(name, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(poppler(t, "pdftotext"), "-layout", name, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return string(out)
}

func TestReportContent(t *testing.T) {
	in := demoInput(t, nil)
	pdf, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	text := pdfText(t, pdf)
	want := []string{in.Campaign.Campaign.Title, "SAE J1594", "Safety", "closed roads or tracks", "licensed practice", "page 1 of"}
	for _, c := range in.Campaign.Configurations {
		want = append(want, c.ID)
	}
	for _, m := range in.Fused.Result.Methods {
		want = append(want, m.ID)
	}
	// The fused figures as the summary prints them, from the result document.
	kgf := air.StandardGravity
	for _, c := range in.Fused.Result.Configs {
		for _, s := range c.AtSpeeds {
			e := s.RearN.Scale(1 / kgf)
			want = append(want, fmt.Sprintf("%+.1f [%+.1f, %+.1f]", e.Mean, e.Lo, e.Hi))
		}
		want = append(want, fmt.Sprintf("%+.3f [%+.3f, %+.3f]", c.Front.CLA.Mean, c.Front.CLA.Lo, c.Front.CLA.Hi))
	}
	flat := strings.Join(strings.Fields(text), " ")
	for _, w := range want {
		if !strings.Contains(flat, strings.Join(strings.Fields(w), " ")) {
			t.Errorf("the report lacks %q", w)
		}
	}
}

func TestReportDeterministicAndPaper(t *testing.T) {
	in := demoInput(t, nil)
	a, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	b, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Error("two renderings of the same input differ")
	}
	in.Paper = "Letter"
	c, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(c, []byte("/MediaBox [0 0 612.00 792.00]")) {
		t.Error("Letter paper is not 612 × 792 pt")
	}
	in.Paper = "A3"
	if _, err := report.PDF(in); err == nil {
		t.Error("an unknown paper size was accepted")
	}
}

func TestReportNonLatinTitle(t *testing.T) {
	in := demoInput(t, func(c *campaign.Campaign) {
		c.Campaign.Title = "Ducktail — Прототип 2 · 試験 · ρ ≤ 1.2 kg/m³ ± 2 %"
	})
	pdf, err := report.PDF(in)
	if err != nil {
		t.Fatal(err)
	}
	if text := pdfText(t, pdf); !strings.Contains(text, "Прототип") || !strings.Contains(text, "ρ ≤ 1.2 kg/m³ ± 2 %") {
		t.Errorf("the title did not survive:\n%s", text[:min(len(text), 400)])
	}
}

// TestReportRenders: every page of the example report rasterises.
func TestReportRenders(t *testing.T) {
	pdf, err := report.PDF(demoInput(t, nil))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	name := filepath.Join(dir, "r.pdf")
	if err := os.WriteFile(name, pdf, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(poppler(t, "pdftoppm"), "-r", "40", "-png", name, filepath.Join(dir, "p")).CombinedOutput()
	if err != nil || len(out) > 0 {
		t.Fatalf("pdftoppm: %v %s", err, out)
	}
	pages, _ := filepath.Glob(filepath.Join(dir, "p-*.png"))
	if len(pages) < 6 {
		t.Errorf("rendered %d pages, want the whole report", len(pages))
	}
}
