package height

import (
	"fmt"
	"io"
	"math"
	"os"
	"sort"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/evidence"
	"liftfuse/methods/gust"
	"liftfuse/methods/logs"
	"liftfuse/methods/steady"
)

// Window is one steady stretch of a log: speed within ±tol of the window's
// mean for at least the minimum duration, one configuration, one direction.
type Window struct {
	Log       int     // index of the log in the entry
	Config    string  // configuration id
	Direction int     // +1, −1, or 0 when not logged
	From, To  float64 // time span, s
	N         int     // samples
	NEff      float64 // effective sample size of the mean
	SpeedKmh  float64 // mean ground speed
	SpeedSq   float64 // mean of (V/100 km/h)² over the samples
	Q         float64 // mean of ½ρV² over the samples, Pa
	HeightMM  float64 // mean height, mm
	SE        float64 // standard error of the mean height, mm (friction not included)
	Scatter   float64 // standard deviation of the samples within the window, mm
	// AccelMs2 is the window's mean longitudinal acceleration (m/s²),
	// the slope of its speed's 1 s means, and AccelSE its standard error
	// (see speedEnds).
	AccelMs2, AccelSE float64
	// Probe is true when the log carries a measured airspeed: Q is then
	// the mean of ½ρV_air² (or of the logged q) and AirKmh the mean
	// airspeed; otherwise AirKmh is the ground speed.
	Probe  bool
	AirKmh float64
	// GustSens is how far the run's wind deviation moves the window's
	// height (mm per m/s, p_c·ρ·V·Dir from the adapter's pilot fit; 0 for
	// probe and standstill windows, or with no gust prior): the
	// run-to-run wind nuisance's coefficient (gust.go).
	GustSens float64
}

// AtRest reports whether the window stands still: below gust.Stop, where
// neither the run-to-run wind nor the taps' airflow reach it, and where
// friction holds the body (restName).
func (w Window) AtRest() bool { return w.SpeedKmh < gust.Stop }

// TracePoint is one sample of the decimated trace kept for plots.
type TracePoint struct {
	T, SpeedKmh   float64
	Raw, LowPass  float64 // mm
	MovingAverage float64 // mm
}

// Trace decimation: at most one point per traceStep seconds and maxTrace
// points per log; plots need no more.
const (
	traceStep = 0.2
	maxTrace  = 20000
)

// Options tune a reduction.
type Options struct {
	// Progress, when set, is called now and then with the bytes read so far
	// of the current log and its size.
	Progress func(done, total int64)
	// Trace keeps each log's decimated trace, raw and filtered
	// (Result.Traces), for the report's plot. Without it the filters do
	// not run: no other output shows them, and on a 1 kHz log they were
	// a tenth of the per-row work.
	Trace bool
}

// Windows reads one log of an entry and returns its steady windows and
// decimated trace. rho is the air density in kg/m³; only is the
// configuration of every sample when the log names none (no config column,
// no segments: a one-configuration campaign).
func Windows(src io.Reader, name string, e *campaign.RideHeightEntry, li int, cal Calibration, rho float64, only string) ([]Window, []TracePoint, error) {
	ps, err := readLog(src, name, []*pass{newPass(e, li, cal, rho, only, true)})
	if err != nil {
		return nil, nil, err
	}
	return ps[0].f.windows, ps[0].trace, nil
}

// pass is one entry's reduction of one log, fed a row at a time, so that
// several sensors logged in one file share a single read of it.
type pass struct {
	e    *campaign.RideHeightEntry
	li   int
	l    *campaign.LogSpec
	cal  Calibration
	cols []logs.Column
	ix   campaign.LogIndex // into cols
	at   []int             // cols[k] → index in the shared reader
	// the shared reader's indices of the time, speed, signal and airspeed
	// columns (−1: none), read on every row
	tk, vk, hk, ak int
	rho            float64

	segs   []campaign.Segment
	seg    int
	plain  bool // no config column and no segments: a row's direction is its logged one (where)
	f      finder
	traced bool // the trace is kept (Options.Trace): lp, ma, trace and keep are used
	lp     LowPass
	ma     *MovingAverage
	trace  []TracePoint
	keep   float64 // next trace time
	prevT  float64
	begun  bool               // the first step is known (begin)
	gapDT  float64            // a step longer than this is a gap: max(1 s, 10 first steps); +Inf until known
	c      *campaign.Campaign // checks the logged configuration ids; nil: none
	rows   *campaign.Rows     // the log's row rules, for this read
	err    error
}

func newPass(e *campaign.RideHeightEntry, li int, cal Calibration, rho float64, only string, traced bool) *pass {
	l := &e.Logs[li]
	cols, ix := l.LogColumns()
	segs := append([]campaign.Segment(nil), l.Segments...)
	sort.Slice(segs, func(i, j int) bool { return segs[i].FromS < segs[j].FromS })
	p := &pass{e: e, li: li, l: l, cal: cal, cols: cols, ix: ix, rho: rho, segs: segs,
		f:      finder{tol: e.Steady.SpeedTolKmh, minDur: e.Steady.MinDurationS, rho: rho, log: li},
		traced: traced, lp: LowPass{Tau: e.FilterTauS}, keep: math.Inf(-1), prevT: math.NaN(), gapDT: math.Inf(1)}
	if p.plain = ix.Config < 0 && len(segs) == 0; p.plain {
		p.f.setConfig(only) // every sample's
	}
	return p
}

// readLog streams one log through every pass that reads it. The passes
// must share the time column. Each pass checks its log's rows
// (campaign.Rows): a configuration id or a direction in the log that the
// campaign cannot take is an error at its place in the file.
func readLog(src io.Reader, name string, ps []*pass) ([]*pass, error) {
	cols := shareColumns(ps)
	r, err := logs.NewReaderFormat(src, name, cols, ps[0].l.ReaderFormat())
	if err != nil {
		return nil, err
	}
	defer r.Close()
	var join *campaign.SpeedJoin
	if ps[0].c != nil {
		if join, err = ps[0].c.JoinSpeed(ps[0].l, r, ps[0].at[ps[0].ix.Time]); err != nil {
			return nil, err
		}
	}
	if join != nil {
		defer join.Close()
	}
	if err := readRows(r, join, ps); err != nil {
		return nil, err
	}
	if err := r.Err(); err != nil {
		return nil, err
	}
	for _, p := range ps {
		if err := p.rows.Done(); err != nil {
			return nil, err
		}
		p.f.finish()
	}
	return ps, nil
}

// readRows feeds the reader's rows to the passes, with the speed of join
// when it is not nil. A log read by one pass without a speed file, the
// common case, has a loop of its own: the general one cost about 20 more
// instructions per row (callgrind, the 1 kHz benchmark log).
func readRows(r *logs.Reader, join *campaign.SpeedJoin, ps []*pass) error {
	if p := ps[0]; len(ps) == 1 && join == nil {
		for r.Next() {
			if p.row(r, math.NaN()); p.err != nil {
				return p.err
			}
		}
		return nil
	}
	for r.Next() {
		speed := math.NaN() // km/h, from the speed file when there is one
		if join != nil {
			var err error
			if speed, err = join.Kmh(); err != nil {
				return err
			}
		}
		for _, p := range ps {
			if p.row(r, speed); p.err != nil {
				return p.err
			}
		}
	}
	return nil
}

// shareColumns returns the columns the passes ask for, each once, and
// sets each pass's index of its columns among them and its row checks.
func shareColumns(ps []*pass) []logs.Column {
	var cols []logs.Column
	index := map[logs.Column]int{}
	for _, p := range ps {
		p.at = make([]int, len(p.cols))
		for k, c := range p.cols {
			i, ok := index[c]
			if !ok {
				i = len(cols)
				index[c] = i
				cols = append(cols, c)
			}
			p.at[k] = i
		}
		at := func(k int) int {
			if k < 0 {
				return -1
			}
			return p.at[k]
		}
		p.rows = campaign.NewRows(p.c, p.l, at(p.ix.Time), at(p.ix.Direction), at(p.ix.Config))
		p.tk, p.vk, p.hk, p.ak = at(p.ix.Time), at(p.ix.Speed), at(p.ix.Signal), at(p.ix.Airspeed)
	}
	return cols
}

// maxHeightMm bounds a calibrated height reading: ten metres is beyond any
// ride height or suspension travel (common practice (no source)).
const maxHeightMm = 1e4

// maxAverageLen bounds the moving average's window in samples, so that a
// log with a tiny first time step cannot ask for a huge buffer.
const maxAverageLen = 1 << 16

// negSpeedTolKmh is how far below zero a logged speed may read before it is
// an error: GPS speed at a standstill jitters around zero.
const negSpeedTolKmh = 2.0

// row feeds the reader's current row to the pass; joined is the speed
// from a speed file (km/h), NaN when the log has its own speed column.
func (p *pass) row(r *logs.Reader, joined float64) {
	t := r.Float(p.tk)
	v := joined // speedAndHeight, inline for the common row
	if p.vk >= 0 {
		v = air.MsToKmh(p.l.SpeedToMs(r.Float(p.vk)))
	}
	h := p.cal.MM(r.Float(p.hk))
	if !(v >= -negSpeedTolKmh) || math.Abs(h) > maxHeightMm {
		var err error
		if v, h, err = p.speedAndHeight(r, joined); err != nil {
			p.err = err
			return
		}
	} else if !(v > 0) { // max(v, 0), v not NaN here
		v = 0
	}
	if !p.begun {
		p.begin(t)
	}
	gap := t-p.prevT > p.gapDT // false on the first row (prevT is NaN)
	p.prevT = t
	dir, ok := p.rows.Quick(r)
	if !ok || !p.plain {
		var err error
		if dir, err = p.where(r, t, dir, ok); err != nil {
			p.err = err
			return
		}
	}
	if gap {
		p.f.close()
	}
	qa := math.NaN()
	if p.ak >= 0 {
		qa = airspeedQ(p.l, r.Float(p.ak), p.rho)
	}
	p.f.feed(sample{t: t, v: v, h: h, qa: qa}, dir)

	// Smoothed trace for plots; the estimates use the raw samples.
	if !p.traced {
		return
	}
	y, ok := p.lp.quick(t, h)
	if !ok {
		y = p.lp.Step(t, h)
	}
	if p.ma != nil {
		p.ma.Add(h)
	}
	if t >= p.keep && len(p.trace) < maxTrace {
		avg := h
		if p.ma != nil {
			avg = p.ma.Mean()
		}
		p.trace = append(p.trace, TracePoint{T: t, SpeedKmh: v, Raw: h, LowPass: y, MovingAverage: avg})
		p.keep = t + traceStep
	}
}

// begin sizes the gap and the moving average (of a traced pass) from the
// log's first step, on its second row (t).
func (p *pass) begin(t float64) {
	if math.IsNaN(p.prevT) {
		return
	}
	p.begun = true
	dt := t - p.prevT
	if p.traced {
		p.ma = NewMovingAverage(int(min(math.Round(p.e.FilterTauS/dt), maxAverageLen)))
	}
	if dt > 0 {
		p.gapDT = max(1, 10*dt)
	}
}

// where returns the direction of the row at t, after it has set the
// finder's configuration for it. The log's columns give them when it
// has them (an unknown id reads as none, and fails the read at its end),
// else its segments, else the only one (set once, newPass). logged is the
// row's direction when checked, that is when Rows.Quick took the row;
// otherwise Rows.Row checks it here.
func (p *pass) where(r *logs.Reader, t float64, logged int, checked bool) (dir int, err error) {
	config := ""
	if !checked {
		if config, logged, err = p.rows.Row(r); err != nil {
			return 0, err
		}
	}
	switch {
	case p.ix.Config >= 0:
		p.f.setConfig(config)
	case len(p.segs) > 0:
		for p.seg < len(p.segs) && t > p.segs[p.seg].ToS {
			p.seg++
		}
		if p.seg < len(p.segs) && t >= p.segs[p.seg].FromS {
			config, dir = p.segs[p.seg].Config, p.segs[p.seg].Direction
		}
		p.f.setConfig(config)
	}
	if p.ix.Direction >= 0 {
		dir = logged
	}
	return dir, nil
}

// speedAndHeight reads the row's ground speed (km/h; joined from a speed
// file when the log has no speed column) and calibrated height (mm). A
// speed below −negSpeedTolKmh or a height beyond maxHeightMm is an error at
// its cell; a small negative speed (GPS jitter at rest) reads as 0. row
// reads the common row itself and calls it for any other.
func (p *pass) speedAndHeight(r *logs.Reader, joined float64) (v, h float64, err error) {
	ix := &p.ix
	v = joined
	if ix.Speed < 0 && math.IsNaN(joined) {
		return 0, 0, fmt.Errorf("%s: log %s has no speed column and no speed file to join", p.e.ID, p.l.File)
	}
	if ix.Speed >= 0 {
		v = air.MsToKmh(p.l.SpeedToMs(r.Float(p.at[ix.Speed])))
		if v < -negSpeedTolKmh {
			return 0, 0, &logs.ParseError{File: r.File(), Line: r.Line(), Column: r.Column(p.at[ix.Speed]), Field: p.l.SpeedColumn(),
				Err: fmt.Errorf("%w: speed %g km/h is negative", campaign.ErrRange, v)}
		}
	}
	h = p.cal.MM(r.Float(p.at[ix.Signal]))
	if math.Abs(h) > maxHeightMm {
		return 0, 0, &logs.ParseError{File: r.File(), Line: r.Line(), Column: r.Column(p.at[ix.Signal]), Field: p.l.Signal,
			Err: fmt.Errorf("%w: reads %g mm after calibration, beyond any ride height (a spike, a dropout code or a unit slip?)", campaign.ErrData, h)}
	}
	return max(v, 0), h, nil
}

// sample is one row of a log as the finder sees it: time (s), ground speed
// (km/h), height (mm) and the measured dynamic pressure qa (Pa; NaN when
// the log has no airspeed).
type sample struct{ t, v, h, qa float64 }

// finder splits a stream of samples into steady windows. A window's span
// (for its band and minimum duration) is every sample admitted; its
// statistics leave out an edge at each end, read from the rates at which
// the speed approaches and leaves it (edge.go). So a closed window waits
// (pending) until RateSpanS of the speed after it is known.
type finder struct {
	tol, minDur, rho float64
	log              int

	windows   []Window
	cur, pend win
	open      bool
	pending   bool
	id        string  // the configuration of the samples fed (setConfig)
	epoch     int     // counts the changes of id
	hist      recent  // the last RateSpanS of speeds, for the approach rate
	held      holdLag // a held speed's lag, added to the departure edge
	longest   float64 // EdgeS(tol), set when a window opens
	lastT     float64 // the latest sample: time (s), speed (km/h)
	lastV     float64
	ends      []ends // of each window, for its acceleration's error (finish)
}

// win is a window being read.
type win struct {
	config       string
	epoch        int // the finder's epoch when it opened: config is still its id while they are equal
	dir          int
	opened, last float64 // the admitted span, s; last set by close
	lastV        float64 // the last admitted speed, km/h, set by close
	lead         float64 // the edge left out at its start, s
	from, to     float64 // the span of the samples used, s
	speed        steady.Band
	sumV, sumV2  float64 // Σ V (km/h), Σ V² ((km/h)²) of the samples used
	ends         speedEnds
	sumQA, sumVA float64 // Σ q_air (Pa), Σ V_air (m/s)
	probe        bool
	h            steady.Stats
	tail         delay // its last EdgeS(tol) + held lag of samples, not yet used
}

// setConfig sets the configuration of the samples fed next ("" for
// none): feed then compares an epoch counter, not the ids, sample by
// sample.
func (f *finder) setConfig(id string) {
	if id != f.id {
		f.id = id
		f.epoch++
	}
}

// feed adds a sample of the configuration last set and direction dir.
// Its common sample (no pending window due to settle, the open window of
// its configuration and direction admits it, holdLag.quick takes it, the
// queues have room) runs here without a call but to use: each branch to
// a rare call (settle, observe, reopen, grow, prune) made the compiler
// spill and reload the sample around it, and queue as a call cost 10
// instructions a row (callgrind, the 1 kHz benchmark log: 513.6 with
// feedAny alone, 512.2 with queue called, 501.7 so). feedAny takes any
// sample.
func (f *finder) feed(s sample, dir int) {
	c := &f.cur
	if (!f.pending || !(s.t-f.pend.last >= RateSpanS-timeSlack)) && f.open && dir == c.dir && f.epoch == c.epoch &&
		!c.tail.full() && !f.hist.full() && c.speed.Admits(s.v, f.tol) && f.held.quick(s.t, s.v) {
		c.speed.Add(s.v) // join, but its tail's edge is the last sample's: quick kept the lag
		f.hist.push(s.t, s.v)
		f.lastT, f.lastV = s.t, s.v
		if s.t-c.opened >= c.lead-timeSlack { // queue, inline: its tail has room
			c.tail.push(s)
			for c.tail.ready(s.t, c.tail.edge) {
				c.use(c.tail.shift(), f.rho)
			}
		}
		return
	}
	f.feedAny(s, dir)
}

// feedAny is feed for any sample. It queues the sample after the speed
// history takes it, as feed does: neither reads the other.
func (f *finder) feedAny(s sample, dir int) {
	if f.pending && s.t-f.pend.last >= RateSpanS-timeSlack {
		f.settle(s.t, s.v)
	}
	if !f.held.quick(s.t, s.v) {
		f.held.observe(s.t, s.v)
	}
	c := &f.cur
	if !f.open || dir != c.dir || f.epoch != c.epoch || !c.speed.Admits(s.v, f.tol) {
		f.reopen(s, dir)
	}
	if f.open {
		f.join(s)
		if c.tail.full() {
			c.tail.grow()
		}
	}
	if f.hist.full() {
		f.hist.prune()
	}
	f.hist.push(s.t, s.v)
	f.lastT, f.lastV = s.t, s.v
	if f.open {
		c.queue(s, f.rho)
	}
}

// join adds s, admitted, to the open window's band, and sets its tail's
// edge from the held speed's lag as of s.
func (f *finder) join(s sample) {
	c := &f.cur
	c.tail.edge = f.longest + f.held.lag()
	c.speed.Add(s.v)
}

// queue puts s, joined to the window, in its tail when it is clear of
// the window's leading edge, and uses the samples the tail releases; the
// tail must have room.
func (c *win) queue(s sample, rho float64) {
	if s.t-c.opened >= c.lead-timeSlack {
		c.tail.push(s)
		for c.tail.ready(s.t, c.tail.edge) {
			c.use(c.tail.shift(), rho)
		}
	}
}

// reopen closes the current window for a sample of another configuration
// or direction, or outside its band, and opens one for the sample unless
// it has no configuration.
func (f *finder) reopen(s sample, dir int) {
	c := &f.cur
	if f.open && (f.epoch != c.epoch || dir != c.dir) {
		f.close()
	}
	if f.id == "" {
		return
	}
	if f.open && !c.speed.Admits(s.v, f.tol) {
		f.close()
	}
	if !f.open {
		f.open = true
		tail := c.tail
		tail.reset()
		*c = win{config: f.id, epoch: f.epoch, dir: dir, opened: s.t, probe: !math.IsNaN(s.qa), tail: tail,
			lead: EdgeFor(f.tol, f.hist.approach(s.t, s.v))}
		f.longest = EdgeS(f.tol)
	}
}

// use adds a sample, clear of the window's edges, to its statistics.
func (c *win) use(s sample, rho float64) {
	if c.h.N() == 0 {
		c.from = s.t
	}
	c.to = s.t
	c.sumV += s.v
	c.sumV2 += s.v * s.v // q and (V/100 km/h)² are both ∝ V²: summed once
	c.ends.add(s.t, s.v)
	if c.probe {
		qa := max(s.qa, 0)
		c.sumQA += qa
		c.sumVA += math.Sqrt(2 * qa / rho)
	}
	c.h.Add(s.h)
}

// close ends the current window; one long enough waits for the speed
// after it (settle). Only then is a window still pending settled early,
// with what is known of the speed after it: a short fragment closing
// (a ramp crossing bands) leaves it pending until add reads RateSpanS of
// speed after it, or finish ends the log. Settling it on every close read
// a ramp's first 0.3 s as an unknown rate, so EdgeS (TestWindowEdges).
func (f *finder) close() {
	if !f.open {
		return
	}
	f.open = false
	// every sample fed while a window is open joins it, so the latest
	// is its last
	f.cur.last, f.cur.lastV = f.lastT, f.lastV
	if f.cur.last-f.cur.opened < f.minDur {
		return
	}
	if f.pending {
		f.settle(f.lastT, f.lastV)
	}
	f.cur, f.pend = f.pend, f.cur
	f.pending = true
}

// settle uses the pending window's last samples but its departure edge,
// read from the speed v at t after it (and a held speed's lag beyond
// MinEdgeS, holdLag), and keeps the window.
func (f *finder) settle(t, v float64) {
	f.pending = false
	c := &f.pend
	edge := min(EdgeFor(f.tol, rateOver(c.last, c.lastV, t, v))+max(0, f.held.lag()-MinEdgeS), c.tail.edge)
	for c.tail.ready(c.last, edge) {
		c.use(c.tail.shift(), f.rho)
	}
	if c.h.N() < 3 {
		return
	}
	n := float64(c.h.N())
	se, neff := c.h.StandardError()
	e := c.ends.accel()
	w := Window{
		Log: f.log, Config: c.config, Direction: c.dir, From: c.from, To: c.to,
		N: c.h.N(), NEff: neff, SpeedKmh: c.sumV / n,
		SpeedSq:  c.sumV2 / n / (evidence.RefSpeedKmh * evidence.RefSpeedKmh),
		Q:        air.DynamicPressure(f.rho, 1) * c.sumV2 / n / (3.6 * 3.6),
		HeightMM: c.h.Mean(), SE: se, Scatter: math.Sqrt(c.h.Variance()),
		AccelMs2: air.KmhToMs(e.a),
	}
	e.atSpeed = !w.AtRest()
	f.ends = append(f.ends, e)
	w.AirKmh = w.SpeedKmh
	if c.probe {
		w.Probe, w.Q, w.AirKmh = true, c.sumQA/n, air.MsToKmh(c.sumVA/n)
	}
	f.windows = append(f.windows, w)
}

// finish closes the open window and settles the pending one at the log's
// end, then sets each window's acceleration error: the variance of a
// batch mean of the speed and the correlation of adjacent ones are pooled
// over the log's windows at speed (batchnoise.go).
func (f *finder) finish() {
	f.close()
	if f.pending {
		f.settle(f.lastT, f.lastV)
	}
	n := pooledBatchNoise(f.ends)
	for i := range f.windows {
		f.windows[i].AccelSE = air.KmhToMs(f.ends[i].errorOf(n))
	}
}

// openLog opens a log and reports its size for progress.
func openLog(name string) (*os.File, int64, error) {
	f, err := campaign.OpenRegular(name)
	if err != nil {
		return nil, 0, fmt.Errorf("%s: %w", name, err)
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, 0, fmt.Errorf("%s: %w", name, err)
	}
	return f, st.Size(), nil
}
