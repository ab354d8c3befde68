package height

import (
	"fmt"
	"sort"

	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/gust"
)

// Result is everything one ride-height entry yields: its windows and traces
// for the report, its stiffness, lever and calibration, the Evidence for
// fusion, detectability figures and warnings.
type Result struct {
	Entry       *campaign.RideHeightEntry
	Calibration Calibration
	Stiffness   Stiffness // at the sensor's own axle
	Lever       Lever     // how the reading combines the axles
	Windows     []Window
	Traces      [][]TracePoint // per log; each nil without Options.Trace
	Evidence    evidence.Evidence
	Detect      Detectability
	// Dropped counts the windows above the entry's max_speed_kmh.
	Dropped int
	// GustSDMs is the run-to-run wind scatter estimated from this entry's
	// windows (m/s; 0 when not modelled), GustSDSDMs its posterior sd.
	GustSDMs, GustSDSDMs float64
	Warnings             []string
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
// for all the sensors logged in it (those that name the same time column):
// set up each entry and plan the reads, read each file, then finish each
// entry (windows in order, the speed limit, evidence, warnings).
func ReduceAll(c *campaign.Campaign, es []*campaign.RideHeightEntry, opt Options) ([]*Result, error) {
	results, groups, err := planReads(c, es, opt.Trace)
	if err != nil {
		return nil, err
	}
	owner := map[*campaign.RideHeightEntry]*Result{}
	for i, e := range es {
		owner[e] = results[i]
	}
	for _, g := range groups {
		if err := g.read(c, opt, owner); err != nil {
			return nil, err
		}
	}
	if err := finishAll(c, es, results); err != nil {
		return nil, err
	}
	return results, nil
}

// readGroup is one log file and the passes (entry, log) that read it.
type readGroup struct {
	path   string
	passes []*pass
}

// planReads prepares every entry and groups its logs by file and time
// column, so that each file is read once.
func planReads(c *campaign.Campaign, es []*campaign.RideHeightEntry, traced bool) ([]*Result, []*readGroup, error) {
	only := ""
	if len(c.Configurations) == 1 {
		only = c.Configurations[0].ID
	}
	rho := c.Density()
	var groups []*readGroup
	byKey := map[[2]string]*readGroup{}
	results := make([]*Result, len(es))
	for i, e := range es {
		res, err := prepare(c, e)
		if err != nil {
			return nil, nil, err
		}
		res.Traces = make([][]TracePoint, len(e.Logs))
		results[i] = res
		for li := range e.Logs {
			key := [2]string{c.Path(e.Logs[li].File), readKey(&e.Logs[li])}
			g, ok := byKey[key]
			if !ok {
				g = &readGroup{path: key[0]}
				byKey[key] = g
				groups = append(groups, g)
			}
			p := newPass(e, li, res.Calibration, rho, only, traced)
			p.c = c
			g.passes = append(g.passes, p)
		}
	}
	return results, groups, nil
}

// read streams the group's file through its passes (feeding the
// campaign's input hash, campaign.Read) and hands each pass's windows and
// trace to its entry's result.
func (g *readGroup) read(c *campaign.Campaign, opt Options, owner map[*campaign.RideHeightEntry]*Result) error {
	f, size, err := openLog(g.path)
	if err != nil {
		return err
	}
	defer f.Close()
	src, done := c.Read(g.path, f)
	defer done()
	if opt.Progress != nil {
		src = &progressReader{r: src, total: size, report: opt.Progress}
	}
	if _, err := readLog(src, g.path, g.passes); err != nil {
		return err
	}
	for _, p := range g.passes {
		res := owner[p.e]
		res.Windows = append(res.Windows, p.f.windows...)
		res.Traces[p.li] = p.trace
	}
	return nil
}

// finishAll orders each entry's windows and drops those above its speed
// limit, estimates the run-to-run wind scatter once from every entry's
// runs (a property of the day, and the prior of the runs' shared wind
// nuisances, which every entry must declare alike), and builds each
// entry's evidence, detectability and warnings.
func finishAll(c *campaign.Campaign, es []*campaign.RideHeightEntry, results []*Result) error {
	bs := make([]*builder, len(es))
	var groups []gust.Group
	for i, e := range es {
		if err := order(e, results[i]); err != nil {
			return err
		}
		bs[i] = newBuilder(c, e, results[i])
		bs[i].split()
		groups = append(groups, bs[i].gust.groups...)
	}
	sd, sdsd := gust.ScatterREML(groups, c.Air.GustSDMs)
	rho := c.Density()
	for i, e := range es {
		res := results[i]
		bs[i].gustSD, res.GustSDMs, res.GustSDSDMs = sd, sd, sdsd
		var err error
		if res.Evidence, err = bs[i].evidence(); err != nil {
			return err
		}
		res.Detect = Detect(res.Windows, e.FrictionMm, res.Stiffness.K, rho)
		res.Warnings = warnings(e, res, rho)
		res.Evidence.Warnings = res.Warnings
	}
	return nil
}

// order sorts an entry's windows by log, as the evidence lists its
// observations, and drops those above its speed limit.
func order(e *campaign.RideHeightEntry, res *Result) error {
	sort.SliceStable(res.Windows, func(a, b int) bool { return res.Windows[a].Log < res.Windows[b].Log })
	res.Windows, res.Dropped = underSpeed(res.Windows, e.MaxSpeedKmh)
	if len(res.Windows) == 0 {
		return fmt.Errorf("%s: no steady windows found (speed within ±%g km/h for %g s%s): check the speed column and the steady settings",
			e.ID, e.Steady.SpeedTolKmh, e.Steady.MinDurationS, limitNote(e.MaxSpeedKmh, res.Dropped))
	}
	return nil
}

// underSpeed keeps the windows at or below max km/h (all when max is 0)
// and counts the others.
func underSpeed(ws []Window, max float64) ([]Window, int) {
	if max <= 0 {
		return ws, 0
	}
	kept := ws[:0:0]
	for _, w := range ws {
		if w.SpeedKmh <= max {
			kept = append(kept, w)
		}
	}
	return kept, len(ws) - len(kept)
}

func limitNote(max float64, dropped int) string {
	if dropped == 0 {
		return ""
	}
	return fmt.Sprintf(", at most %g km/h: %d above it dropped", max, dropped)
}

// prepare sets up an entry's calibration, stiffness and lever.
func prepare(c *campaign.Campaign, e *campaign.RideHeightEntry) (*Result, error) {
	cal, err := NewCalibration(e.Calibration)
	if err != nil {
		return nil, c.EntryProblem(e.ID, "calibration", err)
	}
	res := &Result{Entry: e, Calibration: cal}
	if e.Stiffness.From == campaign.FromBallast {
		res.Stiffness, err = BallastStiffness(e.ID, e.Axle, e.Stiffness.Ballast, c.Vehicle.WheelbaseM, cal)
		if err != nil {
			return nil, c.EntryProblem(e.ID, "stiffness", err)
		}
	} else {
		ax := c.Vehicle.Axles.Front
		if e.Axle == evidence.AxleRear {
			ax = c.Vehicle.Axles.Rear
		}
		res.Stiffness = SpringStiffness(e.Axle, ax, e.Sensor == campaign.SensorLaser)
	}
	if res.Lever, err = NewLever(c, e, res.Stiffness); err != nil {
		return nil, c.EntryProblem(e.ID, "x_m", err)
	}
	return res, nil
}

// readKey tells which logs of one file can share a read: the same time
// column, format and speed source.
func readKey(l *campaign.LogSpec) string {
	k := fmt.Sprintf("%s\x00%+v", l.Time, l.ReaderFormat())
	if sf := l.SpeedFile; sf != nil {
		k += fmt.Sprintf("\x00%s\x00%s\x00%s%s\x00%g\x00%+v", sf.File, sf.Time, sf.SpeedKmh, sf.SpeedMs, sf.OffsetS, sf.ReaderFormat())
	}
	return k
}
