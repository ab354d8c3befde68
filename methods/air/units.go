package air

import "fmt"

// Force units for display.
const (
	UnitN   = "N"
	UnitKgf = "kgf"
	UnitLbf = "lbf"
)

// Unit conversions. Exact by definition unless noted.
const (
	// StandardGravity is g_n in m/s², exact by the 3rd CGPM (1901).
	StandardGravity = 9.80665
	// PoundMass is the international avoirdupois pound in kg (exact, 1959).
	PoundMass = 0.45359237
	// MileM is the international mile in metres (exact, 1959).
	MileM = 1609.344
)

// KmhToMs converts km/h to m/s.
func KmhToMs(v float64) float64 { return v / 3.6 }

// MsToKmh converts m/s to km/h.
func MsToKmh(v float64) float64 { return v * 3.6 }

// MphToMs converts miles per hour to m/s.
func MphToMs(v float64) float64 { return v * MileM / 3600 }

// MsToMph converts m/s to miles per hour.
func MsToMph(v float64) float64 { return v * 3600 / MileM }

// NewtonsPer returns how many newtons one of the force unit is: 1 for N,
// g_n for kgf, g_n·0.45359237 for lbf.
func NewtonsPer(unit string) (float64, error) {
	switch unit {
	case UnitN:
		return 1, nil
	case UnitKgf:
		return StandardGravity, nil
	case UnitLbf:
		return StandardGravity * PoundMass, nil
	}
	return 0, fmt.Errorf("unknown force unit %q (want N, kgf or lbf)", unit)
}

// FromNewtons converts a force in newtons to the unit.
func FromNewtons(f float64, unit string) (float64, error) {
	k, err := NewtonsPer(unit)
	return f / k, err
}

// ToNewtons converts a force in the unit to newtons.
func ToNewtons(f float64, unit string) (float64, error) {
	k, err := NewtonsPer(unit)
	return f * k, err
}
