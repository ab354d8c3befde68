package reality_test

// Issue 12's done-when, on days of this independent simulator run through
// the whole tool as the CLI runs it (fuseDay: loader, adapters, model
// checks, fusion).

import (
	"fmt"
	"math"
	"slices"
	"testing"

	"liftfuse/fuse"
	"liftfuse/methods/sim/reality"
)

// localiseCase is a planted fault and the entries it makes wrong.
type localiseCase struct {
	name   string
	plant  func(f *reality.Faults)
	faulty []string
}

// localiseCases are issue 12's faults on the default day (two pots, a
// rear laser, roof-and-floor taps; stated values drawn about the true
// ones; friction 0.15 mm). A bump stop belongs to the axle, so both rear
// ride-height entries read it; the speed column is shared by every
// ride-height entry of the log.
func localiseCases() []localiseCase {
	return []localiseCase{
		{"a tap blocked in one configuration", func(f *reality.Faults) {
			f.BlockedTap = &reality.BlockedTap{Entry: "body-taps", Tap: "u4", Config: "spoiler"}
		}, []string{"body-taps"}},
		{"rear bump-stop contact at speed", func(f *reality.Faults) {
			f.BumpStop = &reality.BumpStop{Axle: "rear", GapMm: 0.5, RateNPerMm: 400}
		}, []string{"rear-pot", "rear-laser"}},
		{"speed in m/s under a km/h column", func(f *reality.Faults) { f.UnitSlip = true },
			[]string{"front-pot", "rear-pot", "rear-laser"}},
		{"tap readings with their sign inverted", func(f *reality.Faults) { f.InvertedTaps = "body-taps" }, []string{"body-taps"}},
	}
}

// headlineOff returns the headline figures (every configuration's front,
// rear and total C_L·A, every difference to the reference) farther than
// 3 sd from the truth.
func headlineOff(res *fuse.Result, tr *reality.Truth) []string {
	var out []string
	for _, f := range figures(res, tr) {
		if z := (f.est.Mean - f.truth) / f.est.SD; !(math.Abs(z) <= 3) {
			out = append(out, fmt.Sprintf("%s %+.4f ± %.4f against %+.4f (%+.1f sd)", f.name, f.est.Mean, f.est.SD, f.truth, z))
		}
	}
	return out
}

// TestFaultsLocalised: on each of 20 seeded days (3 under -short) per
// fault, the tool's list of suspects (Result.Suspects: the entries a model
// check names, then those the agreement test flags) must begin with a
// faulty entry and hold no correct entry above any faulty one, and every
// headline figure must lie within 3 sd of the truth (issue 12). A correct
// entry may follow the faulty ones (a false alarm of its own); those are
// counted in the log.
func TestFaultsLocalised(t *testing.T) {
	days := 20
	if testing.Short() {
		days = 3
	}
	for _, tc := range localiseCases() {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			first, bystanders := 0, 0
			for seed := int64(1); seed <= int64(days); seed++ {
				d := reality.Default()
				tc.plant(&d.Faults)
				dir, tr := write(t, d, seed)
				res := fuseDay(t, dir)
				sus := res.Suspects()
				t.Logf("seed %d: suspects %v, headline %s, down-weighted %v", seed, sus, res.Headline, res.DownWeighted)
				if len(sus) > 0 && slices.Contains(tc.faulty, sus[0]) {
					first++
				} else {
					t.Errorf("seed %d: suspects %v, want a faulty entry of %v first", seed, sus, tc.faulty)
				}
				for i, id := range sus {
					if slices.Contains(tc.faulty, id) {
						continue
					}
					bystanders++
					if slices.ContainsFunc(sus[i:], func(s string) bool { return slices.Contains(tc.faulty, s) }) {
						t.Errorf("seed %d: correct entry %s above a faulty one in %v", seed, id, sus)
					}
				}
				for _, off := range headlineOff(res, tr) {
					t.Errorf("seed %d: headline %s", seed, off)
				}
			}
			t.Logf("%s: a faulty entry named first on %d of %d days; correct entries named after it %d times", tc.name, first, days, bystanders)
		})
	}
}

// TestCleanFalseAlarms: on 50 clean default days (skipped under -short:
// a rate of 1 % needs hundreds of entry-days to be seen) an entry is named
// — by a model check or as an agreement suspect (p < 0.01 or P(off) > ½) — on
// at most 1 % of the entry-days, model.md's budget ("Model checks": ≤ 1 %
// per entry on a clean day), pooled over the four entries: at most 2 of
// 200, and no entry on more than 2 of its 50 days. Measured with the
// window ends left out and friction at rest modelled (methods/height
// edge.go, obs.go): 0 of 200. Over 200 days (days raised by hand, not
// committed): 5 of 800 (0.62 %) — body taps 2, front pot, rear pot and
// rear laser 1 each, every entry ≤ 1 %; the headline figures lay within
// 1.645 sd of the truth 1 506 of 1 600 times (94 %, 90 % nominal), and the four
// beyond 3 sd are all on seed 48, whose front springs are drawn far in
// their prior's tail. Before the window ends and friction were modelled:
// 5 of 800 with the front pot on 3 of 200 (1.5 %), coverage 83.5 %. The
// plain headline's figures may stray beyond 3 sd by
// chance alone (P = 0.27 % each, 1.1 expected in 400): more than 4
// (P < 1 %, binomial tail; common practice, no source) fails.
func TestCleanFalseAlarms(t *testing.T) {
	if testing.Short() {
		t.Skip("50 simulated days")
	}
	const days = 50
	flags, n, figs, far := 0, 0, 0, 0
	byEntry := map[string]int{}
	for seed := int64(1); seed <= int64(days); seed++ {
		dir, tr := write(t, reality.Default(), seed)
		res := fuseDay(t, dir)
		n += len(res.Methods)
		for _, id := range res.Suspects() {
			flags++
			byEntry[id]++
			t.Logf("seed %d: %s named", seed, id)
		}
		figs += len(figures(res, tr))
		for _, off := range headlineOff(res, tr) {
			far++
			t.Logf("seed %d: headline %s", seed, off)
		}
	}
	t.Logf("clean days: %d entries named in %d entry-days (%.2f %%); by entry %v; %d of %d headline figures beyond 3 sd",
		flags, n, 100*float64(flags)/float64(n), byEntry, far, figs)
	if float64(flags) > 0.01*float64(n) {
		t.Errorf("%d entries named in %d clean entry-days, want ≤ 1 %%", flags, n)
	}
	for id, k := range byEntry {
		if k > 2 {
			t.Errorf("%s named on %d of %d clean days, want ≤ 2 (at 1 %% a day, 3 or more has P ≈ 1.4 %%, Poisson tail; common practice, no source)", id, k, days)
		}
	}
	if far > 4 {
		t.Errorf("%d of %d headline figures beyond 3 sd, want ≤ 4", far, figs)
	}
}

// TestTwoPotGainReality: a second front pot whose calibration is stated
// 12 % off (issue 12's two-pot case) on 20 seeded default days (skipped
// under -short). The leave-one-out agreement must reject the faulty pot
// (p < 0.01) on at least 14 of the 20 days. This is a regression guard,
// not the goal (every day): measured 17 of 20, median p 0.0023, since a
// window's statistics leave out the ramps at its ends (methods/height,
// edge.go; 12 of 20 before). 14 is the measurement less about two
// binomial sd (√(20·0.85·0.15) ≈ 1.6). The correct pot is also below 0.01
// on 17 days and the faulty pot's p is below the correct one's on only 3:
// with the taps as loose as they are, the data cannot tell which of two
// pots on one axle is wrong, only that they disagree. So that a test that
// rejected everything would fail, the entries off the two pots (rear
// pot, rear laser, taps) may be named on at most 2 of the 20 days
// (measured: none). The same case on the model's own simulator reaches
// p < 0.01 for both (fuse's TestTwoPotGainFault).
func TestTwoPotGainReality(t *testing.T) {
	if testing.Short() {
		t.Skip("20 simulated days")
	}
	const days = 20
	var ps []float64
	rejected, bystanders, okRej, first := 0, 0, 0, 0
	for seed := int64(1); seed <= days; seed++ {
		d := reality.Default()
		second := d.Sensors[0]
		second.ID = "front-pot-2"
		d.Sensors = append(d.Sensors, second)
		d.Faults.GainError = &reality.GainError{Sensor: "front-pot-2", Pct: 12}
		dir, _ := write(t, d, seed)
		res := fuseDay(t, dir)
		pOK, pBad := math.NaN(), math.NaN()
		for _, m := range res.Methods {
			if m.ID == "front-pot-2" && m.Agreement != nil {
				ps = append(ps, m.Agreement.PValue)
				pBad = m.Agreement.PValue
				if m.Agreement.PValue < 0.01 {
					rejected++
				}
				t.Logf("seed %d: faulty p %.4g", seed, m.Agreement.PValue)
			}
			if m.ID == "front-pot" && m.Agreement != nil {
				pOK = m.Agreement.PValue
			}
		}
		if pOK < 0.01 {
			okRej++
		}
		if pBad < pOK {
			first++
		}
		sus := res.Suspects()
		t.Logf("seed %d: suspects %v", seed, sus)
		if slices.ContainsFunc(sus, func(id string) bool { return id != "front-pot" && id != "front-pot-2" }) {
			bystanders++
		}
	}
	slices.Sort(ps)
	t.Logf("correct pot p < 0.01 on %d days; the faulty pot's p below the correct one's on %d", okRej, first)
	t.Logf("faulty pot rejected (p < 0.01) on %d of %d days; median p %.3g; an entry off the two pots named on %d days",
		rejected, len(ps), ps[len(ps)/2], bystanders)
	if len(ps) != days || rejected < 14 {
		t.Errorf("faulty pot rejected on %d of %d days (%d p-values), want ≥ 14", rejected, days, len(ps))
	}
	if bystanders > 2 {
		t.Errorf("an entry other than the two front pots named on %d of %d days, want ≤ 2", bystanders, days)
	}
}
