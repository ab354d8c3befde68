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

// campaign writes the campaign file the spec describes.
func (g *gen) campaign() string {
	s := g.s
	var b strings.Builder
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("# Simulated campaign (liftfuse simulate, seed %d); the truth is in truth.json.\n", s.Seed)
	p("liftfuse: 1\ncampaign:\n  title: %s\n  date: %s\n", str(s.Campaign.Title), s.Campaign.Date)
	if s.Campaign.Site != "" {
		p("  site: %s\n", str(s.Campaign.Site))
	}
	if s.Campaign.Notes != "" {
		p("  notes: %s\n", str(s.Campaign.Notes))
	}
	v := s.Vehicle
	p("vehicle:\n  label: %s\n  body: %s\n  wheelbase_m: %s\n  mass_kg: %s\n", str(v.Label), v.Body, num(v.WheelbaseM), num(v.MassKg))
	if v.At.Has("front_static_kg") {
		p("  front_static_kg: %s\n", num(v.FrontStaticKg))
	}
	if v.At.Has("frontal_area_m2") {
		p("  frontal_area_m2: %s\n", num(v.FrontalAreaM2))
	}
	if d := v.Drag; d != nil {
		p("  drag: {cda_m2: %s, centre_height_m: %s, sd_pct: %s}\n", num(d.CdAM2), num(d.CentreHeightM), num(d.SDPct))
	}
	axle := func(a campaign.Axle) string {
		return fmt.Sprintf("{spring_n_per_mm: %s, spring_sd_pct: %s, motion_ratio: %s, motion_ratio_sd: %s, tyre_n_per_mm: %s, tyre_sd_pct: %s}",
			num(a.SpringNPerMm), num(a.SpringSDPct), num(a.MotionRatio), num(a.MotionRatioSD), num(a.TyreNPerMm), num(a.TyreSDPct))
	}
	p("  axles:\n    front: %s\n    rear: %s\n", axle(v.Axles.Front), axle(v.Axles.Rear))
	p("configurations:\n")
	for _, c := range s.Configurations {
		p("  - {id: %s, note: %s}\n", c.ID, str(c.Note))
	}
	p("air:\n  temperature_c: %s\n  pressure_hpa: %s\n  humidity_pct: %s\n  wind_sd_ms: %s\n",
		num(s.Air.TemperatureC), num(s.Air.PressureHPa), num(s.Air.HumidityPct), num(s.Air.WindSDMs))
	if s.Prior.At.Has("cla_sd_m2") || s.Prior.SpeedModel != "" {
		p("prior:\n")
		if s.Prior.At.Has("cla_sd_m2") {
			p("  cla_sd_m2: %s\n", num(s.Prior.CLASDM2))
		}
		if s.Prior.SpeedModel != "" {
			p("  speed_model: %s\n", s.Prior.SpeedModel)
		}
	}
	p("evidence:\n")
	if len(s.RideHeight) > 0 {
		p("  ride_height:\n")
		for _, h := range s.RideHeight {
			p("    - id: %s\n      axle: %s\n      sensor: %s\n", h.ID, h.Axle, h.Sensor)
			p("      calibration: {mm_per_unit: %s}\n", num(h.MmPerUnit))
			if h.Stiffness == campaign.FromBallast {
				p("      stiffness:\n        from: ballast\n        ballast:\n")
				for _, bp := range g.ballast[h.ID] {
					p("          - {added_kg: %s, x_m: %s, signal: %.5f}\n", num(bp[0]), num(h.BallastXM), bp[1])
				}
			} else {
				p("      stiffness: {from: springs}\n")
			}
			if h.FrictionMm > 0 {
				p("      friction_mm: %s\n", num(h.FrictionMm))
			}
			if h.Sensor == campaign.SensorLaser {
				p("      tyre_growth: {mm_at_100kmh: %s, sd_mm: %s}\n", num(h.TyreGrowth.MmAt100kmh), num(h.TyreGrowth.SDMm))
			}
			if h.DriftMmPerH != 0 {
				p("      drift: true\n")
			}
			p("      logs:\n        - file: %s\n          time: t_s\n          speed_kmh: v_kmh\n          signal: %s\n          direction: dir\n          segments:\n", LogName, h.ID)
			for _, sg := range g.segments {
				p("            - {config: %s, from_s: %s, to_s: %s}\n", sg.config, num(sg.from), num(sg.to))
			}
		}
	}
	if len(s.Pressure) > 0 {
		p("  pressure:\n")
		for _, pr := range s.Pressure {
			p("    - id: %s\n      mode: panels\n      sensor_sd_pa: %s\n      reference_sd_pa: %s\n", pr.ID, num(pr.SensorSDPa), num(pr.ReferenceSDPa))
			if pr.At.Has("model_sd_pct") {
				p("      model_sd_pct: %s\n", num(pr.ModelSDPct))
			}
			p("      taps:\n")
			for _, t := range pr.Taps {
				p("        - {id: %s, x_m: %s, surface: %s, area_m2: %s, nz: %s}\n", t.ID, num(t.XM), t.Surface, num(t.AreaM2), num(t.Nz))
			}
			if len(pr.Uncovered) > 0 {
				p("      uncovered:\n")
				for _, u := range pr.Uncovered {
					p("        - {surface: %s, x_m: %s, area_m2: %s, nz: %s, cp_mean: %s, cp_sd: %s}\n", u.Surface, num(u.XM), num(u.AreaM2), num(u.Nz), num(u.CpMean), num(u.CpSD))
				}
			}
			p("      readings_file: %s-readings.csv\n", pr.ID)
		}
	}
	if len(s.Vortex) > 0 {
		p("  vortex:\n")
		for _, o := range s.Vortex {
			p("    - id: %s\n      side: %s\n      informs: %s\n", o.ID, o.Side, o.Informs)
			if _, applies := campaign.DefaultMisread(v.Body); !applies {
				p("      misread: %s\n", num(o.Misread))
			}
			p("      observations:\n")
			for _, sn := range g.senses[o.ID] {
				p("        - {config: %s, speed_kmh: %s, sense: %s}\n", sn.config, num(sn.kmh), sn.sense)
			}
		}
	}
	r := s.Report
	if r.At.Where.Line > 0 {
		p("report:\n")
		if r.At.Has("speeds_kmh") {
			sp := make([]string, len(r.SpeedsKmh))
			for i, x := range r.SpeedsKmh {
				sp[i] = num(x)
			}
			p("  speeds_kmh: [%s]\n", strings.Join(sp, ", "))
		}
		if r.At.Has("credible") {
			p("  credible: %s\n", num(r.Credible))
		}
		if r.ForceUnit != "" {
			p("  force_unit: %s\n", r.ForceUnit)
		}
		if r.ReferenceConfig != "" {
			p("  reference_config: %s\n", r.ReferenceConfig)
		}
		if r.At.Has("seed") {
			p("  seed: %d\n", r.Seed)
		}
	}
	if pl := s.Plan; pl.At.Where.Line > 0 {
		p("plan:\n")
		if t := pl.Target; t.Config != "" {
			p("  target: {config: %s, axle: %s", t.Config, t.Axle)
			if t.Versus != "" {
				p(", versus: %s", t.Versus)
			}
			p("}\n")
		}
		if len(pl.CostH) > 0 {
			var kv []string
			for _, c := range pl.CostH {
				kv = append(kv, fmt.Sprintf("%s: %s", c.Key, num(c.V)))
			}
			p("  cost_h: {%s}\n", strings.Join(kv, ", "))
		}
	}
	return b.String()
}
