package reality

import (
	"fmt"
	"math"
	"regexp"
)

var idPattern = regexp.MustCompile(`^[a-z0-9-]+$`)

// defaults fills the plan's unset timings and the report speeds.
func (d *Day) defaults() {
	set := func(p *float64, v float64) {
		if *p == 0 {
			*p = v
		}
	}
	set(&d.Log.RateHz, 10)
	set(&d.Runs.AccelMs2, 1.5)
	set(&d.Runs.StandS, 8)
	set(&d.Runs.ChangeS, 120)
	set(&d.Runs.HoldS, 16)
	set(&d.Air.WithinTauS, 3)
	for i := range d.Taps {
		set(&d.Taps[i].SampleSDPa, 10)
	}
	if d.Runs.Repeats == 0 {
		d.Runs.Repeats = 1
	}
	if len(d.ReportSpeedsKmh) == 0 {
		d.ReportSpeedsKmh = []float64{100, 150}
	}
}

// validate checks that the day can be simulated.
func (d *Day) validate() error {
	bad := func(format string, a ...any) error { return fmt.Errorf("%w: "+format, append([]any{ErrDay}, a...)...) }
	pos := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	c := d.Car
	switch {
	case d.Title == "" || d.Date == "":
		return bad("title and date are required")
	case c.Label == "" || c.Body == "":
		return bad("car label and body are required")
	case !pos(c.WheelbaseM) || !pos(c.MassKg):
		return bad("wheelbase and mass must be positive")
	case c.CGHeightM < 0 || c.CdAM2 < 0 || c.DragHeightM < 0:
		return bad("centre-of-gravity height, drag area and drag height must not be negative")
	case !(d.Air.PressureHPa > 500 && d.Air.PressureHPa < 1100) || d.Air.HumidityPct < 0 || d.Air.HumidityPct > 100:
		return bad("air pressure must lie in (500, 1100) hPa and humidity in [0, 100] %%")
	case len(d.Configs) == 0 || len(d.Runs.SpeedsKmh) == 0:
		return bad("at least one configuration and one run speed are needed")
	case !pos(d.Runs.HoldS) || !pos(d.Runs.AccelMs2) || d.Runs.Repeats < 0 || !pos(d.Log.RateHz):
		return bad("hold, acceleration, repeats and log rate must be positive")
	}
	for name, a := range map[string]Axle{"front": c.Front, "rear": c.Rear} {
		if !pos(a.SpringNPerMm) || !pos(a.MotionRatio) || !pos(a.TyreNPerMm) || a.StictionMm < 0 || a.BumpRateNPerMm < 0 {
			return bad("%s axle: spring, motion ratio and tyre must be positive, stiction and bump rate not negative", name)
		}
	}
	seen := map[string]bool{}
	for _, cf := range d.Configs {
		if !idPattern.MatchString(cf.ID) || seen[cf.ID] {
			return bad("configuration id %q is malformed or repeated", cf.ID)
		}
		seen[cf.ID] = true
	}
	for _, v := range d.Runs.SpeedsKmh {
		if !pos(v) {
			return bad("run speed %g km/h must be positive", v)
		}
	}
	if err := d.validateSensors(seen); err != nil {
		return err
	}
	return d.validateTaps(seen)
}

func (d *Day) validateSensors(seen map[string]bool) error {
	for _, s := range d.Sensors {
		switch {
		case !idPattern.MatchString(s.ID) || seen[s.ID]:
			return fmt.Errorf("%w: sensor id %q is malformed or repeated", ErrDay, s.ID)
		case s.Axle != "front" && s.Axle != "rear":
			return fmt.Errorf("%w: sensor %q: axle must be front or rear", ErrDay, s.ID)
		case !(s.MmPerUnit > 0) || s.NoiseMm < 0 || s.NoisePhi < 0 || s.NoisePhi >= 1:
			return fmt.Errorf("%w: sensor %q: gain must be positive, noise not negative, φ in [0, 1)", ErrDay, s.ID)
		}
		seen[s.ID] = true
	}
	return nil
}

func (d *Day) validateTaps(seen map[string]bool) error {
	for _, e := range d.Taps {
		if !idPattern.MatchString(e.ID) || seen[e.ID] || len(e.Panels) < 2 {
			return fmt.Errorf("%w: tap entry %q: id malformed or repeated, or fewer than two panels", ErrDay, e.ID)
		}
		seen[e.ID] = true
		for _, p := range e.Panels {
			if p.ID == "" || !(p.AreaM2 > 0) || p.Nz == 0 || (p.Surface != "upper" && p.Surface != "lower") {
				return fmt.Errorf("%w: tap entry %q, panel %q: needs an id, positive area, a non-zero nz and surface upper or lower", ErrDay, e.ID, p.ID)
			}
		}
	}
	return nil
}
