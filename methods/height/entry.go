package height

import (
	"fmt"
	"io"
	"math"
	"sort"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
)

// Result is everything one ride-height entry yields: its windows and traces
// for the report, its stiffness and calibration, the Evidence for fusion,
// detectability figures and warnings.
type Result struct {
	Entry       *campaign.RideHeightEntry
	Calibration Calibration
	Stiffness   Stiffness
	Windows     []Window
	Traces      [][]TracePoint // per log
	Evidence    evidence.Evidence
	Detect      Detectability
	Warnings    []string
}

// Drift prior: 1 mm per 10 minutes (fuel burn, warming dampers; common
// practice, no source).
const driftSDmmPerS = 1.0 / 600

// typicalCLA is the size of axle lift (C_L·A, m²) the stiff-axle warning
// asks a sensor to resolve (common practice, no source).
const typicalCLA = 0.1

// Reduce reads every log of a ride-height entry and returns its Result.
func Reduce(c *campaign.Campaign, e *campaign.RideHeightEntry, opt Options) (*Result, error) {
	rs, err := ReduceAll(c, []*campaign.RideHeightEntry{e}, opt)
	if err != nil {
		return nil, err
	}
	return rs[0], nil
}

// ReduceAll reduces several ride-height entries, reading each log file once
// for all the sensors logged in it (those that name the same time column).
func ReduceAll(c *campaign.Campaign, es []*campaign.RideHeightEntry, opt Options) ([]*Result, error) {
	only := ""
	if len(c.Configurations) == 1 {
		only = c.Configurations[0].ID
	}
	rho := c.Density()
	known := map[string]bool{}
	for _, cf := range c.Configurations {
		known[cf.ID] = true
	}
	type group struct {
		path   string
		passes []*pass
	}
	var groups []*group
	byKey := map[[2]string]*group{}
	results := make([]*Result, len(es))
	for i, e := range es {
		res, err := prepare(c, e)
		if err != nil {
			return nil, err
		}
		res.Traces = make([][]TracePoint, len(e.Logs))
		results[i] = res
		for li := range e.Logs {
			key := [2]string{c.Path(e.Logs[li].File), e.Logs[li].Time}
			g, ok := byKey[key]
			if !ok {
				g = &group{path: key[0]}
				byKey[key] = g
				groups = append(groups, g)
			}
			p := newPass(e, li, res.Calibration, rho, only)
			p.known = known
			g.passes = append(g.passes, p)
		}
	}
	owner := map[*campaign.RideHeightEntry]*Result{}
	for i, e := range es {
		owner[e] = results[i]
	}
	for _, g := range groups {
		f, size, err := openLog(g.path)
		if err != nil {
			return nil, err
		}
		var src io.Reader = f
		if opt.Progress != nil {
			src = &progressReader{r: f, total: size, report: opt.Progress}
		}
		_, err = readLog(src, g.path, g.passes)
		f.Close()
		if err != nil {
			return nil, err
		}
		for _, p := range g.passes {
			res := owner[p.e]
			res.Windows = append(res.Windows, p.f.windows...)
			res.Traces[p.li] = p.trace
		}
	}
	for i, e := range es {
		res := results[i]
		// Windows in log order, as the evidence lists its observations.
		sort.SliceStable(res.Windows, func(a, b int) bool { return res.Windows[a].Log < res.Windows[b].Log })
		if len(res.Windows) == 0 {
			return nil, fmt.Errorf("%s: no steady windows found (speed within ±%g km/h for %g s): check the speed column and the steady settings",
				e.ID, e.Steady.SpeedTolKmh, e.Steady.MinDurationS)
		}
		var err error
		if res.Evidence, err = buildEvidence(c, e, res); err != nil {
			return nil, err
		}
		res.Detect = Detect(res.Windows, e.FrictionMm, res.Stiffness.K, rho)
		res.Warnings = warnings(e, res, rho)
		res.Evidence.Warnings = res.Warnings
	}
	return results, nil
}

// prepare sets up an entry's calibration and stiffness.
func prepare(c *campaign.Campaign, e *campaign.RideHeightEntry) (*Result, error) {
	cal, err := NewCalibration(e.Calibration)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", e.ID, err)
	}
	res := &Result{Entry: e, Calibration: cal}
	if e.Stiffness.From == campaign.FromBallast {
		res.Stiffness, err = BallastStiffness(e.ID, e.Axle, e.Stiffness.Ballast, c.Vehicle.WheelbaseM, cal)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", e.ID, err)
		}
		return res, nil
	}
	ax := c.Vehicle.Axles.Front
	if e.Axle == evidence.AxleRear {
		ax = c.Vehicle.Axles.Rear
	}
	res.Stiffness = SpringStiffness(e.Axle, ax, e.Sensor == campaign.SensorLaser)
	return res, nil
}

// evidence turns the windows into Gaussian observations, one diagonal block
// per log.
func buildEvidence(c *campaign.Campaign, e *campaign.RideHeightEntry, res *Result) (evidence.Evidence, error) {
	ev := evidence.Evidence{Entry: e.ID, Kind: evidence.KindRideHeight}
	ev.Scales = append(ev.Scales, res.Stiffness.Groups...)
	refs := append([]evidence.ScaleRef(nil), res.Stiffness.Refs...)
	if !res.Stiffness.GainCancels && res.Calibration.RelSD > 0 {
		g := evidence.ScaleGroup{Name: e.ID + "/gain", Label: e.ID + " calibration gain", SD: res.Calibration.RelSD}
		ev.Scales = append(ev.Scales, g)
		refs = append(refs, evidence.ScaleRef{Name: g.Name, Pow: 1})
	}
	wind := c.WindNuisance()
	if wind != "" {
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: evidence.WindName, Label: "along-road wind", Unit: "m/s", SD: c.Air.WindSDMs, PerRun: true})
	}
	laser := e.Sensor == campaign.SensorLaser
	growth := e.Axle + "-tyre-growth"
	if laser {
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: growth, Label: e.Axle + " tyre growth", Unit: "mm at 100 km/h",
			Mean: e.TyreGrowth.MmAt100kmh, SD: e.TyreGrowth.SDMm})
	}
	friction := e.FrictionMm * e.FrictionMm / 3
	informs := map[string]bool{}
	for li := range e.Logs {
		offset := fmt.Sprintf("%s/offset[%d]", e.ID, li)
		drift := fmt.Sprintf("%s/drift[%d]", e.ID, li)
		var obs []evidence.Obs
		var sd []float64
		var tbar float64 // mean window time of the log, the drift's origin
		nw := 0
		for _, w := range res.Windows {
			if w.Log == li {
				tbar += (w.From + w.To) / 2
				nw++
			}
		}
		if nw == 0 {
			continue // a log with no steady window says nothing, not even its offset
		}
		tbar /= float64(nw)
		ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: offset, Label: e.ID + " static offset", Unit: "mm", Flat: true, PerRun: true})
		if e.Drift {
			ev.Nuisances = append(ev.Nuisances, evidence.Nuisance{Name: drift, Label: e.ID + " drift", Unit: "mm/s", SD: driftSDmmPerS, PerRun: true})
		}
		for i, w := range res.Windows {
			if w.Log != li {
				continue
			}
			o := evidence.Obs{
				Y:      w.HeightMM,
				Terms:  []evidence.Term{{Config: w.Config, Axle: e.Axle, W: 1 / res.Stiffness.K}},
				Air:    evidence.Airspeed{Q: w.Q, V: air.KmhToMs(w.SpeedKmh), Rho: c.Density(), Dir: float64(w.Direction), Wind: wind},
				Scales: refs,
				Nuis:   []evidence.Coef{{Name: offset, C: 1}},
				Label:  fmt.Sprintf("window %d, %s, %.0f km/h, %.0f–%.0f s", i+1, w.Config, w.SpeedKmh, w.From, w.To),
			}
			if laser {
				o.Nuis = append(o.Nuis, evidence.Coef{Name: growth, C: w.SpeedSq})
			}
			if e.Drift {
				o.Nuis = append(o.Nuis, evidence.Coef{Name: drift, C: (w.From+w.To)/2 - tbar})
			}
			obs = append(obs, o)
			sd = append(sd, math.Sqrt(w.SE*w.SE+friction+1e-12))
			if w.Q > 0 {
				informs[w.Config] = true
			}
		}
		b, err := evidence.Diagonal(obs, sd)
		if err != nil {
			return ev, fmt.Errorf("%s: %w", e.ID, err)
		}
		ev.Blocks = append(ev.Blocks, b)
	}
	for _, cf := range c.Configurations {
		if informs[cf.ID] {
			ev.Informs = append(ev.Informs, evidence.Quantity{Config: cf.ID, Axle: e.Axle})
		}
	}
	return ev, ev.Check()
}

// Detectability says what a height entry can resolve.
type Detectability struct {
	SigmaMM     float64 // typical window sd at speed incl. friction, mm
	ResolvableN float64 // smallest axle load resolvable at 2 sd, N
	// ResolvableCLA100 is ResolvableN as C_L·A at 100 km/h, m².
	ResolvableCLA100 float64
	K                float64 // N/mm
	Rho              float64
}

// Detect computes detectability from the windows at speed: a deflection is
// resolvable at two standard deviations of one window, so the smallest
// load is L = 2·σ·K whatever the speed, and the C_L·A it takes to make that
// load is L/q(V). A stiffer car needs more speed for the same C_L·A (common
// practice, no source).
func Detect(ws []Window, frictionMM, K, rho float64) Detectability {
	var maxV float64
	for _, w := range ws {
		maxV = math.Max(maxV, w.SpeedKmh)
	}
	var ses []float64
	for _, w := range ws {
		if w.SpeedKmh >= 0.5*maxV {
			ses = append(ses, w.SE)
		}
	}
	sort.Float64s(ses)
	se := ses[len(ses)/2]
	sigma := math.Sqrt(se*se + frictionMM*frictionMM/3)
	L := 2 * sigma * K
	return Detectability{SigmaMM: sigma, ResolvableN: L, K: K, Rho: rho,
		ResolvableCLA100: L / air.DynamicPressure(rho, air.KmhToMs(100))}
}

// SpeedFor returns the speed (km/h) at which an axle C_L·A of size |cla| m²
// makes a resolvable load: ½ρV²|β| = L.
func (d Detectability) SpeedFor(cla float64) float64 {
	return air.MsToKmh(math.Sqrt(2 * d.ResolvableN / (d.Rho * math.Abs(cla))))
}

func warnings(e *campaign.RideHeightEntry, res *Result, rho float64) []string {
	var out []string
	var scatter []float64
	var maxV, maxQ float64
	for _, w := range res.Windows {
		scatter = append(scatter, w.Scatter)
		maxV, maxQ = math.Max(maxV, w.SpeedKmh), math.Max(maxQ, w.Q)
	}
	sort.Float64s(scatter)
	if s := scatter[len(scatter)/2]; s >= 3 {
		out = append(out, fmt.Sprintf("%s: within-window scatter is ±%.1f mm; a sensor this noisy (cheap ultrasonic sensors scatter ±3–4 mm) cannot resolve the 0.5–2 mm changes that matter", e.ID, s))
	}
	for li := range e.Logs {
		low := 0
		for _, w := range res.Windows {
			if w.Log == li && w.SpeedKmh < 0.4*maxV {
				low++
			}
		}
		if low < 2 {
			out = append(out, fmt.Sprintf("%s: log %s has %d low-speed windows: the static offset is poorly pinned; add slow or standing stretches", e.ID, e.Logs[li].File, low))
		}
	}
	if e.Sensor == campaign.SensorLaser {
		bands := map[int]map[string]bool{}
		configs := map[string]bool{}
		for _, w := range res.Windows {
			if w.SpeedKmh < 0.4*maxV {
				continue
			}
			b := int(math.Round(w.SpeedKmh / 10))
			if bands[b] == nil {
				bands[b] = map[string]bool{}
			}
			bands[b][w.Config] = true
			configs[w.Config] = true
		}
		paired := false
		for _, cs := range bands {
			paired = paired || len(cs) >= 2
		}
		if len(configs) >= 2 && !paired {
			out = append(out, fmt.Sprintf("%s: no speed was driven in two configurations: a laser cannot tell lift from tyre growth without A/B runs at matched speeds", e.ID))
		}
	}
	if defl := maxQ * typicalCLA / res.Stiffness.K; defl < res.Detect.SigmaMM {
		out = append(out, fmt.Sprintf("%s: at the top speed (%.0f km/h) a C_L·A of %.1f m² deflects this axle only %.2f mm, under the window scatter of %.2f mm: drive faster or use a softer set-up",
			e.ID, maxV, typicalCLA, defl, res.Detect.SigmaMM))
	}
	return out
}

// progressReader reports bytes read.
type progressReader struct {
	r      io.Reader
	done   int64
	total  int64
	report func(done, total int64)
	last   int64
}

func (p *progressReader) Read(b []byte) (int, error) {
	n, err := p.r.Read(b)
	p.done += int64(n)
	if p.done-p.last >= 4<<20 || err == io.EOF {
		p.report(p.done, p.total)
		p.last = p.done
	}
	return n, err
}
