package pressure

import (
	"fmt"
	"io"
	"math"
	"sort"

	"liftfuse/methods/air"
	"liftfuse/methods/campaign"
	"liftfuse/methods/logs"
	"liftfuse/methods/steady"
)

// TapWindow is one steady stretch of a pressure log: ground speed within
// ±tol of the window's mean for at least the minimum duration, one
// configuration, one direction. Pa and SE follow the log's taps
// (LogSpec.Taps), in Pa relative to the reference port.
type TapWindow struct {
	Log       int     // index of the log in the entry
	Config    string  // configuration id
	Direction int     // +1, −1, or 0 when not logged
	From, To  float64 // time span, s
	N         int     // samples
	SpeedKmh  float64 // mean ground speed
	Pa        []float64
	SE        []float64 // standard error of each tap's mean (steady.Stats)
}

// tapReader splits one pressure log into steady windows.
type tapReader struct {
	c        *campaign.Campaign
	l        *campaign.LogSpec
	ix       campaign.LogIndex
	li       int
	tol, dur float64
	rows     *campaign.Rows // the log's row rules
	segs     []campaign.Segment
	seg      int
	prevT    float64
	firstDT  float64

	windows []TapWindow
	open    bool
	cur     struct {
		config   string
		dir      int
		from, to float64
		speed    steady.Band
		taps     []steady.Stats
	}
}

// readTapLog reads log li of entry e from src and returns its steady
// windows. A speed_file, when the log names one, gives the ground speed.
func readTapLog(src io.Reader, name string, c *campaign.Campaign, e *campaign.PressureEntry, li int) ([]TapWindow, error) {
	l := &e.Logs[li]
	cols, ix := l.LogColumns()
	r, err := logs.NewReaderFormat(src, name, cols, l.ReaderFormat())
	if err != nil {
		return nil, err
	}
	defer r.Close()
	join, err := c.JoinSpeed(l, r, ix.Time)
	if err != nil {
		return nil, err
	}
	if join != nil {
		defer join.Close()
	}
	segs := append([]campaign.Segment(nil), l.Segments...)
	sort.Slice(segs, func(i, j int) bool { return segs[i].FromS < segs[j].FromS })
	tr := &tapReader{c: c, l: l, ix: ix, li: li, tol: e.Steady.SpeedTolKmh, dur: e.Steady.MinDurationS, segs: segs, prevT: math.NaN(),
		rows: campaign.NewRows(c, l, ix.Time, ix.Direction, ix.Config)}
	for r.Next() {
		v := math.NaN()
		if join != nil {
			if v, err = join.Kmh(); err != nil {
				return nil, err
			}
		}
		if err := tr.row(r, v); err != nil {
			return nil, err
		}
	}
	if err := r.Err(); err != nil {
		return nil, err
	}
	if err := tr.rows.Done(); err != nil {
		return nil, err
	}
	tr.close()
	return tr.windows, nil
}

// standstillTolKmh is how far below zero a logged speed may read before it
// is an error: GPS speed at a standstill jitters around zero.
const standstillTolKmh = 2.0

// row feeds the reader's current row; joined is the speed from a speed
// file (km/h), NaN when the log has its own speed column.
func (tr *tapReader) row(r *logs.Reader, joined float64) error {
	ix, l := tr.ix, tr.l
	t := r.Float(ix.Time)
	v := joined
	if ix.Speed >= 0 {
		v = air.MsToKmh(l.SpeedToMs(r.Float(ix.Speed)))
		if v < -standstillTolKmh {
			return &logs.ParseError{File: r.File(), Line: r.Line(), Column: r.Column(ix.Speed), Field: l.SpeedColumn(),
				Err: fmt.Errorf("%w: speed %g km/h is negative", campaign.ErrRange, v)}
		}
	}
	v = math.Max(v, 0)
	if !math.IsNaN(tr.prevT) {
		if tr.firstDT == 0 {
			tr.firstDT = t - tr.prevT
		} else if t-tr.prevT > math.Max(1, 10*tr.firstDT) {
			tr.close() // a gap in the log ends the window
		}
	}
	tr.prevT = t
	config, dir, err := tr.where(r, t)
	if err != nil {
		return err
	}
	tr.add(r, t, v, config, dir)
	return nil
}

// where returns the configuration and direction of the current row: from
// the log's columns when named (checked by campaign.Rows: an unknown id
// reads as none and fails the read at its end), else from the segments,
// else the campaign's only configuration.
func (tr *tapReader) where(r *logs.Reader, t float64) (string, int, error) {
	config, logged, err := tr.rows.Row(r)
	if err != nil {
		return "", 0, err
	}
	dir := 0
	switch {
	case tr.ix.Config >= 0:
	case len(tr.segs) > 0:
		for tr.seg < len(tr.segs) && t > tr.segs[tr.seg].ToS {
			tr.seg++
		}
		if tr.seg < len(tr.segs) && t >= tr.segs[tr.seg].FromS {
			config, dir = tr.segs[tr.seg].Config, tr.segs[tr.seg].Direction
		}
	case len(tr.c.Configurations) == 1:
		config = tr.c.Configurations[0].ID
	}
	if tr.ix.Direction >= 0 {
		dir = logged
	}
	return config, dir, nil
}

// add puts one sample in the open window, closing it first when the
// configuration or direction changes or the speed leaves ±tol of the mean.
func (tr *tapReader) add(r *logs.Reader, t, v float64, config string, dir int) {
	c := &tr.cur
	if tr.open && (config != c.config || dir != c.dir) {
		tr.close()
	}
	if config == "" {
		return
	}
	if tr.open && !c.speed.Admits(v, tr.tol) {
		tr.close()
	}
	if !tr.open {
		tr.open = true
		c.config, c.dir, c.from = config, dir, t
		c.speed = steady.Band{}
		c.taps = make([]steady.Stats, len(tr.ix.Taps))
	}
	c.to = t
	c.speed.Add(v)
	for k, at := range tr.ix.Taps {
		c.taps[k].Add(r.Float(at))
	}
}

// close ends the open window and keeps it when it lasted long enough.
func (tr *tapReader) close() {
	if !tr.open {
		return
	}
	tr.open = false
	c := &tr.cur
	if len(c.taps) == 0 || c.to-c.from < tr.dur || c.taps[0].N() < 3 {
		return
	}
	n := c.taps[0].N()
	w := TapWindow{Log: tr.li, Config: c.config, Direction: c.dir, From: c.from, To: c.to, N: n, SpeedKmh: c.speed.Mean()}
	for k := range c.taps {
		se, _ := c.taps[k].StandardError()
		w.Pa = append(w.Pa, c.taps[k].Mean())
		w.SE = append(w.SE, se)
	}
	tr.windows = append(tr.windows, w)
}
