package height

import (
	"fmt"
	"math"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// builder turns an entry's windows into evidence. For window i of log l in
// configuration c, with the sensor's lever (see Lever):
//
//	y_i = h0_l + s·Σ_a (W_a/K_a)·β_{c,a}·q_i + Σ_a W_a·G_a·(V_i/100)²
//	      + κ_i·h_cg + d_l·(t_i − t̄_l) + ε_i
//
// h0 the log's static offset (flat prior), s the stiffness, gain and probe
// scale factors, G_a the axle's tyre growth (lasers only), κ_i the
// load-transfer coefficient of the window's acceleration (accelCoef) on
// the shared nuisance h_cg ~ N(cg_height_m, cg_height_sd_m²), d an optional
// drift, plus c_i·d_r, the run-to-run wind deviation d_r ~ N(0, σ_g²) of
// the window's run (package gust), a nuisance shared by every sensor of
// the log, with c_i the pilot's sensitivity. ε has the window's variance
// (standard error², the friction band's f²/3 and the acceleration
// estimate's share). Windows at rest share one more nuisance per axle, the
// offset at which friction holds the body after a stop (restName).
type builder struct {
	c     *campaign.Campaign
	e     *campaign.RideHeightEntry
	res   *Result
	rho   float64
	wind  string
	laser bool
	refs  []evidence.ScaleRef // stiffness and gain
	probe *evidence.ScaleGroup

	perLog [][]int // window indices of each log
	gust   gustModel
	gustSD float64 // run-to-run wind scatter, m/s (0: none)
}

func newBuilder(c *campaign.Campaign, e *campaign.RideHeightEntry, res *Result) *builder {
	b := &builder{c: c, e: e, res: res, rho: c.Density(), wind: c.WindNuisance(), laser: e.Sensor == campaign.SensorLaser}
	b.refs = res.Lever.Refs()
	if !res.Stiffness.GainCancels && res.Calibration.RelSD > 0 {
		b.refs = append(b.refs, evidence.ScaleRef{Name: b.gainName(), Pow: 1})
	}
	if c.Air.ProbeSDPct > 0 {
		b.probe = &evidence.ScaleGroup{Name: ProbeName, Label: "airspeed probe factor 1 + k", SD: c.Air.ProbeSDPct / 100}
	}
	return b
}

func (b *builder) gainName() string { return b.e.ID + "/gain" }

// split groups the windows by log and prepares the run-to-run wind.
func (b *builder) split() {
	b.perLog = make([][]int, len(b.e.Logs))
	for i, w := range b.res.Windows {
		b.perLog[w.Log] = append(b.perLog[w.Log], i)
	}
	b.gust = b.gusts(b.perLog)
	for li, sens := range b.gust.sens {
		for k, c := range sens {
			b.res.Windows[b.perLog[li][k]].GustSens = c
		}
	}
}

// evidence turns the windows into Gaussian observations, one block per
// log, with the nuisances and scale groups they name.
func (b *builder) evidence() (evidence.Evidence, error) {
	c, e, res := b.c, b.e, b.res
	ev := evidence.Evidence{Entry: e.ID, Kind: evidence.KindRideHeight}
	informs := map[string]bool{}
	used := map[string]bool{}
	for li, idx := range b.perLog {
		if len(idx) == 0 {
			continue // a log with no steady window says nothing, not even its offset
		}
		blk, err := b.block(li, idx, used)
		if err != nil {
			return ev, fmt.Errorf("%s: %w", e.ID, err)
		}
		ev.Blocks = append(ev.Blocks, blk)
		for _, i := range idx {
			if res.Windows[i].Q > 0 {
				informs[res.Windows[i].Config] = true
			}
		}
	}
	ev.Scales, ev.Nuisances = b.declare(used)
	for _, cf := range c.Configurations {
		if informs[cf.ID] {
			// A laser away from its axle informs the lever's combination of
			// both axles; evidence.Quantity names one axle, so it lists its
			// own (see the package doc).
			ev.Informs = append(ev.Informs, evidence.Quantity{Config: cf.ID, Axle: e.Axle})
		}
	}
	return ev, ev.Check()
}

// declare lists the scale groups and nuisances the observations use, in a
// fixed order.
func (b *builder) declare(used map[string]bool) ([]evidence.ScaleGroup, []evidence.Nuisance) {
	sc := b.res.Lever.Groups()
	if !b.res.Stiffness.GainCancels && b.res.Calibration.RelSD > 0 {
		sc = append(sc, evidence.ScaleGroup{Name: b.gainName(), Label: b.e.ID + " calibration gain", SD: b.res.Calibration.RelSD})
	}
	if b.probe != nil && used[ProbeName] {
		sc = append(sc, *b.probe)
	}
	var ns []evidence.Nuisance
	if used[evidence.WindName] {
		ns = append(ns, evidence.Nuisance{Name: evidence.WindName, Label: "along-road wind", Unit: "m/s", SD: b.c.Air.WindSDMs, PerRun: true})
	}
	if b.laser {
		for _, s := range b.res.Lever.Axles {
			ns = append(ns, evidence.Nuisance{Name: growthName(s.Axle), Label: s.Axle + " tyre growth", Unit: "mm at 100 km/h",
				Mean: b.e.TyreGrowth.MmAt100kmh, SD: b.e.TyreGrowth.SDMm})
		}
	}
	if used[CGHeightName] {
		v := b.c.Vehicle
		ns = append(ns, evidence.Nuisance{Name: CGHeightName, Label: "centre-of-gravity height", Unit: "m", Mean: v.CGHeightM, SD: v.CGHeightSDM})
	}
	for _, names := range b.gust.names {
		for _, n := range names {
			if used[n] {
				ns = append(ns, evidence.Nuisance{Name: n, Label: "run-to-run wind of the run from " + n[len("gust/"):], Unit: "m/s",
					SD: max(b.gustSD, minGustSD), PerRun: true})
			}
		}
	}
	for _, s := range b.res.Lever.Axles {
		if used[restName(s.Axle)] {
			ns = append(ns, evidence.Nuisance{Name: restName(s.Axle), Label: s.Axle + " axle's height where friction holds it at rest",
				Unit: "mm", SD: restSD(b.c, s.Axle)})
		}
	}
	for li := range b.e.Logs {
		if !used[b.offsetName(li)] {
			continue
		}
		ns = append(ns, evidence.Nuisance{Name: b.offsetName(li), Label: b.e.ID + " static offset", Unit: "mm", Flat: true, PerRun: true})
		if b.e.Drift {
			ns = append(ns, evidence.Nuisance{Name: b.driftName(li), Label: b.e.ID + " drift", Unit: "mm/s", SD: driftSDmmPerS, PerRun: true})
		}
	}
	return sc, ns
}

// restName names an axle's rest offset: where the friction band holds the
// body at rest. Braking to a stop moves load forward; when the car stands
// the load returns, and the suspension follows it only until friction
// holds it, at the same side of the band after every stop (the front low,
// the rear high). So the windows at rest share an offset within ±f, beside
// the f²/3 of independent scatter every window keeps (leaving it out at
// rest made the bump-stop day of the reality tests fail). It is the body's,
// so every sensor reading the axle shares it: a nuisance of sd f on the
// windows at rest, with the sensor's lever weight, so that the standstill
// windows do not pin the static offset tighter than friction allows, and
// two sensors on one axle are still compared as tightly as their own
// errors allow. Play (backlash) in a suspension with Coulomb friction:
// common practice (no source).
func restName(axle string) string { return "rest-stick/" + axle }

// restSD is the sd of an axle's rest offset (mm): the widest friction band
// friction_mm states among the ride-height entries on the axle, so that
// every entry declares the shared nuisance alike.
func restSD(c *campaign.Campaign, axle string) float64 {
	f := 0.0
	for _, e := range c.Evidence.RideHeight {
		if e.Axle == axle {
			f = max(f, e.FrictionMm)
		}
	}
	return f
}

func (b *builder) offsetName(li int) string { return fmt.Sprintf("%s/offset[%d]", b.e.ID, li) }
func (b *builder) driftName(li int) string  { return fmt.Sprintf("%s/drift[%d]", b.e.ID, li) }

// block builds the observations of one log's windows idx and their
// variances, and marks the names they use. A window in a run carries the
// run's wind deviation as an additive nuisance, coefficient its pilot
// sensitivity (mm per m/s), shared with every sensor of the log.
func (b *builder) block(li int, idx []int, used map[string]bool) (evidence.Block, error) {
	tbar := meanTime(b.res.Windows, idx) // the drift's origin
	obs := make([]evidence.Obs, len(idx))
	sd := make([]float64, len(idx))
	run := b.gust.runOf(li, len(idx))
	for k, i := range idx {
		w := b.res.Windows[i]
		o := b.obs(li, i, w, tbar)
		if r := run[k]; r >= 0 && b.gustSD > 0 && w.GustSens != 0 {
			o.Nuis = append(o.Nuis, evidence.Coef{Name: b.gust.names[li][r], C: w.GustSens})
		}
		for _, s := range o.Scales {
			used[s.Name] = true
		}
		for _, cf := range o.Nuis {
			used[cf.Name] = true
		}
		if o.Air.Wind != "" {
			used[o.Air.Wind] = true
		}
		obs[k] = o
		sd[k] = math.Sqrt(b.variance(w))
	}
	return evidence.Diagonal(obs, sd)
}

// obs is window i's observation without its run's wind.
func (b *builder) obs(li, i int, w Window, tbar float64) evidence.Obs {
	o := evidence.Obs{
		Y:      w.HeightMM,
		Terms:  b.res.Lever.Terms(w.Config),
		Air:    b.airspeed(w),
		Scales: b.refs,
		Nuis:   []evidence.Coef{{Name: b.offsetName(li), C: 1}},
		Label:  fmt.Sprintf("window %d, %s, %.0f km/h, %.0f–%.0f s", i+1, w.Config, w.SpeedKmh, w.From, w.To),
	}
	if w.Probe && b.probe != nil {
		o.Scales = append(append([]evidence.ScaleRef(nil), b.refs...), evidence.ScaleRef{Name: ProbeName, Pow: 1})
	}
	if b.laser {
		o.Nuis = append(o.Nuis, b.res.Lever.growthCoefs(w.SpeedSq)...)
	}
	if b.e.Drift {
		o.Nuis = append(o.Nuis, evidence.Coef{Name: b.driftName(li), C: (w.From+w.To)/2 - tbar})
	}
	if w.AtRest() {
		for _, s := range b.res.Lever.Axles {
			if restSD(b.c, s.Axle) > 0 {
				o.Nuis = append(o.Nuis, evidence.Coef{Name: restName(s.Axle), C: s.W})
			}
		}
	}
	if k := accelCoef(b.c.Vehicle, b.res.Lever, w.AccelMs2); k != 0 {
		o.Nuis = append(o.Nuis, evidence.Coef{Name: CGHeightName, C: k})
	}
	return o
}

// airspeed is a window's dynamic pressure: at ground speed with the
// session's wind, or measured by a probe with no wind term.
func (b *builder) airspeed(w Window) evidence.Airspeed {
	if w.Probe {
		return evidence.Airspeed{Q: w.Q, V: air.KmhToMs(w.AirKmh), Rho: b.rho, Dir: float64(w.Direction)}
	}
	return evidence.Airspeed{Q: w.Q, V: air.KmhToMs(w.SpeedKmh), Rho: b.rho, Dir: float64(w.Direction), Wind: b.wind}
}

// variance is a window's own error variance (mm²): its standard error², the
// friction band's f²/3 (a uniform error of half-width f) and the share of
// its acceleration estimate's error.
func (b *builder) variance(w Window) float64 {
	f := b.e.FrictionMm
	return w.SE*w.SE + f*f/3 + accelVar(b.c.Vehicle, b.res.Lever, w) + 1e-12
}

func meanTime(ws []Window, idx []int) float64 {
	var t float64
	for _, i := range idx {
		t += (ws[i].From + ws[i].To) / 2
	}
	return t / float64(len(idx))
}
