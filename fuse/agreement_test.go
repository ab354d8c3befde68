package fuse_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"liftfuse/fuse"
)

// twoPotSpec: two front pots on the same axle (sharing the front springs'
// scale groups and the wind) and a rear pot; %[1]d is the seed, %[2]g the
// gain error of fpot in percent.
const twoPotSpec = `liftfuse_simulate: 1
seed: %[1]d
campaign: {title: two pots, date: 2026-07-01}
configurations:
  - {id: base, front_cla_m2: 0.10, rear_cla_m2: 0.08}
  - {id: wing, front_cla_m2: 0.12, rear_cla_m2: -0.06}
air: {temperature_c: 15, pressure_hpa: 1000, humidity_pct: 70, wind_sd_ms: 1.0, wind_ms: 0.6}
truth: {tyre_growth_mm: 0.5}
runs: {speeds_kmh: [80, 120, 150], repeats: 2, hold_s: 12, rate_hz: 10}
ride_height:
  - {id: fpot, axle: front, sensor: pot, noise_mm: 0.3, gain_error_pct: %[2]g}
  - {id: fpot2, axle: front, sensor: pot, noise_mm: 0.3}
  - {id: rpot, axle: rear, sensor: pot, noise_mm: 0.3}
`

func TestTwoPotsProbe(t *testing.T) {
	for _, gain := range []float64{0, 12} {
		in := simInput(t, fmt.Sprintf(twoPotSpec, 5, gain), []float64{100})
		f, err := fuse.Run(in)
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range f.Result.Methods {
			t.Logf("gain %g: %s %+v", gain, m.ID, *m.Agreement)
		}
	}
}

// priorDay is a clean simulated day whose uncertain parts (lift, springs
// with their installation ratios, gains, tyre growth, wind, drag pitch,
// integration scale, the uncovered patch's Cp) are drawn from the priors
// the campaign declares, as in TestSimulateFuseCoverage: the day the
// agreement check's null hypothesis describes.
func priorDay(t *testing.T, rng *rand.Rand, seed int) string {
	bf, br, wf, wr := 0.2*rng.NormFloat64(), 0.2*rng.NormFloat64(), 0.2*rng.NormFloat64(), 0.2*rng.NormFloat64()
	text := fmt.Sprintf(simSpec, seed, 0.5+0.5*rng.NormFloat64(), "constant", fmt.Sprintf("front_cla_m2: %g, rear_cla_m2: %g", wf, wr), "80, 120, 150")
	text = strings.Replace(text, "{id: base, front_cla_m2: 0.10, rear_cla_m2: 0.08}", fmt.Sprintf("{id: base, front_cla_m2: %g, rear_cla_m2: %g}", bf, br), 1)
	text = strings.Replace(text, "wind_ms: 0.6", fmt.Sprintf("wind_ms: %g", rng.NormFloat64()), 1)
	lognormal := func(sd float64) float64 { return math.Exp(sd * rng.NormFloat64()) }
	text = strings.Replace(text, "truth: {tyre_growth_mm:", fmt.Sprintf("truth: {front_spring_scale: %g, rear_spring_scale: %g, drag_scale: %g, pressure_scale: %g, tyre_growth_mm:",
		lognormal(math.Hypot(0.05, 2*0.02/0.9)), lognormal(math.Hypot(0.05, 2*0.02/0.85)), lognormal(0.2), lognormal(0.2)), 1)
	text += strings.Replace(testCar(t), "true_cp: -0.1}", fmt.Sprintf("true_cp: %g}", -0.1+0.1*rng.NormFloat64()), 1)
	for _, id := range []string{"fpot", "rpot", "rlaser"} {
		text = strings.Replace(text, "{id: "+id+",", fmt.Sprintf("{id: %s, gain_error_pct: %g,", id, rng.NormFloat64()), 1)
	}
	return text
}

func TestCleanProbe(t *testing.T) {
	rng := newTestRand(4242)
	for day := range 50 {
		f, err := fuse.Run(simInput(t, priorDay(t, rng, 2000+day), []float64{100}))
		if err != nil {
			t.Fatal(err)
		}
		line := ""
		for _, m := range f.Result.Methods {
			line += fmt.Sprintf(" %s p=%.3g off=%.2f", m.ID, m.Agreement.PValue, m.Agreement.POff)
		}
		t.Logf("day %d:%s", day, line)
	}
}

func TestDayProbe(t *testing.T) {
	rng := newTestRand(4242)
	for day := range 31 {
		text := priorDay(t, rng, 2000+day)
		if day != 30 && day != 21 {
			continue
		}
		t.Log(text[:900])
		f, err := fuse.Run(simInput(t, text, []float64{100}))
		if err != nil {
			t.Fatal(err)
		}
		for _, c := range f.Result.Configs {
			t.Logf("%s front %+v rear %+v", c.ID, c.Front.CLA, c.Rear.CLA)
		}
		for _, m := range f.Result.Methods {
			for _, s := range m.Standalone {
				t.Logf("%s %s %s %.4f ± %.4f", m.ID, s.Config, s.Axle, s.CLA.Mean, s.CLA.SD)
			}
		}
		for _, ev := range simInput(t, text, []float64{100}).Evidence {
			for _, n := range ev.Nuisances {
				t.Logf("%s nuisance %s %g±%g", ev.Entry, n.Name, n.Mean, n.SD)
			}
			for _, n := range ev.Scales {
				t.Logf("%s scale %s ±%g", ev.Entry, n.Name, n.SD)
			}
		}
	}
}
