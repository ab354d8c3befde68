package checks_test

import (
	"encoding/json"
	"slices"
	"testing"

	"liftfuse/methods/checks"
	"liftfuse/methods/sim/reality"
)

// TestPlantedFaults: each planted fault, on 20 seeded days (4 under
// -short) of the independent simulator's default day (constant speed
// model; the fixed lift keeps the fault the same size every day), must
// trip its check on a faulty entry on at least its share of days, and no
// check may name a correct entry on more than 1 day in 20 (common
// practice, no source).
func TestPlantedFaults(t *testing.T) {
	days := 20
	if testing.Short() {
		days = 4
	}
	for _, f := range faults {
		t.Run(f.name, func(t *testing.T) {
			found, bystander := 0, 0
			for k := range days {
				seed := int64(2 * (k + 1))
				d := reality.Default()
				if f.plant != nil {
					f.plant(d)
				}
				var edit func(*testing.T, string)
				if f.edit != nil {
					edit = f.edit
				}
				c, r := simulate(t, d, seed, edit)
				hit, other := false, false
				for _, ch := range checks.Run(c, r) {
					if ch.Check == f.check && slices.Contains(f.faulty, ch.Entry) {
						hit = true
					}
					if !slices.Contains(f.faulty, ch.Entry) {
						other = true
						t.Logf("day %d: bystander: %+v", seed, ch)
					}
					if k == 0 {
						t.Logf("example: %+v", ch)
					}
				}
				if hit {
					found++
				} else {
					t.Logf("day %d: missed", seed)
				}
				if other {
					bystander++
				}
			}
			t.Logf("%s: found on %d of %d days, a bystander named on %d", f.name, found, days, bystander)
			if float64(found) < f.min*float64(days) {
				t.Errorf("%s found on %d of %d days", f.name, found, days)
			}
			if bystander > days/20 {
				t.Errorf("%s: a correct entry named on %d of %d days", f.name, bystander, days)
			}
		})
	}
}

// TestCheckJSON: the record carries the keys of result-format.md.
func TestCheckJSON(t *testing.T) {
	b, err := json.Marshal(checks.Check{Check: "height-not-linear", Entry: "rear-pot", Config: "wing-mid",
		Where: "windows above 140 km/h", PValue: 0.0004, Cause: "c", Action: "a"})
	if err != nil {
		t.Fatal(err)
	}
	want := `{"check":"height-not-linear","entry":"rear-pot","config":"wing-mid","where":"windows above 140 km/h","p_value":0.0004,"cause":"c","action":"a"}`
	if string(b) != want {
		t.Errorf("got %s\nwant %s (result-format.md, Model v2 adds)", b, want)
	}
}

// TestCleanDaysFalseAlarm: on clean days of the independent simulator (see
// day: stated values drawn about the true ones, friction, half the days
// with lift drawn from the prior and speed_model: linear) the share of
// checked entries (the three ride heights and the taps) with any check
// tripped must be at most 1 % per entry (model.md). 100 days make 400
// entry-days, so 4 trips at most; 10 days (none allowed) under -short.
func TestCleanDaysFalseAlarm(t *testing.T) {
	days := 100
	if testing.Short() {
		days = 10
	}
	tripped, n := 0, 0
	byCheck := map[string]int{}
	for k := range days {
		seed := int64(1 + k)
		c, r := simulate(t, day(seed), seed, nil)
		entries := map[string]bool{}
		for _, ch := range checks.Run(c, r) {
			t.Logf("day %d: %+v", seed, ch)
			entries[ch.Entry] = true
			byCheck[ch.Check]++
		}
		tripped += len(entries)
		n += 4
	}
	t.Logf("clean days: %d of %d entry-days tripped (%.2f %%); by check %v", tripped, n, 100*float64(tripped)/float64(n), byCheck)
	if float64(tripped) > 0.01*float64(n) {
		t.Errorf("false-alarm rate %d/%d above 1 %% per entry", tripped, n)
	}
}
