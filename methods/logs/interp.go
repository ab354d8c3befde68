package logs

import (
	"errors"
	"fmt"
)

// ErrOutsideSpan is wrapped when a time asks for a value of another log
// outside the span of that log's samples.
var ErrOutsideSpan = errors.New("outside the other log's time span")

// Interp gives one column of another log (speed from a GPS, say) at the
// times of a first log, linearly interpolated between the other log's two
// samples around each time:
//
//	v(t) = v₀ + (v₁ − v₀)·(t − t₀)/(t₁ − t₀),  t₀ ≤ t ≤ t₁.
//
// Both logs are in time order, so one merge walk reads the other log once,
// as a stream: memory does not grow with either file.
//
// The other log's time plus OffsetS is this log's time. When both logs
// write clock time (or both ISO time), their times are first aligned on
// the clock, not on their first samples: OffsetS then only corrects the
// difference between the two devices' clocks. Otherwise (time in seconds,
// or one log on a clock and the other not) each log's own seconds are
// used as they are read, and OffsetS alone aligns them.
type Interp struct {
	main, other   *Reader
	mainK         int // time column of main
	timeK, valueK int // of other
	offset        float64

	started bool
	shift   float64 // added to other's seconds to give main's seconds
	t0, v0  float64 // sample at or before the last time asked
	t1, v1  float64 // sample after it
	firstT  float64 // the other log's first sample
	done    bool
}

// spanTol is how far (in seconds) a time may lie outside the other log's
// span and take its end value: the rounding of adding the offset to
// times read to the nanosecond.
const spanTol = 1e-9

// NewInterp interpolates column valueK of other (whose time is column
// timeK) at the times in column mainTime of main. Call Value after each
// main.Next, or At with times that do not decrease.
func NewInterp(main *Reader, mainTime int, other *Reader, timeK, valueK int, offsetS float64) *Interp {
	if other.Increasing < 0 {
		other.Increasing = timeK
	}
	return &Interp{main: main, mainK: mainTime, other: other, timeK: timeK, valueK: valueK, offset: offsetS}
}

// Value returns the other log's value at the time of main's current row;
// a time outside the other log's span is an error at main's row and time
// cell.
func (ip *Interp) Value() (float64, error) {
	m := ip.main
	v, err := ip.At(m.Float(ip.mainK))
	if err != nil && errors.Is(err, ErrOutsideSpan) {
		return 0, &ParseError{File: m.File(), Line: m.Line(), Column: m.Column(ip.mainK), Field: m.cols[ip.mainK].Name, Err: err}
	}
	return v, err
}

// At returns the other log's value at time t (in main's seconds); t must
// not decrease from call to call.
func (ip *Interp) At(t float64) (float64, error) {
	if !ip.started {
		if err := ip.begin(); err != nil {
			return 0, err
		}
	}
	if t < ip.firstT-spanTol {
		return 0, ip.outside(t, "before the first sample", ip.firstT)
	}
	t = max(t, ip.firstT)
	if t < ip.t0 {
		return 0, fmt.Errorf("logs: Interp.At asked for %g s, before %g s already passed (the times asked must not decrease)", t, ip.t0)
	}
	for t > ip.t1 && !ip.done {
		ip.step()
	}
	if ip.other.Err() != nil {
		return 0, ip.other.Err()
	}
	switch {
	case t == ip.t1 || (ip.done && t > ip.t1 && t <= ip.t1+spanTol):
		return ip.v1, nil
	case t > ip.t1:
		return 0, ip.outside(t, "after the last sample", ip.t1)
	case t == ip.t0:
		return ip.v0, nil
	}
	return ip.v0 + (ip.v1-ip.v0)*(t-ip.t0)/(ip.t1-ip.t0), nil
}

// Close stops the other log's reader.
func (ip *Interp) Close() { ip.other.Close() }

func (ip *Interp) outside(t float64, where string, at float64) error {
	return fmt.Errorf("%w: %g s is %s of %s (%g s)", ErrOutsideSpan, t, where, ip.other.File(), at)
}

// begin reads the other log's first sample and settles the shift between
// the two logs' seconds.
func (ip *Interp) begin() error {
	ip.started = true
	if !ip.other.Next() {
		if err := ip.other.Err(); err != nil {
			return err
		}
		return fmt.Errorf("%w: %s has no samples", ErrOutsideSpan, ip.other.File())
	}
	ip.shift = ip.offset
	m, o := ip.main, ip.other
	if m.haveT0 && o.haveT0 && m.kind[ip.mainK] == o.kind[ip.timeK] {
		// Both on one clock: the other's first sample is this far after main's.
		ip.shift += float64(o.t0-m.t0) / float64(nsPerSec)
	}
	ip.t1, ip.v1 = o.Float(ip.timeK)+ip.shift, o.Float(ip.valueK)
	ip.t0, ip.v0, ip.firstT = ip.t1, ip.v1, ip.t1
	return nil
}

// step moves the pair of samples one sample on.
func (ip *Interp) step() {
	o := ip.other
	if !o.Next() {
		ip.done = true
		return
	}
	ip.t0, ip.v0 = ip.t1, ip.v1
	ip.t1, ip.v1 = o.Float(ip.timeK)+ip.shift, o.Float(ip.valueK)
}
