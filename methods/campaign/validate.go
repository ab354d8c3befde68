package campaign

import (
	"fmt"
	"math"
	"regexp"
	"sort"
	"strings"
	"time"
)

// validator checks a decoded campaign against every rule of format 1 and
// collects all errors and warnings.
type validator struct {
	c     *Campaign
	opt   Options
	errs  []*Problem
	warns []*Problem

	configs  map[string]bool
	informed map[string]bool        // configs that some evidence speaks of
	scanned  map[string]*scanResult // logs read, by file and columns
	speeds   map[string]bool        // speed files read, by file and columns
}

func (v *validator) errf(w Where, path string, kind error, format string, args ...any) {
	v.errs = append(v.errs, &Problem{Where: w, Path: path, Err: wrapf(kind, format, args...)})
}

func (v *validator) warnf(w Where, path string, format string, args ...any) {
	v.warns = append(v.warns, &Problem{Where: w, Path: path, Err: fmt.Errorf(format, args...), Warning: true})
}

var (
	configID = regexp.MustCompile(`^[a-z0-9-]+$`)
	tapID    = regexp.MustCompile(`^[A-Za-z0-9_.-]+$`)
)

// positive requires x > 0.
func (v *validator) positive(p Place, path, key string, x float64) {
	hi, unit := upper(key)
	if !(x > 0 && x <= hi) {
		v.errf(p.Of(key), join(path, key), ErrRange, "%s must lie in (0, %g]%s, got %g", key, hi, unit, x)
	}
}

// nonNegative requires 0 ≤ x ≤ the key's physical upper bound.
func (v *validator) nonNegative(p Place, path, key string, x float64) {
	hi, unit := upper(key)
	if !(x >= 0 && x <= hi) {
		v.errf(p.Of(key), join(path, key), ErrRange, "%s must lie in [0, %g]%s, got %g", key, hi, unit, x)
	}
}

// upperBounds are generous physical limits of each key, so that a slip of
// units or an overflow (1e308) is an error at its place rather than a
// failure deep in the fusion. Each is far beyond any road car (common
// practice, no source).
var upperBounds = map[string]struct {
	hi   float64
	unit string
}{
	"wheelbase_m": {10, " m"}, "mass_kg": {60000, " kg"}, "frontal_area_m2": {20, " m²"},
	"cda_m2": {20, " m²"}, "centre_height_m": {5, " m"}, "spring_n_per_mm": {5000, " N/mm"},
	"motion_ratio": {5, ""}, "motion_ratio_sd": {1, ""}, "tyre_n_per_mm": {10000, " N/mm"},
	"wind_sd_ms": {20, " m/s"}, "cla_sd_m2": {10, " m²"}, "added_kg": {5000, " kg"},
	"friction_mm": {20, " mm"}, "sd_mm": {50, " mm"}, "speed_tol_kmh": {50, " km/h"},
	"min_duration_s": {3600, " s"}, "filter_tau_s": {60, " s"}, "sensor_sd_pa": {10000, " Pa"},
	"reference_sd_pa": {10000, " Pa"}, "area_m2": {50, " m²"}, "width_m": {10, " m"},
	"cp_sd": {10, ""}, "speed_kmh": {500, " km/h"}, "softness_m2": {1, " m²"}, "rpm": {100000, " 1/min"},
}

func upper(key string) (float64, string) {
	if b, ok := upperBounds[key]; ok {
		return b.hi, b.unit
	}
	return math.MaxFloat64, ""
}

// within requires lo ≤ x ≤ hi, a physical range stated in the message.
func (v *validator) within(p Place, path, key string, x, lo, hi float64, unit string) {
	if !(x >= lo && x <= hi) {
		v.errf(p.Of(key), join(path, key), ErrRange, "%s must lie in [%g, %g]%s, got %g", key, lo, hi, unit, x)
	}
}

// percent requires x in [0, 100).
func (v *validator) percent(p Place, path, key string, x float64) {
	if !(x >= 0 && x < 100) {
		v.errf(p.Of(key), join(path, key), ErrRange, "%s is a percentage in [0, 100), got %g", key, x)
	}
}

// oneOf requires s to be one of the words.
func (v *validator) oneOf(p Place, path, key, s string, words ...string) bool {
	for _, w := range words {
		if s == w {
			return true
		}
	}
	v.errf(p.Of(key), join(path, key), ErrRange, "%s must be %s, got %q", key, WordList(words), s)
	return false
}

// config requires id to name a configuration.
func (v *validator) config(p Place, path, key, id string) {
	if !v.configs[id] {
		v.errf(p.Of(key), join(path, key), ErrReference, "unknown configuration %q (known: %s)", id, v.configList())
		return
	}
	v.informed[id] = true
}

func (v *validator) configList() string { return WordList(v.c.ConfigIDs()) }

func (v *validator) direction(p Place, path, key string, d int) {
	if d != -1 && d != 0 && d != 1 {
		v.errf(p.Of(key), join(path, key), ErrRange, "direction must be 1 or -1, got %d", d)
	}
}

func (v *validator) run() {
	c := v.c
	v.configs = map[string]bool{}
	v.informed = map[string]bool{}

	if _, err := time.Parse("2006-01-02", c.Campaign.Date); err != nil {
		v.errf(c.Campaign.At.Of("date"), "campaign.date", ErrRange, "date must be an ISO date such as 2026-10-14, got %q", c.Campaign.Date)
	}
	v.sizes()
	v.vehicle()
	if len(c.Configurations) == 0 {
		v.errf(c.At.Of("configurations"), "configurations", ErrRange, "at least one configuration is needed")
	}
	for i, cf := range c.Configurations {
		path := fmt.Sprintf("configurations[%d]", i)
		switch {
		case !configID.MatchString(cf.ID):
			v.errf(cf.At.Of("id"), path+".id", ErrRange, "configuration id %q must use only a-z, 0-9 and -", cf.ID)
		case v.configs[cf.ID]:
			v.errf(cf.At.Of("id"), path+".id", ErrDuplicate, "configuration %q is listed twice", cf.ID)
		}
		v.configs[cf.ID] = true
	}
	v.air()
	if c.Prior.At.Has("cla_sd_m2") {
		v.positive(c.Prior.At, "prior", "cla_sd_m2", c.Prior.CLASDM2)
	}
	v.oneOf(c.Prior.At, "prior", "speed_model", c.Prior.SpeedModel, SpeedConstant, SpeedLinear)
	v.evidence()
	v.report()
	v.plan()

	if c.stream == nil {
		v.uninformed() // else once the adapters have read the logs (Finish)
	}
}

func (v *validator) vehicle() {
	veh := &v.c.Vehicle
	const path = "vehicle"
	v.oneOf(veh.At, path, "body", veh.Body, BodyFastback, BodyNotchbackRaked, BodyNotchback, BodyHatchback, BodyWagon, BodyOpenWheel, BodyOther)
	v.positive(veh.At, path, "wheelbase_m", veh.WheelbaseM)
	v.positive(veh.At, path, "mass_kg", veh.MassKg)
	if veh.At.Has("front_static_kg") && !(veh.FrontStaticKg > 0 && veh.FrontStaticKg < veh.MassKg) {
		v.errf(veh.At.Of("front_static_kg"), path+".front_static_kg", ErrRange, "front_static_kg must lie between 0 and mass_kg (%g), got %g", veh.MassKg, veh.FrontStaticKg)
	}
	if veh.At.Has("frontal_area_m2") {
		v.positive(veh.At, path, "frontal_area_m2", veh.FrontalAreaM2)
	}
	if d := veh.Drag; d != nil {
		v.positive(d.At, path+".drag", "cda_m2", d.CdAM2)
		v.positive(d.At, path+".drag", "centre_height_m", d.CentreHeightM)
		v.percent(d.At, path+".drag", "sd_pct", d.SDPct)
	}
	v.within(veh.At, path, "cg_height_m", veh.CGHeightM, 0.05, 3, " m")
	v.within(veh.At, path, "cg_height_sd_m", veh.CGHeightSDM, 0, 1, " m")
	for _, ax := range []struct {
		name string
		a    *Axle
	}{{"front", &veh.Axles.Front}, {"rear", &veh.Axles.Rear}} {
		p := path + ".axles." + ax.name
		v.positive(ax.a.At, p, "spring_n_per_mm", ax.a.SpringNPerMm)
		v.percent(ax.a.At, p, "spring_sd_pct", ax.a.SpringSDPct)
		v.positive(ax.a.At, p, "motion_ratio", ax.a.MotionRatio)
		v.nonNegative(ax.a.At, p, "motion_ratio_sd", ax.a.MotionRatioSD)
		v.positive(ax.a.At, p, "tyre_n_per_mm", ax.a.TyreNPerMm)
		v.percent(ax.a.At, p, "tyre_sd_pct", ax.a.TyreSDPct)
	}
}

func (v *validator) air() {
	a := &v.c.Air
	if !(a.TemperatureC >= -40 && a.TemperatureC <= 60) {
		v.errf(a.At.Of("temperature_c"), "air.temperature_c", ErrRange, "temperature_c must lie in [-40, 60] °C, got %g", a.TemperatureC)
	}
	if !(a.PressureHPa >= 500 && a.PressureHPa <= 1100) {
		v.errf(a.At.Of("pressure_hpa"), "air.pressure_hpa", ErrRange, "pressure_hpa must lie in [500, 1100] hPa, got %g", a.PressureHPa)
	}
	if !(a.HumidityPct >= 0 && a.HumidityPct <= 100) {
		v.errf(a.At.Of("humidity_pct"), "air.humidity_pct", ErrRange, "humidity_pct must lie in [0, 100], got %g", a.HumidityPct)
	}
	if !(a.CO2ppm >= 0 && a.CO2ppm <= 10000) {
		v.errf(a.At.Of("co2_ppm"), "air.co2_ppm", ErrRange, "co2_ppm must lie in [0, 10000], got %g", a.CO2ppm)
	}
	v.nonNegative(a.At, "air", "wind_sd_ms", a.WindSDMs)
	v.percent(a.At, "air", "probe_sd_pct", a.ProbeSDPct)
	v.within(a.At, "air", "gust_sd_ms", a.GustSDMs, 0, 15, " m/s")
}

func (v *validator) evidence() {
	c := v.c
	e := &c.Evidence
	if len(e.RideHeight)+len(e.Pressure)+len(e.Vortex) == 0 {
		v.errf(c.At.Of("evidence"), "evidence", ErrMissing, "no evidence entries: give at least one of ride_height, pressure, vortex")
	}
	ids := map[string]bool{}
	entryID := func(p Place, path, id string) {
		switch {
		case !configID.MatchString(id):
			v.errf(p.Of("id"), path+".id", ErrRange, "entry id %q must use only a-z, 0-9 and -", id)
		case ids[id]:
			v.errf(p.Of("id"), path+".id", ErrDuplicate, "evidence id %q is used twice", id)
		}
		ids[id] = true
	}
	heightAxles := map[string]bool{}
	for i := range e.RideHeight {
		path := fmt.Sprintf("evidence.ride_height[%d]", i)
		entryID(e.RideHeight[i].At, path, e.RideHeight[i].ID)
		v.rideHeight(&e.RideHeight[i], path)
		heightAxles[e.RideHeight[i].Axle] = true
	}
	if len(e.RideHeight) > 0 {
		for _, ax := range []string{AxleFront, AxleRear} {
			if !heightAxles[ax] {
				v.warnf(e.At.Of("ride_height"), "evidence.ride_height", "no ride-height evidence on the %s axle: its figure rests on the other methods alone", ax)
			}
		}
	}
	for i := range e.Pressure {
		path := fmt.Sprintf("evidence.pressure[%d]", i)
		entryID(e.Pressure[i].At, path, e.Pressure[i].ID)
		v.pressure(&e.Pressure[i], path)
	}
	for i := range e.Vortex {
		path := fmt.Sprintf("evidence.vortex[%d]", i)
		entryID(e.Vortex[i].At, path, e.Vortex[i].ID)
		v.vortex(&e.Vortex[i], path)
	}
	for _, cv := range c.Plan.CostH {
		if !ids[cv.Key] {
			v.errf(cv.At, "plan.cost_h."+cv.Key, ErrReference, "no evidence entry %q", cv.Key)
		} else if !(cv.V > 0 && cv.V <= 1000) {
			v.errf(cv.At, "plan.cost_h."+cv.Key, ErrRange, "cost must lie in (0, 1000] hours, got %g", cv.V)
		}
	}
}

func (v *validator) rideHeight(e *RideHeightEntry, path string) {
	v.oneOf(e.At, path, "axle", e.Axle, AxleFront, AxleRear)
	v.oneOf(e.At, path, "sensor", e.Sensor, SensorPot, SensorLaser)

	cal := &e.Calibration
	cp := path + ".calibration"
	switch hasGain, hasPts := cal.At.Has("mm_per_unit"), cal.At.Has("points"); {
	case hasGain == hasPts:
		v.errf(e.At.Of("calibration"), cp, ErrMissing, "give exactly one of mm_per_unit and points")
	case hasGain && !(math.Abs(cal.MmPerUnit) > 0 && math.Abs(cal.MmPerUnit) <= 1e5):
		v.errf(cal.At.Of("mm_per_unit"), cp+".mm_per_unit", ErrRange, "mm_per_unit must not be zero and its size at most 1e5 mm per unit, got %g", cal.MmPerUnit)
	case hasPts:
		if distinct(len(cal.Points), func(i int) float64 { return cal.Points[i].A }) < 2 {
			v.errf(cal.At.Of("points"), cp+".points", ErrRange, "a points calibration needs at least 2 distinct signals")
		}
	}
	v.percent(cal.At, cp, "sd_pct", cal.SDPct)

	st := &e.Stiffness
	sp := path + ".stiffness"
	if v.oneOf(st.At, sp, "from", st.From, FromSprings, FromBallast) {
		switch {
		case st.From == FromBallast && distinct(len(st.Ballast), func(i int) float64 { return st.Ballast[i].AddedKg }) < 2:
			v.errf(st.At.Of("ballast"), sp+".ballast", ErrRange, "a ballast stiffness needs at least 2 distinct added masses")
		case st.From == FromSprings && st.At.Has("ballast"):
			v.errf(st.At.Of("ballast"), sp+".ballast", ErrRange, "ballast points are given but from is springs")
		}
	}
	for j, b := range st.Ballast {
		bp := fmt.Sprintf("%s.ballast[%d]", sp, j)
		v.nonNegative(b.At, bp, "added_kg", b.AddedKg)
		if L := v.c.Vehicle.WheelbaseM; L > 0 && !(b.XM >= -2 && b.XM <= L+2) {
			v.errf(b.At.Of("x_m"), bp+".x_m", ErrRange, "x_m (from the front axle, rearward) %g is off the car", b.XM)
		}
	}
	v.nonNegative(e.At, path, "friction_mm", e.FrictionMm)
	v.placeAndLimit(e, path)
	if e.Sensor == SensorLaser {
		if !e.At.Has("tyre_growth") {
			v.warnf(e.At.Where, path, "laser %q has no tyre_growth prior: using %g ± %g mm at 100 km/h", e.ID, DefaultGrowthMm, DefaultGrowthSDMm)
		}
		v.positive(e.TyreGrowth.At, path+".tyre_growth", "sd_mm", e.TyreGrowth.SDMm)
	} else if e.At.Has("tyre_growth") {
		v.warnf(e.At.Of("tyre_growth"), path+".tyre_growth", "tyre_growth is ignored for a suspension potentiometer (it does not see the tyres)")
	}
	v.positive(e.Steady.At, path+".steady", "speed_tol_kmh", e.Steady.SpeedTolKmh)
	v.positive(e.Steady.At, path+".steady", "min_duration_s", e.Steady.MinDurationS)
	v.positive(e.At, path, "filter_tau_s", e.FilterTauS)
	if len(e.Logs) == 0 {
		v.errf(e.At.Of("logs"), path+".logs", ErrMissing, "at least one log is needed")
	}
	for j := range e.Logs {
		lp := fmt.Sprintf("%s.logs[%d]", path, j)
		l := &e.Logs[j]
		if l.Signal == "" {
			v.errf(l.At.Where, lp+".signal", ErrMissing, "a ride-height log needs signal (the sensor's column)")
		}
		if l.At.Has("taps") {
			v.errf(l.At.Of("taps"), lp+".taps", ErrNotApply, "taps are for pressure logs")
		}
		v.logSpec(l, lp)
	}
}

// placeAndLimit checks a laser's position and an entry's speed limit.
func (v *validator) placeAndLimit(e *RideHeightEntry, path string) {
	if e.At.Has("x_m") {
		if e.Sensor != SensorLaser {
			v.errf(e.At.Of("x_m"), path+".x_m", ErrNotApply, "x_m is for a laser; a potentiometer measures at its axle")
		} else if L := v.c.Vehicle.WheelbaseM; L > 0 {
			v.within(e.At, path, "x_m", e.XM, -2, L+2, " m (from the front axle, rearward)")
		}
	}
	if e.At.Has("max_speed_kmh") {
		v.within(e.At, path, "max_speed_kmh", e.MaxSpeedKmh, 10, 500, " km/h")
	}
}

// distinct counts the distinct values among n.
func distinct(n int, at func(int) float64) int {
	seen := map[float64]bool{}
	for i := range n {
		seen[at(i)] = true
	}
	return len(seen)
}

func (v *validator) logSpec(l *LogSpec, path string) {
	v.columnNames(l, path)
	if n := count(l.At.Has("speed_kmh"), l.At.Has("speed_ms"), l.SpeedFile != nil); n != 1 {
		v.errf(l.At.Where, path, ErrMissing, "give exactly one of speed_kmh, speed_ms (the speed column) and speed_file")
	}
	if count(l.At.Has("airspeed_kmh"), l.At.Has("airspeed_ms"), l.At.Has("q_pa")) > 1 {
		v.errf(l.At.Where, path, ErrRange, "give at most one of airspeed_kmh, airspeed_ms and q_pa")
	}
	v.logFormat(l.Format, path+".format")
	if sf := l.SpeedFile; sf != nil {
		if count(sf.At.Has("speed_kmh"), sf.At.Has("speed_ms")) != 1 {
			v.errf(sf.At.Where, path+".speed_file", ErrMissing, "give exactly one of speed_kmh and speed_ms")
		}
		v.within(sf.At, path+".speed_file", "offset_s", sf.OffsetS, -86400, 86400, " s")
		v.logFormat(sf.Format, path+".speed_file.format")
	}
	hasCol, hasSeg := l.At.Has("config"), len(l.Segments) > 0
	switch {
	case hasCol && hasSeg:
		v.errf(l.At.Of("segments"), path+".segments", ErrRange, "give a config column or segments, not both")
	case !hasCol && !hasSeg && len(v.c.Configurations) > 1:
		v.errf(l.At.Where, path, ErrMissing, "with %d configurations a log needs a config column or segments", len(v.c.Configurations))
	case !hasCol && !hasSeg && len(v.c.Configurations) == 1:
		v.informed[v.c.Configurations[0].ID] = true
	}
	for k, s := range l.Segments {
		sp := fmt.Sprintf("%s.segments[%d]", path, k)
		v.config(s.At, sp, "config", s.Config)
		v.direction(s.At, sp, "direction", s.Direction)
		if !(s.ToS > s.FromS) {
			v.errf(s.At.Of("to_s"), sp+".to_s", ErrRange, "to_s (%g) must be after from_s (%g)", s.ToS, s.FromS)
		}
	}
	order := make([]int, len(l.Segments))
	for k := range order {
		order[k] = k
	}
	sort.SliceStable(order, func(a, b int) bool { return l.Segments[order[a]].FromS < l.Segments[order[b]].FromS })
	for k := 1; k < len(order); k++ {
		prev, cur := l.Segments[order[k-1]], l.Segments[order[k]]
		if cur.FromS < prev.ToS {
			v.errf(cur.At.Of("from_s"), fmt.Sprintf("%s.segments[%d]", path, order[k]), ErrOverlap,
				"segment %g–%g s overlaps segment %g–%g s", cur.FromS, cur.ToS, prev.FromS, prev.ToS)
		}
	}
	v.scanLog(l, path)
}

func (v *validator) pressure(e *PressureEntry, path string) {
	modeOK := v.oneOf(e.At, path, "mode", e.Mode, ModePanels, ModeStrips)
	switch {
	case e.At.Has("sensor_sd_pa"):
		v.positive(e.At, path, "sensor_sd_pa", e.SensorSDPa)
	case !e.At.Has("logs"):
		v.errf(e.At.Where, path+".sensor_sd_pa", ErrMissing, "missing required key \"sensor_sd_pa\" (it is estimated only when the taps are logged in time)")
	}
	v.nonNegative(e.At, path, "reference_sd_pa", e.ReferenceSDPa)
	v.percent(e.At, path, "model_sd_pct", e.ModelSDPct)

	switch hasTaps, hasFile := e.At.Has("taps"), e.At.Has("taps_file"); {
	case hasTaps == hasFile:
		v.errf(e.At.Where, path, ErrMissing, "give exactly one of taps and taps_file")
	case hasFile:
		v.loadTaps(e, path)
	}
	switch hasFile := e.At.Has("readings_file"); {
	case count(e.At.Has("readings"), hasFile, e.At.Has("logs")) != 1:
		v.errf(e.At.Where, path, ErrMissing, "give exactly one of readings, readings_file and logs")
	case hasFile:
		v.loadReadings(e, path)
	}
	v.pressureLogs(e, path)
	taps := v.taps(e, path, modeOK)
	v.uncovered(e, path)
	v.readings(e, path, taps)
}

// taps checks each tap of a pressure entry (its id, surface, and the keys
// of its mode) and the balance of upper and lower coverage; it returns the
// tap ids.
func (v *validator) taps(e *PressureEntry, path string, modeOK bool) map[string]bool {
	taps := map[string]bool{}
	var upper, lower float64
	for i := range e.Taps {
		t := &e.Taps[i]
		tp := fmt.Sprintf("%s.taps[%d]", path, i)
		switch {
		case !tapID.MatchString(t.ID):
			v.errf(t.At.Of("id"), tp+".id", ErrRange, "tap id %q must use only letters, digits, _ . -", t.ID)
		case taps[t.ID]:
			v.errf(t.At.Of("id"), tp+".id", ErrDuplicate, "tap %q is listed twice", t.ID)
		}
		taps[t.ID] = true
		v.oneOf(t.At, tp, "surface", t.Surface, SurfaceUpper, SurfaceLower)
		if modeOK {
			v.tapMode(t, tp, e.Mode)
		}
		if t.Surface == SurfaceUpper {
			upper += t.AreaM2 + t.WidthM
		} else {
			lower += t.AreaM2 + t.WidthM
		}
	}
	if len(e.Taps) == 0 && (e.At.Has("taps") || e.At.Has("taps_file")) {
		v.errf(e.At.Of("taps"), path+".taps", ErrMissing, "no taps")
	}
	if len(e.Taps) > 0 && (upper == 0 || lower == 0 || upper > 4*lower || lower > 4*upper) {
		v.warnf(e.At.Of("taps"), path+".taps", "upper and lower surfaces are covered very unequally: the reference-port offset will not cancel")
	}
	return taps
}

// tapMode checks a tap's keys for the entry's mode: panels take area_m2
// and nz, strips take width_m.
func (v *validator) tapMode(t *Tap, tp, mode string) {
	own, other := "area_m2", "width_m"
	x := t.AreaM2
	if mode == ModeStrips {
		own, other, x = "width_m", "area_m2", t.WidthM
	}
	if t.At.Has(other) {
		v.errf(t.At.Of(other), tp+"."+other, ErrRange, "%s is for %s mode; %s takes %s", other,
			map[string]string{ModePanels: ModeStrips, ModeStrips: ModePanels}[mode], mode, own)
	}
	if !t.At.Has(own) {
		v.errf(t.At.Where, tp+"."+own, ErrMissing, "missing required key %q", own)
	} else {
		v.positive(t.At, tp, own, x)
	}
	if mode == ModePanels && !t.At.Has("nz") {
		v.errf(t.At.Where, tp+".nz", ErrMissing, "missing required key \"nz\"")
	}
	if t.At.Has("nz") && !(t.Nz >= -1 && t.Nz <= 1 && t.Nz != 0) {
		v.errf(t.At.Of("nz"), tp+".nz", ErrRange, "nz is the vertical component of the outward unit normal, in [-1, 1] and not 0; got %g", t.Nz)
	}
}

// uncovered checks the patches with no taps.
func (v *validator) uncovered(e *PressureEntry, path string) {
	if len(e.Uncovered) == 0 {
		v.warnf(e.At.Where, path, "no uncovered patches declared: the integration assumes the taps see the whole body")
	}
	for i, u := range e.Uncovered {
		up := fmt.Sprintf("%s.uncovered[%d]", path, i)
		v.oneOf(u.At, up, "surface", u.Surface, SurfaceUpper, SurfaceLower)
		v.positive(u.At, up, "area_m2", u.AreaM2)
		v.nonNegative(u.At, up, "cp_sd", u.CpSD)
		if !(u.Nz >= -1 && u.Nz <= 1) {
			v.errf(u.At.Of("nz"), up+".nz", ErrRange, "nz must lie in [-1, 1], got %g", u.Nz)
		}
	}
}

// readings checks each averaged reading: its configuration, speed and
// direction, and that it reads every tap and no other.
func (v *validator) readings(e *PressureEntry, path string, taps map[string]bool) {
	if len(e.Readings) == 0 && e.At.Has("readings") {
		v.errf(e.At.Of("readings"), path+".readings", ErrMissing, "no readings")
	}
	for i := range e.Readings {
		r := &e.Readings[i]
		rp := fmt.Sprintf("%s.readings[%d]", path, i)
		v.config(r.At, rp, "config", r.Config)
		v.positive(r.At, rp, "speed_kmh", r.SpeedKmh)
		v.direction(r.At, rp, "direction", r.Direction)
		for _, pv := range r.Pa {
			if !taps[pv.Key] {
				v.errf(pv.At, rp+".pa."+pv.Key, ErrReference, "reading names tap %q, which is not among the taps", pv.Key)
			}
		}
		for _, t := range e.Taps {
			if _, ok := r.Pa.Get(t.ID); !ok {
				v.errf(r.At.Of("pa"), rp, ErrMissing, "tap %q has no reading", t.ID)
			}
		}
	}
}

func (v *validator) vortex(e *VortexEntry, path string) {
	v.oneOf(e.At, path, "side", e.Side, SideLeft, SideRight)
	v.oneOf(e.At, path, "informs", e.Informs, AxleTotal, AxleRear)
	if !v.c.VortexApplies(e) {
		v.errf(e.At.Where, path, ErrNotApply,
			"the vortex-sense method applies to fastbacks and raked notchbacks, not to a %s body; set misread to use it anyway", v.c.Vehicle.Body)
	}
	if !(e.Misread >= 0 && e.Misread < 0.5) {
		v.errf(e.At.Of("misread"), path+".misread", ErrRange, "misread is a probability in [0, 0.5), got %g", e.Misread)
	}
	v.positive(e.At, path, "softness_m2", e.SoftnessM2)
	if len(e.Observations) == 0 {
		v.errf(e.At.Of("observations"), path+".observations", ErrMissing, "no observations")
	}
	for i, o := range e.Observations {
		op := fmt.Sprintf("%s.observations[%d]", path, i)
		v.config(o.At, op, "config", o.Config)
		v.positive(o.At, op, "speed_kmh", o.SpeedKmh)
		v.oneOf(o.At, op, "sense", o.Sense, SenseCW, SenseCCW)
		v.nonNegative(o.At, op, "rpm", o.RPM)
	}
}

func (v *validator) report() {
	r := &v.c.Report
	if n := len(r.SpeedsKmh); n == 0 || n > MaxReportSpeeds {
		v.errf(r.At.Of("speeds_kmh"), "report.speeds_kmh", ErrRange, "give 1 to %d report speeds, got %d", MaxReportSpeeds, n)
	}
	for i, s := range r.SpeedsKmh {
		if !(s > 0 && s < 500) {
			v.errf(r.At.Of("speeds_kmh"), fmt.Sprintf("report.speeds_kmh[%d]", i), ErrRange, "report speed must lie in (0, 500) km/h, got %g", s)
		}
	}
	if !(r.Credible > 0 && r.Credible < 1) {
		v.errf(r.At.Of("credible"), "report.credible", ErrRange, "credible is a probability in (0, 1), got %g", r.Credible)
	}
	v.oneOf(r.At, "report", "force_unit", r.ForceUnit, UnitKgf, UnitN, UnitLbf)
	if r.At.Has("reference_config") && !v.configs[r.ReferenceConfig] {
		v.errf(r.At.Of("reference_config"), "report.reference_config", ErrReference, "unknown configuration %q (known: %s)", r.ReferenceConfig, v.configList())
	}
}

func (v *validator) plan() {
	t := &v.c.Plan.Target
	if !v.c.Plan.At.Has("target") {
		return
	}
	if !v.configs[t.Config] {
		v.errf(t.At.Of("config"), "plan.target.config", ErrReference, "unknown configuration %q (known: %s)", t.Config, v.configList())
	}
	v.oneOf(t.At, "plan.target", "axle", t.Axle, AxleFront, AxleRear, AxleTotal)
	if t.At.Has("versus") {
		switch {
		case !v.configs[t.Versus]:
			v.errf(t.At.Of("versus"), "plan.target.versus", ErrReference, "unknown configuration %q (known: %s)", t.Versus, v.configList())
		case t.Versus == t.Config:
			v.errf(t.At.Of("versus"), "plan.target.versus", ErrRange, "a difference needs two different configurations")
		}
	}
}

// count returns how many of the conditions hold.
func count(bs ...bool) int {
	n := 0
	for _, b := range bs {
		if b {
			n++
		}
	}
	return n
}

// logFormat checks the keys a person gave for how a logger wrote a file.
func (v *validator) logFormat(f *LogFormat, path string) {
	if f == nil {
		return
	}
	if f.At.Has("delimiter") {
		v.oneOf(f.At, path, "delimiter", f.Delimiter, ",", ";", "\t")
	}
	if f.At.Has("decimal") && v.oneOf(f.At, path, "decimal", f.Decimal, ".", ",") &&
		f.Decimal == "," && f.Delimiter == "," {
		v.errf(f.At.Of("decimal"), path+".decimal", ErrRange, "a decimal comma needs delimiter \";\" or a tab")
	}
	if f.At.Has("header_line") {
		v.within(f.At, path, "header_line", float64(f.HeaderLine), 1, 1000, "")
	}
	v.within(f.At, path, "skip_lines", float64(f.SkipLines), 0, 100, "")
	if f.At.Has("time") {
		v.oneOf(f.At, path, "time", f.Time, TimeSeconds, TimeClock, TimeISO)
	}
	if f.At.Has("empty") {
		v.oneOf(f.At, path, "empty", f.Empty, EmptyError, EmptyHold, EmptySkip)
	}
}

// pressureLogs checks taps logged in time: every tap has a column, every
// column names a tap, and the log's keys as for any log.
func (v *validator) pressureLogs(e *PressureEntry, path string) {
	for j := range e.Logs {
		l := &e.Logs[j]
		lp := fmt.Sprintf("%s.logs[%d]", path, j)
		if l.At.Has("signal") {
			v.errf(l.At.Of("signal"), lp+".signal", ErrNotApply, "a pressure log names its taps' columns under taps, not signal")
		}
		named := map[string]bool{}
		for _, n := range l.Taps {
			named[n.Key] = true
			if !e.hasTap(n.Key) {
				v.errf(n.At, lp+".taps."+n.Key, ErrReference, "tap %q is not among the entry's taps", n.Key)
			}
		}
		for _, t := range e.Taps {
			if !named[t.ID] {
				v.errf(l.At.Of("taps"), lp+".taps", ErrMissing, "tap %q has no column in this log", t.ID)
			}
		}
		v.logSpec(l, lp)
	}
	if len(e.Logs) > 0 {
		v.positive(e.Steady.At, path+".steady", "speed_tol_kmh", e.Steady.SpeedTolKmh)
		v.positive(e.Steady.At, path+".steady", "min_duration_s", e.Steady.MinDurationS)
	}
}

func (e *PressureEntry) hasTap(id string) bool {
	for _, t := range e.Taps {
		if t.ID == id {
			return true
		}
	}
	return false
}

// Limits on how much a campaign may ask for, so that the work stays bounded
// by what a test day can hold.
const (
	MaxConfigurations = 200
	MaxEntries        = 200  // evidence entries of all methods
	MaxLogSpecs       = 1000 // logs named by all entries
	MaxReportSpeeds   = 50
	MaxTextLen        = 2000 // characters of a title, label, site or note
)

// sizes checks the campaign's counts and text lengths against the limits.
func (v *validator) sizes() {
	c := v.c
	if n := len(c.Configurations); n > MaxConfigurations {
		v.errf(c.At.Of("configurations"), "configurations", ErrRange, "at most %d configurations, got %d", MaxConfigurations, n)
	}
	e := &c.Evidence
	if n := len(e.RideHeight) + len(e.Pressure) + len(e.Vortex); n > MaxEntries {
		v.errf(c.At.Of("evidence"), "evidence", ErrRange, "at most %d evidence entries, got %d", MaxEntries, n)
	}
	logs := 0
	for _, r := range e.RideHeight {
		logs += len(r.Logs)
	}
	for _, p := range e.Pressure {
		logs += len(p.Logs)
	}
	if logs > MaxLogSpecs {
		v.errf(c.At.Of("evidence"), "evidence", ErrRange, "at most %d logs in all entries, got %d", MaxLogSpecs, logs)
	}
	for _, t := range []struct {
		at        Place
		path, key string
		s         string
	}{
		{c.Campaign.At, "campaign", "title", c.Campaign.Title}, {c.Campaign.At, "campaign", "site", c.Campaign.Site},
		{c.Campaign.At, "campaign", "notes", c.Campaign.Notes}, {c.Vehicle.At, "vehicle", "label", c.Vehicle.Label},
	} {
		if n := len([]rune(t.s)); n > MaxTextLen {
			v.errf(t.at.Of(t.key), join(t.path, t.key), ErrRange, "%s is %d characters long; at most %d", t.key, n, MaxTextLen)
		}
	}
}

// columnNames refuses a column key given with an empty name: it would be
// taken as given and then read nothing.
func (v *validator) columnNames(l *LogSpec, path string) {
	for _, k := range []struct{ key, name string }{
		{"time", l.Time}, {"speed_kmh", l.SpeedKmh}, {"speed_ms", l.SpeedMs}, {"airspeed_kmh", l.AirspeedKmh},
		{"airspeed_ms", l.AirspeedMs}, {"q_pa", l.QPa}, {"signal", l.Signal}, {"direction", l.Direction}, {"config", l.Config},
	} {
		if l.At.Has(k.key) && strings.TrimSpace(k.name) == "" {
			v.errf(l.At.Of(k.key), path+"."+k.key, ErrRange, "%s names no column (the name is empty)", k.key)
		}
	}
	for _, t := range l.Taps {
		if strings.TrimSpace(t.V) == "" {
			v.errf(t.At, path+".taps."+t.Key, ErrRange, "tap %q names no column (the name is empty)", t.Key)
		}
	}
	if sf := l.SpeedFile; sf != nil {
		for _, k := range []struct{ key, name string }{{"time", sf.Time}, {"speed_kmh", sf.SpeedKmh}, {"speed_ms", sf.SpeedMs}} {
			if sf.At.Has(k.key) && strings.TrimSpace(k.name) == "" {
				v.errf(sf.At.Of(k.key), path+".speed_file."+k.key, ErrRange, "%s names no column (the name is empty)", k.key)
			}
		}
	}
}
