package main

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

const demo = "../../examples/ducktail-fastback/campaign.yaml"

// liftfuse runs the command line in-process and returns exit code and output.
func liftfuse(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errOut bytes.Buffer
	code := run(context.Background(), args, &out, &errOut)
	return code, out.String(), errOut.String()
}

func TestExitCodes(t *testing.T) {
	bad := filepath.Join(t.TempDir(), "bad.yaml")
	if err := os.WriteFile(bad, []byte("liftfuse: 1\ncampaign: {title: x, date: 2026-01-01, colour: red}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
	}{
		{"valid demo", []string{"validate", demo}, 0, ""},
		{"invalid campaign names the line", []string{"validate", bad}, 2, "bad.yaml:2:"},
		{"missing file", []string{"validate", "nope.yaml"}, 2, "nope.yaml"},
		{"no argument", []string{"validate"}, 2, "want one campaign file"},
		{"unknown flag", []string{"air", "--temp", "3"}, 2, "unknown flag"},
		{"unknown command", []string{"frobnicate"}, 2, "unknown command"},
		{"air without pressure", []string{"air", "--temperature-c", "20", "--humidity-pct", "50"}, 2, "missing required flag --pressure-hpa"},
		{"air out of range", []string{"air", "--temperature-c", "20", "--pressure-hpa", "10", "--humidity-pct", "50"}, 2, "pressure-hpa"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			code, _, stderr := liftfuse(t, tt.args...)
			if code != tt.code || !strings.Contains(stderr, tt.inStderr) {
				t.Errorf("exit %d, stderr %q; want exit %d with %q", code, stderr, tt.code, tt.inStderr)
			}
		})
	}
}

func TestAirJSON(t *testing.T) {
	code, out, stderr := liftfuse(t, "air", "--temperature-c", "20", "--pressure-hpa", "1013.25", "--humidity-pct", "50", "--speed-kmh", "100", "--json")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var got struct {
		Density float64 `json:"density_kg_m3"`
		Q       float64 `json:"dynamic_pressure_pa"`
	}
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatal(err)
	}
	// 1.19931 kg/m³: CIPM-2007 reference point (Picard et al., Metrologia 45 (2008) 149).
	if math.Abs(got.Density-1.19931) > 1e-5 {
		t.Errorf("density %v, want 1.19931", got.Density)
	}
	// q = ½ρV² with V = 100/3.6 m/s.
	if want := 0.5 * got.Density * (100 / 3.6) * (100 / 3.6); math.Abs(got.Q-want) > 1e-9 {
		t.Errorf("q %v, want %v", got.Q, want)
	}
}

func TestInit(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "day")
	if code, _, stderr := liftfuse(t, "init", dir); code != 0 {
		t.Fatalf("init: exit %d: %s", code, stderr)
	}
	if code, out, stderr := liftfuse(t, "validate", filepath.Join(dir, "campaign.yaml")); code != 0 || !strings.Contains(out, "valid campaign") {
		t.Fatalf("validate the written demo: exit %d: %s %s", code, out, stderr)
	}
	if code, _, stderr := liftfuse(t, "init", dir); code != 2 || !strings.Contains(stderr, "already exists") {
		t.Errorf("second init: exit %d, %q; want a refusal", code, stderr)
	}
	left, _ := filepath.Glob(filepath.Join(filepath.Dir(dir), ".day.tmp-*"))
	if len(left) > 0 {
		t.Errorf("temporary folders left behind: %v", left)
	}
}
