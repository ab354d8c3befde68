package reality_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/sim/reality"
)

// standalone returns one entry's standalone figure.
func standalone(res *fuse.Result, entry, config, axle string) (fuse.Estimate, bool) {
	for _, m := range res.Methods {
		if m.ID != entry {
			continue
		}
		for _, s := range m.Standalone {
			if s.Config == config && s.Axle == axle {
				return s.CLA, true
			}
		}
	}
	return fuse.Estimate{}, false
}

// agreementLine summarises each entry's agreement for the log.
func agreementLine(res *fuse.Result) string {
	var b strings.Builder
	for _, m := range res.Methods {
		if a := m.Agreement; a != nil {
			fmt.Fprintf(&b, " %s p=%.3g off=%.2f", m.ID, a.PValue, a.POff)
		}
	}
	return b.String()
}

// TestChainFaultSignatures runs each fault through the tool beside the
// same day and seed without it, and checks that the fault moves what the
// faulty entry alone says by more than 3 of its standard deviations (the
// fault is visible to the tool, so a check can be built on it), or by what
// the physics predicts where that is sharper. It logs
// the fused figures and every entry's agreement for the report.
func TestChainFaultSignatures(t *testing.T) {
	if testing.Short() {
		t.Skip("whole chain on simulated days: skipped with -short")
	}
	cases := signatureCases()
	day := func(f reality.Faults) *reality.Day {
		d := reality.Default()
		d.Keys, d.ExactKnowledge = reality.KeysV1, true
		d.Car.Front.StictionMm, d.Car.Rear.StictionMm = 0, 0
		d.Faults = f
		return d
	}
	const seed = 3
	cdir, _ := write(t, day(reality.Faults{}), seed)
	clean := fuseDay(t, cdir)
	t.Logf("clean:%s", agreementLine(clean))
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir, tr := write(t, day(tc.fault), seed)
			res := fuseDay(t, dir)
			for _, f := range figures(res, tr) {
				t.Logf("%-24s %+.4f ± %.4f  truth %+.4f  z %+.1f", f.name, f.est.Mean, f.est.SD, f.truth, (f.est.Mean-f.truth)/f.est.SD)
			}
			t.Logf("agreement:%s", agreementLine(res))
			if tc.entry == "" {
				return
			}
			a, ok1 := standalone(res, tc.entry, tc.config, tc.axle)
			b, ok2 := standalone(clean, tc.entry, tc.config, tc.axle)
			if !ok1 || !ok2 {
				t.Fatalf("no standalone %s %s %s", tc.entry, tc.config, tc.axle)
			}
			t.Logf("%s alone on %s %s: %+.4f ± %.4f, clean %+.4f ± %.4f (%+.1f sd)", tc.entry, tc.config, tc.axle,
				a.Mean, a.SD, b.Mean, b.SD, (a.Mean-b.Mean)/b.SD)
			if err := tc.check(a, b, tr); err != nil {
				t.Errorf("%s alone on %s %s: %v", tc.entry, tc.config, tc.axle, err)
			}
		})
	}
}

// signatureCase is a fault and the figure it should move.
type signatureCase struct {
	name                string
	fault               reality.Faults
	entry, config, axle string // the figure the fault should move
	check               func(faulty, clean fuse.Estimate, tr *reality.Truth) error
}

// beyond3sd passes when the fault moved the figure by more than 3 of the
// clean figure's sd.
func beyond3sd(a, b fuse.Estimate, _ *reality.Truth) error {
	if math.Abs(a.Mean-b.Mean) < 3*b.SD {
		return fmt.Errorf("moved by only %.1f sd", (a.Mean-b.Mean)/b.SD)
	}
	return nil
}

// signatureCases are the faults of TestChainFaultSignatures.
func signatureCases() []signatureCase {
	return []signatureCase{

		{"bump stop", reality.Faults{BumpStop: &reality.BumpStop{Axle: "rear", GapMm: 0.5, RateNPerMm: 400}},
			"rear-pot", "spoiler", "rear", beyond3sd},
		// A rigid body: the spot at x sees δ_r + (x − L)/L·(δ_r − δ_f), so
		// the laser alone reads β_r + (x − L)/L·(β_r − β_f·K_r/K_f), K the
		// heave rates to the ground (hand-worked). The laser's sd is mostly
		// its tyre-growth prior, shared with the clean day of the same
		// seed, so the shift is compared with this prediction (±30 %: the
		// growth nuisance absorbs part of it).
		{"laser behind the axle", reality.Faults{LaserAt: &reality.LaserAt{Sensor: "rear-laser", XM: 3.25}},
			"rear-laser", "spoiler", "rear", func(a, b fuse.Estimate, tr *reality.Truth) error {
				n, c := tr.Nuisances, tr.Configs[1]
				want := (3.25 - 2.45) / 2.45 * (c.Rear - c.Front*n.RearGroundNPerMm/n.FrontGroundNPerMm)
				if got := a.Mean - b.Mean; got/want < 0.7 || got/want > 1.3 {
					return fmt.Errorf("moved by %+.4f, the geometry predicts %+.4f", got, want)
				}
				return nil
			}},
		// Model v2 carries the acceleration load transfer (m·a·h_cg/L with
		// the window's mean acceleration), so a creeping speed no longer
		// moves the rear pot's figure beyond its error.
		{"creeping speed", reality.Faults{CreepKmhPerS: 0.75}, "rear-pot", "baseline", "rear", func(a, b fuse.Estimate, _ *reality.Truth) error {
			if math.Abs(a.Mean-b.Mean) > 3*b.SD {
				return fmt.Errorf("moved by %.1f sd; model v2 should absorb a creeping speed", (a.Mean-b.Mean)/b.SD)
			}
			return nil
		}},
		{"gusts", reality.Faults{Gusts: &reality.Gusts{RunSDMs: 2.5, WithinSDMs: 1}}, "", "", "", nil},
		{"unit slip", reality.Faults{UnitSlip: true}, "front-pot", "baseline", "front", beyond3sd},
		{"blocked tap", reality.Faults{BlockedTap: &reality.BlockedTap{Entry: "body-taps", Tap: "u4", Config: "spoiler"}},
			"body-taps", "spoiler", "rear", beyond3sd},
		{"inverted taps", reality.Faults{InvertedTaps: "body-taps"}, "body-taps", "baseline", "rear", beyond3sd},
		// The pot reads every height 12 % large, so its lift is 12 % large
		// (same seed, same noise: the ratio is exact but for the prior).
		{"gain error 12 %", reality.Faults{GainError: &reality.GainError{Sensor: "front-pot", Pct: 12}},
			"front-pot", "spoiler", "front", func(a, b fuse.Estimate, _ *reality.Truth) error {
				if r := a.Mean / b.Mean; math.Abs(r-1.12) > 0.01 {
					return fmt.Errorf("scaled by %.4f, want 1.12", r)
				}
				return nil
			}},
	}
}
