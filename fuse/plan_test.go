package fuse_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/air"
	"liftfuse/methods/evidence"
)

// heightLike is a linear-Gaussian ride-height-like entry: windows at
// several dynamic pressures, a per-run flat offset, a shared tyre growth.
func heightLike(t *testing.T, id, offset string, noise float64, shift float64) evidence.Evidence {
	var o []evidence.Obs
	var sd []float64
	for i, q := range []float64{0, 50, 300, 600, 900, 0, 300, 900} {
		cfg := "a"
		if i >= 5 {
			cfg = "b"
		}
		v2 := q / 500
		o = append(o, evidence.Obs{Y: 10 + q*0.1/40 + 0.4*v2 + shift*float64(i%3-1), Terms: []evidence.Term{{Config: cfg, Axle: "rear", W: 1.0 / 40}},
			Air: evidence.Airspeed{Q: q}, Nuis: []evidence.Coef{{Name: offset, C: 1}, {Name: "growth", C: v2}}, Label: "w"})
		sd = append(sd, noise)
	}
	b, err := evidence.Diagonal(o, sd)
	if err != nil {
		t.Fatal(err)
	}
	return evidence.Evidence{Entry: id, Kind: evidence.KindRideHeight, Blocks: []evidence.Block{b},
		Nuisances: []evidence.Nuisance{{Name: offset, Label: "offset", Flat: true, PerRun: true}, {Name: "growth", Label: "tyre growth", Mean: 0.5, SD: 0.5}},
		Informs:   []evidence.Quantity{{Config: "a", Axle: "rear"}, {Config: "b", Axle: "rear"}}}
}

// TestRepeatMatchesDuplicate: for a linear-Gaussian campaign the predicted
// sd after repeating an entry must equal the sd of the campaign fused with
// that entry's data duplicated — the duplicate with its own offset (a new
// log) but the same tyre growth (the same tyres).
func TestRepeatMatchesDuplicate(t *testing.T) {
	a := heightLike(t, "laser", "laser/offset", 0.05, 0.02)
	other := entry(t, "taps", []evidence.Obs{obs("a", "rear", 0.11), obs("b", "rear", 0.02), obs("a", "front", 0.1)}, []float64{0.04, 0.04, 0.04})
	set := fuse.Settings{Configs: []string{"a", "b"}, Seed: 1, Credible: 0.9}
	f, err := fuse.Run(fuse.Input{Evidence: []evidence.Evidence{a, other}, Settings: set, Reference: "a", Rho: 1.2})
	if err != nil {
		t.Fatal(err)
	}
	for _, tgt := range []fuse.Target{{Config: "a", Axle: "rear"}, {Config: "b", Axle: "rear", Versus: "a"}} {
		pl, err := f.PlanRepeats(tgt, func(string) float64 { return 1 })
		if err != nil {
			t.Fatal(err)
		}
		dup := heightLike(t, "laser-again", "laser-again/offset", 0.05, 0.02)
		P, err := fuse.Fit([]evidence.Evidence{a, other, dup}, set)
		if err != nil {
			t.Fatal(err)
		}
		terms := []evidence.Term{{Config: tgt.Config, Axle: tgt.Axle, W: 1}}
		if tgt.Versus != "" {
			terms = append(terms, evidence.Term{Config: tgt.Versus, Axle: tgt.Axle, W: -1})
		}
		want, _ := P.Linear(terms...)
		for _, o := range pl.Options {
			if o.Entry == "laser" && math.Abs(o.SDAfter-want.SD) > 1e-9*want.SD {
				t.Errorf("%s: predicted sd after a repeat %.10f, duplicate fused %.10f", tgt, o.SDAfter, want.SD)
			}
		}
	}
}

// TestSystematicVersusRandom: repeating an entry whose error is all
// systematic (a shared offset of sd 0.1 against noise of 0.001) removes
// almost nothing; repeating one whose error is all random, and which alone
// informs the target, halves its variance (the prior, sd 1, is negligible).
func TestSystematicVersusRandom(t *testing.T) {
	sys := entry(t, "sys", []evidence.Obs{obs("c", "front", 0.2, evidence.Coef{Name: "bias", C: 1}), obs("c", "front", 0.2, evidence.Coef{Name: "bias", C: 1})},
		[]float64{0.001, 0.001}, evidence.Nuisance{Name: "bias", Label: "sensor bias", SD: 0.1})
	rnd := entry(t, "rnd", []evidence.Obs{obs("c", "rear", 0.1), obs("c", "rear", 0.12)}, []float64{0.05, 0.05})
	f, err := fuse.Run(fuse.Input{Evidence: []evidence.Evidence{sys, rnd}, Settings: fuse.Settings{Configs: []string{"c"}, Seed: 1}, Reference: "c", Rho: 1.2})
	if err != nil {
		t.Fatal(err)
	}
	removed := func(axle, id string) float64 {
		pl, err := f.PlanRepeats(fuse.Target{Config: "c", Axle: axle}, func(string) float64 { return 1 })
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range pl.Options {
			if o.Entry == id {
				return o.RemovedPct
			}
		}
		t.Fatalf("no option for %s", id)
		return 0
	}
	if r := removed("front", "sys"); r >= 10 {
		t.Errorf("an all-systematic entry removes %.1f %% when repeated, want < 10 %%", r)
	}
	// Exactly: var = 1/(n/σ² + 1) with σ = 0.05, n = 2 → 4: removed ≈ 49.99 %.
	if r := removed("rear", "rnd"); math.Abs(r-50) > 0.1 {
		t.Errorf("an all-random entry removes %.2f %% when repeated, want ≈ 50 %%", r)
	}
}

// TestCrosscheck: a claim at the predictive mean is unsurprising; a claim
// 15 predictive sd away is very surprising. On a campaign whose laser's
// tyres really grow 3 mm against a prior of 0.5 ± 0.5, the laser mistakes
// growth for lift and overstates the rear: a claim below the prediction
// must be explained first by more tyre growth.
func TestCrosscheck(t *testing.T) {
	text := fmt.Sprintf(simSpec, 21, 3.0, "constant", plainWing, "80, 120, 150")
	f := runSim(t, text, "rpot", "taps", "tuft")
	const rho = 1.225
	cc, err := f.Crosscheck(fuse.Claim{Config: "wing", Axle: "rear", SpeedKmh: 120, Unit: air.UnitN, NewtonsPerUnit: 1}, rho)
	if err != nil {
		t.Fatal(err)
	}
	at := cc.Predictive
	cc, err = f.Crosscheck(fuse.Claim{Config: "wing", Axle: "rear", SpeedKmh: 120, Value: at.Mean, Unit: air.UnitN, NewtonsPerUnit: 1}, rho)
	if err != nil || math.Abs(cc.Z) >= 0.1 {
		t.Fatalf("a claim at the predictive mean has z = %v (%v)", cc.Z, err)
	}
	if cc.Verdict != fuse.VerdictConsistent || len(cc.Explanations) != 0 || len(cc.Checks) != 0 {
		t.Errorf("a claim at the predictive mean: verdict %q, %d explanations, %d checks; want consistent, none, none", cc.Verdict, len(cc.Explanations), len(cc.Checks))
	}
	// 15 sd away: no single error within 4 prior sd explains it; the
	// trade's checks are those of ride-height entries (this campaign has
	// no other kind) and the common ones.
	far := at.Mean - 15*at.SD
	cc, err = f.Crosscheck(fuse.Claim{Config: "wing", Axle: "rear", SpeedKmh: 120, Value: far, Unit: air.UnitN, NewtonsPerUnit: 1}, rho)
	if err != nil {
		t.Fatal(err)
	}
	if cc.PValue >= 1e-3 {
		t.Errorf("a claim 15 sd away has p = %v", cc.PValue)
	}
	if cc.Verdict != fuse.VerdictUnexplained || cc.Summary != "no single modelled error explains it" || len(cc.Explanations) != 0 {
		t.Errorf("15 sd away: verdict %q, summary %q, explanations %+v; want unexplained, none", cc.Verdict, cc.Summary, cc.Explanations)
	}
	if !containsText(cc.Checks, "tyre pressure") || containsText(cc.Checks, "tap tube") {
		t.Errorf("checks for a ride-height campaign: %q", cc.Checks)
	}
	// 2.5 sd below: the laser's tyres growing more than assumed explains it.
	near := at.Mean - 2.5*at.SD
	cc, err = f.Crosscheck(fuse.Claim{Config: "wing", Axle: "rear", SpeedKmh: 120, Value: near, Unit: air.UnitN, NewtonsPerUnit: 1}, rho)
	if err != nil {
		t.Fatal(err)
	}
	if cc.Verdict != fuse.VerdictExplained || len(cc.Explanations) == 0 || !strings.Contains(cc.Explanations[0].Nuisance, "tyre growth") || cc.Explanations[0].ShiftSD <= 0 {
		t.Errorf("2.5 sd below: verdict %q, explanations %+v; want the rear tyre growth, upward, first", cc.Verdict, cc.Explanations)
	}
	for _, e := range cc.Explanations {
		if math.Abs(e.ShiftSD) > 4 || (e.Unit == "×" && (e.Value < 0.5 || e.Value > 2)) {
			t.Errorf("explanation beyond the physical bounds: %+v", e)
		}
	}
	// In m², at any speed: the C_L·A itself.
	cm, err := f.Crosscheck(fuse.Claim{Config: "wing", Axle: "rear", SpeedKmh: 100, Unit: "m2"}, rho)
	if err != nil {
		t.Fatal(err)
	}
	e, _ := f.Posterior.Quantity(evidence.Quantity{Config: "wing", Axle: "rear"})
	if math.Abs(cm.Predictive.Mean-e.Mean) > 1e-9 {
		t.Errorf("m² predictive %v, posterior %v", cm.Predictive.Mean, e.Mean)
	}
}
