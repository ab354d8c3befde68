package pressure_test

import (
	"math"
	"path/filepath"
	"testing"

	"liftfuse/methods/campaign"
	"liftfuse/methods/pressure"
	"liftfuse/methods/sim/reality"
)

// TestLoggedTapsSimulatedDay: the simulator writes one day's taps either as
// averaged readings (v1 keys) or as the time series they were averaged
// from (v2 keys, logged). Reduced through the campaign loader, both give
// the same configuration-mean C_L·A the taps imply at the speeds both
// hold, within 0.015 m² (about 5 % of the baseline's 0.26 m²; the scatter
// of single readings is about 0.02 m²: common practice, no source). The
// reference is the simulator's own averaging, outside this package.
func TestLoggedTapsSimulatedDay(t *testing.T) {
	cla := map[reality.Keys]map[string]float64{}
	for _, tc := range []struct {
		name string
		keys reality.Keys
	}{
		{"v1 averaged readings", reality.KeysV1},
		{"v2 taps logged in time", reality.KeysV2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			d := reality.Default()
			d.Keys = tc.keys
			d.Taps[0].Logged = true
			dir := t.TempDir()
			if _, err := d.Write(dir, 4); err != nil {
				t.Fatal(err)
			}
			c, err := campaign.Load(filepath.Join(dir, reality.CampaignFile), campaign.Options{})
			if err != nil {
				t.Fatal(err)
			}
			e := &c.Evidence.Pressure[0]
			if got := len(e.Logs) > 0; got != (tc.keys == reality.KeysV2) {
				t.Fatalf("entry has logs %v with keys %v", got, tc.keys)
			}
			res, err := pressure.Reduce(c, e, c.WindNuisance())
			if err != nil {
				t.Fatal(err)
			}
			sum, n := map[string]float64{}, map[string]float64{}
			for _, r := range res.Readings {
				for _, v := range []float64{110, 140} {
					if math.Abs(r.SpeedKmh-v) < 1 {
						sum[r.Config] += r.ImpliedCLA().Total
						n[r.Config]++
					}
				}
			}
			cla[tc.keys] = map[string]float64{}
			for cf := range sum {
				cla[tc.keys][cf] = sum[cf] / n[cf]
			}
		})
	}
	v1, v2 := cla[reality.KeysV1], cla[reality.KeysV2]
	if len(v1) == 0 || len(v1) != len(v2) {
		t.Fatalf("configurations at 110 and 140 km/h: v1 %v, v2 %v", v1, v2)
	}
	for cf, a := range v1 {
		if b, ok := v2[cf]; !ok || math.Abs(a-b) > 0.015 {
			t.Errorf("%s: implied C_L·A %.4f m² from readings, %.4f m² from the logs", cf, a, b)
		}
		t.Logf("%s: implied C_L·A %.4f m² from readings, %.4f m² from the logs", cf, a, v2[cf])
	}
}
