package checks

import "testing"

// TestUnitSlip: the speed-unit rule on top speeds against a reference;
// 1 m/s = 3.6 km/h exactly (SI Brochure, 9th ed., Table 8: km/h is not SI
// but 1 km/h = (1000/3600) m/s).
func TestUnitSlip(t *testing.T) {
	cases := []struct {
		name     string
		top, ref float64
		trips    bool
	}{
		{"m/s under km/h (150 km/h logged as 41.7)", 41.7, 150, true},
		{"km/h under m/s (41.7 m/s read as 150 m/s = 540 km/h)", 540, 150, true},
		{"same units", 148, 150, false},
		{"a slow day, not a factor 3.6", 90, 150, false},
		{"a fast day, not a factor 3.6", 200, 150, false},
		{"no speed", 0, 150, false},
	}
	for _, c := range cases {
		_, ok := unitSlip("e", "log", c.top, c.ref)
		if ok != c.trips {
			t.Errorf("%s: trips %v, want %v", c.name, ok, c.trips)
		}
	}
}
