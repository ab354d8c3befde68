package reality

import (
	"fmt"
	"slices"
)

// Faults are departures of the day from what the campaign says. Each is off
// at its zero value.
type Faults struct {
	// BumpStop puts a bump stop with a small gap on one axle: at speed the
	// downforce compresses the springs onto it. The campaign does not say.
	BumpStop *BumpStop
	// LaserAt moves a laser's spot to XM behind the front axle while the
	// campaign says it sits over its axle (x_m not written).
	LaserAt *LaserAt
	// CreepKmhPerS makes the speed rise through every steady hold.
	CreepKmhPerS float64
	// Gusts makes the wind change from run to run (and within a run).
	Gusts *Gusts
	// UnitSlip writes the ride-height log's speed in m/s under its km/h
	// column.
	UnitSlip bool
	// BlockedTap makes one tap read about zero (a pinched tube).
	BlockedTap *BlockedTap
	// InvertedTaps flips the sign of every reading of one tap entry.
	InvertedTaps string
	// GainError states one sensor's calibration gain Pct percent off.
	GainError *GainError
}

// BumpStop is a bump stop on one axle's wheels.
type BumpStop struct {
	Axle       string  // front | rear
	GapMm      float64 // wheel compression from static before contact
	RateNPerMm float64 // extra wheel rate beyond it
}

// LaserAt is a laser whose true position the campaign does not state.
type LaserAt struct {
	Sensor string
	XM     float64
}

// Gusts is a gusty day.
type Gusts struct {
	RunSDMs    float64 // sd of the wind's deviation per run
	WithinSDMs float64 // sd of the gust noise within a run
}

// BlockedTap is a tap whose tube is blocked in one configuration ("" = all).
type BlockedTap struct {
	Entry, Tap, Config string
}

// GainError is a sensor whose stated calibration gain is off.
type GainError struct {
	Sensor string
	Pct    float64 // stated gain = true gain·(1 + Pct/100)
}

// List names the faults that are on, for the truth document.
func (f Faults) List() []string {
	var out []string
	if b := f.BumpStop; b != nil {
		out = append(out, fmt.Sprintf("bump stop on the %s axle: gap %g mm, %g N/mm", b.Axle, b.GapMm, b.RateNPerMm))
	}
	if l := f.LaserAt; l != nil {
		out = append(out, fmt.Sprintf("laser %s at x = %g m, campaign says over its axle", l.Sensor, l.XM))
	}
	if f.CreepKmhPerS != 0 {
		out = append(out, fmt.Sprintf("speed creeps %g km/h/s through the holds", f.CreepKmhPerS))
	}
	if g := f.Gusts; g != nil {
		out = append(out, fmt.Sprintf("gusts: %g m/s run to run, %g m/s within a run", g.RunSDMs, g.WithinSDMs))
	}
	if f.UnitSlip {
		out = append(out, "ride-height log speed in m/s under a km/h column")
	}
	if b := f.BlockedTap; b != nil {
		out = append(out, fmt.Sprintf("tap %s of %s blocked (config %q)", b.Tap, b.Entry, b.Config))
	}
	if f.InvertedTaps != "" {
		out = append(out, fmt.Sprintf("readings of %s sign-inverted", f.InvertedTaps))
	}
	if g := f.GainError; g != nil {
		out = append(out, fmt.Sprintf("calibration of %s stated %+g %%", g.Sensor, g.Pct))
	}
	return out
}

// apply returns a copy of the day with the physical faults built in. The
// faults that only change what the campaign says (laser position, gain,
// unit slip, blocked and inverted taps) are read where the files are
// written.
func (d *Day) apply() (*Day, error) {
	c := d.clone()
	f := c.Faults
	if b := f.BumpStop; b != nil {
		a, err := c.axle(b.Axle)
		if err != nil {
			return nil, fmt.Errorf("%w: bump-stop fault: %v", ErrDay, err)
		}
		a.BumpGapMm, a.BumpRateNPerMm = b.GapMm, b.RateNPerMm
	}
	if l := f.LaserAt; l != nil {
		s := c.sensor(l.Sensor)
		if s == nil || !s.Laser {
			return nil, fmt.Errorf("%w: laser fault: no laser %q", ErrDay, l.Sensor)
		}
		s.XM, s.XSet = l.XM, true
	}
	if f.CreepKmhPerS != 0 {
		c.Runs.CreepKmhPerS = f.CreepKmhPerS
	}
	if g := f.Gusts; g != nil {
		c.Air.GustSDMs, c.Air.WithinSDMs = g.RunSDMs, g.WithinSDMs
	}
	if g := f.GainError; g != nil && c.sensor(g.Sensor) == nil {
		return nil, fmt.Errorf("%w: gain fault: no sensor %q", ErrDay, g.Sensor)
	}
	if b := f.BlockedTap; b != nil && !c.hasTap(b.Entry, b.Tap) {
		return nil, fmt.Errorf("%w: blocked-tap fault: no tap %q in %q", ErrDay, b.Tap, b.Entry)
	}
	if f.InvertedTaps != "" && !c.hasTap(f.InvertedTaps, "") {
		return nil, fmt.Errorf("%w: inverted-taps fault: no tap entry %q", ErrDay, f.InvertedTaps)
	}
	return c, nil
}

// clone copies the day deeply enough that apply and Write never change it.
func (d *Day) clone() *Day {
	c := *d
	c.Configs = slices.Clone(d.Configs)
	c.Runs.SpeedsKmh = slices.Clone(d.Runs.SpeedsKmh)
	c.Sensors = slices.Clone(d.Sensors)
	for i := range c.Sensors {
		c.Sensors[i].BallastKg = slices.Clone(c.Sensors[i].BallastKg)
	}
	c.Taps = slices.Clone(d.Taps)
	for i := range c.Taps {
		c.Taps[i].Panels = slices.Clone(c.Taps[i].Panels)
		c.Taps[i].Uncovered = slices.Clone(c.Taps[i].Uncovered)
		c.Taps[i].SpeedsKmh = slices.Clone(c.Taps[i].SpeedsKmh)
	}
	if d.Log.Probe != nil {
		p := *d.Log.Probe
		c.Log.Probe = &p
	}
	c.ReportSpeedsKmh = slices.Clone(d.ReportSpeedsKmh)
	return &c
}

func (d *Day) axle(name string) (*Axle, error) {
	switch name {
	case "front":
		return &d.Car.Front, nil
	case "rear":
		return &d.Car.Rear, nil
	}
	return nil, fmt.Errorf("axle must be front or rear, got %q", name)
}

func (d *Day) sensor(id string) *Sensor {
	for i := range d.Sensors {
		if d.Sensors[i].ID == id {
			return &d.Sensors[i]
		}
	}
	return nil
}

// hasTap reports whether entry exists and (tap non-empty) holds that tap.
func (d *Day) hasTap(entry, tap string) bool {
	for _, e := range d.Taps {
		if e.ID != entry {
			continue
		}
		if tap == "" {
			return true
		}
		for _, p := range e.Panels {
			if p.ID == tap {
				return true
			}
		}
	}
	return false
}
