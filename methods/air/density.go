package air

import "math"

// Air constants of the CIPM-2007 equation for the density of moist air.
//
//	A. Picard, R. S. Davis, M. Gläser, K. Fujii, "Revised formula for the
//	density of moist air (CIPM-2007)", Metrologia 45 (2008) 149–155.
const (
	gasConstant = 8.314472    // R, J/(mol·K), as CIPM-2007 uses it
	molarWater  = 18.01528e-3 // M_v, kg/mol
	molarDryAir = 28.96546e-3 // M_a at x_CO2 = 0.0004, kg/mol
	celsiusZero = 273.15      // K
)

// Density returns the density of moist air in kg/m³ by CIPM-2007 from the
// temperature t (°C), pressure p (Pa), relative humidity h (0…1) and CO₂
// mole fraction xCO2 (0.0004 for 400 ppm):
//
//	ρ = p·M_a / (Z·R·T) · [1 − x_v·(1 − M_v/M_a)]
//	M_a = [28.96546 + 12.011·(x_CO2 − 0.0004)]·10⁻³ kg/mol
//	x_v = h·f(p,t)·p_sv(T)/p
//	p_sv = exp(A·T² + B·T + C + D/T)           (saturation vapour pressure)
//	f = α + β·p + γ·t²                          (enhancement factor)
//	Z = 1 − p/T·[a0 + a1·t + a2·t² + (b0 + b1·t)·x_v + (c0 + c1·t)·x_v²]
//	      + p²/T²·(d + e·x_v²)                  (compressibility)
//
// with T = t + 273.15 K (Picard et al., Metrologia 45 (2008) 149, eqs. 1–4 and
// appendix A). The formula is stated for 15–27 °C and 60–110 kPa; outside that
// it extrapolates smoothly, well within the needs of on-road testing.
func Density(t, p, h, xCO2 float64) float64 {
	T := t + celsiusZero
	const (
		A = 1.2378847e-5  // K⁻²
		B = -1.9121316e-2 // K⁻¹
		C = 33.93711047
		D = -6.3431645e3 // K
	)
	psv := math.Exp(A*T*T + B*T + C + D/T)
	const (
		alpha = 1.00062
		beta  = 3.14e-8 // Pa⁻¹
		gamma = 5.6e-7  // K⁻²
	)
	f := alpha + beta*p + gamma*t*t
	xv := h * f * psv / p
	const (
		a0 = 1.58123e-6 // K/Pa
		a1 = -2.9331e-8 // 1/Pa
		a2 = 1.1043e-10 // 1/(K·Pa)
		b0 = 5.707e-6   // K/Pa
		b1 = -2.051e-8  // 1/Pa
		c0 = 1.9898e-4  // K/Pa
		c1 = -2.376e-6  // 1/Pa
		d  = 1.83e-11   // K²/Pa²
		e  = -0.765e-8  // K²/Pa²
	)
	Z := 1 - p/T*(a0+a1*t+a2*t*t+(b0+b1*t)*xv+(c0+c1*t)*xv*xv) + p*p/(T*T)*(d+e*xv*xv)
	Ma := molarDryAir + 12.011e-3*(xCO2-0.0004)
	return p * Ma / (Z * gasConstant * T) * (1 - xv*(1-molarWater/Ma))
}

// DynamicPressure returns q = ½·ρ·V² in Pa for a density in kg/m³ and an
// airspeed in m/s.
func DynamicPressure(rho, v float64) float64 { return 0.5 * rho * v * v }
