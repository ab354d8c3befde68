package height

import (
	"math"

	"liftfuse/methods/campaign"
)

// speedEnds tracks what a window's mean acceleration needs: its first and
// last speed and the sum of squared steps between samples.
type speedEnds struct {
	n           int
	first, last float64 // km/h
	sumStep2    float64 // Σ (v_i − v_{i−1})², (km/h)²
}

func (s *speedEnds) add(v float64) {
	if s.n == 0 {
		s.first = v
	} else {
		d := v - s.last
		s.sumStep2 += d * d
	}
	s.last = v
	s.n++
}

// accel returns the window's mean acceleration over its span T (s), in
// km/h per s, and its standard error. The height responds to the
// acceleration at each instant, so a window's mean height carries the
// mean of a(t), which is exactly (v_last − v_first)/T — not the
// least-squares slope, which weights the middle of the window and misses a
// ramp's first samples at the edge of a standstill window (they carry
// several mm of pitch). The error is that of two speed samples,
// √2·σ_v/T, with σ_v² = Σ(Δv)²/(2(n − 1)) the speed sensor's white noise
// estimated from successive differences (von Neumann, Ann. Math. Stat.
// 12, 1941 — from memory), which a smooth true speed barely enters.
func (s *speedEnds) accel(T float64) (a, se float64) {
	if s.n < 2 || T <= 0 {
		return 0, 0
	}
	sv2 := s.sumStep2 / (2 * float64(s.n-1))
	return (s.last - s.first) / T, math.Sqrt(2*sv2) / T
}

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
