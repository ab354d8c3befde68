package fuse_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/sim"
)

// simInput simulates and reduces a spec (completed with the shared test
// car and its taps) and returns the fusion's input, with report speeds;
// drop lists entries to leave out.
func simInput(t *testing.T, text string, speeds []float64, drop ...string) fuse.Input {
	t.Helper()
	if !strings.Contains(text, "\nvehicle:") {
		text += testCar(t)
	}
	c, _, err := sim.Build(strings.NewReader(text), "spec.yaml", t.TempDir())
	if err != nil {
		t.Fatal(err)
	}
	r, err := methods.Reduce(c, methods.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var evs []evidence.Evidence
	for _, ev := range r.Evidence() {
		keep := true
		for _, d := range drop {
			keep = keep && ev.Entry != d
		}
		if keep {
			evs = append(evs, ev)
		}
	}
	return fuse.Input{Evidence: evs, Settings: fuse.Settings{Configs: []string{"base", "wing"}, Seed: 1, Credible: 0.9,
		Linear: c.Prior.SpeedModel == campaign.SpeedLinear}, Reference: "base", SpeedsKmh: speeds, Rho: c.Density()}
}

// TestAtSpeedsUseBetaOfV: with the linear speed model the rear of "wing"
// lifts at low speed and makes downforce at high speed (truth of the
// simulation: 0 at 100 km/h, −0.2 m² per 100 km/h, so +0.12 at 40 km/h and
// −0.10 at 150). Each report speed's P(downforce) and force must be those
// of β(V) at that speed — not of β at 100 km/h, whose P(downforce) is near
// ½ here.
func TestAtSpeedsUseBetaOfV(t *testing.T) {
	in := simInput(t, fmt.Sprintf(simSpec, 9, 0.5, "linear", "front_cla_m2: 0.05, rear_cla_m2: 0, rear_slope_m2: -0.2", "40, 60, 100, 150"),
		[]float64{40, 150})
	f, err := fuse.Run(in)
	if err != nil {
		t.Fatal(err)
	}
	var wing fuse.ConfigResult
	for _, c := range f.Result.Configs {
		if c.ID == "wing" {
			wing = c
		}
	}
	cases := []struct {
		name      string
		speed     float64
		truth     float64 // rear C_L·A at that speed, m² (the simulation's truth)
		downforce bool
	}{
		{"40 km/h lifts", 40, 0.12, false},
		{"150 km/h makes downforce", 150, -0.10, true},
	}
	for i, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			s := wing.AtSpeeds[i]
			if s.SpeedKmh != tc.speed {
				t.Fatalf("speed %v, want %v", s.SpeedKmh, tc.speed)
			}
			q := 0.5 * in.Rho * (tc.speed / 3.6) * (tc.speed / 3.6)
			e, pd := f.Posterior.At(tc.speed, evidence.Term{Config: "wing", Axle: "rear", W: 1})
			if s.PDownforce.Rear != pd || math.Abs(s.RearN.Mean-e.Mean*q) > 1e-9*math.Abs(e.Mean*q) {
				t.Errorf("at %v km/h: document P(down) %v, force %v N; β(V) gives %v, %v N", tc.speed, s.PDownforce.Rear, s.RearN.Mean, pd, e.Mean*q)
			}
			if got := s.PDownforce.Rear > 0.95; got != tc.downforce || (!tc.downforce && s.PDownforce.Rear > 0.05) {
				t.Errorf("at %v km/h (truth %+.2f m²) P(rear downforce) = %.3f", tc.speed, tc.truth, s.PDownforce.Rear)
			}
			if lo, hi := s.RearN.Lo/q, s.RearN.Hi/q; tc.truth < lo || tc.truth > hi {
				t.Errorf("at %v km/h the rear force interval [%.3f, %.3f] m²·q excludes the truth %+.2f", tc.speed, lo, hi, tc.truth)
			}
		})
	}
}

// TestChecksCarried: the adapters' checks reach the result document
// unchanged, each also as one warning naming entry, configuration and span.
func TestChecksCarried(t *testing.T) {
	ev := entry(t, "a", []evidence.Obs{obs("c", "front", 0.1)}, []float64{0.01})
	ck := fuse.Check{Check: "height-not-linear", Entry: "a", Config: "c", Where: "windows above 140 km/h", PValue: 0.0004,
		Cause: "bump-stop contact or progressive springs", Action: "set max_speed_kmh: 140 on a"}
	f, err := fuse.Run(fuse.Input{Evidence: []evidence.Evidence{ev}, Settings: fuse.Settings{Configs: []string{"c"}, Seed: 1}, Reference: "c", Checks: []fuse.Check{ck}})
	if err != nil {
		t.Fatal(err)
	}
	res := f.Result
	if len(res.Checks) != 1 || res.Checks[0] != ck {
		t.Errorf("checks %+v, want [%+v]", res.Checks, ck)
	}
	want := "a, c, windows above 140 km/h: height-not-linear (p = 0.0004) — likely bump-stop contact or progressive springs; set max_speed_kmh: 140 on a"
	if !containsText(res.Warnings, want) {
		t.Errorf("warnings %q lack %q", res.Warnings, want)
	}
	if res.Headline != fuse.HeadlinePlain || len(res.DownWeighted) != 0 || res.Plain != nil {
		t.Errorf("one entry: headline %q, down-weighted %v, plain %v; want plain, none, nil", res.Headline, res.DownWeighted, res.Plain)
	}
}
