// Command gen regenerates the bundled demo campaign
// examples/ducktail-fastback from a stated truth, with the physics of
// model.md and a fixed seed:
//
//	go run ./examples/gen -o examples/ducktail-fastback
//
// The scenario is invented: Marsh Lane Garage tries a bolt-on ducktail on a
// customer's fastback coupe on a closed airfield runway.
package main

import (
	"bufio"
	"flag"
	"fmt"
	"log"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"

	"liftfuse/methods"
)

// truth is the demo car's lift, C_L·A per axle in m² (lift positive up).
var truth = map[string][2]float64{
	"baseline": {0.120, 0.100},
	"ducktail": {0.135, -0.045},
}

const (
	seed      = 20261014
	hz        = 10.0
	wheelbase = 2.52
	windMs    = 1.1 // along-road wind in the +1 direction
	growthMm  = 0.6 // true tyre growth at 100 km/h
	// pitch of drag m = CdA·h/L
	cdA     = 0.66
	dragH   = 0.52
	tempC   = 17.5
	presHPa = 1016.0
	humPct  = 58
)

// heave stiffness of each axle, N/mm, seen at the wheel (springs path).
func wheelRate(spring, mr float64) float64 { return 2 * spring * mr * mr }

var (
	kFront     = wheelRate(30, 0.95)
	kRear      = wheelRate(36, 0.82)
	kTyre      = 2 * 240.0
	kRearLaser = 1 / (1/kRear + 1/kTyre)
)

type leg struct {
	config string
	dir    float64
	kmh    float64
}

func main() {
	out := flag.String("o", "examples/ducktail-fastback", "output folder")
	flag.Parse()
	rng := rand.New(rand.NewPCG(seed, 1))
	rho := methods.AirDensity(tempC, presHPa*100, humPct/100.0, 0.0004)
	if err := os.MkdirAll(filepath.Join(*out, "logs"), 0o755); err != nil {
		log.Fatal(err)
	}
	segs := writeLog(filepath.Join(*out, "logs", "runway-day.csv"), rng, rho)
	ballast := ballastPoints(rng)
	writeReadings(filepath.Join(*out, "taps-readings.csv"), rng, rho)
	vortex := vortexObs(rng)
	writeCampaign(filepath.Join(*out, "campaign.yaml"), segs, ballast, vortex)
}

// schedule lists the runs of one configuration: alternating directions at
// steady speeds.
func schedule(config string) []leg {
	var legs []leg
	for i, kmh := range []float64{80, 110, 140, 160, 80, 110, 140, 160} {
		d := 1.0
		if i%2 == 1 {
			d = -1
		}
		legs = append(legs, leg{config, d, kmh})
	}
	return legs
}

type segment struct {
	config   string
	from, to float64
	dir      int
}

// ar1 is a first-order autoregressive noise with marginal sd and lag-one
// correlation phi.
type ar1 struct {
	x, sd, phi float64
}

func (a *ar1) next(rng *rand.Rand) float64 {
	a.x = a.phi*a.x + a.sd*math.Sqrt(1-a.phi*a.phi)*rng.NormFloat64()
	return a.x
}

func writeLog(name string, rng *rand.Rand, rho float64) []segment {
	f, err := os.Create(name)
	if err != nil {
		log.Fatal(err)
	}
	w := bufio.NewWriter(f)
	fmt.Fprintln(w, "t_s,v_kmh,dir,front_pot_v,rear_pot_v,rear_laser_mm,coolant_c")
	var segs []segment
	t := 0.0
	dt := 1 / hz
	frontN := &ar1{sd: 0.25, phi: 0.85}
	rearN := &ar1{sd: 0.25, phi: 0.85}
	laserN := &ar1{sd: 0.45, phi: 0.6}
	speedN := &ar1{sd: 0.35, phi: 0.9}
	for ci, config := range []string{"baseline", "ducktail"} {
		if ci == 1 {
			t += 120 // the ducktail is bolted on in the pits; the log pauses
		}
		start := t
		v := 0.0
		for _, lg := range schedule(config) {
			// a leg: roll at 35 km/h, ramp to the test speed, hold, ramp down,
			// roll at 35 km/h, stop and turn round.
			hold := []struct{ kmh, secs float64 }{{35, 8}, {lg.kmh, 16}, {35, 8}, {0, 6}}
			stiction := [2]float64{0.15 * (2*rng.Float64() - 1), 0.15 * (2*rng.Float64() - 1)}
			for _, h := range hold {
				for math.Abs(v-h.kmh) > 0.5 { // ramp at about 8 km/h per second
					step := math.Copysign(math.Min(0.8, math.Abs(h.kmh-v)), h.kmh-v)
					v += step
					t = sample(w, t, dt, v, lg, rho, frontN, rearN, laserN, speedN, rng, stiction)
				}
				v = h.kmh
				for s := 0.0; s < h.secs; s += dt {
					t = sample(w, t, dt, v, lg, rho, frontN, rearN, laserN, speedN, rng, stiction)
				}
			}
		}
		segs = append(segs, segment{config: config, from: math.Floor(start), to: math.Floor(t - 1)})
	}
	if err := w.Flush(); err != nil {
		log.Fatal(err)
	}
	if err := f.Close(); err != nil {
		log.Fatal(err)
	}
	return segs
}

func sample(w *bufio.Writer, t, dt, v float64, lg leg, rho float64, frontN, rearN, laserN, speedN *ar1, rng *rand.Rand, stiction [2]float64) float64 {
	ground := math.Max(0, v+speedN.next(rng))
	dir := lg.dir
	if v == 0 {
		ground = 0
	}
	air := methods.KmhToMs(ground) + dir*windMs
	if ground == 0 {
		air = 0
	}
	q := methods.DynamicPressure(rho, air)
	b := truth[lg.config]
	lf, lr := q*b[0], q*b[1]
	hFront := lf/kFront + stiction[0] + frontN.next(rng)
	hRear := lr/kRear + stiction[1] + rearN.next(rng)
	vr := methods.KmhToMs(ground) / methods.KmhToMs(100)
	hLaser := 118 + lr/kRearLaser + growthMm*vr*vr + laserN.next(rng)
	frontV := 2.0 + hFront/24.0
	rearV := 1.6 + hRear/23.8
	fmt.Fprintf(w, "%.2f,%.2f,%d,%.4f,%.4f,%.2f,%.1f\n", t, ground, int(dir), frontV, rearV, hLaser, 88+3*rng.Float64())
	return t + dt
}

// ballastPoints returns static rear-pot signals with 0, 40 and 80 kg in the
// boot (x = 2.30 m): the rear axle takes m·g·x/L of it.
func ballastPoints(rng *rand.Rand) [][2]float64 {
	var pts [][2]float64
	for _, kg := range []float64{0, 40, 80} {
		fr := kg * methods.StandardGravity * 2.30 / wheelbase
		h := -fr / kRear
		pts = append(pts, [2]float64{kg, 1.6 + (h+0.05*rng.NormFloat64())/23.8})
	}
	return pts
}

// taps of the demo car: x from the front axle, rearward; tributary areas.
var taps = []struct {
	id      string
	x, area float64
	surface string
	nz      float64
}{
	{"u1", -0.35, 0.55, "upper", 0.85}, {"u2", 0.45, 0.70, "upper", 0.95}, {"u3", 1.05, 0.45, "upper", 0.55},
	{"u4", 1.60, 0.95, "upper", 1.0}, {"u5", 2.25, 0.75, "upper", 0.60}, {"u6", 2.85, 0.40, "upper", 0.98},
	{"l1", -0.20, 0.60, "lower", -1}, {"l2", 0.60, 0.90, "lower", -1}, {"l3", 1.30, 1.00, "lower", -1},
	{"l4", 2.00, 0.90, "lower", -1}, {"l5", 2.80, 0.45, "lower", -1},
}

// baseCp is a plausible fastback Cp shape; two free levels per
// configuration are solved so that taps plus uncovered patches carry the
// true axle lift less the pitch of drag.
var baseCp = map[string]float64{"u1": -0.2, "u2": -0.6, "u3": 0.1, "u4": -0.7, "u5": -0.35, "u6": -0.15,
	"l1": -0.3, "l2": -0.15, "l3": -0.1, "l4": -0.05, "l5": -0.1}

const uncoveredX, uncoveredArea, uncoveredCp = 2.45, 0.5, -0.15 // lower, nz −1

func tapCp(config string) map[string]float64 {
	// unknowns a (front-weighted upper suction) and b (rear-weighted):
	// Cp_k = base_k + a·φa(x) + b·φb(x) on the upper surface.
	phiA := func(x float64) float64 { return math.Max(0, 1-x/wheelbase) }
	phiB := func(x float64) float64 { return math.Min(1, math.Max(0, x/wheelbase)) }
	m := cdA * dragH / wheelbase
	bt := truth[config]
	// coefficient form: force/q, front and rear, of a Cp field
	split := func(cp func(i int) float64) (float64, float64) {
		var tot, mom float64
		for i, tp := range taps {
			f := -cp(i) * tp.area * tp.nz
			tot += f
			mom += f * tp.x
		}
		fu := -uncoveredCp * uncoveredArea * -1
		tot += fu
		mom += fu * uncoveredX
		return tot - mom/wheelbase, mom / wheelbase
	}
	f0, r0 := split(func(i int) float64 { return baseCp[taps[i].id] })
	fa, ra := split(func(i int) float64 {
		if taps[i].surface == "upper" {
			return phiA(taps[i].x)
		}
		return 0
	})
	fb, rb := split(func(i int) float64 {
		if taps[i].surface == "upper" {
			return phiB(taps[i].x)
		}
		return 0
	})
	// solve [fa fb; ra rb]·[a b] = [βf − m − f0, βr + m − r0]
	tf, tr := bt[0]-m-f0, bt[1]+m-r0
	det := fa*rb - fb*ra
	a := (tf*rb - fb*tr) / det
	b := (fa*tr - tf*ra) / det
	cp := map[string]float64{}
	for _, tp := range taps {
		c := baseCp[tp.id]
		if tp.surface == "upper" {
			c += a*phiA(tp.x) + b*phiB(tp.x)
		}
		cp[tp.id] = c
	}
	return cp
}

func writeReadings(name string, rng *rand.Rand, rho float64) {
	var b strings.Builder
	b.WriteString("config,speed_kmh,direction")
	for _, tp := range taps {
		b.WriteString("," + tp.id)
	}
	b.WriteString("\n")
	for _, config := range []string{"baseline", "ducktail"} {
		cp := tapCp(config)
		for _, kmh := range []float64{100, 130} {
			for _, dir := range []float64{1, -1} {
				q := methods.DynamicPressure(rho, methods.KmhToMs(kmh)+dir*windMs)
				ref := 3 * rng.NormFloat64()
				fmt.Fprintf(&b, "%s,%g,%d", config, kmh, int(dir))
				for _, tp := range taps {
					fmt.Fprintf(&b, ",%.1f", cp[tp.id]*q+ref+2*rng.NormFloat64())
				}
				b.WriteString("\n")
			}
		}
	}
	if err := os.WriteFile(name, []byte(b.String()), 0o644); err != nil {
		log.Fatal(err)
	}
}

type vortexOb struct {
	config, sense string
	kmh, rpm      float64
}

// vortexObs: the right-side vortex seen from behind turns ccw when the car
// makes net lift; one observation in twenty is misread.
func vortexObs(rng *rand.Rand) []vortexOb {
	var obs []vortexOb
	for _, config := range []string{"baseline", "ducktail"} {
		total := truth[config][0] + truth[config][1]
		for _, kmh := range []float64{50, 90, 130} {
			sense := "ccw"
			if total < 0 {
				sense = "cw"
			}
			if rng.Float64() < 0.05 {
				sense = map[string]string{"cw": "ccw", "ccw": "cw"}[sense]
			}
			obs = append(obs, vortexOb{config, sense, kmh, math.Round(kmh * math.Abs(total) * 12)})
		}
	}
	return obs
}

func writeCampaign(name string, segs []segment, ballast [][2]float64, vortex []vortexOb) {
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p(`# Demo campaign (invented scenario): Marsh Lane Garage tries a bolt-on
# ducktail on a customer's fastback coupe, on the closed runway of a
# disused airfield hired for the morning. Regenerate with
#   go run ./examples/gen -o examples/ducktail-fastback
liftfuse: 1
campaign:
  title: Ducktail trial on a customer fastback
  date: 2026-10-14
  site: Fenwick Moor airfield, closed runway 08/26 (hired, marshalled)
  notes: Two configurations, both directions, steady runs at 80-160 km/h.

vehicle:
  label: Fastback coupe, customer car MLG-0412
  body: fastback
  wheelbase_m: %.2f
  mass_kg: 1285
  front_static_kg: 731
  frontal_area_m2: 1.95
  drag:
    cda_m2: %.2f
    centre_height_m: %.2f
    sd_pct: 20
  axles:
    front: {spring_n_per_mm: 30, spring_sd_pct: 5, motion_ratio: 0.95, motion_ratio_sd: 0.02, tyre_n_per_mm: 240, tyre_sd_pct: 10}
    rear:  {spring_n_per_mm: 36, spring_sd_pct: 5, motion_ratio: 0.82, motion_ratio_sd: 0.02, tyre_n_per_mm: 240, tyre_sd_pct: 10}

configurations:
  - {id: baseline, note: as delivered}
  - {id: ducktail, note: 45 mm bolt-on ducktail on the boot lid}

air:
  temperature_c: %.1f
  pressure_hpa: %.1f
  humidity_pct: %d
  wind_sd_ms: 1.5

evidence:
  ride_height:
`, wheelbase, cdA, dragH, tempC, presHPa, humPct)
	segText := func() string {
		var s strings.Builder
		for _, sg := range segs {
			fmt.Fprintf(&s, "            - {config: %s, from_s: %g, to_s: %g}\n", sg.config, sg.from, sg.to)
		}
		return s.String()
	}()
	p(`    - id: front-pot
      axle: front
      sensor: pot
      calibration: {mm_per_unit: 24.0, sd_pct: 1.0}
      stiffness: {from: springs}
      friction_mm: 0.15
      logs:
        - file: logs/runway-day.csv
          time: t_s
          speed_kmh: v_kmh
          signal: front_pot_v
          direction: dir
          segments:
%s    - id: rear-pot
      axle: rear
      sensor: pot
      calibration:
        points: [[0.50, 0.0], [1.50, 23.8], [2.50, 47.6]]
        sd_pct: 0.5
      stiffness:
        from: ballast
        ballast:
`, segText)
	for _, bp := range ballast {
		p("          - {added_kg: %g, x_m: 2.30, signal: %.4f}\n", bp[0], bp[1])
	}
	p(`      friction_mm: 0.15
      logs:
        - file: logs/runway-day.csv
          time: t_s
          speed_kmh: v_kmh
          signal: rear_pot_v
          direction: dir
          segments:
%s    - id: rear-laser
      axle: rear
      sensor: laser
      calibration: {mm_per_unit: 1.0, sd_pct: 0.5}
      stiffness: {from: springs}
      tyre_growth: {mm_at_100kmh: 0.5, sd_mm: 0.5}
      logs:
        - file: logs/runway-day.csv
          time: t_s
          speed_kmh: v_kmh
          signal: rear_laser_mm
          direction: dir
          segments:
%s
  pressure:
    - id: body-taps
      mode: panels
      sensor_sd_pa: 2.5
      reference_sd_pa: 4
      model_sd_pct: 25
      taps:
`, segText, segText)
	for _, tp := range taps {
		p("        - {id: %s, x_m: %.2f, surface: %s, area_m2: %.2f, nz: %g}\n", tp.id, tp.x, tp.surface, tp.area, tp.nz)
	}
	p(`      uncovered:
        - {surface: lower, x_m: %.2f, area_m2: %.2f, nz: -1.0, cp_mean: -0.1, cp_sd: 0.15}
      readings_file: taps-readings.csv

  vortex:
    - id: tail-tuft
      side: right
      informs: total
      observations:
`, uncoveredX, uncoveredArea)
	for _, o := range vortex {
		p("        - {config: %s, speed_kmh: %g, sense: %s}\n", o.config, o.kmh, o.sense)
	}
	p(`
report:
  speeds_kmh: [100, 150]
  credible: 0.90
  force_unit: kgf
  reference_config: baseline
  seed: 1

plan:
  target: {config: ducktail, axle: rear, versus: baseline}
  cost_h: {front-pot: 1.5, rear-pot: 1.5, rear-laser: 1.5, body-taps: 2.0, tail-tuft: 0.5}
`)
	if err := os.WriteFile(name, []byte(b.String()), 0o644); err != nil {
		log.Fatal(err)
	}
}
