package campaign

// Defaults of format 1, applied in one place (applyDefaults) after decoding.
// A key that is present keeps its value, even when it is zero.
const (
	DefaultCO2ppm         = 400
	DefaultWindSDMs       = 1.0
	DefaultCLASDM2        = 1.0
	DefaultCalSDPct       = 1.0
	DefaultGrowthMm       = 0.5
	DefaultGrowthSDMm     = 0.5
	DefaultSpeedTolKmh    = 1.5
	DefaultMinDurationS   = 4
	DefaultFilterTauS     = 0.5
	DefaultModelSDPct     = 25
	DefaultDragSDPct      = 20
	DefaultSoftnessM2     = 0.03
	DefaultCredible       = 0.90
	DefaultSeed           = 1
	DefaultCostH          = 1.0
	MisreadFastback       = 0.05
	MisreadNotchbackRaked = 0.15
	// Model v2 (campaign-format.md, "Additions to format 1").
	DefaultCGHeightM   = 0.50 // road car, from memory
	DefaultCGHeightSDM = 0.10
	DefaultProbeSDPct  = 3   // probe position error, from memory
	DefaultGustSDMs    = 1.5 // run-to-run wind scatter scale
)

// DefaultSpeedsKmh returns the report speeds used when none are given.
func DefaultSpeedsKmh() []float64 { return []float64{100, 150} }

// DefaultMisread returns the vortex misread probability for a body style and
// whether the vortex method applies to that body at all (fastbacks, and
// notchbacks with a steeply raked rear window: common practice, no source).
func DefaultMisread(body string) (float64, bool) {
	switch body {
	case BodyFastback:
		return MisreadFastback, true
	case BodyNotchbackRaked:
		return MisreadNotchbackRaked, true
	}
	return 0, false
}

func applyDefaults(c *Campaign) {
	if !c.Air.At.Has("co2_ppm") {
		c.Air.CO2ppm = DefaultCO2ppm
	}
	if !c.Air.At.Has("wind_sd_ms") {
		c.Air.WindSDMs = DefaultWindSDMs
	}
	if !c.Prior.At.Has("cla_sd_m2") {
		c.Prior.CLASDM2 = DefaultCLASDM2
	}
	if c.Prior.SpeedModel == "" {
		c.Prior.SpeedModel = SpeedConstant
	}
	vehicleDefaults(&c.Vehicle)
	if !c.Air.At.Has("probe_sd_pct") {
		c.Air.ProbeSDPct = DefaultProbeSDPct
	}
	if !c.Air.At.Has("gust_sd_ms") {
		c.Air.GustSDMs = DefaultGustSDMs
	}
	if d := c.Vehicle.Drag; d != nil && !d.At.Has("sd_pct") {
		d.SDPct = DefaultDragSDPct
	}
	for i := range c.Evidence.RideHeight {
		e := &c.Evidence.RideHeight[i]
		if !e.Calibration.At.Has("sd_pct") {
			e.Calibration.SDPct = DefaultCalSDPct
		}
		if !e.TyreGrowth.At.Has("mm_at_100kmh") {
			e.TyreGrowth.MmAt100kmh = DefaultGrowthMm
		}
		if !e.TyreGrowth.At.Has("sd_mm") {
			e.TyreGrowth.SDMm = DefaultGrowthSDMm
		}
		steadyDefaults(&e.Steady)
		if !e.At.Has("filter_tau_s") {
			e.FilterTauS = DefaultFilterTauS
		}
		if !e.At.Has("x_m") && e.Axle == AxleRear {
			e.XM = c.Vehicle.WheelbaseM
		}
	}
	for i := range c.Evidence.Pressure {
		e := &c.Evidence.Pressure[i]
		if !e.At.Has("model_sd_pct") {
			e.ModelSDPct = DefaultModelSDPct
		}
		steadyDefaults(&e.Steady)
	}
	for i := range c.Evidence.Vortex {
		e := &c.Evidence.Vortex[i]
		if e.Informs == "" {
			e.Informs = AxleTotal
		}
		if !e.At.Has("misread") {
			e.Misread, _ = DefaultMisread(c.Vehicle.Body)
		}
		if !e.At.Has("softness_m2") {
			e.SoftnessM2 = DefaultSoftnessM2
		}
	}
	r := &c.Report
	if !r.At.Has("speeds_kmh") {
		r.SpeedsKmh = DefaultSpeedsKmh()
	}
	if !r.At.Has("credible") {
		r.Credible = DefaultCredible
	}
	if r.ForceUnit == "" {
		r.ForceUnit = UnitKgf
	}
	if r.ReferenceConfig == "" && len(c.Configurations) > 0 {
		r.ReferenceConfig = c.Configurations[0].ID
	}
	if !r.At.Has("seed") {
		r.Seed = DefaultSeed
	}
	targetDefaults(c)
}

// targetDefaults: without plan.target, the target is the rear axle of the
// last configuration, as a difference to the reference configuration (the
// change a trial is usually about).
func targetDefaults(c *Campaign) {
	t := &c.Plan.Target
	if t.Config != "" || len(c.Configurations) == 0 {
		return
	}
	t.Config = c.Configurations[len(c.Configurations)-1].ID
	if t.Axle == "" {
		t.Axle = AxleRear
	}
	if t.Config != c.Report.ReferenceConfig {
		t.Versus = c.Report.ReferenceConfig
	}
}

// VortexApplies reports whether the vortex-sense method may be used on the
// campaign's body: on fastbacks and raked notchbacks, or anywhere the entry
// sets its misread probability.
func (c *Campaign) VortexApplies(e *VortexEntry) bool {
	_, applies := DefaultMisread(c.Vehicle.Body)
	return applies || e.At.Has("misread")
}

// CostH returns the hours it takes to repeat an evidence entry (plan.cost_h,
// default 1 h).
func (c *Campaign) CostH(entry string) float64 {
	if v, ok := c.Plan.CostH.Get(entry); ok {
		return v
	}
	return DefaultCostH
}

// Density returns the campaign's air density in kg/m³.
func (c *Campaign) Density() float64 { return c.Air.Density() }

func vehicleDefaults(v *Vehicle) {
	if !v.At.Has("cg_height_m") {
		v.CGHeightM = DefaultCGHeightM
	}
	if !v.At.Has("cg_height_sd_m") {
		v.CGHeightSDM = DefaultCGHeightSDM
	}
}

func steadyDefaults(s *Steady) {
	if !s.At.Has("speed_tol_kmh") {
		s.SpeedTolKmh = DefaultSpeedTolKmh
	}
	if !s.At.Has("min_duration_s") {
		s.MinDurationS = DefaultMinDurationS
	}
}
