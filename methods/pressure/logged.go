package pressure

import (
	"errors"
	"fmt"
	"math"

	"liftfuse/methods/campaign"
)

// StandstillKmh is the mean ground speed below which a steady window is a
// standstill: with q ≈ 0 every tap should read zero, so such windows pin
// each tap's zero instead of becoming readings.
const StandstillKmh = 5.0

// ErrNoWindows is wrapped when an entry's logs hold no steady window at
// speed.
var ErrNoWindows = errors.New("no steady window at speed")

// Logged is what an entry's tap logs yield: one reading per steady window
// at speed, each tap's mean with its zero subtracted, and the standard
// error of each tap's reading (SE[i][k] for reading i and the k-th tap of
// Readings[i].Pa).
type Logged struct {
	Windows  []TapWindow // every steady window, standstills included, as read
	Readings []campaign.Reading
	SE       [][]float64
	// SensorSDPa is the estimated per-tap noise of one reading: the RMS of
	// the readings' standard errors, or the entry's sensor_sd_pa when larger.
	SensorSDPa float64
	Warnings   []string
}

// FromLogs reads an entry's tap logs and turns each steady window into a
// reading. Windows at a standstill (mean speed < StandstillKmh) pin each
// tap's zero: per log and tap the sample-weighted mean z of its
// standstill windows is subtracted from that log's readings, and the
// zero's standard error is added in quadrature, SE² = SE_w² + SE_z². A log
// without a standstill window is warned about and nothing is subtracted.
// The reading's speed is the window's mean ground speed.
func FromLogs(c *campaign.Campaign, e *campaign.PressureEntry) (*Logged, error) {
	out := &Logged{}
	var ss float64
	var n int
	for li := range e.Logs {
		l := &e.Logs[li]
		name := c.Path(l.File)
		f, err := campaign.OpenRegular(name)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", name, err)
		}
		src, done := c.Read(name, f)
		ws, err := readTapLog(src, name, c, e, li)
		done()
		f.Close()
		if err != nil {
			return nil, err
		}
		out.Windows = append(out.Windows, ws...)
		zero, zse, ok := tapZeros(ws, len(l.Taps))
		if !ok {
			out.Warnings = append(out.Warnings, fmt.Sprintf("%s: log %s has no standstill window (steady below %g km/h): the taps' zeros are not pinned, so each tube's offset stays in the readings; log a stretch at rest",
				e.ID, l.File, StandstillKmh))
		}
		for _, w := range ws {
			if w.SpeedKmh < StandstillKmh {
				continue
			}
			rd := campaign.Reading{Config: w.Config, SpeedKmh: w.SpeedKmh, Direction: w.Direction}
			se := make([]float64, len(l.Taps))
			for k, tp := range l.Taps {
				rd.Pa = append(rd.Pa, campaign.Value{Key: tp.Key, V: w.Pa[k] - zero[k]})
				se[k] = math.Hypot(w.SE[k], zse[k])
				ss += se[k] * se[k]
				n++
			}
			out.Readings = append(out.Readings, rd)
			out.SE = append(out.SE, se)
		}
	}
	if len(out.Readings) == 0 {
		return nil, fmt.Errorf("%w in the logs (speed within ±%g km/h for %g s, above %g km/h)",
			ErrNoWindows, e.Steady.SpeedTolKmh, e.Steady.MinDurationS, StandstillKmh)
	}
	out.SensorSDPa = math.Max(math.Sqrt(ss/float64(n)), e.SensorSDPa)
	return out, nil
}

// tapZeros returns, for each of nt taps, the sample-weighted mean of its
// standstill windows and that mean's standard error; ok is false (and the
// zeros are 0) when there is no standstill window.
func tapZeros(ws []TapWindow, nt int) (zero, se []float64, ok bool) {
	zero, se = make([]float64, nt), make([]float64, nt)
	var total float64
	for _, w := range ws {
		if w.SpeedKmh >= StandstillKmh {
			continue
		}
		ok = true
		wn := float64(w.N)
		total += wn
		for k := range nt {
			zero[k] += wn * w.Pa[k]
			se[k] += wn * wn * w.SE[k] * w.SE[k]
		}
	}
	if !ok {
		return zero, se, false
	}
	for k := range nt {
		zero[k] /= total
		se[k] = math.Sqrt(se[k]) / total
	}
	return zero, se, true
}

// withLogged returns a copy of the entry whose readings are built from its
// logs (FromLogs) and whose sensor_sd_pa is the estimated one, so that the
// reduction proceeds as if the readings had been given.
func withLogged(c *campaign.Campaign, e *campaign.PressureEntry) (*campaign.PressureEntry, *Logged, error) {
	lg, err := FromLogs(c, e)
	if err != nil {
		return nil, nil, err
	}
	cp := *e
	cp.Readings, cp.SensorSDPa = lg.Readings, lg.SensorSDPa
	return &cp, lg, nil
}
