package sim_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/sim"
)

const demoSpec = "../../examples/ducktail-fastback/spec.yaml"

func TestBuildDemo(t *testing.T) {
	f, err := os.Open(demoSpec)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	dir := t.TempDir()
	c, truth, err := sim.Build(f, demoSpec, dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Configurations) != 2 || len(c.Evidence.RideHeight) != 3 || len(c.Evidence.Pressure) != 1 || len(c.Evidence.Vortex) != 1 {
		t.Fatalf("campaign does not mirror the spec: %+v", c.Evidence)
	}
	var doc sim.TruthDoc
	b, _ := os.ReadFile(filepath.Join(dir, "truth.json"))
	if err := json.Unmarshal(b, &doc); err != nil || doc.Configs["ducktail"].Rear != -0.045 || truth.Configs["baseline"].Front != 0.12 {
		t.Errorf("truth.json %s, want the spec's lift", b)
	}
}

// TestPotPhysics: at a steady 150 km/h in still air, a pot on a noiseless
// simulated car rises by q·β/K over its standing height (K = 2·k·MR²).
func TestPotPhysics(t *testing.T) {
	spec := `liftfuse_simulate: 1
campaign: {title: physics, date: 2026-01-01}
vehicle:
  label: x
  body: fastback
  wheelbase_m: 2.5
  mass_kg: 1200
  axles:
    front: {spring_n_per_mm: 25, spring_sd_pct: 5, motion_ratio: 1, motion_ratio_sd: 0.02, tyre_n_per_mm: 200, tyre_sd_pct: 8}
    rear: {spring_n_per_mm: 25, spring_sd_pct: 5, motion_ratio: 1, motion_ratio_sd: 0.02, tyre_n_per_mm: 200, tyre_sd_pct: 8}
configurations: [{id: a, front_cla_m2: 0.2, rear_cla_m2: 0}]
air: {temperature_c: 15, pressure_hpa: 1013.25, humidity_pct: 0, wind_ms: 0}
runs: {speeds_kmh: [150], repeats: 1, hold_s: 10, rate_hz: 10, speed_sd_kmh: 0}
ride_height:
  - {id: pot, axle: front, sensor: pot, noise_mm: 0.000001, noise_phi: 0, mm_per_unit: 1}
`
	c, _, err := sim.Build(strings.NewReader(spec), "spec.yaml", t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(c.Path(c.Evidence.RideHeight[0].Logs[0].File))
	if err != nil {
		t.Fatal(err)
	}
	var still, fast float64
	for _, line := range strings.Split(strings.TrimSpace(string(data)), "\n")[1:] {
		var tt, v, d, h float64
		if _, err := fmtSscan(line, &tt, &v, &d, &h); err != nil {
			t.Fatal(err)
		}
		switch v {
		case 0:
			still = h
		case 150:
			fast = h
		}
	}
	rho := air.Density(15, 101325, 0, 0.0004)
	q := air.DynamicPressure(rho, air.KmhToMs(150))
	// By hand: ½ρV² · 0.2 m² / (2 · 25 N/mm · 1²).
	want := q * 0.2 / 50
	if math.Abs((fast-still)-want) > 1e-4 {
		t.Errorf("pot rose %.5f mm at 150 km/h, want q·β/K = %.5f mm", fast-still, want)
	}
}

func TestSpecErrors(t *testing.T) {
	_, err := sim.Parse(strings.NewReader("liftfuse_simulate: 1\ncampaign: {title: x, date: 2026-01-01}\ncolour: red\n"), "s.yaml")
	var ps campaign.Problems
	if !errors.As(err, &ps) {
		t.Fatalf("want Problems, got %v", err)
	}
	found := false
	for _, p := range ps {
		if p.Line == 3 && errors.Is(p, campaign.ErrUnknownKey) && strings.HasSuffix(p.File, "s.yaml") {
			found = true
		}
	}
	if !found {
		t.Errorf("no unknown-key problem at s.yaml:3: %v", err)
	}
	if _, err := sim.Parse(strings.NewReader("liftfuse_simulate: 2\n"), "s.yaml"); err == nil {
		t.Error("format 2 accepted")
	}
}

// fmtSscan reads the comma-separated numbers of a log line.
func fmtSscan(line string, xs ...*float64) (int, error) {
	args := make([]any, len(xs))
	for i, x := range xs {
		args[i] = x
	}
	return fmt.Sscan(strings.ReplaceAll(line, ",", " "), args...)
}
