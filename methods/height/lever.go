package height

import (
	"fmt"
	"math"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// AxleShare is one axle's part in what a sensor reads: the lever weight W
// of the axle's deflection at the sensor and the axle's stiffness there.
type AxleShare struct {
	Axle      string
	W         float64
	Stiffness Stiffness
}

// Lever says how a sensor's reading combines the two axles. A body-to-ground
// laser at x behind the front axle on a rigid body of wheelbase L sees
//
//	δ(x) = δ_f·(1 − x/L) + δ_r·x/L,   δ_a = L_a/K_a
//
// with K_a the axle's heave stiffness with its tyres in series; x < 0 or
// x > L extrapolates the same line (a laser ahead of the front axle or
// behind the rear one sees the far axle with a negative weight). A pot reads
// its own axle's suspension only (W = 1). Tyre growth is weighted the same
// way: G(x) = G_f·(1 − x/L) + G_r·x/L, the rigid body's rise at x.
type Lever struct {
	X      float64 // m behind the front axle
	AtAxle bool    // the sensor reads its own axle alone
	Axles  []AxleShare
}

// atAxleTol is how close (as a fraction of the wheelbase) a laser must sit
// to its axle to count as over it: 1 mm on a 2.6 m car.
const atAxleTol = 4e-4

// NewLever returns the lever of an entry whose own-axle stiffness is own.
// A laser away from its axle takes both axles' spring stiffness; a ballast
// stiffness, measured at the sensor for loads on one axle, cannot be split
// between the axles and is refused there.
func NewLever(c *campaign.Campaign, e *campaign.RideHeightEntry, own Stiffness) (Lever, error) {
	L := c.Vehicle.WheelbaseM
	a := e.XM / L
	if e.Sensor != campaign.SensorLaser || (e.Axle == campaign.AxleFront && math.Abs(a) <= atAxleTol) ||
		(e.Axle == campaign.AxleRear && math.Abs(a-1) <= atAxleTol) {
		x := 0.0
		if e.Axle == campaign.AxleRear {
			x = L
		}
		return Lever{X: x, AtAxle: true, Axles: []AxleShare{{Axle: e.Axle, W: 1, Stiffness: own}}}, nil
	}
	if e.Stiffness.From == campaign.FromBallast {
		return Lever{}, fmt.Errorf("a laser at x_m = %g m, away from its axle, sees both axles: its stiffness must come from the springs, not ballast", e.XM)
	}
	lv := Lever{X: e.XM}
	for _, s := range []struct {
		axle string
		w    float64
		ax   campaign.Axle
	}{{campaign.AxleFront, 1 - a, c.Vehicle.Axles.Front}, {campaign.AxleRear, a, c.Vehicle.Axles.Rear}} {
		if s.w == 0 {
			continue
		}
		lv.Axles = append(lv.Axles, AxleShare{Axle: s.axle, W: s.w, Stiffness: SpringStiffness(s.axle, s.ax, true)})
	}
	return lv, nil
}

// Terms returns the observation's lift terms for a configuration: W_a/K_a
// on each axle's β (mm per N of axle lift).
func (lv Lever) Terms(config string) []evidence.Term {
	out := make([]evidence.Term, len(lv.Axles))
	for i, s := range lv.Axles {
		out[i] = evidence.Term{Config: config, Axle: s.Axle, W: s.W / s.Stiffness.K}
	}
	return out
}

// Groups returns the scale groups the axles' stiffnesses declare.
func (lv Lever) Groups() []evidence.ScaleGroup {
	var out []evidence.ScaleGroup
	for _, s := range lv.Axles {
		out = append(out, s.Stiffness.Groups...)
	}
	return out
}

// Refs returns the scale references of the lift term. Evidence scales the
// whole term Σ_a w_a·β_a by one factor, so with two axles each axle's
// groups enter with their powers times the axle's share of the compliance
// at the sensor, c_a = |W_a/K_a| / Σ|W/K|: exact when the axles' lift
// terms are in that ratio, first order otherwise (the springs' 5 % sd
// makes the difference a fraction of a percent of the term).
func (lv Lever) Refs() []evidence.ScaleRef {
	var tot float64
	for _, s := range lv.Axles {
		tot += math.Abs(s.W / s.Stiffness.K)
	}
	var out []evidence.ScaleRef
	for _, s := range lv.Axles {
		share := math.Abs(s.W/s.Stiffness.K) / tot
		for _, r := range s.Stiffness.Refs {
			out = append(out, evidence.ScaleRef{Name: r.Name, Pow: r.Pow * share})
		}
	}
	return out
}

// growthCoefs returns the tyre-growth coefficients of a window: each
// axle's growth (mm at 100 km/h) times its lever weight times (V/100)².
func (lv Lever) growthCoefs(speedSq float64) []evidence.Coef {
	out := make([]evidence.Coef, len(lv.Axles))
	for i, s := range lv.Axles {
		out[i] = evidence.Coef{Name: growthName(s.Axle), C: s.W * speedSq}
	}
	return out
}

// growthName is the nuisance name of an axle's tyre growth, shared by every
// laser that sees that axle.
func growthName(axle string) string { return axle + "-tyre-growth" }
