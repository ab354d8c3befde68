package vortex

import (
	"fmt"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// LiftSense returns the rotation sense, seen from behind looking forward,
// that a vortex on the given side shows when the car makes net lift.
func LiftSense(side string) string {
	if side == campaign.SideLeft {
		return campaign.SenseCW
	}
	return campaign.SenseCCW
}

// ShowsLift reports whether a vortex on side turning with sense (seen from
// behind) says the car makes lift (true) or downforce (false).
func ShowsLift(side, sense string) bool { return sense == LiftSense(side) }

// Observation is one observed sense with what it says.
type Observation struct {
	Config   string
	SpeedKmh float64
	Sense    string
	RPM      float64
	Lift     bool // the sense says lift
}

// Result is what one vortex entry yields.
type Result struct {
	Entry        *campaign.VortexEntry
	Observations []Observation
	Evidence     evidence.Evidence
}

// Reduce maps each observation to a sign observation on β_total (or β_rear
// with informs: rear) of its configuration.
func Reduce(c *campaign.Campaign, e *campaign.VortexEntry) (*Result, error) {
	if !c.VortexApplies(e) {
		return nil, fmt.Errorf("%s: the vortex-sense method does not apply to a %s body; set misread to use it anyway", e.ID, c.Vehicle.Body)
	}
	res := &Result{Entry: e}
	ev := evidence.Evidence{Entry: e.ID, Kind: evidence.KindVortex}
	rho := c.Density()
	seen := map[string]bool{}
	for i, o := range e.Observations {
		lift := ShowsLift(e.Side, o.Sense)
		res.Observations = append(res.Observations, Observation{Config: o.Config, SpeedKmh: o.SpeedKmh, Sense: o.Sense, RPM: o.RPM, Lift: lift})
		terms := []evidence.Term{{Config: o.Config, Axle: evidence.AxleRear, W: 1}}
		if e.Informs != evidence.AxleRear {
			terms = append(terms, evidence.Term{Config: o.Config, Axle: evidence.AxleFront, W: 1})
		}
		V := air.KmhToMs(o.SpeedKmh)
		word := "downforce"
		if lift {
			word = "lift"
		}
		ev.Signs = append(ev.Signs, evidence.Sign{
			Terms:    terms,
			Air:      evidence.Airspeed{Q: air.DynamicPressure(rho, V), V: V, Rho: rho},
			Lift:     lift,
			Misread:  e.Misread,
			Softness: e.SoftnessM2,
			Label:    fmt.Sprintf("observation %d, %s, %g km/h, %s vortex %s: %s", i+1, o.Config, o.SpeedKmh, e.Side, o.Sense, word),
		})
		if !seen[o.Config] {
			seen[o.Config] = true
			ev.Informs = append(ev.Informs, evidence.Quantity{Config: o.Config, Axle: e.Informs})
		}
	}
	res.Evidence = ev
	return res, ev.Check()
}
