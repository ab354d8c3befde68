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

// threePotSpec adds a third front pot (the same springs and wind):
// with three informative front entries (and the taps) a single faulty one
// can be told apart from the others.
const threePotSpec = twoPotSpec + "  - {id: fpot3, axle: front, sensor: pot, noise_mm: 0.3}\n"

func agreementOf(t *testing.T, res *fuse.Result, id string) *fuse.Agreement {
	t.Helper()
	for _, m := range res.Methods {
		if m.ID == id && m.Agreement != nil {
			return m.Agreement
		}
	}
	t.Fatalf("no agreement for %q", id)
	return nil
}

// TestTwoPotGainFault: two front pots share the front springs' scale groups
// and the wind; one reads 12 % high (a gain error, 12 prior sd of a 1 %
// calibration). Counting the shared springs once, the leave-one-out
// predictive of its data must reject it (p < 0.01; issue 12 measured 9e-5
// once the spring prior is counted once, against 0.58 when the standalone
// and others' covariances are added); on the same day without the fault
// neither pot is rejected. With the fault, the data cannot tell which of
// the two pots is wrong (the taps are too loose to say): both are
// suspects, each with P(off) ≥ 0.2 (0.02 on the clean day). The headline
// is the robust fusion's, down-weighting the pots whose P(off) exceeds ½,
// if any (model.md's rule; no data are condemned here), else the plain one;
// either way it covers the truth (0.10 and 0.12 m², the spec's values)
// within 3 sd. (P(off) of both pots was 0.73 while a window's acceleration
// error read 1.6 times too small; with it honest it is 0.41, p 0.004 and
// 0.003: rejected, not past ½.)
func TestTwoPotGainFault(t *testing.T) {
	cases := []struct {
		name    string
		gainPct float64
		reject  bool
	}{
		{"clean", 0, false},
		{"fpot reads 12 % high", 12, true},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			f, err := fuse.Run(simInput(t, fmt.Sprintf(twoPotSpec, 5, tc.gainPct), []float64{100}))
			if err != nil {
				t.Fatal(err)
			}
			var off []string // the pots with P(off) > ½, which the robust headline down-weights
			for _, id := range []string{"fpot", "fpot2"} {
				ag := agreementOf(t, f.Result, id)
				t.Logf("%s: p = %.3g, P(off) = %.2f", id, ag.PValue, ag.POff)
				if tc.reject != (ag.PValue < 0.01) || tc.reject != ag.Suspect {
					t.Errorf("%s: p = %.3g, suspect %v; want rejection %v", id, ag.PValue, ag.Suspect, tc.reject)
				}
				if ag.POff > 0.5 {
					off = append(off, id)
				}
				// The robust layer must see the fault too: P(off) 0.41 with
				// it, 0.02 without (measured); 0.2 is ten clean days' worth.
				if tc.reject && ag.POff < 0.2 {
					t.Errorf("%s: P(off) = %.2f with the fault, want ≥ 0.2", id, ag.POff)
				}
			}
			res := f.Result
			if !tc.reject && len(off) > 0 {
				t.Errorf("clean day: %v with P(off) > ½", off)
			}
			if want := map[bool]string{false: fuse.HeadlinePlain, true: fuse.HeadlineRobust}[len(off) > 0]; res.Headline != want || fmt.Sprint(res.DownWeighted) != fmt.Sprint(off) {
				t.Errorf("headline %q, down-weighted %v; want %q, %v", res.Headline, res.DownWeighted, want, off)
			}
			for _, c := range res.Configs {
				truth := map[string]float64{"base": 0.10, "wing": 0.12}[c.ID]
				if z := (c.Front.CLA.Mean - truth) / c.Front.CLA.SD; math.Abs(z) > 3 {
					t.Errorf("%s front %.4f ± %.4f is %.1f sd from the truth %.2f", c.ID, c.Front.CLA.Mean, c.Front.CLA.SD, z, truth)
				}
			}
		})
	}
}

// TestFaultRankedFirst: three front pots, one of them (fpot) reading 12 %
// high, plus a rear pot and the taps. On every seeded day the faulty pot
// must have the largest P(off) and no correct entry may be flagged; where
// its P(off) exceeds ½ the headline must be the robust fusion's with fpot
// alone down-weighted and the plain fusion kept beside it; either way the
// headline front C_L·A must lie within 3 sd of the truth (0.10 and 0.12 m²,
// the spec's values). The 12 % error is 12 prior sd of the pot's 1 %
// calibration but only 2.4 sd of the κ-widened "off" prior, so P(off) need
// not pass ½ every day; it must on most.
func TestFaultRankedFirst(t *testing.T) {
	days := 6
	if testing.Short() {
		days = 2
	}
	truth := map[string]float64{"base": 0.10, "wing": 0.12}
	robust := 0
	for day := range days {
		t.Run(fmt.Sprintf("seed %d", 40+day), func(t *testing.T) {
			f, err := fuse.Run(simInput(t, fmt.Sprintf(threePotSpec, 40+day, 12.0), []float64{100}))
			if err != nil {
				t.Fatal(err)
			}
			res := f.Result
			bad := agreementOf(t, res, "fpot")
			for _, m := range res.Methods {
				ag := m.Agreement
				t.Logf("%s: p = %.3g, P(off) = %.3f, flag %v", m.ID, ag.PValue, ag.POff, ag.Suspect)
				if m.ID != "fpot" && (ag.POff >= bad.POff || ag.Suspect) {
					t.Errorf("correct entry %s: P(off) %.3f (faulty pot %.3f), flagged %v", m.ID, ag.POff, bad.POff, ag.Suspect)
				}
			}
			if day == 0 {
				diagnoseGainFault(t, f)
				headlineEverywhere(t, f)
			}
			if bad.POff > 0.5 {
				robust++
				if res.Headline != fuse.HeadlineRobust || len(res.DownWeighted) != 1 || res.DownWeighted[0] != "fpot" || res.Plain == nil {
					t.Fatalf("headline %q, down-weighted %v, plain present %v; want robust, [fpot], true", res.Headline, res.DownWeighted, res.Plain != nil)
				}
			}
			for _, c := range res.Configs {
				z := (c.Front.CLA.Mean - truth[c.ID]) / c.Front.CLA.SD
				t.Logf("%s front, %s headline: %.4f ± %.4f (%+.1f sd)", c.ID, res.Headline, c.Front.CLA.Mean, c.Front.CLA.SD, z)
				if math.Abs(z) > 3 {
					t.Errorf("%s front: headline %.4f ± %.4f is %.1f sd from the truth %.2f", c.ID, c.Front.CLA.Mean, c.Front.CLA.SD, z, truth[c.ID])
				}
			}
		})
	}
	t.Logf("P(off) of the faulty pot above ½ on %d of %d days", robust, days)
	if 2*robust < days {
		t.Errorf("P(off) of the faulty pot above ½ on only %d of %d days", robust, days)
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

// diagnoseGainFault: the faulty pot's diagnosis may name only its own
// errors (the front springs and the wind are shared with the other pots,
// so they move both sides alike), within their physical bounds — a 12 %
// gain error is 12 sd of a 1 % calibration, so nothing qualifies — and
// its trade checks are a ride-height entry's, not the taps'.
func diagnoseGainFault(t *testing.T, f *fuse.Fused) {
	t.Helper()
	cc, err := f.Diagnose("fpot")
	if err != nil || cc == nil {
		t.Fatalf("diagnosis of fpot: %v, %v", cc, err)
	}
	t.Logf("diagnosis: %s; %s; %+v; checks %q", cc.Verdict, cc.Summary, cc.Explanations, cc.Checks)
	for _, e := range cc.Explanations {
		if strings.Contains(e.Nuisance, "spring") || strings.Contains(e.Nuisance, "wind") || math.Abs(e.ShiftSD) > 4 {
			t.Errorf("diagnosis names a shared or implausible error: %+v", e)
		}
	}
	if cc.Verdict != fuse.VerdictUnexplained || cc.Summary != "no single modelled error explains it" {
		t.Errorf("verdict %q (%s), want unexplained", cc.Verdict, cc.Summary)
	}
	if !containsText(cc.Checks, "bracket") || containsText(cc.Checks, "tap tube") {
		t.Errorf("checks %q, want a ride-height entry's", cc.Checks)
	}
	if d, _ := f.Diagnose("rpot"); d != nil {
		t.Errorf("an entry that is not flagged is diagnosed: %+v", d)
	}
}

// headlineEverywhere: with a robust headline, plan and crosscheck start
// from the robust posterior and say so; the plain posterior stays at hand.
func headlineEverywhere(t *testing.T, f *fuse.Fused) {
	t.Helper()
	res := f.Result
	if res.Headline != fuse.HeadlineRobust || f.Posterior == f.Plain {
		t.Fatalf("headline %q; robust posterior distinct from the plain one: %v", res.Headline, f.Posterior != f.Plain)
	}
	pl, err := f.PlanRepeats(fuse.Target{Config: "wing", Axle: "front", Versus: "base"}, func(string) float64 { return 1 })
	if err != nil {
		t.Fatal(err)
	}
	if pl.Headline != fuse.HeadlineRobust || len(pl.DownWeighted) != 1 || math.Abs(pl.Target.Now.Mean-res.Deltas[0].Front.CLA.Mean) > 1e-12 {
		t.Errorf("plan: headline %q %v, now %+v; the robust delta is %+v", pl.Headline, pl.DownWeighted, pl.Target.Now, res.Deltas[0].Front.CLA)
	}
	cc, err := f.Crosscheck(fuse.Claim{Config: "base", Axle: "front", SpeedKmh: 100, Value: 0.10, SD: 0.01, Unit: "m2"}, res.Air.DensityKgM3)
	if err != nil {
		t.Fatal(err)
	}
	if cc.Headline != fuse.HeadlineRobust || math.Abs(cc.Predictive.Mean-res.Configs[0].Front.CLA.Mean) > 1e-12 {
		t.Errorf("crosscheck: headline %q, predictive %+v; the robust base front is %+v", cc.Headline, cc.Predictive, res.Configs[0].Front.CLA)
	}
}

// falseAlarms fuses a number of clean days and returns the flags raised
// (p < 0.01 or P(off) > ½) and the entry-days checked.
func falseAlarms(t *testing.T, days int, day func(i int) string) (flags, n int) {
	for i := range days {
		f, err := fuse.Run(simInput(t, day(i), []float64{100}))
		if err != nil {
			t.Fatal(err)
		}
		for _, m := range f.Result.Methods {
			n++
			if m.Agreement.Suspect {
				flags++
				t.Logf("day %d: %s flagged (p = %.3g, P(off) = %.2f)", i, m.ID, m.Agreement.PValue, m.Agreement.POff)
			}
		}
	}
	return flags, n
}

// TestCleanFalseAlarms: on clean simulated days (nothing planted, the
// uncertain parts at the values the campaign declares) the agreement flag
// must trip on at most 1 % of entry-days, the false-alarm rate model.md
// asks of every model check. 50 days of five entries (two pots, a laser,
// the taps, a tuft) in the full run.
func TestCleanFalseAlarms(t *testing.T) {
	days := 50
	if testing.Short() {
		days = 4
	}
	flags, n := falseAlarms(t, days, func(i int) string { return fmt.Sprintf(simSpec, 1000+i, 0.5, "constant", plainWing, "80, 120, 150") })
	t.Logf("%d flags in %d entry-days (%.1f %%)", flags, n, 100*float64(flags)/float64(n))
	if float64(flags) > 0.01*float64(n) {
		t.Errorf("%d flags in %d clean entry-days, want ≤ 1 %%", flags, n)
	}
}

// TestPriorDrawnFalseAlarms: clean days whose uncertain parts are drawn
// from the declared priors (priorDay). Here the leave-one-out check meets
// the adapters' error models at their tails: measured 10 flags in 250
// entry-days (4.0 %) over these 50 days — the pots on days with a
// spring or uncovered-patch Cp draw beyond 2.3 prior sd, the laser on a
// day whose tyre growth was drawn 3.2 sd high. The entries' data really
// disagree beyond their stated errors there; the same check is calibrated
// on data drawn from its own model (TestAgreementCalibrated). The bound is
// a regression guard at 6 %, not the 1 % goal.
func TestPriorDrawnFalseAlarms(t *testing.T) {
	if testing.Short() {
		t.Skip("50 simulated days")
	}
	rng := newTestRand(4242)
	flags, n := falseAlarms(t, 50, func(i int) string { return priorDay(t, rng, 2000+i) })
	t.Logf("%d flags in %d entry-days (%.1f %%)", flags, n, 100*float64(flags)/float64(n))
	if float64(flags) > 0.06*float64(n) {
		t.Errorf("%d flags in %d entry-days, want ≤ 6 %%", flags, n)
	}
}

// TestDiagnoseTyreGrowth: a rear laser whose tyres grow more than its
// prior of 0.5 ± 0.5 mm at 100 km/h says. The laser alone is flagged; its
// diagnosis names its tyre growth first, at the planted value (the
// simulation's truth) within 0.3 mm, when that is within 4 prior sd
// (2.3 mm: 3.6 sd); at 3.5 mm (6 sd) no single error within the bounds
// explains it, and the diagnosis says so with a ride-height entry's
// checks.
func TestDiagnoseTyreGrowth(t *testing.T) {
	seeds := []int{3, 4, 5}
	if testing.Short() {
		seeds = seeds[:1]
	}
	cases := []struct {
		name    string
		growth  float64
		verdict string
	}{
		{"3.6 sd", 2.3, fuse.VerdictExplained},
		{"6 sd", 3.5, fuse.VerdictUnexplained},
	}
	for _, tc := range cases {
		for _, seed := range seeds {
			t.Run(fmt.Sprintf("%s seed %d", tc.name, seed), func(t *testing.T) {
				f, err := fuse.Run(simInput(t, fmt.Sprintf(simSpec, seed, tc.growth, "constant", plainWing, "80, 120, 150"), []float64{100}))
				if err != nil {
					t.Fatal(err)
				}
				if got := flagged(f.Result); len(got) != 1 || got[0] != "rlaser" {
					t.Fatalf("flagged %v, want [rlaser]", got)
				}
				cc, err := f.Diagnose("rlaser")
				if err != nil || cc == nil {
					t.Fatalf("diagnosis %v, %v", cc, err)
				}
				t.Logf("%s: %s", cc.Verdict, cc.Summary)
				if cc.Verdict != tc.verdict {
					t.Fatalf("verdict %q, want %q", cc.Verdict, tc.verdict)
				}
				if tc.verdict == fuse.VerdictExplained {
					first := cc.Explanations[0]
					if !strings.Contains(first.Nuisance, "tyre growth") || math.Abs(first.Value-tc.growth) > 0.3 || first.ShiftSD <= 2 || first.ShiftSD > 4 {
						t.Errorf("first explanation %+v, want the rear tyre growth at %.1f mm", first, tc.growth)
					}
				} else if len(cc.Explanations) != 0 || !containsText(cc.Checks, "tyre pressure") || containsText(cc.Checks, "tap tube") {
					t.Errorf("explanations %+v, checks %q; want none, a ride-height entry's checks", cc.Explanations, cc.Checks)
				}
			})
		}
	}
}
