package reality

import "math"

// WheelRate returns the rate at the wheel of a spring k (N/mm) mounted with
// a motion ratio MR (spring travel per wheel travel): the spring moves MR
// per unit of wheel travel and its force acts on the wheel through MR
// again, so k_w = k·MR² (Milliken & Milliken, Race Car Vehicle Dynamics,
// 1995, ch. 16 — from memory).
func WheelRate(spring, mr float64) float64 { return spring * mr * mr }

// InSeries returns the rate of two springs in series, which carry the same
// force and add their deflections: 1/k = 1/k1 + 1/k2 (any mechanics
// textbook).
func InSeries(k1, k2 float64) float64 { return k1 * k2 / (k1 + k2) }

// wheel is one wheel's suspension as a force–compression law.
type wheel struct {
	k    float64 // static wheel rate, N/mm
	p    float64 // progressive coefficient, 1/mm
	gap  float64 // bump-stop gap, mm
	kb   float64 // bump-stop rate, N/mm (0: none)
	tyre float64 // tyre rate, N/mm
}

func newWheel(a Axle) wheel {
	return wheel{k: WheelRate(a.SpringNPerMm, a.MotionRatio), p: a.ProgressivePerMm,
		gap: a.BumpGapMm, kb: a.BumpRateNPerMm, tyre: a.TyreNPerMm}
}

// force returns the spring force change (N, positive pushing the body up)
// at compression c (mm) from static. The rate is k·(1 + p·c), floored at
// k/2 below c0 = −1/(2p); beyond the gap the bump stop adds kb.
func (w wheel) force(c float64) float64 {
	f := w.k * c
	if w.p != 0 {
		c0 := -0.5 / w.p
		if w.p > 0 && c < c0 || w.p < 0 && c > c0 {
			f = w.k*(c0+w.p*c0*c0/2) + 0.5*w.k*(c-c0)
		} else {
			f = w.k * (c + w.p*c*c/2)
		}
	}
	if w.kb > 0 && c > w.gap {
		f += w.kb * (c - w.gap)
	}
	return f
}

// compression solves force(c) = load for c (mm), load the added downward
// load on the wheel (N). force is increasing, so bisection on a bracket
// grown from the linear guess converges; 60 halvings give ~1e-15 relative.
func (w wheel) compression(load float64) float64 {
	if w.p == 0 && w.kb == 0 {
		return load / w.k
	}
	span := math.Abs(load)/w.k*4 + 1
	lo, hi := -span, span
	for w.force(lo) > load {
		lo *= 2
	}
	for w.force(hi) < load {
		hi *= 2
	}
	for range 60 {
		mid := 0.5 * (lo + hi)
		if w.force(mid) < load {
			lo = mid
		} else {
			hi = mid
		}
	}
	return 0.5 * (lo + hi)
}

// play is the friction band: a play (backlash) operator of half-width f.
// The body stays where it is until its equilibrium moves more than f away,
// then follows at distance f.
type play struct {
	f, y float64
	init bool
}

func (p *play) step(x float64) float64 {
	if !p.init {
		p.y, p.init = x, true
		return x
	}
	p.y = min(max(p.y, x-p.f), x+p.f)
	return p.y
}

// LoadTransfer returns the load (N) moved from the front axle to the rear
// by a longitudinal acceleration a (m/s²) of a car of mass m (kg) with its
// centre of gravity at height h (m) on wheelbase L (m): m·a·h/L (moments
// about a ground-level point; Milliken & Milliken, Race Car Vehicle
// Dynamics, 1995, ch. 18 — from memory).
func LoadTransfer(m, a, h, L float64) float64 { return m * a * h / L }

// DragPitch returns C_D·A·h_D/L, m²: per unit of dynamic pressure, the
// load the drag moves from the front contact patches to the rear (the same
// moment balance with D = q·C_D·A at height h_D).
func DragPitch(cda, h, L float64) float64 { return cda * h / L }

// atX returns a body deflection at x behind the front axle from those at
// the axles: δ(x) = δ_f·(1 − x/L) + δ_r·x/L (a rigid body; also outside
// the wheelbase).
func atX(front, rear, x, L float64) float64 {
	return front*(1-x/L) + rear*x/L
}
