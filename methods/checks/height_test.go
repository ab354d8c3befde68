package checks

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
)

// synthetic builds a ride-height result by hand: two windows at each of
// 0, 40, 80, 100, 120, 140 and 160 km/h (four at 0 and 40), 10 s at 10 Hz
// with SE 0.1 mm, heights h(q) plus seeded noise of that SE (invented).
func synthetic(seed uint64, h func(q float64) float64) (*campaign.Campaign, *height.Result) {
	rng := rand.New(rand.NewPCG(seed, 3))
	rho := 1.2
	var ws []height.Window
	t := 0.0
	for _, v := range []float64{0, 0, 0, 0, 40, 40, 40, 40, 80, 80, 100, 100, 120, 120, 140, 140, 160, 160} {
		q := air.DynamicPressure(rho, air.KmhToMs(v))
		ws = append(ws, height.Window{Config: "wing", From: t, To: t + 10, N: 100, NEff: 20, SpeedKmh: v,
			SpeedSq: v * v / 1e4, Q: q, HeightMM: h(q) + 0.1*rng.NormFloat64(), SE: 0.1})
		t += 30
	}
	e := &campaign.RideHeightEntry{ID: "rear-pot", Axle: "rear", Sensor: campaign.SensorPot, Logs: []campaign.LogSpec{{File: "day.csv"}}}
	c := &campaign.Campaign{Prior: campaign.Prior{SpeedModel: campaign.SpeedConstant}}
	return c, &height.Result{Entry: e, Windows: ws, Calibration: height.Calibration{Gain: 24}}
}

// TestHeightNotLinearSynthetic: a 50 N/mm axle under −0.25 m² (heights
// −q·0.25/50 mm) meets a bump stop at the deflection of 130 km/h, beyond
// which it is four times stiffer (common practice for a bump rubber, no
// source): the check must trip and cut at 130 km/h, or at 150 km/h when
// noise hides the 0.47 mm the stop takes off at 140 km/h (the 160 km/h
// windows, 1.5 mm off, must go). A straight line must not trip; springs
// that stiffen from the start must trip.
func TestHeightNotLinearSynthetic(t *testing.T) {
	q130 := air.DynamicPressure(1.2, air.KmhToMs(130))
	line := func(q float64) float64 { return -q * 0.25 / 50 }
	cases := []struct {
		name  string
		h     func(q float64) float64
		where string // "" for no trip, "any", or the accepted places separated by |
	}{
		{"linear", line, ""},
		{"bump stop at 130 km/h", func(q float64) float64 {
			if q > q130 {
				return line(q130) + line(q-q130)/4
			}
			return line(q)
		}, "windows above 130 km/h|windows above 150 km/h"},
		{"progressive from the start", func(q float64) float64 { return line(q) * (1 - q/1500) }, "any"},
	}
	for _, c := range cases {
		for seed := uint64(1); seed <= 5; seed++ {
			cp, r := synthetic(seed, c.h)
			got := notLinear(cp, r, heightFits(cp, r, newEntryData(cp, r)))
			switch {
			case c.where == "" && len(got) > 0:
				t.Errorf("%s (seed %d): tripped: %v", c.name, seed, got)
			case c.where == "any" && len(got) == 0:
				t.Errorf("%s (seed %d): not tripped", c.name, seed)
			case c.where != "" && c.where != "any" && (len(got) != 1 || !oneOf(got[0].Where, c.where)):
				t.Errorf("%s (seed %d): %v, want one check at %q", c.name, seed, got, c.where)
			case len(got) == 1 && !strings.Contains(got[0].Action, "rear-pot"):
				t.Errorf("%s: action does not name the entry: %q", c.name, got[0].Action)
			}
		}
	}
}

// TestResidualSynthetic: one window 1 mm (10 SE) off a straight line is
// named with its time span; none is named on the clean line.
func TestResidualSynthetic(t *testing.T) {
	line := func(q float64) float64 { return -q * 0.25 / 50 }
	for seed := uint64(1); seed <= 5; seed++ {
		c, r := synthetic(seed, line)
		check := func() []Check { // the windows as they stand now
			d := newEntryData(c, r)
			return residuals(c, r, d, heightFits(c, r, d))
		}
		if got := check(); len(got) > 0 {
			t.Errorf("seed %d: clean line tripped %v", seed, got)
		}
		r.Windows[12].HeightMM += 1
		got := check()
		if len(got) != 1 || !strings.Contains(got[0].Where, "360–370 s") || math.IsNaN(got[0].PValue) {
			t.Errorf("seed %d: %v, want the window at 360–370 s", seed, got)
		}
	}
}

func oneOf(s, alternatives string) bool {
	for _, a := range strings.Split(alternatives, "|") {
		if s == a {
			return true
		}
	}
	return false
}
