package reality

import "math"

// Gas constants of dry air and water vapour, J/(kg·K) (ISO 2533:1975 for
// dry air, 287.05287; water vapour R/M_v with M_v = 18.015 g/mol — from
// memory).
const (
	rDry    = 287.05287
	rVapour = 461.52
	kelvin  = 273.15
)

// SaturationPa returns the saturation vapour pressure over water at t °C,
// Magnus form e_s = 610.94·exp(17.625·t/(t + 243.04)) Pa (Alduchov &
// Eskridge, J. Appl. Meteor. 35 (1996) 601 — from memory).
func SaturationPa(t float64) float64 {
	return 610.94 * math.Exp(17.625*t/(t+243.04))
}

// Density returns the density of moist air, kg/m³, as an ideal mixture:
//
//	ρ = (p − e)/(R_d·T) + e/(R_v·T),  e = RH/100·e_s(t)
//
// with t in °C, p in hPa and RH in %. It ignores the compressibility
// (Z ≈ 0.9996 near sea level), so it reads about 0.04 % below CIPM-2007.
func Density(t, pHPa, rhPct float64) float64 {
	T := t + kelvin
	p := pHPa * 100
	e := rhPct / 100 * SaturationPa(t)
	return (p-e)/(rDry*T) + e/(rVapour*T)
}

// DynamicPressure returns q = ½·ρ·V², Pa, for V in m/s.
func DynamicPressure(rho, v float64) float64 { return 0.5 * rho * v * v }

// kmh converts km/h to m/s.
func kmh(v float64) float64 { return v / 3.6 }

func sqrt1p(k float64) float64 { return math.Sqrt(1 + k) }
