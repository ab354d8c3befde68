package height_test

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/gust"
	"liftfuse/methods/height"
)

// TestMaxSpeed: windows above an entry's max_speed_kmh are not used, and a
// warning says how many were dropped.
func TestMaxSpeed(t *testing.T) {
	c := simulate(t, 5, truth{beta: [4]float64{0.1, 0.05, 0.12, -0.05}, fs: 1, rs: 1, grow: 0.5, growSD: 0.5})
	e := &c.Evidence.RideHeight[0]
	all, err := height.Reduce(c, e, height.Options{})
	if err != nil {
		t.Fatal(err)
	}
	e.MaxSpeedKmh = 140
	r, err := height.Reduce(c, e, height.Options{})
	if err != nil {
		t.Fatal(err)
	}
	fast := 0
	for _, w := range all.Windows {
		if w.SpeedKmh > 140 {
			fast++
		}
	}
	if fast < 4 || r.Dropped != fast || len(r.Windows) != len(all.Windows)-fast {
		t.Errorf("dropped %d of %d windows above 140 km/h, kept %d of %d", r.Dropped, fast, len(r.Windows), len(all.Windows))
	}
	for _, w := range r.Windows {
		if w.SpeedKmh > 140 {
			t.Errorf("window at %.1f km/h kept", w.SpeedKmh)
		}
	}
	if !strings.Contains(strings.Join(r.Warnings, "\n"), fmt.Sprintf("%d steady windows above max_speed_kmh", fast)) {
		t.Errorf("no warning of the dropped windows: %v", r.Warnings)
	}
}

// probeLog writes a clean log with a steady stand and a steady 100 km/h
// hold into a 10 km/h headwind, measured by an airspeed probe (column
// air_kmh) or as its dynamic pressure (column q_pa).
func probeLog(t *testing.T, rho float64) string {
	t.Helper()
	var b strings.Builder
	b.WriteString("t_s,v_kmh,dir,fpot,air_kmh,q_pa\n")
	for i := range 400 {
		tt := 0.1 * float64(i)
		v := 0.0
		if tt >= 12 && tt < 28 {
			v = 100
		}
		va := v
		if v > 0 {
			va = v + 10 + 2*math.Sin(tt) // a headwind with a little gust
		}
		q := air.DynamicPressure(rho, air.KmhToMs(va))
		fmt.Fprintf(&b, "%.1f,%g,1,%.4f,%.6f,%.6f\n", tt, v, 2+0.001*math.Sin(7*tt), va, q)
	}
	name := filepath.Join(t.TempDir(), "probe.csv")
	if err := os.WriteFile(name, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return name
}

// TestProbe: windows of a log with a measured airspeed use the mean of
// ½ρV_air² (or of the logged q), name no wind and carry the probe's scale
// group with sd probe_sd_pct.
func TestProbe(t *testing.T) {
	c := simulate(t, 3, truth{fs: 1, rs: 1, growSD: 0.5})
	c.Air.ProbeSDPct = 3
	name := probeLog(t, c.Density())
	// The mean of ½ρV² over the hold, worked here from the same samples:
	// those of 12–27.9 s but the edge at each end. The speed steps by
	// 100 km/h within the 1 s the rate is read over, so by edge.go's rule
	// (0.3 s plus the band's width over the rate) the edge is, by hand,
	// 0.3 + 1.5 km/h ÷ 100 km/h/s = 0.315 s at the default ±1.5 km/h.
	if tol := c.Evidence.RideHeight[0].Steady.SpeedTolKmh; tol != 1.5 {
		t.Fatalf("speed tolerance %g km/h, the edge below is worked for 1.5", tol)
	}
	const edge = 0.315
	var sum float64
	n := 0
	for i := range 400 {
		tt := 0.1 * float64(i)
		if tt >= 12+edge-1e-9 && tt <= 27.9-edge+1e-9 {
			sum += air.DynamicPressure(c.Density(), air.KmhToMs(110+2*math.Sin(tt)))
			n++
		}
	}
	wantQ := sum / float64(n)
	for _, col := range []string{"airspeed_kmh", "q_pa"} {
		t.Run(col, func(t *testing.T) {
			e := c.Evidence.RideHeight[0]
			l := campaign.LogSpec{File: name, Time: "t_s", SpeedKmh: "v_kmh", Direction: "dir", Signal: "fpot",
				Segments: []campaign.Segment{{Config: "base", FromS: 0, ToS: 40}}}
			if col == "q_pa" {
				l.QPa = "q_pa"
			} else {
				l.AirspeedKmh = "air_kmh"
			}
			e.Logs = []campaign.LogSpec{l}
			r, err := height.Reduce(c, &e, height.Options{})
			if err != nil {
				t.Fatal(err)
			}
			var hold *height.Window
			for i := range r.Windows {
				if r.Windows[i].SpeedKmh > 50 {
					hold = &r.Windows[i]
				}
			}
			if hold == nil || !hold.Probe || math.Abs(hold.Q-wantQ) > 1e-6*wantQ {
				t.Fatalf("hold window %+v, want q %.4f from the probe", hold, wantQ)
			}
			for _, o := range r.Evidence.Blocks[0].Obs {
				if o.Air.Wind != "" || !slices.ContainsFunc(o.Scales, func(s evidence.ScaleRef) bool { return s.Name == height.ProbeName && s.Pow == 1 }) {
					t.Errorf("%s: wind %q, scales %v", o.Label, o.Air.Wind, o.Scales)
				}
			}
			if !slices.ContainsFunc(r.Evidence.Scales, func(s evidence.ScaleGroup) bool { return s.Name == height.ProbeName && s.SD == 0.03 }) {
				t.Errorf("no probe group of sd 0.03 in %v", r.Evidence.Scales)
			}
			if slices.ContainsFunc(r.Evidence.Nuisances, func(n evidence.Nuisance) bool { return n.Name == evidence.WindName }) {
				t.Error("a probe-only entry declares the wind")
			}
		})
	}
}

// TestGustShared: two sensors logged in one file name the same run-to-run
// wind nuisances with the same prior, so fusion sees one deviation per
// run; the nuisances are per run and each run has one.
func TestGustShared(t *testing.T) {
	c := simulate(t, 4, truth{beta: [4]float64{0.1, 0.05, 0.12, -0.05}, fs: 1, rs: 1, grow: 0.5, growSD: 0.5})
	c.Air.GustSDMs = 1.5
	rs, err := height.ReduceAll(c, []*campaign.RideHeightEntry{&c.Evidence.RideHeight[0], &c.Evidence.RideHeight[1]}, height.Options{})
	if err != nil {
		t.Fatal(err)
	}
	gusts := func(ev evidence.Evidence) map[string]evidence.Nuisance {
		out := map[string]evidence.Nuisance{}
		for _, n := range ev.Nuisances {
			if strings.HasPrefix(n.Name, "gust/") {
				out[n.Name] = n
			}
		}
		return out
	}
	a, b := gusts(rs[0].Evidence), gusts(rs[1].Evidence)
	// 2 configurations × 2 repeats × 3 speeds, each its own pass from a
	// stop to a stop (methods/sim's plan): 12 runs.
	if len(a) != 12 || len(b) != 12 {
		t.Fatalf("%d and %d run nuisances, want 12 each", len(a), len(b))
	}
	for name, n := range a {
		if m, ok := b[name]; !ok || m != n || !n.PerRun || n.SD <= 0 {
			t.Errorf("run nuisance %q: %+v and %+v", name, n, m)
		}
	}
}

// TestRestOffset: the windows at rest, and only they, carry each axle's
// rest offset with the sensor's lever weight on that axle — 1 for a sensor
// at its axle; for a laser x behind the front axle of a car of wheelbase
// L, 1 − x/L on the front and x/L on the rear (the rigid body's line
// through the axles, as TestLeverWeights) — and its sd is the friction
// band the axle's entries state (the model of restName; common practice
// (no source): Coulomb friction holds a suspension anywhere in its band).
func TestRestOffset(t *testing.T) {
	for _, behind := range []float64{0, 0.8} {
		t.Run(fmt.Sprintf("laser %.1f m behind the rear axle", behind), func(t *testing.T) {
			c := simulate(t, 5, truth{beta: [4]float64{0.1, 0.05, 0.12, -0.05}, fs: 1, rs: 1, grow: 0.5, growSD: 0.5})
			es := []*campaign.RideHeightEntry{&c.Evidence.RideHeight[0], &c.Evidence.RideHeight[1]}
			es[0].FrictionMm, es[1].FrictionMm = 0.1, 0.3
			L := c.Vehicle.WheelbaseM
			x := L + behind
			es[1].XM = x
			rs, err := height.ReduceAll(c, es, height.Options{})
			if err != nil {
				t.Fatal(err)
			}
			sds := map[string]float64{"rest-stick/front": 0.1, "rest-stick/rear": 0.3}
			weights := []map[string]float64{{"rest-stick/front": 1}, {"rest-stick/rear": 1}}
			if behind > 0 {
				weights[1] = map[string]float64{"rest-stick/front": 1 - x/L, "rest-stick/rear": x / L}
			}
			for i, want := range weights {
				checkRestOffset(t, rs[i], want, sds)
			}
		})
	}
}

// checkRestOffset checks that the windows at rest of r's evidence, and
// only they, carry the rest offsets named in want with those
// coefficients, and that the offsets' sds are sds'.
func checkRestOffset(t *testing.T, r *height.Result, want, sds map[string]float64) {
	t.Helper()
	ev, atRest := r.Evidence, 0
	for _, w := range r.Windows {
		if w.SpeedKmh < gust.Stop {
			atRest++
		}
	}
	carried := map[string]int{}
	for _, bl := range ev.Blocks {
		for _, o := range bl.Obs {
			for _, k := range o.Nuis {
				if _, ok := sds[k.Name]; !ok {
					continue
				}
				carried[k.Name]++
				if w, ok := want[k.Name]; !ok || math.Abs(k.C-w) > 1e-12 {
					t.Errorf("%s: %s coefficient %g, want the lever weight %g", ev.Entry, k.Name, k.C, w)
				}
			}
		}
	}
	for name := range want {
		if atRest == 0 || carried[name] != atRest {
			t.Errorf("%s: %d observations carry %s, want the %d windows at rest", ev.Entry, carried[name], name, atRest)
		}
		sd := -1.0
		for _, n := range ev.Nuisances {
			if n.Name == name {
				sd = n.SD
			}
		}
		if sd != sds[name] {
			t.Errorf("%s: %s sd %g, want %g", ev.Entry, name, sd, sds[name])
		}
	}
}
