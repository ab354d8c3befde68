package adapters_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/adapters"
	"liftfuse/methods/sim"
)

// spec is a simulated day with every method; the true lift and the truth of
// the uncertain quantities are filled in per seed.
const spec = `liftfuse_simulate: 1
seed: %d
campaign: {title: conformance, date: 2026-06-01}
vehicle:
  label: test car
  body: fastback
  wheelbase_m: 2.5
  mass_kg: 1250
  drag: {cda_m2: 0.62, centre_height_m: 0.5, sd_pct: 20}
  axles:
    front: {spring_n_per_mm: 30, spring_sd_pct: 5, motion_ratio: 0.9, motion_ratio_sd: 0.02, tyre_n_per_mm: 230, tyre_sd_pct: 8}
    rear: {spring_n_per_mm: 34, spring_sd_pct: 5, motion_ratio: 0.85, motion_ratio_sd: 0.02, tyre_n_per_mm: 230, tyre_sd_pct: 8}
configurations:
  - {id: one, front_cla_m2: %g, rear_cla_m2: %g}
  - {id: two, front_cla_m2: %g, rear_cla_m2: %g}
air: {temperature_c: 15, pressure_hpa: 1000, humidity_pct: 70, wind_sd_ms: 1.0, wind_ms: %g}
truth: {front_spring_scale: %g, rear_spring_scale: %g, tyre_growth_mm: %g, drag_scale: %g, pressure_scale: %g}
runs: {speeds_kmh: [90, 140], repeats: 2, hold_s: 12, rate_hz: 10}
ride_height:
  - {id: pot, axle: front, sensor: pot, noise_mm: 0.3}
  - {id: laser, axle: rear, sensor: laser, noise_mm: 0.4}
pressure:
  - id: taps
    sensor_sd_pa: 3
    reference_sd_pa: 5
    model_sd_pct: 20
    speeds_kmh: [100, 130]
    taps:
      - {id: u1, x_m: 0.1, surface: upper, area_m2: 1.2, nz: 0.9, cp: -0.4}
      - {id: u2, x_m: 1.3, surface: upper, area_m2: 1.5, nz: 1.0, cp: -0.6}
      - {id: u3, x_m: 2.4, surface: upper, area_m2: 1.0, nz: 0.8, cp: -0.2}
      - {id: l1, x_m: 0.2, surface: lower, area_m2: 1.3, nz: -1, cp: -0.2}
      - {id: l2, x_m: 1.4, surface: lower, area_m2: 1.5, nz: -1, cp: -0.1}
      - {id: l3, x_m: 2.4, surface: lower, area_m2: 1.1, nz: -1, cp: -0.1}
    uncovered:
      - {surface: lower, x_m: 3.0, area_m2: 0.4, nz: -1, cp_mean: -0.1, cp_sd: 0.1, true_cp: %g}
vortex:
  - {id: tuft, side: left, speeds_kmh: [60, 100, 140], misread: 0.05}
`

// TestConformance runs every adapter on simulated days whose uncertain
// quantities are drawn from the declared priors: each entry's evidence must
// be well formed and its standalone 90 % intervals must cover the truth at
// about the nominal rate; the vortex entry must put P(downforce) on the
// right side of ½ when the total is clearly away from zero.
func TestConformance(t *testing.T) {
	days := 12
	if testing.Short() {
		days = 3
	}
	rng := rand.New(rand.NewPCG(11, 3))
	hits := map[string]int{}
	tries := map[string]int{}
	for day := range days {
		beta := [4]float64{}
		for i := range beta {
			beta[i] = 0.25 * rng.NormFloat64()
		}
		text := fmt.Sprintf(spec, day+1, beta[0], beta[1], beta[2], beta[3], rng.NormFloat64(),
			math.Exp(0.06*rng.NormFloat64()), math.Exp(0.06*rng.NormFloat64()), 0.5+0.5*rng.NormFloat64(),
			math.Exp(0.2*rng.NormFloat64()), math.Exp(0.2*rng.NormFloat64()), -0.1+0.1*rng.NormFloat64())
		dir := t.TempDir()
		c, _, err := sim.Build(strings.NewReader(text), "spec.yaml", dir)
		if err != nil {
			t.Fatal(err)
		}
		r, err := adapters.Reduce(c, adapters.Options{})
		if err != nil {
			t.Fatal(err)
		}
		truth := map[methods.Quantity]float64{
			{Config: "one", Axle: "front"}: beta[0], {Config: "one", Axle: "rear"}: beta[1],
			{Config: "two", Axle: "front"}: beta[2], {Config: "two", Axle: "rear"}: beta[3],
			{Config: "one", Axle: "total"}: beta[0] + beta[1], {Config: "two", Axle: "total"}: beta[2] + beta[3],
		}
		for _, ev := range r.Evidence {
			if err := ev.Check(); err != nil {
				t.Fatalf("%s: %v", ev.Entry, err)
			}
			if len(ev.Informs) == 0 {
				t.Fatalf("%s informs nothing", ev.Entry)
			}
			P, err := fuse.Fit([]methods.Evidence{ev}, fuse.Settings{Configs: []string{"one", "two"}, Seed: uint64(day + 1), Credible: 0.9})
			if err != nil {
				t.Fatalf("%s: %v", ev.Entry, err)
			}
			for _, q := range ev.Informs {
				e, pDown := P.Quantity(q)
				want := truth[q]
				if ev.Kind == methods.KindVortex {
					if math.Abs(want) > 0.1 {
						tries[ev.Entry]++
						if (want < 0) == (pDown > 0.5) {
							hits[ev.Entry]++
						}
					}
					continue
				}
				tries[ev.Entry]++
				if e.Lo <= want && want <= e.Hi {
					hits[ev.Entry]++
				}
			}
		}
	}
	for id, n := range tries {
		rate := float64(hits[id]) / float64(n)
		t.Logf("%s: %d of %d", id, hits[id], n)
		// The intervals of one entry on one day share its systematic
		// errors; the floor allows for that and for the few days run.
		if rate < 0.7 {
			t.Errorf("%s: right only %d of %d times", id, hits[id], n)
		}
	}
}
