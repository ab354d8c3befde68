package height

import (
	"math"

	"liftfuse/methods/campaign"
)

// lineSums accumulates the sums of a least-squares line y = a + b·t, with
// t measured from the window's start (so the sums stay well conditioned).
type lineSums struct {
	n                     float64
	st, stt, sy, syy, sty float64
}

func (l *lineSums) add(t, y float64) {
	l.n++
	l.st += t
	l.stt += t * t
	l.sy += y
	l.syy += y * y
	l.sty += t * y
}

// slope returns the least-squares slope b = S_ty/S_tt and its standard
// error √(s²/S_tt), s² = (S_yy − b·S_ty)/(n − 2), with S_ab = Σ(a − ā)(b − b̄)
// (e.g. Draper & Smith, Applied Regression Analysis, ch. 1 — from memory).
// Fewer than three samples or no spread in time give a zero slope.
func (l *lineSums) slope() (b, se float64) {
	if l.n < 3 {
		return 0, 0
	}
	stt := l.stt - l.st*l.st/l.n
	if stt <= 0 {
		return 0, 0
	}
	sty := l.sty - l.st*l.sy/l.n
	syy := l.syy - l.sy*l.sy/l.n
	b = sty / stt
	s2 := math.Max(0, (syy-b*sty)/(l.n-2))
	return b, math.Sqrt(s2 / stt)
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
