package steady

import "testing"

// TestBandAdmits: the steady-window rule (model.md, "Steady windows":
// every sample within ±tol of the window mean), worked by hand on a band
// of 100 and 101 km/h (mean 100.5) with tol = 1 km/h.
func TestBandAdmits(t *testing.T) {
	tests := []struct {
		name string
		v    float64
		want bool
	}{
		{"inside", 100.5, true},
		{"new mean 101: 100 is 1.0 below, on the edge", 102, true},
		{"new mean 101.33: 100 is 1.33 below", 103, false},
		{"new mean 99.33: 101 is 1.67 above", 97, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var b Band
			b.Add(100)
			b.Add(101)
			if got := b.Admits(tt.v, 1); got != tt.want {
				t.Errorf("Admits(%g) = %v, want %v", tt.v, got, tt.want)
			}
		})
	}
	var empty Band
	if !empty.Admits(1e9, 0) || empty.Mean() != 0 {
		t.Errorf("an empty band must admit anything and have mean 0")
	}
}
