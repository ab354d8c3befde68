package height

import (
	"liftfuse/methods/campaign"
)

// CGHeightName is the nuisance name of the centre-of-gravity height h_cg
// (m), shared by every ride-height entry of the car.
const CGHeightName = "cg-height"

// LoadTransferN returns the load a longitudinal acceleration a (m/s²) moves
// from the front axle to the rear of a car of mass m (kg), centre-of-gravity
// height h and wheelbase L (m):
//
//	ΔW = m·a·h/L
//
// from moments about a contact patch (Milliken & Milliken, Race Car Vehicle
// Dynamics, 1995, ch. 18 — from memory).
func LoadTransferN(m, a, h, L float64) float64 { return m * a * h / L }

// accelCoef returns the height change (mm) at a sensor per metre of h_cg
// for a window of mean acceleration a: the front axle loses m·a·h/L and
// rises by that over K_f, the rear gains it and sinks, and the sensor sees
// them through its lever (see Lever):
//
//	∂y/∂h_cg = (m·a/L)·(w_f/K_f − w_r/K_r)     (mm per m)
//
// Anti-dive and anti-squat geometry, which carry part of the transfer
// past the springs, are not modelled (a pot's share is then overstated).
// AccelCoef is accelCoef for the result's sensor: the coefficient of h_cg
// in a window's height at mean acceleration a (mm per m), as the entry's
// evidence carries it. The model checks take the same load transfer out.
func (r *Result) AccelCoef(v campaign.Vehicle, a float64) float64 {
	return accelCoef(v, r.Lever, a)
}

func accelCoef(v campaign.Vehicle, lv Lever, a float64) float64 {
	per := LoadTransferN(v.MassKg, a, 1, v.WheelbaseM) // N per m of h_cg
	var c float64
	for _, t := range lv.Axles {
		sgn := 1.0 // the front is unloaded and rises
		if t.Axle == campaign.AxleRear {
			sgn = -1
		}
		c += sgn * per * t.W / t.Stiffness.K
	}
	return c
}

// accelVar returns the variance (mm²) a window's height picks up from the
// error of its acceleration estimate, at the prior mean of h_cg.
func accelVar(v campaign.Vehicle, lv Lever, w Window) float64 {
	c := accelCoef(v, lv, w.AccelSE) * v.CGHeightM
	return c * c
}
