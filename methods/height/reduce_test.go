package height_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/height"
	"liftfuse/methods/logs"
	"liftfuse/methods/sim"
)

// specText is a simulated test day for one pot and one laser; the truth
// (spring rates, gains, tyre growth, wind) is drawn by the caller.
const specText = `liftfuse_simulate: 1
seed: %d
campaign: {title: height check, date: 2026-05-01}
vehicle:
  label: test car
  body: fastback
  wheelbase_m: 2.6
  mass_kg: 1300
  axles:
    front: {spring_n_per_mm: 30, spring_sd_pct: 5, motion_ratio: 0.9, motion_ratio_sd: 0.02, tyre_n_per_mm: 230, tyre_sd_pct: 8}
    rear: {spring_n_per_mm: 35, spring_sd_pct: 5, motion_ratio: 0.85, motion_ratio_sd: 0.02, tyre_n_per_mm: 230, tyre_sd_pct: 8}
configurations:
  - {id: base, front_cla_m2: %g, rear_cla_m2: %g}
  - {id: wing, front_cla_m2: %g, rear_cla_m2: %g}
air: {temperature_c: 20, pressure_hpa: 1010, humidity_pct: 50, wind_sd_ms: 1.0, wind_ms: %g}
truth: {front_spring_scale: %g, rear_spring_scale: %g, tyre_growth_mm: %g}
runs: {speeds_kmh: [90, 130, 160], repeats: 2, hold_s: 12, rate_hz: 10}
ride_height:
  - {id: fpot, axle: front, sensor: pot, noise_mm: 0.3, friction_mm: 0.1, gain_error_pct: %g}
  - {id: rlaser, axle: rear, sensor: laser, noise_mm: 0.4, tyre_growth: {mm_at_100kmh: 0.5, sd_mm: %g}}
`

type truth struct {
	beta                     [4]float64
	wind, fs, rs, grow, gain float64
	growSD                   float64
}

// drawTruth draws the true state from the priors the campaign declares, so
// that the posterior's intervals should cover it at their nominal rate.
func drawTruth(rng *rand.Rand, growSD float64) truth {
	var tr truth
	for i := range tr.beta {
		tr.beta[i] = 0.2 * rng.NormFloat64()
	}
	tr.wind = rng.NormFloat64()
	// Spring rate and motion ratio are both uncertain; the spec plants only
	// a spring scale, so it carries the spread of the whole compliance.
	tr.fs = math.Exp(math.Sqrt(0.05*0.05+4*(0.02/0.9)*(0.02/0.9)) * rng.NormFloat64())
	tr.rs = math.Exp(math.Sqrt(0.05*0.05+4*(0.02/0.85)*(0.02/0.85)) * rng.NormFloat64())
	tr.growSD = growSD
	tr.grow = 0.5 + growSD*rng.NormFloat64()
	tr.gain = 1 * rng.NormFloat64() // calibration gain error, % (sd_pct 1 by default)
	return tr
}

// simulate writes the campaign of a truth and loads it.
func simulate(t testing.TB, seed int, tr truth) *campaign.Campaign {
	t.Helper()
	dir := t.TempDir()
	text := fmt.Sprintf(specText, seed, tr.beta[0], tr.beta[1], tr.beta[2], tr.beta[3], tr.wind, tr.fs, tr.rs, tr.grow, tr.gain, tr.growSD)
	c, _, err := sim.Build(strings.NewReader(text), "spec.yaml", dir)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

func standalone(t testing.TB, c *campaign.Campaign, i int) (*height.Result, *fuse.Posterior) {
	t.Helper()
	r, err := height.Reduce(c, &c.Evidence.RideHeight[i], height.Options{})
	if err != nil {
		t.Fatal(err)
	}
	P, err := fuse.Fit([]evidence.Evidence{r.Evidence}, fuse.Settings{Configs: []string{"base", "wing"}, Seed: 3, Credible: 0.9})
	if err != nil {
		t.Fatal(err)
	}
	return r, P
}

// TestStandaloneCoverage: over simulated test days whose truth is drawn from
// the declared priors, each entry's 90 % interval must cover the true axle
// C_L·A about 90 % of the time. The two configurations of one day share
// that day's stiffness, gain and tyre growth, so their misses come in pairs:
// the band counts two independent intervals a day (one per entry) and is
// ±3 binomial sd of that count.
func TestStandaloneCoverage(t *testing.T) {
	days := 60
	if testing.Short() {
		days = 10
	}
	rng := rand.New(rand.NewPCG(7, 7))
	covered, n := 0, 0
	for day := range days {
		tr := drawTruth(rng, 0.5)
		c := simulate(t, day+1, tr)
		for i, axle := range []string{evidence.AxleFront, evidence.AxleRear} {
			_, P := standalone(t, c, i)
			for k, cfg := range []string{"base", "wing"} {
				e, _ := P.Quantity(evidence.Quantity{Config: cfg, Axle: axle})
				want := tr.beta[2*k+i]
				n++
				if e.Lo <= want && want <= e.Hi {
					covered++
				}
			}
		}
	}
	rate := float64(covered) / float64(n)
	sd := math.Sqrt(0.9 * 0.1 / float64(2*days))
	t.Logf("90%% intervals covered the truth %d of %d times (%.1f %%)", covered, n, 100*rate)
	if math.Abs(rate-0.9) > 3*sd {
		t.Errorf("coverage %.3f, want 0.90 ± %.3f", rate, 3*sd)
	}
}

// TestLaserGrowthConfound: a laser whose tyre-growth prior is loose cannot
// pin absolute lift (growth ∝ V² looks like lift), but the difference
// between configurations at the same speeds stays sharp.
func TestLaserGrowthConfound(t *testing.T) {
	tr := truth{beta: [4]float64{0.1, 0.1, 0.1, -0.05}, fs: 1, rs: 1, grow: 1.5, growSD: 2}
	c := simulate(t, 11, tr)
	_, P := standalone(t, c, 1)
	abs, _ := P.Quantity(evidence.Quantity{Config: "base", Axle: evidence.AxleRear})
	diff, _ := P.Delta("wing", "base", evidence.AxleRear)
	if !(diff.SD < 0.25*abs.SD) {
		t.Errorf("difference sd %.4f should be far below the absolute sd %.4f", diff.SD, abs.SD)
	}
	if !(diff.Lo <= -0.15 && -0.15 <= diff.Hi) {
		t.Errorf("difference %+v does not cover the true −0.15", diff)
	}
}

func TestReduceWindowsAndWarnings(t *testing.T) {
	tr := truth{beta: [4]float64{0.1, 0.05, 0.12, -0.05}, fs: 1, rs: 1, grow: 0.5, growSD: 0.5}
	c := simulate(t, 5, tr)
	r, _ := standalone(t, c, 0)
	// 2 configurations × 2 repeats × 3 speeds, each run framed by two rolls
	// at 35 km/h and a stop: 48 windows, a few more where speed noise splits
	// a long hold in two.
	if len(r.Windows) < 48 || len(r.Windows) > 52 {
		t.Errorf("found %d steady windows, want 48 to 52", len(r.Windows))
	}
	seen := map[string]bool{}
	for _, w := range r.Windows {
		seen[fmt.Sprintf("%s@%.0f", w.Config, 10*math.Round(w.SpeedKmh/10))] = true
	}
	for _, cfg := range []string{"base", "wing"} {
		for _, v := range []int{0, 40, 90, 130, 160} {
			if !seen[fmt.Sprintf("%s@%d", cfg, v)] {
				t.Errorf("no window of %s at %d km/h", cfg, v)
			}
		}
	}
	edge := height.EdgeS(c.Evidence.RideHeight[0].Steady.SpeedTolKmh)
	for _, w := range r.Windows {
		// A window's admitted span is at least its 4 s, but its
		// statistics leave out up to EdgeS (0.83 s here) at each end, so
		// the span used is at least 4 − 2·EdgeS less one 0.1 s sample
		// period: 2.23 s for a speed logged every sample, as this log's
		// is (shortest measured 2.60 s, wing at rest, 27 samples); a
		// speed logged slower would move the departure edge by its lag
		// as well (EdgeS + lag, up to 1.23 s at 2 Hz), and this bound
		// would not hold. A window at rest whose height still
		// settles reads a lag-one correlation of 0.99 or more, and
		// steady.EffectiveN floors n_eff at 1 (SE = scatter): measured
		// least 1.000 (base at rest, 191.6-196.6 s, 51 samples), next
		// 1.22. So n_eff ≥ 1, and 1 is allowed.
		if w.To-w.From < 4-2*edge-0.1 || w.SE <= 0 || w.NEff < 1 || w.NEff > float64(w.N) {
			t.Fatalf("bad window %+v", w)
		}
	}
	if len(r.Warnings) != 0 {
		t.Errorf("a clean pot should raise no warning: %v", r.Warnings)
	}
	// A noisy sensor (cheap ultrasonic) must be called out.
	c.Evidence.RideHeight[0].Calibration.MmPerUnit *= 15
	noisy, err := height.Reduce(c, &c.Evidence.RideHeight[0], height.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(strings.Join(noisy.Warnings, "\n"), "scatter") {
		t.Errorf("no scatter warning for a ±4 mm sensor: %v", noisy.Warnings)
	}
}

func TestBadLogs(t *testing.T) {
	c := simulate(t, 2, truth{fs: 1, rs: 1, growSD: 0.5})
	e := &c.Evidence.RideHeight[0]
	tests := []struct {
		name      string
		log       string
		line, col int
		want      error
	}{
		{"empty file", "", 1, 0, logs.ErrEmpty},
		{"time goes back", "t_s,v_kmh,dir,fpot\n0,0,1,1.5\n0.1,0,1,1.5\n0.05,0,1,1.5\n", 4, 1, logs.ErrNotIncreasing},
		{"missing cell", "t_s,v_kmh,dir,fpot\n0,0,1,1.5\n0.1,,1,1.5\n", 3, 5, logs.ErrMissingCell},
		{"non-numeric cell", "t_s,v_kmh,dir,fpot\n0,0,1,1.5\n0.1,0,1,1.5V\n", 3, 9, logs.ErrNotNumber},
		{"direction not ±1", "t_s,v_kmh,dir,fpot\n0,0,1,1.5\n0.1,0,0,1.5\n", 3, 7, campaign.ErrRange},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			name := filepath.Join(t.TempDir(), "day.csv")
			if err := os.WriteFile(name, []byte(tt.log), 0o644); err != nil {
				t.Fatal(err)
			}
			e.Logs[0].File = name
			_, err := height.Reduce(c, e, height.Options{})
			at, ok := errPlace(err)
			if !ok || (tt.want != nil && !errors.Is(err, tt.want)) || at != (campaign.Where{File: name, Line: tt.line, Column: tt.col}) {
				t.Fatalf("err = %v, want %v at %s:%d:%d", err, tt.want, name, tt.line, tt.col)
			}
		})
	}
}

// errPlace is where an error of the reader (a *logs.ParseError) or of the
// row rules (a *campaign.Problem) stands in the log.
func errPlace(err error) (campaign.Where, bool) {
	var pe *logs.ParseError
	if errors.As(err, &pe) {
		return campaign.Where{File: pe.File, Line: pe.Line, Column: pe.Column}, true
	}
	var p *campaign.Problem
	if errors.As(err, &p) {
		return p.Where, true
	}
	return campaign.Where{}, false
}

func TestDetectability(t *testing.T) {
	ws := []height.Window{{SpeedKmh: 150, SE: 0.1}, {SpeedKmh: 140, SE: 0.1}, {SpeedKmh: 30, SE: 0.5}}
	d := height.Detect(ws, 0, 50, 1.2)
	// Worked by hand: 2 sd of 0.1 mm on a 50 N/mm axle is 10 N.
	if math.Abs(d.ResolvableN-10) > 1e-9 {
		t.Errorf("resolvable load %v N, want 10", d.ResolvableN)
	}
	// A C_L·A of 0.05 m² makes 10 N at ½·1.2·V²·0.05 = 10, V = 18.26 m/s = 65.7 km/h.
	if got := d.SpeedFor(0.05); math.Abs(got-65.73) > 0.01 {
		t.Errorf("speed to resolve 0.05 m² = %.2f km/h, want 65.73", got)
	}
	// Twice as stiff needs √2 times the speed (common practice, no source).
	stiff := height.Detect(ws, 0, 100, 1.2)
	if r := stiff.SpeedFor(0.05) / d.SpeedFor(0.05); math.Abs(r-math.Sqrt2) > 1e-9 {
		t.Errorf("speed ratio %v, want √2", r)
	}
}
