package main

import (
	"context"
	"encoding/json"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestJSONDocuments: each command's --json output is its documented
// format, read back as values.
func TestJSONDocuments(t *testing.T) {
	tests := []struct {
		name   string
		args   []string
		format string
		check  func(t *testing.T, doc map[string]any)
	}{
		{"fuse", []string{"fuse", demo, "--json", "-q"}, "liftfuse.result/1", func(t *testing.T, doc map[string]any) {
			if len(doc["configs"].([]any)) != 2 || len(doc["methods"].([]any)) != 5 || doc["campaign"].(map[string]any)["sha256"] == "" {
				t.Errorf("incomplete result document: %v", doc)
			}
		}},
		{"reduce", []string{"reduce", demo, "--json", "-q"}, "liftfuse.result/1", func(t *testing.T, doc map[string]any) {
			if len(doc["configs"].([]any)) != 0 || len(doc["methods"].([]any)) != 5 {
				t.Errorf("reduce fills only methods: %v", doc)
			}
		}},
		{"plan", []string{"plan", demo, "--json", "-q"}, "liftfuse.plan/1", func(t *testing.T, doc map[string]any) {
			opts := doc["options"].([]any)
			if len(opts) != 5 {
				t.Fatalf("want every entry as an option, got %d", len(opts))
			}
			prev := 1e9
			for _, o := range opts {
				ph := o.(map[string]any)["per_hour"].(float64)
				if ph > prev {
					t.Errorf("options not sorted by per_hour")
				}
				prev = ph
			}
		}},
		{"crosscheck", []string{"crosscheck", demo, "--config", "ducktail", "--axle", "rear", "--speed-kmh", "150", "--value", "-12", "--sd", "1", "--unit", "kgf", "--json", "-q"},
			"liftfuse.crosscheck/1", func(t *testing.T, doc map[string]any) {
				if doc["p_value"].(float64) > 1e-3 || len(doc["explanations"].([]any)) == 0 {
					t.Errorf("a claim far off should be surprising and explained: %v", doc)
				}
			}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			code, out, stderr := liftfuse(t, tt.args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			var doc map[string]any
			if err := json.Unmarshal([]byte(out), &doc); err != nil {
				t.Fatalf("not JSON: %v\n%s", err, out)
			}
			if doc["format"] != tt.format {
				t.Errorf("format %v, want %s", doc["format"], tt.format)
			}
			tt.check(t, doc)
		})
	}
}

func TestReportCommand(t *testing.T) {
	dir := t.TempDir()
	pdf, js := filepath.Join(dir, "r.pdf"), filepath.Join(dir, "r.json")
	code, _, stderr := liftfuse(t, "report", demo, "-o", pdf, "--json", js, "-q")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	b, err := os.ReadFile(pdf)
	if err != nil || !strings.HasPrefix(string(b), "%PDF-") {
		t.Fatalf("no PDF written: %v", err)
	}
	// The --json file is the same document fuse --json prints.
	_, fused, _ := liftfuse(t, "fuse", demo, "--json", "-q")
	j, _ := os.ReadFile(js)
	if string(j) != fused {
		t.Error("report --json differs from fuse --json")
	}
	// A run that fails leaves no file behind: here the output folder is missing.
	bad := filepath.Join(dir, "missing", "r.pdf")
	if code, _, _ := liftfuse(t, "report", demo, "-o", bad, "-q"); code == 0 {
		t.Fatal("writing into a missing folder succeeded")
	}
	// And an invalid campaign exits 2 and writes nothing.
	broken := filepath.Join(dir, "broken.yaml")
	os.WriteFile(broken, []byte("liftfuse: 1\ncampaign: {title: x}\n"), 0o644)
	out := filepath.Join(dir, "never.pdf")
	if code, _, _ := liftfuse(t, "report", broken, "-o", out, "-q"); code != 2 {
		t.Errorf("invalid campaign: exit %d, want 2", code)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a failed run left a PDF behind")
	}
	left, _ := filepath.Glob(filepath.Join(dir, ".*tmp*"))
	if len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

func TestSimulateCommand(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "sim")
	code, _, stderr := liftfuse(t, "simulate", "../../examples/ducktail-fastback/spec.yaml", "-o", dir)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	for _, f := range []string{"campaign.yaml", "truth.json", "logs/simulated.csv", "body-taps-readings.csv"} {
		if _, err := os.Stat(filepath.Join(dir, f)); err != nil {
			t.Errorf("simulate did not write %s", f)
		}
	}
	// The bundled demo is exactly what its spec simulates.
	for _, f := range []string{"campaign.yaml", "logs/simulated.csv", "body-taps-readings.csv", "truth.json"} {
		a, _ := os.ReadFile(filepath.Join(dir, f))
		b, _ := os.ReadFile(filepath.Join("../../examples/ducktail-fastback", f))
		if string(a) != string(b) {
			t.Errorf("%s differs from the bundled demo: regenerate it with simulate --force", f)
		}
	}
	if code, _, _ := liftfuse(t, "simulate", "../../examples/ducktail-fastback/spec.yaml", "-o", dir); code != 2 {
		t.Error("simulate overwrote a folder without --force")
	}
	if code, _, stderr := liftfuse(t, "plan", filepath.Join(dir, "campaign.yaml"), "-q"); code != 0 {
		t.Errorf("plan on a simulated campaign: exit %d: %s", code, stderr)
	}
}

// BenchmarkReport: the example report end to end (load, reduce, fuse,
// plan, lay out, write).
func BenchmarkReport(b *testing.B) {
	out := filepath.Join(b.TempDir(), "r.pdf")
	for b.Loop() {
		if code := run(context.Background(), []string{"report", demo, "-o", out, "-q"}, io.Discard, io.Discard); code != 0 {
			b.Fatal("report failed")
		}
	}
}

// TestFlaggedEntryExplained: the demo with the laser's tyres really growing
// 3.5 mm (prior 0.5 ± 0.5): the laser is flagged, and its own tyre growth is
// the first thing that would reconcile it with the others — at about the
// planted value.
func TestFlaggedEntryExplained(t *testing.T) {
	spec, err := os.ReadFile("../../examples/ducktail-fastback/spec.yaml")
	if err != nil {
		t.Fatal(err)
	}
	planted := strings.Replace(string(spec), "tyre_growth_mm: 0.6", "tyre_growth_mm: 3.5", 1)
	dir := t.TempDir()
	name := filepath.Join(dir, "spec.yaml")
	os.WriteFile(name, []byte(planted), 0o644)
	out := filepath.Join(dir, "day")
	if code, _, stderr := liftfuse(t, "simulate", name, "-o", out); code != 0 {
		t.Fatal(stderr)
	}
	a, err := analyse(filepath.Join(out, "campaign.yaml"), true, io.Discard)
	if err != nil {
		t.Fatal(err)
	}
	ex, err := explanations(a)
	if err != nil {
		t.Fatal(err)
	}
	cc, ok := ex["rear-laser"]
	if !ok || len(ex) != 1 {
		t.Fatalf("want the laser alone explained, got %v", ex)
	}
	first := cc.Explanations[0]
	if !strings.Contains(first.Nuisance, "tyre growth") || first.ShiftSD < 2 || first.ShiftSD > 8 {
		t.Errorf("first explanation %+v, want the rear tyre growth a few sd up", first)
	}
}
