package air_test

import (
	"fmt"
	"math"
	"testing"

	"liftfuse/methods/air"
)

// mmHg is the conventional millimetre of mercury in Pa (101325/760).
const mmHg = 101325.0 / 760

func TestAirDensity(t *testing.T) {
	tests := []struct {
		name      string
		t, p, h   float64
		want, tol float64
		source    string
	}{
		{"CIPM-2007 reference point", 20, 101325, 0.5, 1.19931, 1e-5,
			"Picard et al., Metrologia 45 (2008) 149: 20 °C, 101.325 kPa, 50 % RH, x_CO2 = 0.0004"},
		{"cool and low", 10, 730 * mmHg, 0.4, 1.19569, 1e-5, "S. V. Gupta, Mass Metrology, p. 205"},
		{"hot", 40, 760 * mmHg, 0.4, 1.1150, 1e-4, "S. V. Gupta, Mass Metrology, p. 205"},
		// The ISA treats dry air as an ideal gas, so CIPM-2007 (a real gas)
		// agrees only to about 0.1 %.
		{"ISA sea level, dry", 15, 101325, 0, 1.2250, 1.2250 * 1e-3, "ISO 2533:1975, sea level"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := air.Density(tt.t, tt.p, tt.h, 0.0004)
			if math.Abs(got-tt.want) > tt.tol {
				t.Errorf("Density(%g °C, %g Pa, %g) = %.6f, want %.6f ± %g (%s)", tt.t, tt.p, tt.h, got, tt.want, tt.tol, tt.source)
			}
		})
	}
}

func TestAirDensityTrends(t *testing.T) {
	// Humid air is lighter than dry air (water's molar mass is below air's);
	// more CO₂ makes air heavier (common practice, no source).
	if air.Density(25, 100000, 0.9, 0.0004) >= air.Density(25, 100000, 0.1, 0.0004) {
		t.Error("humid air should be lighter than dry air")
	}
	if air.Density(20, 101325, 0.5, 0.0010) <= air.Density(20, 101325, 0.5, 0.0004) {
		t.Error("more CO₂ should make air heavier")
	}
}

func TestForceUnits(t *testing.T) {
	tests := []struct {
		unit string
		one  float64 // newtons in one unit
		src  string
	}{
		{air.UnitN, 1, "SI"},
		{air.UnitKgf, 9.80665, "standard gravity, 3rd CGPM (1901)"},
		{air.UnitLbf, 4.4482216152605, "0.45359237 kg × 9.80665 m/s², international pound (1959)"},
	}
	for _, tt := range tests {
		t.Run(tt.unit, func(t *testing.T) {
			n, err := air.ToNewtons(1, tt.unit)
			if err != nil || math.Abs(n-tt.one) > 1e-12 {
				t.Errorf("1 %s = %v N (%v), want %v (%s)", tt.unit, n, err, tt.one, tt.src)
			}
			back, _ := air.FromNewtons(n, tt.unit)
			if math.Abs(back-1) > 1e-15 {
				t.Errorf("round trip gives %v", back)
			}
		})
	}
	if _, err := air.NewtonsPer("kp"); err == nil {
		t.Error("unknown unit accepted")
	}
}

func TestSpeedUnits(t *testing.T) {
	// 1 mph = 0.44704 m/s exactly (international mile, 1959); 36 km/h = 10 m/s.
	if got := air.MphToMs(1); math.Abs(got-0.44704) > 1e-15 {
		t.Errorf("1 mph = %v m/s, want 0.44704", got)
	}
	if got := air.KmhToMs(36); got != 10 {
		t.Errorf("36 km/h = %v m/s, want 10", got)
	}
	if got := air.MsToMph(air.MphToMs(70)); math.Abs(got-70) > 1e-12 {
		t.Errorf("mph round trip = %v", got)
	}
}

func ExampleDensity() {
	// A mild, damp test morning: 19.5 °C, 1011 hPa, 62 % relative humidity.
	rho := air.Density(19.5, 101100, 0.62, 0.0004)
	q := air.DynamicPressure(rho, air.KmhToMs(120))
	fmt.Printf("ρ = %.4f kg/m³, q at 120 km/h = %.0f Pa\n", rho, q)
	// Output: ρ = 1.1976 kg/m³, q at 120 km/h = 665 Pa
}
