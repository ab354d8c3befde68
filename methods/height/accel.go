package height

import (
	"math"

	"liftfuse/methods/campaign"
)

// speedTrend accumulates what a window's mean acceleration needs: the
// least-squares sums of its speed against time and the sum of squared
// steps between samples.
type speedTrend struct {
	n                int
	t0               float64 // time of the first sample, s (sums are about it)
	st, sv, stv, stt float64 // Σt, Σv, Σtv, Σt² (t from t0, v in km/h)
	last, sumStep2   float64 // last speed; Σ (v_i − v_{i−1})², (km/h)²
}

func (s *speedTrend) add(t, v float64) {
	if s.n == 0 {
		s.t0 = t
	} else {
		d := v - s.last
		s.sumStep2 += d * d
	}
	dt := t - s.t0
	s.st += dt
	s.sv += v
	s.stv += dt * v
	s.stt += dt * dt
	s.last = v
	s.n++
}

// accel returns the window's mean acceleration in km/h per s, the
// least-squares slope of its speed against time, and its standard error
// σ_v/√Σ(t − t̄)², with σ_v² = Σ(Δv)²/(2(n − 1)) the speed sensor's white
// noise estimated from successive differences (von Neumann, Ann. Math.
// Stat. 12, 1941 — from memory), which a smooth true speed barely enters.
// A window's mean height carries the mean of a(t) over it; clear of the
// ramps at its ends (EdgeS, edge.go) the speed is a straight line plus
// noise, whose slope is that mean. The slope uses every sample where
// (v_last − v_first)/T would use two: a speed logged at a lower rate and
// held (2 Hz in a 10 Hz file) moves a window's ends by a whole step, its
// slope hardly at all. Least squares: any regression text, e.g. Draper &
// Smith, Applied Regression Analysis, ch. 1 (from memory).
func (s *speedTrend) accel() (a, se float64) {
	if s.n < 3 {
		return 0, 0
	}
	n := float64(s.n)
	sxx := s.stt - s.st*s.st/n
	if sxx <= 0 {
		return 0, 0
	}
	sv2 := s.sumStep2 / (2 * (n - 1))
	return (s.stv - s.st*s.sv/n) / sxx, math.Sqrt(sv2 / sxx)
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
