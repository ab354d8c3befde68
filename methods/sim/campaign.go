package sim

import (
	"fmt"
	"strconv"
	"strings"

	"liftfuse/methods/campaign"
)

// num formats a number for YAML.
func num(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

// str formats text for YAML (double-quoted).
func str(s string) string { return strconv.Quote(s) }

// yamlText accumulates the campaign file's text.
type yamlText struct{ b strings.Builder }

// p appends formatted text.
func (y *yamlText) p(format string, args ...any) { fmt.Fprintf(&y.b, format, args...) }

// campaign writes the campaign file the spec describes, block by block in
// the order of the campaign format.
func (g *gen) campaign() string {
	y := &yamlText{}
	y.p("# Simulated campaign (liftfuse simulate, seed %d); the truth is in truth.json.\n", g.s.Seed)
	g.campaignHeader(y)
	g.vehicle(y)
	g.configurationsAndAir(y)
	y.p("evidence:\n")
	g.rideHeightEvidence(y)
	g.pressureEvidence(y)
	g.vortexEvidence(y)
	g.reportBlock(y)
	g.planBlock(y)
	return y.b.String()
}

// campaignHeader writes the format version and the campaign block.
func (g *gen) campaignHeader(y *yamlText) {
	s := g.s
	y.p("liftfuse: 1\ncampaign:\n  title: %s\n  date: %s\n", str(s.Campaign.Title), s.Campaign.Date)
	if s.Campaign.Site != "" {
		y.p("  site: %s\n", str(s.Campaign.Site))
	}
	if s.Campaign.Notes != "" {
		y.p("  notes: %s\n", str(s.Campaign.Notes))
	}
}

// vehicle writes the vehicle block: what a shop knows of the car.
func (g *gen) vehicle(y *yamlText) {
	v := g.s.Vehicle
	y.p("vehicle:\n  label: %s\n  body: %s\n  wheelbase_m: %s\n  mass_kg: %s\n", str(v.Label), v.Body, num(v.WheelbaseM), num(v.MassKg))
	if v.At.Has("front_static_kg") {
		y.p("  front_static_kg: %s\n", num(v.FrontStaticKg))
	}
	if v.At.Has("frontal_area_m2") {
		y.p("  frontal_area_m2: %s\n", num(v.FrontalAreaM2))
	}
	if d := v.Drag; d != nil {
		y.p("  drag: {cda_m2: %s, centre_height_m: %s, sd_pct: %s}\n", num(d.CdAM2), num(d.CentreHeightM), num(d.SDPct))
	}
	axle := func(a campaign.Axle) string {
		return fmt.Sprintf("{spring_n_per_mm: %s, spring_sd_pct: %s, motion_ratio: %s, motion_ratio_sd: %s, tyre_n_per_mm: %s, tyre_sd_pct: %s}",
			num(a.SpringNPerMm), num(a.SpringSDPct), num(a.MotionRatio), num(a.MotionRatioSD), num(a.TyreNPerMm), num(a.TyreSDPct))
	}
	y.p("  axles:\n    front: %s\n    rear: %s\n", axle(v.Axles.Front), axle(v.Axles.Rear))
}

// configurationsAndAir writes the configurations, the air and, when the
// spec sets one, the prior block.
func (g *gen) configurationsAndAir(y *yamlText) {
	s := g.s
	y.p("configurations:\n")
	for _, c := range s.Configurations {
		y.p("  - {id: %s, note: %s}\n", c.ID, str(c.Note))
	}
	y.p("air:\n  temperature_c: %s\n  pressure_hpa: %s\n  humidity_pct: %s\n  wind_sd_ms: %s\n",
		num(s.Air.TemperatureC), num(s.Air.PressureHPa), num(s.Air.HumidityPct), num(s.Air.WindSDMs))
	if s.Prior.At.Has("cla_sd_m2") || s.Prior.SpeedModel != "" {
		y.p("prior:\n")
		if s.Prior.At.Has("cla_sd_m2") {
			y.p("  cla_sd_m2: %s\n", num(s.Prior.CLASDM2))
		}
		if s.Prior.SpeedModel != "" {
			y.p("  speed_model: %s\n", s.Prior.SpeedModel)
		}
	}
}

// rideHeightEvidence writes the ride-height entries, each reading the
// simulated log over the configurations' segments.
func (g *gen) rideHeightEvidence(y *yamlText) {
	if len(g.s.RideHeight) == 0 {
		return
	}
	y.p("  ride_height:\n")
	for _, h := range g.s.RideHeight {
		y.p("    - id: %s\n      axle: %s\n      sensor: %s\n", h.ID, h.Axle, h.Sensor)
		y.p("      calibration: {mm_per_unit: %s}\n", num(h.MmPerUnit))
		if h.Stiffness == campaign.FromBallast {
			y.p("      stiffness:\n        from: ballast\n        ballast:\n")
			for _, bp := range g.ballast[h.ID] {
				y.p("          - {added_kg: %s, x_m: %s, signal: %.5f}\n", num(bp[0]), num(h.BallastXM), bp[1])
			}
		} else {
			y.p("      stiffness: {from: springs}\n")
		}
		if h.FrictionMm > 0 {
			y.p("      friction_mm: %s\n", num(h.FrictionMm))
		}
		if h.Sensor == campaign.SensorLaser {
			y.p("      tyre_growth: {mm_at_100kmh: %s, sd_mm: %s}\n", num(h.TyreGrowth.MmAt100kmh), num(h.TyreGrowth.SDMm))
		}
		if h.DriftMmPerH != 0 {
			y.p("      drift: true\n")
		}
		y.p("      logs:\n        - file: %s\n          time: t_s\n          speed_kmh: v_kmh\n          signal: %s\n          direction: dir\n          segments:\n", LogName, h.ID)
		for _, sg := range g.segments {
			y.p("            - {config: %s, from_s: %s, to_s: %s}\n", sg.config, num(sg.from), num(sg.to))
		}
	}
}

// pressureEvidence writes the pressure entries: taps, uncovered patches
// and the readings file of each.
func (g *gen) pressureEvidence(y *yamlText) {
	if len(g.s.Pressure) == 0 {
		return
	}
	y.p("  pressure:\n")
	for _, pr := range g.s.Pressure {
		y.p("    - id: %s\n      mode: panels\n      sensor_sd_pa: %s\n      reference_sd_pa: %s\n", pr.ID, num(pr.SensorSDPa), num(pr.ReferenceSDPa))
		if pr.At.Has("model_sd_pct") {
			y.p("      model_sd_pct: %s\n", num(pr.ModelSDPct))
		}
		y.p("      taps:\n")
		for _, t := range pr.Taps {
			y.p("        - {id: %s, x_m: %s, surface: %s, area_m2: %s, nz: %s}\n", t.ID, num(t.XM), t.Surface, num(t.AreaM2), num(t.Nz))
		}
		if len(pr.Uncovered) > 0 {
			y.p("      uncovered:\n")
			for _, u := range pr.Uncovered {
				y.p("        - {surface: %s, x_m: %s, area_m2: %s, nz: %s, cp_mean: %s, cp_sd: %s}\n", u.Surface, num(u.XM), num(u.AreaM2), num(u.Nz), num(u.CpMean), num(u.CpSD))
			}
		}
		y.p("      readings_file: %s-readings.csv\n", pr.ID)
	}
}

// vortexEvidence writes the vortex entries with their observed senses; the
// misread probability only where the body has no default for it.
func (g *gen) vortexEvidence(y *yamlText) {
	if len(g.s.Vortex) == 0 {
		return
	}
	y.p("  vortex:\n")
	for _, o := range g.s.Vortex {
		y.p("    - id: %s\n      side: %s\n      informs: %s\n", o.ID, o.Side, o.Informs)
		if _, applies := campaign.DefaultMisread(g.s.Vehicle.Body); !applies {
			y.p("      misread: %s\n", num(o.Misread))
		}
		y.p("      observations:\n")
		for _, sn := range g.senses[o.ID] {
			y.p("        - {config: %s, speed_kmh: %s, sense: %s}\n", sn.config, num(sn.kmh), sn.sense)
		}
	}
}

// reportBlock writes the report settings the spec gives, if any.
func (g *gen) reportBlock(y *yamlText) {
	r := g.s.Report
	if r.At.Where.Line == 0 {
		return
	}
	y.p("report:\n")
	if r.At.Has("speeds_kmh") {
		sp := make([]string, len(r.SpeedsKmh))
		for i, x := range r.SpeedsKmh {
			sp[i] = num(x)
		}
		y.p("  speeds_kmh: [%s]\n", strings.Join(sp, ", "))
	}
	if r.At.Has("credible") {
		y.p("  credible: %s\n", num(r.Credible))
	}
	if r.ForceUnit != "" {
		y.p("  force_unit: %s\n", r.ForceUnit)
	}
	if r.ReferenceConfig != "" {
		y.p("  reference_config: %s\n", r.ReferenceConfig)
	}
	if r.At.Has("seed") {
		y.p("  seed: %d\n", r.Seed)
	}
}

// planBlock writes the plan settings the spec gives, if any.
func (g *gen) planBlock(y *yamlText) {
	pl := g.s.Plan
	if pl.At.Where.Line == 0 {
		return
	}
	y.p("plan:\n")
	if t := pl.Target; t.Config != "" {
		y.p("  target: {config: %s, axle: %s", t.Config, t.Axle)
		if t.Versus != "" {
			y.p(", versus: %s", t.Versus)
		}
		y.p("}\n")
	}
	if len(pl.CostH) > 0 {
		var kv []string
		for _, c := range pl.CostH {
			kv = append(kv, fmt.Sprintf("%s: %s", c.Key, num(c.V)))
		}
		y.p("  cost_h: {%s}\n", strings.Join(kv, ", "))
	}
}
