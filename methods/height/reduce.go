package height

import (
	"fmt"
	"io"
	"math"
	"os"
	"sort"

	"liftfuse/methods"
	"liftfuse/methods/logs"
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
}

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
}

// Windows reads one log of an entry and returns its steady windows and
// decimated trace. rho is the air density in kg/m³; only is the
// configuration of every sample when the log names none (no config column,
// no segments: a one-configuration campaign).
func Windows(src io.Reader, name string, e *methods.RideHeightEntry, li int, cal Calibration, rho float64, only string) ([]Window, []TracePoint, error) {
	l := &e.Logs[li]
	cols, ix := l.LogColumns()
	r, err := logs.NewReader(src, name, cols)
	if err != nil {
		return nil, nil, err
	}
	defer r.Close()
	r.Increasing = ix.Time
	segs := append([]methods.Segment(nil), l.Segments...)
	sort.Slice(segs, func(i, j int) bool { return segs[i].FromS < segs[j].FromS })

	f := finder{tol: e.Steady.SpeedTolKmh, minDur: e.Steady.MinDurationS, rho: rho, log: li}
	lp := LowPass{Tau: e.FilterTauS}
	var ma *MovingAverage
	var trace []TracePoint
	nextKeep := math.Inf(-1)
	seg, prevT, firstDT := 0, math.NaN(), 0.0
	configs := map[string]string{} // interned configuration ids
	for r.Next() {
		t := r.Float(ix.Time)
		v := methods.MsToKmh(l.SpeedToMs(r.Float(ix.Speed)))
		h := cal.MM(r.Float(ix.Signal))
		if ma == nil && !math.IsNaN(prevT) {
			firstDT = t - prevT
			ma = NewMovingAverage(int(math.Round(e.FilterTauS / firstDT)))
		}
		gap := !math.IsNaN(prevT) && firstDT > 0 && t-prevT > math.Max(1, 10*firstDT)
		prevT = t

		// Which configuration and direction does this sample belong to?
		config, dir := "", 0
		switch {
		case ix.Config >= 0:
			b := r.Text(ix.Config)
			id, ok := configs[string(b)]
			if !ok {
				id = string(b)
				configs[id] = id
			}
			config = id
		case len(segs) > 0:
			for seg < len(segs) && t > segs[seg].ToS {
				seg++
			}
			if seg < len(segs) && t >= segs[seg].FromS {
				config, dir = segs[seg].Config, segs[seg].Direction
			}
		default:
			config = only
		}
		if ix.Direction >= 0 {
			dir = int(r.Float(ix.Direction))
		}
		if gap {
			f.close()
		}
		f.add(t, v, h, config, dir)

		// Smoothed trace for plots; the estimates use the raw samples.
		y := lp.Step(t, h)
		avg := h
		if ma != nil {
			avg = ma.Step(h)
		}
		if t >= nextKeep && len(trace) < maxTrace {
			trace = append(trace, TracePoint{T: t, SpeedKmh: v, Raw: h, LowPass: y, MovingAverage: avg})
			nextKeep = t + traceStep
		}
	}
	if err := r.Err(); err != nil {
		return nil, nil, err
	}
	f.close()
	return f.windows, trace, nil
}

// finder splits a stream of samples into steady windows.
type finder struct {
	tol, minDur, rho float64
	log              int

	windows []Window
	cur     struct {
		config           string
		dir              int
		from, to         float64
		sumV, minV, maxV float64
		sumV2            float64 // Σ V², (km/h)²
		h                windowStats
	}
	open bool
}

func (f *finder) add(t, v, h float64, config string, dir int) {
	c := &f.cur
	if f.open && (config != c.config || dir != c.dir) {
		f.close()
	}
	if config == "" {
		return
	}
	if f.open {
		// Every sample within ±tol of the mean with v added: with n samples
		// and sum s, max − s/n ≤ tol and s/n − min ≤ tol, multiplied by n.
		n := float64(c.h.n + 1)
		s := c.sumV + v
		hi, lo := max(c.maxV, v), min(c.minV, v)
		if n*hi-s > n*f.tol || s-n*lo > n*f.tol {
			f.close()
		}
	}
	if !f.open {
		f.open = true
		c.config, c.dir, c.from = config, dir, t
		c.sumV, c.minV, c.maxV, c.sumV2 = 0, v, v, 0
		c.h = windowStats{}
	}
	c.to = t
	c.sumV += v
	c.minV, c.maxV = min(c.minV, v), max(c.maxV, v)
	c.sumV2 += v * v // q and (V/100 km/h)² are both ∝ V²: summed once
	c.h.add(h)
}

func (f *finder) close() {
	if !f.open {
		return
	}
	f.open = false
	c := &f.cur
	if c.to-c.from < f.minDur || c.h.n < 3 {
		return
	}
	n := float64(c.h.n)
	se, neff := c.h.standardError()
	f.windows = append(f.windows, Window{
		Log: f.log, Config: c.config, Direction: c.dir, From: c.from, To: c.to,
		N: c.h.n, NEff: neff, SpeedKmh: c.sumV / n,
		SpeedSq:  c.sumV2 / n / (methods.RefSpeedKmh * methods.RefSpeedKmh),
		Q:        methods.DynamicPressure(f.rho, 1) * c.sumV2 / n / (3.6 * 3.6),
		HeightMM: c.h.mean(), SE: se, Scatter: math.Sqrt(c.h.variance()),
	})
}

// openLog opens a log and reports its size for progress.
func openLog(name string) (*os.File, int64, error) {
	f, err := os.Open(name)
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
