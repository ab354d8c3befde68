package vortex

import (
	"fmt"

	"liftfuse/methods"
)

// LiftSense returns the rotation sense, seen from behind looking forward,
// that a vortex on the given side shows when the car makes net lift.
func LiftSense(side string) string {
	if side == methods.SideLeft {
		return methods.SenseCW
	}
	return methods.SenseCCW
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
	Entry        *methods.VortexEntry
	Observations []Observation
	Evidence     methods.Evidence
}

// Reduce maps each observation to a sign observation on β_total (or β_rear
// with informs: rear) of its configuration.
func Reduce(c *methods.Campaign, e *methods.VortexEntry) (*Result, error) {
	if _, applies := methods.DefaultMisread(c.Vehicle.Body); !applies && !e.At.Has("misread") {
		return nil, fmt.Errorf("%s: the vortex-sense method does not apply to a %s body; set misread to use it anyway", e.ID, c.Vehicle.Body)
	}
	res := &Result{Entry: e}
	ev := methods.Evidence{Entry: e.ID, Kind: methods.KindVortex}
	rho := c.Density()
	seen := map[string]bool{}
	for i, o := range e.Observations {
		lift := ShowsLift(e.Side, o.Sense)
		res.Observations = append(res.Observations, Observation{Config: o.Config, SpeedKmh: o.SpeedKmh, Sense: o.Sense, RPM: o.RPM, Lift: lift})
		terms := []methods.Term{{Config: o.Config, Axle: methods.AxleRear, W: 1}}
		if e.Informs != methods.AxleRear {
			terms = append(terms, methods.Term{Config: o.Config, Axle: methods.AxleFront, W: 1})
		}
		V := methods.KmhToMs(o.SpeedKmh)
		word := "downforce"
		if lift {
			word = "lift"
		}
		ev.Signs = append(ev.Signs, methods.Sign{
			Terms:    terms,
			Air:      methods.Airspeed{Q: methods.DynamicPressure(rho, V), V: V, Rho: rho},
			Lift:     lift,
			Misread:  e.Misread,
			Softness: e.SoftnessM2,
			Label:    fmt.Sprintf("observation %d, %s, %g km/h, %s vortex %s: %s", i+1, o.Config, o.SpeedKmh, e.Side, o.Sense, word),
		})
		if !seen[o.Config] {
			seen[o.Config] = true
			ev.Informs = append(ev.Informs, methods.Quantity{Config: o.Config, Axle: e.Informs})
		}
	}
	res.Evidence = ev
	return res, ev.Check()
}
