package checks_test

import (
	"bufio"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/sim"
)

// daySpec is a two-configuration day (invented data) with pots on both
// axles, a rear laser, the shared test car's taps and a tuft: %[1]d seed,
// %[2]s the truth line, %[3]s the wind, %[4]s base's lift, %[5]s wing's.
const daySpec = `liftfuse_simulate: 1
seed: %[1]d
campaign: {title: checks, date: 2026-07-01}
configurations:
  - {id: base, %[4]s}
  - {id: wing, %[5]s}
air: {temperature_c: 15, pressure_hpa: 1000, humidity_pct: 70, wind_sd_ms: 1.0, wind_ms: %[3]g}
prior: {speed_model: %[9]s}
truth: {%[2]s}
runs: {speeds_kmh: [80, 120, 150], repeats: 2, hold_s: 12, rate_hz: 10}
ride_height:
  - {id: fpot, axle: front, sensor: pot, noise_mm: 0.3, gain_error_pct: %[6]g, friction_mm: %[10]g}
  - {id: rpot, axle: rear, sensor: pot, noise_mm: 0.3, gain_error_pct: %[7]g, friction_mm: %[10]g}
  - {id: rlaser, axle: rear, sensor: laser, noise_mm: 0.4, gain_error_pct: %[8]g}
vortex:
  - {id: tuft, side: right, speeds_kmh: [80, 120, 150], misread: 0.05}
`

// day is one simulated day's text, its fault-free truth drawn from the
// priors the campaign declares (as fuse's coverage test does); base and
// wing, when not "", replace the drawn lifts. Odd seeds make a day of
// speed_model: linear, whose drawn lifts change with speed (slopes of
// 0.1 m² per 100 km/h sd), and whose pots stick by ±0.1 mm (friction).
func day(t *testing.T, seed int, base, wing string) string {
	t.Helper()
	rng := rand.New(rand.NewPCG(uint64(seed), 5))
	logn := func(sd float64) float64 { return math.Exp(sd * rng.NormFloat64()) }
	truth := fmt.Sprintf("front_spring_scale: %.4f, rear_spring_scale: %.4f, drag_scale: %.4f, pressure_scale: %.4f, tyre_growth_mm: %.3f",
		logn(math.Hypot(0.05, 2*0.02/0.9)), logn(math.Hypot(0.05, 2*0.02/0.85)), logn(0.2), logn(0.2), 0.5+0.5*rng.NormFloat64())
	model, friction := "constant", 0.0
	slopes := func() string { return "" }
	if seed%2 == 1 {
		model, friction = "linear", 0.1
		slopes = func() string {
			return fmt.Sprintf(", front_slope_m2: %.3f, rear_slope_m2: %.3f", 0.1*rng.NormFloat64(), 0.1*rng.NormFloat64())
		}
	}
	b0 := fmt.Sprintf("front_cla_m2: %.3f, rear_cla_m2: %.3f", 0.2*rng.NormFloat64(), 0.2*rng.NormFloat64()) + slopes()
	if base == "" {
		base = b0
	}
	if wing == "" {
		wing = fmt.Sprintf("front_cla_m2: %.3f, rear_cla_m2: %.3f", 0.2*rng.NormFloat64(), 0.2*rng.NormFloat64()) + slopes()
	}
	text := fmt.Sprintf(daySpec, seed, truth, rng.NormFloat64(), base, wing, rng.NormFloat64(), rng.NormFloat64(), rng.NormFloat64(), model, friction)
	car, err := os.ReadFile("../../testdata/sim/test-car.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return text + strings.Replace(string(car), "true_cp: -0.1}", fmt.Sprintf("true_cp: %.3f}", -0.1+0.1*rng.NormFloat64()), 1)
}

// simulate writes a day, lets plant change its files, loads and reduces it.
func simulate(t *testing.T, text string, plant func(t *testing.T, dir string)) (*campaign.Campaign, *methods.Reduced) {
	t.Helper()
	s, err := sim.Parse(strings.NewReader(text), "spec.yaml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if _, err := sim.Generate(s, dir); err != nil {
		t.Fatal(err)
	}
	if plant != nil {
		plant(t, dir)
	}
	c, err := campaign.Load(filepath.Join(dir, "campaign.yaml"), campaign.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return c, r
}

// editCSV rewrites a CSV file cell by cell: f gets the header, the row and
// the column index and returns the new cell.
func editCSV(t *testing.T, path string, f func(head, row []string, k int) string) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var out strings.Builder
	sc := bufio.NewScanner(strings.NewReader(string(b)))
	var head []string
	for sc.Scan() {
		cells := strings.Split(sc.Text(), ",")
		if head == nil {
			head = cells
			out.WriteString(sc.Text() + "\n")
			continue
		}
		next := make([]string, len(cells))
		for k := range cells {
			next[k] = f(head, cells, k)
		}
		out.WriteString(strings.Join(next, ",") + "\n")
	}
	if err := os.WriteFile(path, []byte(out.String()), 0o644); err != nil {
		t.Fatal(err)
	}
}

func cell(head, row []string, name string) float64 {
	for k, h := range head {
		if h == name {
			v, _ := strconv.ParseFloat(row[k], 64)
			return v
		}
	}
	return math.NaN()
}

func col(head []string, name string) int {
	for k, h := range head {
		if h == name {
			return k
		}
	}
	return -1
}
